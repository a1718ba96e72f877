#include "measure/blas_library.h"

#include <dlfcn.h>

#include <algorithm>
#include <atomic>
#include <cstdlib>
#include <initializer_list>
#include <string>
#include <system_error>
#include <thread>
#include <vector>

namespace manicule {

namespace {

// OpenBLAS starts a thread per core when it is loaded and, when the system refuses one (a
// limit on a user's threads, as on a shared login node), raises SIGINT: the run then ended
// as if the user had pressed Ctrl-C. Where this process cannot start as many threads as
// there are cores, OpenBLAS is asked for one (OPENBLAS_NUM_THREADS, read as it loads),
// unless the user has chosen a number. The variable is the whole process's, on purpose: a
// host program embedding manicule that cannot start threads could not use OpenBLAS's pool
// either. A limit the program set (limit_blas_threads) is asked for the same way.
std::atomic<unsigned> blas_thread_limit{0};  // 0: one per core

void ask_one_blas_thread_if_threads_are_refused() {
  if (std::getenv("OPENBLAS_NUM_THREADS")) return;
  const unsigned cores = std::max(1u, std::thread::hardware_concurrency());
  const unsigned limit = blas_thread_limit.load();
  std::vector<std::thread> probes;
  bool refused = false;
  for (unsigned i = 1; i < cores && !refused; ++i) {
    try {
      probes.emplace_back([] {});
    } catch (const std::system_error&) {
      refused = true;
    }
  }
  for (std::thread& probe : probes) probe.join();
  if (refused)
    setenv("OPENBLAS_NUM_THREADS", "1", 0);
  else if (limit && limit < cores)
    setenv("OPENBLAS_NUM_THREADS", std::to_string(limit).c_str(), 0);
}

}  // namespace

void limit_blas_threads(unsigned threads) { blas_thread_limit.store(threads); }

const BlasFunctions& blas_functions() {
  static const BlasFunctions found = []() -> BlasFunctions {
    ask_one_blas_thread_if_threads_are_refused();
    for (const char* name : {"libopenblas.so.0", "libblas.so.3", "libcblas.so.3"}) {
      void* library = dlopen(name, RTLD_NOW | RTLD_LOCAL);
      if (!library) continue;
      void* dsyrk = dlsym(library, "cblas_dsyrk");
      void* dgemm = dlsym(library, "cblas_dgemm");
      if (dsyrk && dgemm)
        return BlasFunctions{reinterpret_cast<decltype(&cblas_dsyrk)>(dsyrk),
                             reinterpret_cast<decltype(&cblas_dgemm)>(dgemm),
                             reinterpret_cast<decltype(&cblas_sgemm)>(dlsym(library, "cblas_sgemm")),
                             reinterpret_cast<DsyevrFunction>(dlsym(library, "dsyevr_"))};
      dlclose(library);
    }
    return {};
  }();
  return found;
}

}  // namespace manicule
