#include "measure/blas_library.h"

#include <dlfcn.h>

#include <initializer_list>

namespace manicule {

const BlasFunctions& blas_functions() {
  static const BlasFunctions found = []() -> BlasFunctions {
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
