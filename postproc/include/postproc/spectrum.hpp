#pragma once
// One-sided amplitude spectra of real sequences sampled over whole periods (through FFTW; the
// only file that sees FFTW is spectrum.cpp). Bin k is k cycles per record; amplitude of a
// cosine of amplitude a in bin k > 0 is a, bin 0 holds the mean.
#include <complex>
#include <vector>

namespace gapflux {

std::vector<std::complex<double>> real_dft(const std::vector<double>& samples);
std::vector<double> amplitude_spectrum(const std::vector<double>& samples);
// 2-D DFT of a real rows × cols array (row-major): out[k0·(cols/2 + 1) + k1] =
// Σ_n Σ_j x[n][j]·e^{−2πi(k0·n/rows + k1·j/cols)}, for k0 < rows, k1 ≤ cols/2.
std::vector<std::complex<double>> real_dft_2d(const std::vector<double>& data, int rows, int cols);

}  // namespace gapflux
