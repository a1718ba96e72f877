#include "measure/blas_threads.h"

// OpenBLAS's own entry (blas_server.c), the one it uses around fork(); declared weak so
// that a build against another BLAS links and simply skips the call.
extern "C" int blas_thread_shutdown_(void) __attribute__((weak));

namespace manicule {

void stop_idle_blas_threads() {
  if (blas_thread_shutdown_) blas_thread_shutdown_();
}

}  // namespace manicule
