#pragma once
// A resolved case: every value of a case file after defaults and range checks, in SI units
// (metres, radians, amperes, hertz). One struct per TOML table; docs/case-file.md lists every key
// with its unit, range and default. Geometric feasibility is checked in geometry/ (it needs the
// derived shapes), using `sources` to point back at the line of the offending key.
#include <array>
#include <string>
#include <vector>

#include "cases/input_error.hpp"

namespace gapflux {

struct MachineSpec {
  std::string name;
  int poles = 0;  // 2p
  double stack_length_m = 0.0;
  int pole_pairs() const { return poles / 2; }
};

enum class SlotShape { semi_closed, open, open_radial };
enum class SlotBody { constant_tooth_width, constant_slot_width };
enum class SlotBottom { round, flat };

// Stator slot; see docs/case-file.md for the drawing that labels each dimension.
struct StatorSlotSpec {
  SlotShape shape = SlotShape::semi_closed;
  // semi_closed: the tooth tip
  double opening_width_m = 0.0;  // width of the slot opening at the bore
  double tip_height_m = 0.0;     // radial length of the opening's parallel walls
  double wedge_angle_rad = 0.0;  // slope of the tip underside, from the tangential direction
  // semi_closed and open: the slot body
  SlotBody body = SlotBody::constant_tooth_width;
  double tooth_width_m = 0.0;  // body = constant_tooth_width
  double slot_width_m = 0.0;   // body = constant_slot_width, and open slots
  SlotBottom bottom = SlotBottom::round;
  // all shapes
  double slot_depth_m = 0.0;    // from the bore radius to the deepest point of the slot
  double wedge_height_m = 0.0;  // open, open_radial: radial height of the wedge (no winding)
  // open_radial: angular width of the annular-sector slot
  double slot_angle_rad = 0.0;
};

struct StatorSpec {
  double outer_diameter_m = 0.0;
  double bore_diameter_m = 0.0;
  int slots = 0;  // Q
  StatorSlotSpec slot;
};

enum class RotorKind { cage, smooth };
enum class BarShape { round, teardrop, rectangular };
enum class BarClosure { closed, semi_open };

struct RotorBarSpec {
  BarShape shape = BarShape::round;
  double diameter_m = 0.0;       // round
  double top_radius_m = 0.0;     // teardrop: radius of the end nearer the airgap
  double bottom_radius_m = 0.0;  // teardrop: radius of the end nearer the shaft
  double height_m = 0.0;         // teardrop, rectangular: overall radial height
  double width_m = 0.0;          // rectangular
  BarClosure closure = BarClosure::closed;
  double bridge_thickness_m = 0.0;  // closed: iron between the bar top and the rotor surface
  double opening_width_m = 0.0;     // semi_open: width of the slit to the airgap
  double opening_height_m = 0.0;    // semi_open: radial length of the slit
};

// The bars' currents: induced by the field through the cage's circuit, or an imposed balanced
// set ([rotor_currents]) for quick magnetising studies.
enum class BarCurrents { induced, imposed };

// The end rings (both alike): their cross-section and mean diameter, or each segment's values
// given directly (0 where not given: estimated from the dimensions; docs/case-file.md).
struct EndRingSpec {
  double mean_diameter_m = 0.0;         // 0: through the middle of the bars
  double radial_height_m = 0.0;         // 0: the bars' radial height
  double axial_width_m = 0.0;           // 0: for the bars' current density (common practice)
  double segment_resistance_ohm = 0.0;  // > 0: given, instead of from the dimensions
  double segment_inductance_h = -1.0;   // ≥ 0: given; < 0: estimated
};

struct RotorSpec {
  RotorKind kind = RotorKind::cage;
  double outer_diameter_m = 0.0;
  double shaft_diameter_m = 0.0;  // 0: no shaft region
  int bars = 0;                   // R; 0 for a smooth rotor
  RotorBarSpec bar;
  BarCurrents bar_currents = BarCurrents::induced;
  double cage_temperature_c = 100.0;  // bars and rings
  EndRingSpec ring;
};

struct WindingSpec {
  int layers = 2;
  int coil_pitch_slots = 0;  // 0 until resolved: default full pitch Q/(2p)
  int turns_per_coil = 0;
  int parallel_paths = 1;
  double fill_factor = 0.40;  // copper area / coil-side area
  double end_winding_length_m =
      0.0;  // one turn's end connection at one end; 0: estimated (winding_resistance)
  double conductor_temperature_c = 75.0;
  double phase_resistance_ohm = 0.0;       // 0: from the winding's geometry
  double end_winding_inductance_h = -1.0;  // per phase; < 0: estimated (winding_resistance)
};

enum class MaterialKind { air, conductor, steel };

// A material the case defines itself ([materials.define.NAME]); SI units.
struct MaterialDefinition {
  std::string name;
  MaterialKind kind = MaterialKind::steel;
  double relative_permeability = 1.0;  // when no B–H table is given
  std::vector<double> bh_h_a_per_m, bh_b_tesla;
  double conductivity_s_per_m = 0.0;
  double temperature_coefficient_per_k = 0.0;
  double density_kg_per_m3 = 0.0;
  double specific_loss_w_per_kg = 0.0;  // steels: loss at 1.5 T, 50 Hz; 0: no loss data
  double thickness_m = 0.0;             // steels: lamination thickness
};

// Region → material name. Names are resolved against the case's own definitions, then the
// material library in materials/.
struct MaterialsSpec {
  std::string stator_iron;
  std::string rotor_iron;
  std::string coils;
  std::string bars;
  std::string rings;  // "": the bars' material
  std::string shaft;
  std::vector<MaterialDefinition> definitions;
};

// What the supply imposes on the winding: its currents, or its voltages (the currents then
// follow from the field–circuit equations of design.md §3).
enum class Feed { current, voltage };
// How the three windings meet the lines (voltage feed): star with an isolated neutral, star
// with the neutral connected to the source's, or delta (winding a between lines a and b, b
// between b and c, c between c and a).
enum class Connection { star, star_neutral, delta };
// Whether the voltages given are line-to-neutral (phase) or line-to-line (ab, bc, ca).
enum class VoltageBasis { phase, line_to_line };

// The fundamental of one phase: RMS in A (current feed) or V (voltage feed), and its angle.
struct PhaseSpec {
  double rms = 0.0;
  double angle_rad = 0.0;
};

enum class SupplyForm { phases, sequence, waveform };

// One time-harmonic component of the supply beyond the fundamental, resolved per phase:
// x_k(t) ⊃ √2·rms[k]·cos(order·ω·t + angle_rad[k]) in A or V. Orders may be non-integer
// (interharmonics). A component given for all phases follows each phase's fundamental timing
// (angle_k = angle + order·φ_k), so its sequence follows from the angles, not from a rule.
struct SupplyComponent {
  double order = 1.0;
  std::array<double, 3> rms{0, 0, 0};
  std::array<double, 3> angle_rad{0, 0, 0};
  std::string key_path;  // "supply.harmonics[i]", for checks made after parsing
};

// A measured three-phase record (CSV: time, then three phase currents or voltages), used as
// given and interpolated linearly onto the time steps.
struct WaveformTable {
  std::string file;  // as resolved against the case file's folder
  std::vector<double> time_s;
  std::array<std::vector<double>, 3> values;  // A or V
};

struct SupplySpec {
  Feed feed = Feed::current;
  // The winding's connection. A current feed imposes the winding (branch) currents: into an
  // isolated star they must hold no zero sequence; a delta circulates it.
  Connection connection = Connection::star;
  VoltageBasis voltage_basis = VoltageBasis::phase;  // voltage feed
  double frequency_hz = 50.0;
  bool frequency_detected = false;  // true: taken from the waveform table, not the case
  SupplyForm form = SupplyForm::phases;
  double rms = 0.0;       // balanced RMS of each phase (A or V; line-to-line if so given)
  PhaseSpec phases[3];    // fundamental of a, b, c or ab, bc, ca (as given or from sequences)
  PhaseSpec sequence[3];  // zero, positive, negative as given (form == sequence)
  std::vector<SupplyComponent> harmonics;
  WaveformTable waveform;  // form == waveform
  bool voltage_fed() const { return feed == Feed::voltage; }
  const char* unit() const { return voltage_fed() ? "V" : "A"; }
};

enum class Symmetry { automatic, full };

struct MeshSpec {
  int order = 2;
  double airgap_size_m = 0.0;  // 0 until resolved: airgap length / 2
  double iron_size_m = 0.0;    // 0 until resolved: stator slot pitch at the bore / 3
  double growth_rate = 0.2;    // size increase per unit distance from the airgap
  int band_nodes = 0;          // nodes on each band circle, full circle; 0: from airgap_size
  Symmetry symmetry = Symmetry::automatic;
};

// Discretisation of d/dt in the circuit equations: backward Euler (first order) or the
// two-step backward difference formula (second order).
enum class TimeScheme { backward_euler, bdf2 };
// slip_curves: the time-harmonic steady state at a range of slips (torque, current, power
// factor, efficiency against slip).
enum class StudyKind { static_field, time_stepping, time_harmonic, slip_curves };
enum class Motion { slip, speed, locked };
// Where time stepping starts: `cold` — the induced cage switched on in the stator's field (its
// currents then build up with the rotor's time constant) and a voltage feed from its linear steady
// state; `time_harmonic` — field, bar and ring currents and winding linkages from the
// time-harmonic solution at the case's slip, so the run begins near its steady state.
enum class StartKind { cold, time_harmonic };

struct StudySpec {
  StudyKind kind = StudyKind::static_field;
  double rotor_angle_rad = 0.0;  // at time_s
  double time_s = 0.0;           // the instant (static) or the start (time stepping)
  // time stepping
  int steps_per_period = 60;
  double periods = 1.0;
  double discard_periods = 0.0;  // start-up left out of the statistics and spectra
  Motion motion = Motion::slip;
  double slip = 0.0;
  double speed_rpm = 0.0;
  bool band_aligned_steps = false;  // pick the step count so the rotor moves whole band pitches
  TimeScheme time_scheme = TimeScheme::bdf2;  // voltage feed: the circuit equations' d/dt
  double steady_state_tolerance_pct = 0.5;    // per-period change of the flux-linkage phasors
  StartKind start = StartKind::cold;
  // End the run after the first period (from the second on) within the steady-state tolerance;
  // `periods` is then the most that is run.
  bool stop_when_settled = false;
  // slip_curves: `points` slips evenly from slip_from to slip_to (the case's slip, if given, is
  // marked as the rated point).
  double slip_from = 1.0;
  double slip_to = -0.02;
  int points = 20;
  bool rated_given = false;
};

// Currents imposed on the cage bars (not induced): a balanced set at slip frequency.
struct RotorCurrentSpec {
  double bar_rms_a = 0.0;  // 0: no bar currents
  double angle_rad = 0.0;  // electrical angle of the bar-current wave behind the stator's
                           // current wave; 90°…180° motors (forward torque)
};

struct SolverSpec {
  int max_iterations = 30;
  double residual_tolerance = 1e-8;  // ‖r‖/‖f‖
  double update_tolerance = 1e-8;    // ‖δ‖/‖A‖
  int cg_budget = 20;  // CG iterations on an earlier factor before refactorising; 0: never
};

struct OutputSpec {
  int fields_every = 1;
  int airgap_samples = 0;                 // 0 until resolved: from the band nodes
  double saturation_threshold_tesla = 0;  // 0: each iron's deep saturation (differential μr 10)
};

struct Case {
  std::string file;  // as given on the command line
  MachineSpec machine;
  StatorSpec stator;
  RotorSpec rotor;
  WindingSpec winding;
  MaterialsSpec materials;
  SupplySpec supply;
  MeshSpec mesh;
  StudySpec study;
  RotorCurrentSpec rotor_currents;
  SolverSpec solver;
  OutputSpec output;
  SourceMap sources;
  std::vector<std::string> warnings;  // about valid but doubtful input; shown by check and run
};

const char* to_string(SlotShape);
const char* to_string(SlotBody);
const char* to_string(SlotBottom);
const char* to_string(RotorKind);
const char* to_string(BarShape);
const char* to_string(BarClosure);
const char* to_string(Symmetry);
const char* to_string(Feed);
const char* to_string(Connection);
const char* to_string(VoltageBasis);
const char* to_string(TimeScheme);

}  // namespace gapflux
