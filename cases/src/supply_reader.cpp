// [supply] → SupplySpec. The fundamental comes one way only (balanced rms_a with per-phase
// overrides, or symmetrical components, or a measured table); harmonics add to the first two.
#include "supply_reader.hpp"

#include <fmt/format.h>

#include <cmath>
#include <complex>
#include <filesystem>

#include "value_checks.hpp"

namespace gapflux {
namespace {

using namespace value_checks;
using cplx = std::complex<double>;

const char* phase_names[3] = {"a", "b", "c"};

PhaseSpec parse_phase(TableReader t, std::optional<double> default_rms_a,
                      double default_angle_deg) {
  PhaseSpec p;
  if (!t.has("rms_a") && !default_rms_a)
    throw t.missing("rms_a", "the phase's RMS current in A, or rms_a in [supply] for all phases");
  p.rms_a = number_in(t, "rms_a", default_rms_a, 0.0, 1e6, "A");
  p.angle_rad = number_in(t, "angle_deg", default_angle_deg, -360.0, 360.0, "degrees") * deg;
  t.finish();
  return p;
}

// Fortescue's inverse: a = X0 + X1 + X2, b = X0 + α²X1 + αX2, c = X0 + αX1 + α²X2.
void phases_from_sequences(SupplySpec& s) {
  const cplx alpha = std::polar(1.0, 2.0 * std::numbers::pi / 3.0);
  cplx x[3];
  for (int q = 0; q < 3; ++q) x[q] = std::polar(s.sequence[q].rms_a, s.sequence[q].angle_rad);
  const cplx abc[3] = {x[0] + x[1] + x[2], x[0] + alpha * alpha * x[1] + alpha * x[2],
                       x[0] + alpha * x[1] + alpha * alpha * x[2]};
  for (int k = 0; k < 3; ++k) {
    s.phases[k].rms_a = std::abs(abc[k]);
    s.phases[k].angle_rad = std::abs(abc[k]) > 0 ? std::arg(abc[k]) : 0.0;
  }
}

void parse_sequences(TableReader t, SupplySpec& s) {
  const char* names[3] = {"zero", "positive", "negative"};
  for (int q = 0; q < 3; ++q) {
    auto part = t.table(names[q]);
    if (!part) {
      if (q == 1) throw t.missing("positive", "the positive-sequence { rms_a, angle_deg }", true);
      continue;
    }
    s.sequence[q].rms_a = number_in(*part, "rms_a", std::nullopt, 0.0, 1e6, "A");
    s.sequence[q].angle_rad = number_in(*part, "angle_deg", 0.0, -360.0, 360.0, "degrees") * deg;
    part->finish();
  }
  t.finish();
  phases_from_sequences(s);
}

void parse_harmonics(std::vector<TableReader> tables, SupplySpec& s) {
  for (TableReader& t : tables) {
    CurrentComponent h;
    h.key_path = t.path();
    h.order = number_in(t, "order", std::nullopt, 0.0, 1000.0, "(multiples of the fundamental)");
    if (!(h.order > 0.0))
      throw t.error("order", "must be greater than 0 (a DC offset is not a harmonic)");
    if (std::abs(h.order - 1.0) < 1e-12)
      throw t.error("order",
                    "order 1 is the fundamental, set by rms_a, [supply.phases] or "
                    "[supply.sequence]");
    const bool percent = t.has("percent"), rms = t.has("rms_a");
    if (percent == rms)
      throw percent ? t.error("rms_a", "give percent or rms_a, not both")
                    : t.missing("percent", "percent (of the phase's fundamental RMS) or rms_a");
    const double value = percent ? number_in(t, "percent", {}, 0.0, 1000.0, "%")
                                 : number_in(t, "rms_a", {}, 0.0, 1e6, "A");
    if (!percent) t.know("percent");
    if (percent) t.know("rms_a");
    const double angle_rad = number_in(t, "angle_deg", 0.0, -360.0, 360.0, "degrees") * deg;
    const std::size_t which = choice(t, "phase", {"all", "a", "b", "c"}, std::size_t{0});
    t.finish();
    for (int k = 0; k < 3; ++k) {
      if (which != 0 && static_cast<int>(which) - 1 != k) continue;
      h.rms_a[k] = percent ? value / 100.0 * s.phases[k].rms_a : value;
      // The phase's waveform shifted as its fundamental is: angle + order·φ_k.
      h.angle_rad[k] = angle_rad + h.order * s.phases[k].angle_rad;
    }
    for (const CurrentComponent& other : s.harmonics) {
      if (std::abs(other.order - h.order) > 1e-12) continue;
      for (int k = 0; k < 3; ++k)
        if (other.rms_a[k] > 0 && h.rms_a[k] > 0)
          throw t.error("order", fmt::format("order {:g} is already given for phase {} in {}",
                                             h.order, phase_names[k], other.key_path));
    }
    s.harmonics.push_back(h);
  }
}

}  // namespace

SupplySpec parse_supply(TableReader t, const std::string& case_file) {
  SupplySpec s;
  s.feed = static_cast<Feed>(choice(t, "feed", {"current"}, std::size_t{0}));
  const bool has_waveform = t.has("waveform"), has_sequence = t.has("sequence");
  if (t.has("frequency_hz") || !has_waveform) {
    s.frequency_hz = number_in(t, "frequency_hz", 50.0, 0.0, 10000.0, "Hz");
    if (s.frequency_hz <= 0.0) throw t.error("frequency_hz", "must be greater than 0 Hz");
  } else {
    t.know("frequency_hz");
  }
  if (has_waveform || has_sequence) {
    const std::string why =
        has_waveform ? "the measured table in [supply.waveform] already sets every phase current"
                     : "[supply.sequence] already sets the fundamental";
    for (const char* key : {"rms_a", "phases"})
      if (t.has(key)) throw t.error(key, "does not apply here: " + why);
    if (has_waveform && has_sequence) throw t.error("sequence", "does not apply here: " + why);
    if (has_waveform && t.has("harmonics"))
      throw t.error("harmonics", "does not apply here: " + why + ", harmonics included");
  }

  if (has_waveform) {
    s.form = SupplyForm::waveform;
    auto w = t.table("waveform");
    const auto file = w->string("file");
    if (!file || file->empty())
      throw w->missing("file", "the path of a CSV: time_s, i_a, i_b, i_c");
    w->finish();
    std::filesystem::path path(*file);
    if (path.is_relative()) path = std::filesystem::path(case_file).parent_path() / path;
    try {
      s.waveform = read_waveform_csv(path.string(), w->key_path("file"));
    } catch (const std::runtime_error& e) {
      if (dynamic_cast<const InputError*>(&e)) throw;
      throw w->error("file", e.what());
    }
    if (!t.has("frequency_hz")) {
      try {
        s.frequency_hz = detect_fundamental_hz(s.waveform);
      } catch (const std::runtime_error& e) {
        throw w->error("file", fmt::format("{}; give supply.frequency_hz", e.what()));
      }
      s.frequency_detected = true;
    }
    t.know("rms_a"), t.know("phases"), t.know("sequence"), t.know("harmonics");
    t.finish();
    return s;
  }

  if (has_sequence) {
    s.form = SupplyForm::sequence;
    parse_sequences(*t.table("sequence"), s);
    t.know("rms_a"), t.know("phases");
  } else {
    s.form = SupplyForm::phases;
    const auto balanced = t.number("rms_a");
    if (balanced) s.rms_a = number_in(t, "rms_a", {}, 0.0, 1e6, "A");
    auto phases = t.table("phases");
    const double default_angle_deg[3] = {0.0, -120.0, -240.0};
    for (int k = 0; k < 3; ++k) {
      std::optional<TableReader> p = phases ? phases->table(phase_names[k]) : std::nullopt;
      if (!p && !balanced)
        throw t.missing("rms_a",
                        "rms_a (balanced RMS phase current in A), [supply.phases.a/b/c] with "
                        "rms_a each, [supply.sequence] or [supply.waveform]");
      s.phases[k] = p ? parse_phase(*p, balanced ? std::optional(s.rms_a) : std::nullopt,
                                    default_angle_deg[k])
                      : PhaseSpec{s.rms_a, default_angle_deg[k] * deg};
    }
    if (phases) phases->finish();
    t.know("sequence");
  }
  parse_harmonics(t.table_array("harmonics"), s);
  t.know("waveform");
  t.finish();
  return s;
}

}  // namespace gapflux
