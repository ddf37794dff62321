#include "blas_threads.hpp"

#include <dlfcn.h>

#include <mutex>

namespace gapflux {

void keep_blas_serial() {
  static std::once_flag once;
  std::call_once(once, [] {
    // Looked up at run time: the library behind libblas.so.3 is chosen by the system's
    // alternatives, not at build time.
    using SetThreads = void (*)(int);
    if (auto set = reinterpret_cast<SetThreads>(dlsym(RTLD_DEFAULT, "openblas_set_num_threads")))
      set(1);
  });
}

}  // namespace gapflux
