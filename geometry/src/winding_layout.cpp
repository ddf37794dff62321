#include "geometry/winding_layout.hpp"

#include <fmt/format.h>

#include <cmath>
#include <complex>
#include <numbers>

namespace gapflux {
namespace {

constexpr double pi = std::numbers::pi;

// Belt m = 0…5 → (phase, sign): a+, c−, b+, a−, c+, b−.
constexpr int belt_phase[6] = {0, 2, 1, 0, 2, 1};
constexpr int belt_sign[6] = {+1, -1, +1, -1, +1, -1};

double slot_angle_el(int slot, int slots, int pole_pairs) {
  return pole_pairs * (slot + 0.5) * 2.0 * pi / slots;
}

std::complex<double> phasor_sum(const WindingLayout& w, int phase, double order, bool top_only) {
  std::complex<double> sum = 0.0;
  for (const CoilSide& s : w.sides) {
    if (s.phase != phase || (top_only && s.layer != 0)) continue;
    sum += double(s.sign) * std::polar(1.0, order * slot_angle_el(s.slot, w.slots, w.pole_pairs));
  }
  return sum;
}

}  // namespace

const char* phase_name(int phase) {
  static const char* names[3] = {"a", "b", "c"};
  return names[phase];
}

bool WindingLayout::repeats(int slots_per_sector, bool antiperiodic) const {
  for (int k = 0; k + slots_per_sector < slots; ++k)
    for (int l = 0; l < layers; ++l) {
      const CoilSide& a = side(k, l);
      const CoilSide& b = side(k + slots_per_sector, l);
      if (a.phase != b.phase || a.sign * (antiperiodic ? -1 : 1) != b.sign) return false;
    }
  return true;
}

WindingFactor winding_factor(const WindingLayout& w, double order) {
  WindingFactor f;
  f.order = order;
  int n_all = 0, n_top = 0;
  for (const CoilSide& s : w.sides)
    if (s.phase == 0) {
      ++n_all;
      n_top += s.layer == 0;
    }
  f.kw = std::abs(phasor_sum(w, 0, order, false)) / n_all;
  f.kd = std::abs(phasor_sum(w, 0, order, true)) / n_top;
  f.kp = f.kd > 1e-12 ? f.kw / f.kd : 0.0;
  return f;
}

WindingLayout build_winding_layout(const Case& c) {
  WindingLayout w;
  w.slots = c.stator.slots;
  w.pole_pairs = c.machine.pole_pairs();
  w.layers = c.winding.layers;
  w.coil_pitch_slots = c.winding.coil_pitch_slots;
  w.turns_per_coil = c.winding.turns_per_coil;
  w.parallel_paths = c.winding.parallel_paths;
  const int Q = w.slots, p = w.pole_pairs;

  const auto belt_of = [&](int slot) {
    const double theta = std::fmod(slot_angle_el(slot, Q, p), 2.0 * pi);
    return static_cast<int>(std::floor(theta / (pi / 3.0) + 1e-9)) % 6;
  };
  for (int k = 0; k < Q; ++k) {
    const int top = belt_of(k);
    w.sides.push_back({k, 0, belt_phase[top], belt_sign[top]});
    if (w.layers == 2) {
      const int start = ((k - w.coil_pitch_slots) % Q + Q) % Q;
      const int belt = belt_of(start);
      w.sides.push_back({k, 1, belt_phase[belt], -belt_sign[belt]});
    }
  }

  // Balance: equal side counts, equal fundamental phasors 120° apart, and as many return
  // sides as go sides in every phase.
  int count[3] = {0, 0, 0}, net[3] = {0, 0, 0};
  for (const CoilSide& s : w.sides) {
    count[s.phase]++;
    net[s.phase] += s.sign;
  }
  const auto a = phasor_sum(w, 0, 1.0, false);
  const auto b = phasor_sum(w, 1, 1.0, false);
  const auto cc = phasor_sum(w, 2, 1.0, false);
  const auto turn = std::polar(1.0, 2.0 * pi / 3.0);
  const double scale = std::max(1.0, std::abs(a));
  const bool balanced = count[0] == count[1] && count[1] == count[2] && net[0] == 0 &&
                        net[1] == 0 && net[2] == 0 && std::abs(a) > 1e-9 &&
                        std::abs(b - a * turn) < 1e-9 * scale &&
                        std::abs(cc - a * turn * turn) < 1e-9 * scale;
  if (!balanced)
    throw c.sources.error(
        "stator.slots",
        fmt::format("{} slots and {} poles give no balanced three-phase winding with 60° phase "
                    "belts ({} layer(s), coil pitch {}); Q/(3·gcd(Q, p)) must be an integer{}",
                    Q, 2 * p, w.layers, w.coil_pitch_slots,
                    w.layers == 1 ? ", and a single layer needs as many return as go sides" : ""));

  // Phase a's axis: 90° behind its "+" belt centre; the MMF fundamental of phase a is along
  // −j·(phasor sum of its conductors) for currents out of the plane.
  const double axis_a = std::arg(a) - pi / 2.0;
  for (int k = 0; k < 3; ++k)
    w.phase_axis_el_rad[k] = std::remainder(axis_a + k * 2.0 * pi / 3.0, 2.0 * pi);

  w.series_turns_per_phase = double(count[0]) * w.turns_per_coil / (2.0 * w.parallel_paths);

  const double slot_order = double(Q) / p;
  std::vector<std::pair<double, bool>> orders = {
      {1, false}, {5, false}, {7, false}, {11, false}, {13, false}};
  for (int k = 1; k <= 2; ++k)
    for (double o : {k * slot_order - 1, k * slot_order + 1})
      if (std::abs(o - std::round(o)) < 1e-9 && o > 0) orders.emplace_back(std::round(o), true);
  for (const auto& [order, slot] : orders) {
    bool seen = false;
    for (auto& f : w.factors)
      if (f.order == order) {
        f.slot_harmonic = f.slot_harmonic || slot;
        seen = true;
      }
    if (seen) continue;
    WindingFactor f = winding_factor(w, order);
    f.slot_harmonic = slot;
    w.factors.push_back(f);
  }
  return w;
}

}  // namespace gapflux
