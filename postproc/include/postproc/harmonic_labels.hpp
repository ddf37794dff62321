#pragma once
// Names for airgap space orders, space–time waves and torque harmonics, from the machine's
// orders: phase-belt harmonics 6k ± 1 of an integral-slot winding, stator and rotor slot
// harmonics k·Q/p ± 1 and k·R/p ± 1 (common practice, no source), supply time harmonics, and
// for the torque the pairs of waves that can beat at its frequency.
#include <string>
#include <vector>

#include "postproc/airgap_waves.hpp"

namespace gapflux {

struct MachineOrders {
  int pole_pairs = 1;
  int stator_slots = 0;
  int rotor_bars = 0;           // 0: smooth rotor
  bool integral_slot = true;    // slots per pole and phase a whole number
  double rotor_speed_pu = 0.0;  // p·ω_m/ω: 1 − s
};

std::string space_order_label(const MachineOrders& m, int order_mech);
// `tolerance` on time orders: half a DFT bin (0.5/periods).
std::string wave_label(const MachineOrders& m, const Wave& w, double tolerance);

struct TorqueHarmonic {
  double order = 0.0;  // multiples of the supply frequency
  double amplitude_nm = 0.0;
  std::string label;   // the family, e.g. "2f pulsation: forward × backward fundamental"
  std::string source;  // the wave pair that beats at this frequency, strongest first
};

// Each harmonic (order, amplitude) is matched with the pairs of airgap waves of equal space
// order whose signed time orders differ by the torque order; the strongest product names it.
// A heuristic: it names the likely source, it proves nothing.
// `supply_orders`: time orders the phase currents carry besides the fundamental; a pair of
// space-fundamental waves is put down to the supply only when its other order is among them.
std::vector<TorqueHarmonic> attribute_torque_harmonics(
    const std::vector<std::pair<double, double>>& harmonics, const std::vector<Wave>& waves,
    const MachineOrders& m, const std::vector<double>& supply_orders, double tolerance);

}  // namespace gapflux
