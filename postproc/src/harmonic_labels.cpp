#include "postproc/harmonic_labels.hpp"

#include <fmt/format.h>

#include <cmath>

namespace gapflux {
namespace {

bool near(double a, double b, double tol = 1e-9) {
  return std::abs(a - b) <= tol;
}

bool is_integer(double x) {
  return near(x, std::round(x));
}

// Smallest k ≥ 1 with ν = k·N/p ± 1, or 0; `sign` gets the ±.
int slot_order_k(double nu, int count, int pole_pairs, int* sign = nullptr) {
  if (count <= 0) return 0;
  for (int k = 1; k <= 8; ++k) {
    const double base = double(k) * count / pole_pairs;
    for (int s : {-1, 1})
      if (near(nu, base + s)) {
        if (sign) *sign = s;
        return k;
      }
  }
  return 0;
}

// "k=1 (Q/p−1)": the same form for space orders and waves.
std::string slot_name(const char* side, const char* count, int k, int sign) {
  return fmt::format("{} slot harmonic k={} ({}{}/p{}1)", side, k, k == 1 ? "" : std::to_string(k),
                     count, sign < 0 ? "−" : "+");
}

std::string dir_word(int direction) {
  return direction > 0 ? "forward" : direction < 0 ? "backward" : "standing";
}

std::string wave_name(const Wave& w) {
  return fmt::format("ν={:g} h={:g} {}", w.space_order_el, w.time_order, dir_word(w.direction));
}

// Rotor slot harmonic k: mechanical order p + k·R turning with the rotor, seen from the stator
// at time order 1 + k·R·(1 − s)/p.
bool is_rotor_slot_wave(const MachineOrders& m, const Wave& w, double tol, int& k_out) {
  if (m.rotor_bars <= 0) return false;
  for (int k = -6; k <= 6; ++k) {
    if (k == 0) continue;
    int order = m.pole_pairs + k * m.rotor_bars;
    double h = 1.0 + k * m.rotor_bars * m.rotor_speed_pu / m.pole_pairs;
    if (order < 0) order = -order, h = -h;
    if (order == w.space_order_mech && near(w.signed_time_order(), h, tol)) {
      k_out = k;
      return true;
    }
  }
  return false;
}

}  // namespace

std::string space_order_label(const MachineOrders& m, int order_mech) {
  const double nu = double(order_mech) / m.pole_pairs;
  if (order_mech == 0) return "uniform (mean) field";
  if (near(nu, 1.0)) return "fundamental";
  std::vector<std::string> names;
  int sign = 0;
  if (int k = slot_order_k(nu, m.stator_slots, m.pole_pairs, &sign))
    names.push_back(slot_name("stator", "Q", k, sign));
  if (int k = slot_order_k(nu, m.rotor_bars, m.pole_pairs, &sign))
    names.push_back(slot_name("rotor", "R", k, sign));
  if (is_integer(nu)) {
    const long v = std::lround(nu);
    if (m.integral_slot && v % 2 == 1 && v % 3 != 0) names.push_back("phase belt 6k±1");
    if (v % 2 == 1 && v % 3 == 0) names.push_back("triplen (zero sequence or saturation)");
    if (v % 2 == 0) names.push_back("even order (asymmetry)");
  } else {
    names.push_back("fractional order (winding sub/inter-harmonic)");
  }
  if (names.empty()) names.push_back("other");
  return fmt::format("{}", fmt::join(names, "; "));
}

std::string wave_label(const MachineOrders& m, const Wave& w, double tol) {
  const double nu = w.space_order_el;
  int k = 0;
  if (w.space_order_mech == 0) return "uniform pulsation";
  if (is_rotor_slot_wave(m, w, tol, k))  // m = p + k·R: ν = |k|·R/p + 1 for k > 0, − 1 for k < 0
    return slot_name("rotor", "R", std::abs(k), k > 0 ? 1 : -1) + ", turning with the rotor";
  if (near(nu, 1.0)) {
    if (near(w.time_order, 1.0, tol))
      return w.direction > 0 ? "fundamental, forward (positive sequence)"
                             : "fundamental, backward (negative sequence)";
    if (w.direction == 0) return "static field (DC)";
    return fmt::format("supply time harmonic {:g}, {}", w.time_order, dir_word(w.direction));
  }
  const std::string space = space_order_label(m, w.space_order_mech);
  if (near(w.time_order, 1.0, tol)) return space + ", of the fundamental current";
  if (w.direction == 0 && near(w.time_order, 0.0, tol)) return space + ", static";
  return fmt::format("{}, at time order {:g}", space, w.time_order);
}

std::vector<TorqueHarmonic> attribute_torque_harmonics(
    const std::vector<std::pair<double, double>>& harmonics, const std::vector<Wave>& waves,
    const MachineOrders& m, const std::vector<double>& supply_orders, double tol) {
  const auto from_supply = [&](const Wave& w) {
    if (near(w.time_order, 1.0, tol)) return true;
    for (double h : supply_orders)
      if (near(w.time_order, h, tol)) return true;
    return false;
  };
  std::vector<TorqueHarmonic> out;
  // Waves at the mid-band: only the larger ones can beat to a visible torque.
  const std::size_t n = std::min<std::size_t>(waves.size(), 60);
  for (const auto& [order, amplitude] : harmonics) {
    TorqueHarmonic t;
    t.order = order;
    t.amplitude_nm = amplitude;
    const Wave *best_a = nullptr, *best_b = nullptr;
    double best = 0;
    for (std::size_t i = 0; i < n; ++i)
      for (std::size_t j = 0; j < n; ++j) {
        const Wave &a = waves[i], &b = waves[j];
        if (a.space_order_mech != b.space_order_mech || a.space_order_mech == 0) continue;
        if (!near(a.signed_time_order() - b.signed_time_order(), order, tol)) continue;
        const double score = a.amplitude * b.amplitude;
        if (score > best) best = score, best_a = &a, best_b = &b;
      }
    if (!best_a) {
      t.label = "no matching wave pair in the airgap table";
      out.push_back(t);
      continue;
    }
    t.source = wave_name(*best_a) + " × " + wave_name(*best_b);
    int k = 0;
    const bool fundamental_pair =
        best_a->space_order_mech == m.pole_pairs && best_b->space_order_mech == m.pole_pairs;
    const auto is_fund = [&](const Wave& w, int dir) {
      return w.space_order_mech == m.pole_pairs && near(w.time_order, 1.0, tol) &&
             w.direction == dir;
    };
    const bool supply_pair = fundamental_pair && from_supply(*best_a) && from_supply(*best_b);
    const double stator_slot_order = double(m.stator_slots) / m.pole_pairs;  // Q/p
    if (supply_pair && ((is_fund(*best_a, 1) && is_fund(*best_b, -1)) ||
                        (is_fund(*best_a, -1) && is_fund(*best_b, 1))))
      t.label = "2f pulsation: forward × backward fundamental (negative sequence)";
    else if (supply_pair && is_integer(order / 6.0) && (is_fund(*best_a, 1) || is_fund(*best_b, 1)))
      t.label = fmt::format("{:g}f family: fundamental × supply time harmonics {:g}/{:g}", order,
                            order - 1, order + 1);
    else if (supply_pair)
      t.label =
          fmt::format("supply time harmonics {:g} × {:g}", best_a->time_order, best_b->time_order);
    else if (is_rotor_slot_wave(m, *best_a, tol, k) || is_rotor_slot_wave(m, *best_b, tol, k))
      t.label = "rotor slot ripple";
    else if (slot_order_k(best_a->space_order_el, m.stator_slots, m.pole_pairs) > 0 ||
             (stator_slot_order > 0 && is_integer(order / stator_slot_order)))
      t.label = "stator slot ripple";
    else
      t.label = "wave interaction";
    out.push_back(t);
  }
  return out;
}

}  // namespace gapflux
