#include "blas_threads.hpp"

#include <omp.h>

namespace gapflux {

SerialBlas::SerialBlas() : threads_(omp_get_max_threads()) {
  if (threads_ > 1) omp_set_num_threads(1);
}

SerialBlas::~SerialBlas() {
  if (threads_ > 1) omp_set_num_threads(threads_);
}

}  // namespace gapflux
