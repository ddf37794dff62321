// Reading a sweep file: [sweep] with its base case and [[sweep.vary]] keys, [slurm] for a
// cluster. Ranges become their values here, so that every later step sees plain lists.
#include <fmt/format.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <sstream>

#include "cases/sweep_file.hpp"
#include "table_reader.hpp"
#include "value_checks.hpp"

namespace gapflux {
namespace {

using namespace value_checks;

constexpr int max_cases = 100000;  // a sweep beyond this is a mistake, not a study

std::string number_text(double v) {
  return fmt::format("{}", v);  // shortest text that reads back to the same double
}

// A range { from, to, count } or { from, to, step }: inclusive of both ends.
std::vector<SweepValue> range_values(TableReader& r) {
  const auto from = r.number("from");
  const auto to = r.number("to");
  if (!from) throw r.missing("from", "the range's first value (a number)");
  if (!to) throw r.missing("to", "the range's last value (a number)");
  const auto count = r.integer("count");
  const auto step = r.number("step");
  r.finish();
  if (count.has_value() == step.has_value())
    throw r.error(count ? "step" : "count",
                  "give either count (how many values, ends included) or step, not both");
  int n = 0;
  double h = 0.0;
  if (count) {
    if (*count < 2 || *count > max_cases)
      throw r.error("count", fmt::format("must be an integer in [2, {}] (got {}): a range has "
                                         "two ends; one value is a list of one",
                                         max_cases, *count));
    n = static_cast<int>(*count);
    h = (*to - *from) / (n - 1);
  } else {
    if (!(*step > 0.0))
      throw r.error("step", fmt::format("must be a number > 0 (got {}); a falling range "
                                        "has from > to",
                                        *step));
    const double span = std::abs(*to - *from) / *step;
    if (span + 1 > max_cases)
      throw r.error("step", fmt::format("gives {:.0f} values; at most {}", span + 1, max_cases));
    const double whole = std::round(span);
    if (std::abs(span - whole) > 1e-9 * std::max(1.0, span))
      throw r.error("step", fmt::format("does not divide the range {} → {} into whole steps "
                                        "({:.6g} steps); use count, or change to",
                                        *from, *to, span));
    n = static_cast<int>(whole) + 1;
    h = *to >= *from ? *step : -*step;
    if (n < 2) throw r.error("to", "equals from: a range has two different ends");
  }
  // Integer ends and an integer step keep integer values (a slot count, a turn number).
  const bool integral = std::floor(*from) == *from && std::floor(h) == h &&
                        std::abs(*from) < 1e15 && std::abs(*to) < 1e15;
  std::vector<SweepValue> out;
  for (int i = 0; i < n; ++i) {
    SweepValue v;
    // The last value is `to` itself, not the sum of the steps (no 0.30000000000000004).
    v.number = i == n - 1 ? *to : *from + h * i;
    if (integral) {
      v.kind = SweepValue::Kind::integer;
      v.integer = static_cast<long long>(std::llround(v.number));
      v.number = static_cast<double>(v.integer);
    }
    out.push_back(v);
  }
  return out;
}

SweepParameter read_parameter(TableReader& v, std::vector<std::string>& settings) {
  SweepParameter p;
  p.pos = v.pos();
  const auto key = v.string("key");
  if (!key || key->empty())
    throw v.missing("key", "the dotted case key to vary, as in \"supply.phases.b.rms_v\"");
  p.key = *key;
  for (std::size_t i = 0; i < p.key.size(); ++i) {
    const char ch = p.key[i];
    const bool ok = std::isalnum(static_cast<unsigned char>(ch)) || ch == '_' || ch == '.' ||
                    ch == '[' || ch == ']' || ch == '-';
    if (!ok || p.key.front() == '.' || p.key.back() == '.' || p.key.find("..") != std::string::npos)
      throw v.error("key", fmt::format("{} is not a dotted case key (letters, digits, _ and - "
                                       "between dots; an array element as name[0])",
                                       quote_text(p.key)));
  }
  const bool has_values = v.has("values"), has_range = v.has("range");
  if (has_values == has_range)
    throw v.error(has_values ? "range" : "values",
                  "give either values = [ … ] or range = { from, to, count or step }");
  if (has_values) {
    const auto values = v.scalar_array("values");
    for (const auto& [value, pos] : *values) p.values.push_back(value);
    if (p.values.empty()) throw v.error("values", "is empty: give at least one value");
  } else {
    auto r = v.table("range");
    p.values = range_values(*r);
  }
  v.finish();
  std::string list;
  for (const SweepValue& x : p.values) list += (list.empty() ? "" : ", ") + x.display();
  settings.push_back(fmt::format("vary {} = [{}]", p.key, list));
  return p;
}

void read_slurm(TableReader& s, SlurmSettings& out) {
  out.partition = s.string("partition").value_or("");
  out.account = s.string("account").value_or("");
  out.qos = s.string("qos").value_or("");
  out.throttle = integer_in(s, "throttle", 0, 0, 100000);
  out.time_minutes = integer_in(s, "time_minutes", 0, 0, 60 * 24 * 30);
  out.memory_mb = integer_in(s, "memory_mb", 0, 0, 4 * 1024 * 1024);
  out.threads_per_task = integer_in(s, "threads_per_task", 0, 0, 1024);
  out.setup = s.string_array("setup").value_or(std::vector<std::string>{});
  for (const std::string& line : out.setup)
    if (line.find('\n') != std::string::npos)
      throw s.error("setup", "one shell line per string (no newlines inside)");
  for (const std::string* v : {&out.partition, &out.account, &out.qos})
    for (char ch : *v)
      if (!(std::isalnum(static_cast<unsigned char>(ch)) || ch == '_' || ch == '-' || ch == '.' ||
            ch == ','))
        throw s.error(v == &out.partition ? "partition"
                      : v == &out.account ? "account"
                                          : "qos",
                      fmt::format("{} is not a Slurm name", quote_text(*v)));
  s.finish();
}

}  // namespace

std::string SweepValue::display() const {
  switch (kind) {
    case Kind::number:
      return number_text(number);
    case Kind::integer:
      return std::to_string(integer);
    case Kind::text:
      return text;
    case Kind::flag:
      return flag ? "true" : "false";
  }
  return "";
}

double SweepValue::as_double() const {
  switch (kind) {
    case Kind::number:
    case Kind::integer:
      return number;
    case Kind::flag:
      return flag ? 1.0 : 0.0;
    case Kind::text:
      break;
  }
  return std::numeric_limits<double>::quiet_NaN();
}

SweepSpec read_sweep_text(std::string_view text, const std::string& file_name) {
  SourceMap sources(file_name);
  TableReader root = TableReader::parse_root(text, file_name, sources);
  SweepSpec spec;
  spec.file = file_name;
  auto sweep = root.table("sweep");
  if (!sweep)
    throw root.missing("sweep", "a [sweep] table with base_case and [[sweep.vary]]", true);
  const auto base = sweep->string("base_case");
  if (!base || base->empty())
    throw sweep->missing("base_case",
                         "the path of the case file the sweep varies (relative to "
                         "the sweep file)");
  std::filesystem::path base_path(*base);
  if (base_path.is_relative())
    base_path = std::filesystem::path(file_name).parent_path() / base_path;
  spec.base_case = base_path.lexically_normal().string();
  spec.combine = choice(*sweep, "combine", {"product", "zip"}, 0) == 0 ? SweepCombine::product
                                                                       : SweepCombine::zip;
  spec.outputs = sweep->string_array("outputs").value_or(std::vector<std::string>{});
  spec.threads_per_case = integer_in(*sweep, "threads_per_case", 1, 1, 1024);
  spec.workers = integer_in(*sweep, "workers", 0, 0, 1024);
  spec.lean = sweep->boolean("lean").value_or(true);
  spec.settings.push_back(
      fmt::format("combine = {}", spec.combine == SweepCombine::product ? "product" : "zip"));
  spec.settings.push_back(fmt::format("lean = {}", spec.lean));
  for (TableReader& v : sweep->table_array("vary"))
    spec.parameters.push_back(read_parameter(v, spec.settings));
  if (spec.parameters.empty())
    throw sweep->missing("vary", "at least one [[sweep.vary]] table with key and values or range",
                         true);
  for (std::size_t i = 0; i < spec.parameters.size(); ++i)
    for (std::size_t j = 0; j < i; ++j)
      if (spec.parameters[i].key == spec.parameters[j].key)
        throw InputError(
            file_name, spec.parameters[i].pos, "sweep.vary",
            fmt::format("{} is varied twice (also at line {})", quote_text(spec.parameters[i].key),
                        spec.parameters[j].pos.line));
  if (spec.combine == SweepCombine::zip)
    for (const SweepParameter& p : spec.parameters)
      if (p.values.size() != spec.parameters.front().values.size())
        throw InputError(
            file_name, p.pos, "sweep.combine",
            fmt::format("combine = \"zip\" pairs the i-th values of every key, but {} "
                        "has {} values and {} has {}",
                        quote_text(p.key), p.values.size(), quote_text(spec.parameters.front().key),
                        spec.parameters.front().values.size()));
  double cases = 1.0;
  for (const SweepParameter& p : spec.parameters)
    cases = spec.combine == SweepCombine::zip ? p.values.size() : cases * p.values.size();
  if (cases > max_cases)
    throw sweep->error("vary", fmt::format("makes {:.0f} cases; at most {}", cases, max_cases));
  sweep->finish();
  if (auto s = root.table("slurm")) read_slurm(*s, spec.slurm);
  root.finish();
  return spec;
}

SweepSpec read_sweep_file(const std::string& path) {
  std::error_code ec;
  if (std::filesystem::is_directory(path, ec))
    throw InputError(path, {}, "", "is a folder, not a sweep file; name the sweep's .toml file");
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw InputError(
        path, {}, "",
        std::filesystem::exists(path, ec) ? "cannot read the sweep file" : "no such sweep file");
  std::ostringstream buffer;
  buffer << in.rdbuf();
  return read_sweep_text(buffer.str(), path);
}

}  // namespace gapflux
