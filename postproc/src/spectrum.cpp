#include "postproc/spectrum.hpp"

#include <fftw3.h>

#include <cmath>
#include <mutex>

namespace gapflux {

namespace {
// FFTW's planner is not thread-safe; plans are cheap at these sizes (FFTW_ESTIMATE).
std::mutex planner;
}  // namespace

std::vector<std::complex<double>> real_dft(const std::vector<double>& samples) {
  const int n = static_cast<int>(samples.size());
  std::vector<std::complex<double>> out(n / 2 + 1);
  if (n == 0) return out;
  std::vector<double> in(samples);
  fftw_plan plan;
  {
    std::lock_guard<std::mutex> lock(planner);
    plan = fftw_plan_dft_r2c_1d(n, in.data(), reinterpret_cast<fftw_complex*>(out.data()),
                                FFTW_ESTIMATE);
  }
  fftw_execute(plan);
  {
    std::lock_guard<std::mutex> lock(planner);
    fftw_destroy_plan(plan);
  }
  return out;
}

std::vector<double> amplitude_spectrum(const std::vector<double>& samples) {
  const auto x = real_dft(samples);
  const double n = static_cast<double>(samples.size());
  std::vector<double> a(x.size());
  for (std::size_t k = 0; k < x.size(); ++k) {
    const bool nyquist = samples.size() % 2 == 0 && k == x.size() - 1;
    a[k] = std::abs(x[k]) / n * (k == 0 || nyquist ? 1.0 : 2.0);
  }
  return a;
}

std::vector<std::complex<double>> real_dft_2d(const std::vector<double>& data, int rows, int cols) {
  std::vector<std::complex<double>> out(static_cast<std::size_t>(rows) * (cols / 2 + 1));
  if (rows == 0 || cols == 0) return out;
  std::vector<double> in(data);  // FFTW_ESTIMATE leaves the input alone, but takes non-const
  fftw_plan plan;
  {
    std::lock_guard<std::mutex> lock(planner);
    plan = fftw_plan_dft_r2c_2d(rows, cols, in.data(), reinterpret_cast<fftw_complex*>(out.data()),
                                FFTW_ESTIMATE);
  }
  fftw_execute(plan);
  {
    std::lock_guard<std::mutex> lock(planner);
    fftw_destroy_plan(plan);
  }
  return out;
}

}  // namespace gapflux
