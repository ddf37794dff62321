// [supply] → SupplySpec. The fundamental comes one way only (balanced rms_a or rms_v with per-phase
// overrides, or symmetrical components, or a measured table); harmonics add to the first two.
#include "supply_reader.hpp"

#include <fmt/format.h>

#include <cmath>
#include <complex>
#include <filesystem>
#include <map>
#include <numbers>

#include "value_checks.hpp"

namespace gapflux {
namespace {

using namespace value_checks;
using cplx = std::complex<double>;

// The words a supply is described in: RMS key and unit, and the names of its three phases.
struct Terms {
  const char* rms_key;  // "rms_a" or "rms_v"
  const char* unit;     // "A" or "V"
  const char* quantity;
  std::array<const char*, 3> phase;
};

Terms terms_of(const SupplySpec& s) {
  if (!s.voltage_fed()) return {"rms_a", "A", "current", {"a", "b", "c"}};
  if (s.voltage_basis == VoltageBasis::line_to_line)
    return {"rms_v", "V", "line-to-line voltage", {"ab", "bc", "ca"}};
  return {"rms_v", "V", "phase (line-to-neutral) voltage", {"a", "b", "c"}};
}

PhaseSpec parse_phase(TableReader t, const Terms& w, std::optional<double> default_rms,
                      double default_angle_deg) {
  PhaseSpec p;
  if (!t.has(w.rms_key) && !default_rms)
    throw t.missing(w.rms_key, fmt::format("the phase's RMS {} in {}, or {} in [supply] for all "
                                           "phases",
                                           w.quantity, w.unit, w.rms_key));
  p.rms = number_in(t, w.rms_key, default_rms, 0.0, 1e7, w.unit);
  p.angle_rad = number_in(t, "angle_deg", default_angle_deg, -360.0, 360.0, "degrees") * deg;
  t.finish();
  return p;
}

// Fortescue's inverse: a = X0 + X1 + X2, b = X0 + α²X1 + αX2, c = X0 + αX1 + α²X2.
void phases_from_sequences(SupplySpec& s) {
  const cplx alpha = std::polar(1.0, 2.0 * std::numbers::pi / 3.0);
  cplx x[3];
  for (int q = 0; q < 3; ++q) x[q] = std::polar(s.sequence[q].rms, s.sequence[q].angle_rad);
  const cplx abc[3] = {x[0] + x[1] + x[2], x[0] + alpha * alpha * x[1] + alpha * x[2],
                       x[0] + alpha * x[1] + alpha * alpha * x[2]};
  for (int k = 0; k < 3; ++k) {
    s.phases[k].rms = std::abs(abc[k]);
    s.phases[k].angle_rad = std::abs(abc[k]) > 0 ? std::arg(abc[k]) : 0.0;
  }
}

void parse_sequences(TableReader t, const Terms& w, SupplySpec& s) {
  const char* names[3] = {"zero", "positive", "negative"};
  for (int q = 0; q < 3; ++q) {
    auto part = t.table(names[q]);
    if (!part) {
      if (q == 1)
        throw t.missing("positive",
                        fmt::format("the positive-sequence {{ {}, angle_deg }}", w.rms_key), true);
      continue;
    }
    if (q == 0 && s.voltage_fed() && s.voltage_basis == VoltageBasis::line_to_line)
      throw t.error("zero", "line-to-line voltages hold no zero sequence (they sum to zero)");
    s.sequence[q].rms = number_in(*part, w.rms_key, std::nullopt, 0.0, 1e7, w.unit);
    s.sequence[q].angle_rad = number_in(*part, "angle_deg", 0.0, -360.0, 360.0, "degrees") * deg;
    part->finish();
  }
  t.finish();
  phases_from_sequences(s);
}

void parse_harmonics(std::vector<TableReader> tables, const Terms& w, SupplySpec& s) {
  for (TableReader& t : tables) {
    SupplyComponent h;
    h.key_path = t.path();
    h.order = number_in(t, "order", std::nullopt, 0.0, 1000.0, "(multiples of the fundamental)");
    if (!(h.order > 0.0))
      throw t.error("order", "must be greater than 0 (a DC offset is not a harmonic)");
    if (std::abs(h.order - 1.0) < 1e-12)
      throw t.error("order", fmt::format("order 1 is the fundamental, set by {}, [supply.phases] "
                                         "or [supply.sequence]",
                                         w.rms_key));
    const bool percent = t.has("percent"), rms = t.has(w.rms_key);
    if (percent == rms)
      throw percent ? t.error(w.rms_key, fmt::format("give percent or {}, not both", w.rms_key))
                    : t.missing("percent", fmt::format("percent (of the phase's fundamental RMS) "
                                                       "or {}",
                                                       w.rms_key));
    const double value = percent ? number_in(t, "percent", {}, 0.0, 1000.0, "%")
                                 : number_in(t, w.rms_key, {}, 0.0, 1e7, w.unit);
    if (!percent) t.know("percent");
    if (percent) t.know(w.rms_key);
    const double angle_rad = number_in(t, "angle_deg", 0.0, -360.0, 360.0, "degrees") * deg;
    const std::size_t which =
        choice(t, "phase", {"all", w.phase[0], w.phase[1], w.phase[2]}, std::size_t{0});
    t.finish();
    for (int k = 0; k < 3; ++k) {
      if (which != 0 && static_cast<int>(which) - 1 != k) continue;
      h.rms[k] = percent ? value / 100.0 * s.phases[k].rms : value;
      // The phase's waveform shifted as its fundamental is: angle + order·φ_k.
      h.angle_rad[k] = angle_rad + h.order * s.phases[k].angle_rad;
    }
    for (const SupplyComponent& other : s.harmonics) {
      if (std::abs(other.order - h.order) > 1e-12) continue;
      for (int k = 0; k < 3; ++k)
        if (other.rms[k] > 0 && h.rms[k] > 0)
          throw t.error("order", fmt::format("order {:g} is already given for phase {} in {}",
                                             h.order, w.phase[k], other.key_path));
    }
    s.harmonics.push_back(h);
  }
}

// Line-to-line phasors must close (u_ab + u_bc + u_ca = 0, Kirchhoff's voltage law). Without
// any angle given, the angles follow from the three magnitudes as a meter reads them: ab stays
// at 30° and bc lags it by the triangle's exterior angle, by the law of cosines,
// cos(φ_bc − φ_ab) = (|ca|² − |ab|² − |bc|²)/(2|ab||bc|); ca closes the triangle. With angles
// given, a set that does not close to 0.1 % is refused.
void close_line_triangle(TableReader& t, std::optional<TableReader>& phases, const Terms& w,
                         SupplySpec& s) {
  bool angles_given = false;
  for (int k = 0; k < 3; ++k)
    if (phases)
      if (auto p = phases->table(w.phase[k]); p && p->has("angle_deg")) angles_given = true;
  const double a = s.phases[0].rms, b = s.phases[1].rms, c = s.phases[2].rms;
  const double mean = (a + b + c) / 3.0;
  if (mean <= 0.0) return;
  if (!angles_given) {
    const double cosine = (c * c - a * a - b * b) / (2.0 * a * b);
    if (!(a > 0 && b > 0) || cosine < -1.0 - 1e-12 || cosine > 1.0)
      throw t.error(w.rms_key, fmt::format("line-to-line magnitudes {:g}, {:g}, {:g} V do not "
                                           "form a triangle (each must be below the sum of the "
                                           "other two)",
                                           a, b, c));
    const cplx ab = std::polar(a, s.phases[0].angle_rad);
    const cplx bc = std::polar(b, s.phases[0].angle_rad - std::acos(std::max(-1.0, cosine)));
    const cplx ca = -(ab + bc);
    s.phases[1].angle_rad = std::arg(bc);
    s.phases[2].rms = std::abs(ca);
    s.phases[2].angle_rad = std::arg(ca);
    return;
  }
  cplx sum = 0;
  for (const PhaseSpec& p : s.phases) sum += std::polar(p.rms, p.angle_rad);
  if (std::abs(sum) > 1e-3 * mean)
    throw t.error("phases", fmt::format("the line-to-line voltages do not close: |u_ab + u_bc + "
                                        "u_ca| = {:.4g} V (Kirchhoff's voltage law); give the "
                                        "three magnitudes without angles to have the angles "
                                        "from the triangle",
                                        std::abs(sum)));
}

// Feed, connection and voltage basis; the keys that do not apply to the feed are refused.
void parse_feed(TableReader& t, SupplySpec& s) {
  s.feed = static_cast<Feed>(choice(t, "feed", {"current", "voltage"}, std::size_t{0}));
  s.connection = static_cast<Connection>(
      choice(t, "connection", {"star", "star_neutral", "delta"}, std::size_t{0}));
  if (!s.voltage_fed()) {
    for (const char* key : {"voltages", "rms_v"})
      if (t.has(key))
        throw t.error(key,
                      "applies to feed = \"voltage\" only (a current feed imposes the "
                      "winding currents)");
    return;
  }
  if (t.has("rms_a"))
    throw t.error("rms_a", "a voltage feed takes rms_v (the currents follow from the field)");
  s.voltage_basis = static_cast<VoltageBasis>(
      choice(t, "voltages", {"phase", "line_to_line"},
             s.connection == Connection::star_neutral ? std::size_t{0} : std::size_t{1}));
  if (s.connection == Connection::star_neutral && s.voltage_basis == VoltageBasis::line_to_line)
    throw t.error("voltages",
                  "a star with its neutral connected needs the phase (line-to-neutral) voltages, "
                  "zero sequence included: set voltages = \"phase\"");
}

}  // namespace

SupplySpec parse_supply(TableReader t, const std::string& case_file) {
  SupplySpec s;
  parse_feed(t, s);
  const Terms w = terms_of(s);
  const bool has_waveform = t.has("waveform"), has_sequence = t.has("sequence");
  if (t.has("frequency_hz") || !has_waveform) {
    s.frequency_hz = number_in(t, "frequency_hz", 50.0, 0.0, 10000.0, "Hz");
    if (s.frequency_hz <= 0.0) throw t.error("frequency_hz", "must be greater than 0 Hz");
  } else {
    t.know("frequency_hz");
  }
  if (has_waveform || has_sequence) {
    const std::string why = has_waveform ? fmt::format(
                                               "the measured table in [supply.waveform] "
                                               "already sets every phase {}",
                                               w.quantity)
                                         : "[supply.sequence] already sets the fundamental";
    for (const char* key : {w.rms_key, "phases"})
      if (t.has(key)) throw t.error(key, "does not apply here: " + why);
    if (has_waveform && has_sequence) throw t.error("sequence", "does not apply here: " + why);
    if (has_waveform && t.has("harmonics"))
      throw t.error("harmonics", "does not apply here: " + why + ", harmonics included");
  }

  if (has_waveform) {
    s.form = SupplyForm::waveform;
    auto table = t.table("waveform");
    const auto file = table->string("file");
    if (!file || file->empty())
      throw table->missing("file", fmt::format("the path of a CSV: time_s, then the {} of {}, "
                                               "{}, {}",
                                               w.quantity, w.phase[0], w.phase[1], w.phase[2]));
    table->finish();
    std::filesystem::path path(*file);
    if (path.is_relative()) path = std::filesystem::path(case_file).parent_path() / path;
    try {
      s.waveform = read_waveform_csv(path.string(), table->key_path("file"));
    } catch (const std::runtime_error& e) {
      if (dynamic_cast<const InputError*>(&e)) throw;
      throw table->error("file", e.what());
    }
    if (!t.has("frequency_hz")) {
      try {
        s.frequency_hz = detect_fundamental_hz(s.waveform);
      } catch (const std::runtime_error& e) {
        throw table->error("file", fmt::format("{}; give supply.frequency_hz", e.what()));
      }
      s.frequency_detected = true;
    }
    t.know(w.rms_key), t.know("phases"), t.know("sequence"), t.know("harmonics");
    t.finish();
    return s;
  }

  if (has_sequence) {
    s.form = SupplyForm::sequence;
    parse_sequences(*t.table("sequence"), w, s);
    t.know(w.rms_key), t.know("phases");
  } else {
    s.form = SupplyForm::phases;
    const auto balanced = t.number(w.rms_key);
    if (balanced) s.rms = number_in(t, w.rms_key, {}, 0.0, 1e7, w.unit);
    auto phases = t.table("phases");
    // Line-to-line voltages of a positive-sequence set lead their phase voltages by 30°.
    const bool line = s.voltage_fed() && s.voltage_basis == VoltageBasis::line_to_line;
    const double default_angle_deg[3] = {line ? 30.0 : 0.0, line ? -90.0 : -120.0,
                                         line ? -210.0 : -240.0};
    for (int k = 0; k < 3; ++k) {
      std::optional<TableReader> p = phases ? phases->table(w.phase[k]) : std::nullopt;
      if (!p && !balanced)
        throw t.missing(w.rms_key,
                        fmt::format("{} (balanced RMS {} in {}), [supply.phases.{}/{}/{}] with "
                                    "{} each, [supply.sequence] or [supply.waveform]",
                                    w.rms_key, w.quantity, w.unit, w.phase[0], w.phase[1],
                                    w.phase[2], w.rms_key));
      s.phases[k] = p ? parse_phase(*p, w, balanced ? std::optional(s.rms) : std::nullopt,
                                    default_angle_deg[k])
                      : PhaseSpec{s.rms, default_angle_deg[k] * deg};
    }
    if (phases) phases->finish();
    if (line) close_line_triangle(t, phases, w, s);
    t.know("sequence");
  }
  parse_harmonics(t.table_array("harmonics"), w, s);
  t.know("waveform");
  t.finish();
  return s;
}

void close_isolated_star(Case& c, std::vector<std::string>& warnings) {
  SupplySpec& s = c.supply;
  if (s.voltage_fed() || s.connection != Connection::star) return;
  // Zero sequence (Fortescue: a third of the three phasors' sum), removed from every phase as
  // the isolated star point removes it; reported against the fundamental's positive sequence.
  double removed = 0.0, removed_order = 1.0, reference = 0.0;
  std::string key = "supply.phases";
  const auto note = [&](double zero, double order, const std::string& at) {
    if (zero > removed) removed = zero, removed_order = order, key = at;
  };
  if (s.form == SupplyForm::waveform) {
    double sum2 = 0.0, phase2 = 0.0;
    auto& v = s.waveform.values;
    for (std::size_t i = 0; i < s.waveform.time_s.size(); ++i) {
      const double z = (v[0][i] + v[1][i] + v[2][i]) / 3.0;
      sum2 += z * z;
      phase2 += (v[0][i] * v[0][i] + v[1][i] * v[1][i] + v[2][i] * v[2][i]) / 3.0;
      for (int k = 0; k < 3; ++k) v[k][i] -= z;
    }
    reference = std::sqrt(phase2);
    note(std::sqrt(sum2), 0.0, "supply.waveform.file");
  } else {
    const cplx alpha = std::polar(1.0, 2.0 * std::numbers::pi / 3.0);
    std::array<cplx, 3> x;
    cplx positive{0.0, 0.0}, zero{0.0, 0.0};
    for (int k = 0; k < 3; ++k) {
      x[k] = std::polar(s.phases[k].rms, s.phases[k].angle_rad);
      zero += x[k] / 3.0;
      positive += x[k] * std::pow(alpha, k) / 3.0;
    }
    reference = std::abs(positive);
    note(std::abs(zero), 1.0, s.form == SupplyForm::sequence ? "supply.sequence" : "supply.phases");
    if (std::abs(zero) > 1e-12 * reference)  // a closed set keeps its angles as given
      for (int k = 0; k < 3; ++k) {
        const cplx closed = x[k] - zero;
        s.phases[k] = {std::abs(closed), std::abs(closed) > 0 ? std::arg(closed) : 0.0};
      }
    // Per order: each phase's component of that order (one at most per phase) loses the zero
    // sequence; a phase with none gets one of its own.
    std::map<double, std::array<cplx, 3>> by_order;
    std::map<double, std::string> key_of;
    for (const SupplyComponent& h : s.harmonics) {
      for (int k = 0; k < 3; ++k) by_order[h.order][k] += std::polar(h.rms[k], h.angle_rad[k]);
      key_of[h.order] = h.key_path;
    }
    for (const auto& [order, phasors] : by_order) {
      const cplx z = (phasors[0] + phasors[1] + phasors[2]) / 3.0;
      if (std::abs(z) <= 1e-12 * reference) continue;
      note(std::abs(z), order, key_of[order]);
      for (int k = 0; k < 3; ++k) {
        SupplyComponent* own = nullptr;
        for (SupplyComponent& h : s.harmonics)
          if (h.order == order && h.rms[k] > 0) own = &h;
        if (!own) {
          SupplyComponent added;
          added.order = order;
          added.key_path = key_of[order];
          s.harmonics.push_back(added);
          own = &s.harmonics.back();
        }
        const cplx closed = std::polar(own->rms[k], own->angle_rad[k]) - z;
        own->rms[k] = std::abs(closed);
        own->angle_rad[k] = std::arg(closed);
      }
    }
  }
  if (reference <= 0.0 || removed <= 1e-3 * reference) return;  // rounding of given values
  warnings.push_back(fmt::format(
      "{}: the described currents carry {:.3g} A of zero sequence{} ({:.2f} % of the "
      "fundamental's positive sequence), which an isolated star (connection = \"star\", the "
      "default) cannot carry: its three currents always sum to zero. It is removed from every "
      "phase (Kirchhoff); give supply.connection = \"star_neutral\" or \"delta\" if the winding "
      "does carry it",
      key, removed,
      s.form == SupplyForm::waveform ? " (RMS of the three-phase sum)"
                                     : fmt::format(" at order {:g}", removed_order),
      100.0 * removed / reference));
}

}  // namespace gapflux
