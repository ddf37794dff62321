#pragma once
// One-sided amplitude spectra of real sequences sampled over whole periods (through FFTW; the
// only file that sees FFTW is spectrum.cpp). Bin k is k cycles per record; amplitude of a
// cosine of amplitude a in bin k > 0 is a, bin 0 holds the mean.
#include <complex>
#include <vector>

namespace gapflux {

std::vector<std::complex<double>> real_dft(const std::vector<double>& samples);
std::vector<double> amplitude_spectrum(const std::vector<double>& samples);

}  // namespace gapflux
