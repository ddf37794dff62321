#pragma once
// The BLAS under CHOLMOD and UMFPACK runs on one thread: OpenBLAS (Debian's libblas.so.3 when
// installed) otherwise threads every small dense block of the factorisations over the program's
// OpenMP threads and, on this project's 2-core machines, made a time step 1.6× slower than the
// reference BLAS, where on one thread it is 0.72× (docs/performance.md). The program's own
// threads work in assembly; the factor's blocks stay serial.
namespace gapflux {

// Idempotent and cheap; a BLAS without the call (the reference one) is left alone.
void keep_blas_serial();

}  // namespace gapflux
