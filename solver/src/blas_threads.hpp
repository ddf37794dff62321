#pragma once
// The BLAS under CHOLMOD and UMFPACK runs on one thread. OpenBLAS (Debian's libblas.so.3 when
// installed) in its OpenMP build threads every dense block of a factorisation over OpenMP's
// thread count and, on this project's 2-core machines, made a time step 1.6× slower than the
// reference BLAS; serial it is 0.72× (docs/performance.md). Its OpenMP build follows OpenMP's
// count at each call and cannot be held at one thread otherwise: the count is lowered around
// the factorisation and the solves and put back after. The program's own threads work in
// assembly.
namespace gapflux {

class SerialBlas {
 public:
  SerialBlas();
  ~SerialBlas();
  SerialBlas(const SerialBlas&) = delete;
  SerialBlas& operator=(const SerialBlas&) = delete;

 private:
  int threads_ = 1;
};

}  // namespace gapflux
