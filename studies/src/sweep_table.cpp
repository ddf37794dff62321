// The sweep's table: one row per case, the varied values and the chosen summary values, as
// DIR/sweep.csv (units in the titles) and DIR/sweep.h5 (units on every dataset).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <nlohmann/json.hpp>

#include "cases/input_error.hpp"
#include "postproc/output_file.hpp"
#include "postproc/results_file.hpp"
#include "studies/run_folder.hpp"
#include "studies/sweep.hpp"
#include "sweep_names.hpp"

namespace gapflux {

namespace fs = std::filesystem;
using json = nlohmann::json;

std::vector<std::string> default_sweep_outputs() {
  return {"torque.mean_nm",
          "torque.ripple_pct",
          "torque.twice_supply_frequency_nm",
          "supply.unbalance.vuf_pct",
          "supply.current_sequence.positive_a",
          "supply.current_sequence.negative_a",
          "supply.current_unbalance.vuf_pct",
          "supply.unbalance_amplification",
          "saturation.peak_tesla",
          "losses.copper_w",
          "losses.iron_w",
          "power.cage_w",
          "power.input_w",
          "power.efficiency_pct",
          "power.power_factor"};
}

namespace {

std::optional<json> read_json(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return std::nullopt;
  try {
    return json::parse(in);
  } catch (const json::exception&) {
    return std::nullopt;  // a file being written, or damaged: not a finished run
  }
}

// The value at a dotted path ("torque.mean_nm", "saturation.regions[0].peak_tesla").
const json* at_path(const json& root, const std::string& path) {
  const json* node = &root;
  std::size_t start = 0;
  while (start <= path.size()) {
    const std::size_t dot = path.find('.', start);
    std::string word =
        path.substr(start, dot == std::string::npos ? std::string::npos : dot - start);
    int index = -1;
    if (const std::size_t open = word.find('['); open != std::string::npos && word.back() == ']') {
      try {
        index = std::stoi(word.substr(open + 1, word.size() - open - 2));
      } catch (const std::exception&) {
        return nullptr;
      }
      word.resize(open);
    }
    if (!node->is_object() || !node->contains(word)) return nullptr;
    node = &(*node)[word];
    if (index >= 0) {
      if (!node->is_array() || index >= static_cast<int>(node->size())) return nullptr;
      node = &(*node)[static_cast<std::size_t>(index)];
    }
    if (dot == std::string::npos) break;
    start = dot + 1;
  }
  return node;
}

std::string cell_of(const json* v) {
  if (!v || v->is_null()) return "";
  if (v->is_number_float()) return fmt::format("{}", v->get<double>());
  if (v->is_number()) return v->dump();
  if (v->is_boolean()) return v->get<bool>() ? "true" : "false";
  if (v->is_string()) return v->get<std::string>();
  return v->dump();  // an object or array: its JSON, quoted in the CSV
}

}  // namespace

bool case_finished(const SweepPlan& plan, const SweepCase& c) {
  const auto s = read_json((fs::path(plan.run_dir(c)) / "summary.json").string());
  if (!s) return false;
  const json* failure = at_path(*s, "solver.failure");
  return !failure || failure->is_null();
}

SweepPlan read_sweep_plan(const std::string& dir) {
  const std::string path = (fs::path(dir) / "manifest.json").string();
  const auto m = read_json(path);
  if (!m)
    throw InputError(dir, {}, "",
                     "holds no sweep (no readable manifest.json); gapflux sweep writes one");
  SweepPlan plan;
  plan.dir = dir;
  try {
    plan.digest = m->at("digest").get<std::string>();
    plan.spec.file = m->at("sweep_file").get<std::string>();
    plan.spec.base_case = m->at("base_case").get<std::string>();
    plan.spec.lean = m->at("lean").get<bool>();
    plan.spec.threads_per_case = m->at("threads_per_case").get<int>();
    plan.spec.outputs = m->at("outputs").get<std::vector<std::string>>();
    for (const json& p : m->at("parameters")) {
      SweepParameter q;
      q.key = p.at("key").get<std::string>();
      plan.spec.parameters.push_back(q);
    }
    for (const json& row : m->at("cases")) {
      SweepCase c;
      c.index = row.at("index").get<int>();
      c.name = row.at("name").get<std::string>();
      c.time_stepping = row.at("time_stepping").get<bool>();
      c.unknowns = row.at("unknowns").get<long long>();
      c.steps = row.at("steps").get<int>();
      c.cost = static_cast<double>(c.unknowns) * c.steps;
      for (const SweepParameter& p : plan.spec.parameters) {
        const json& v = row.at("values").at(p.key);
        SweepValue x;
        if (v.is_number_integer()) {
          x.kind = SweepValue::Kind::integer;
          x.integer = v.get<long long>();
          x.number = static_cast<double>(x.integer);
        } else if (v.is_number()) {
          x.number = v.get<double>();
        } else if (v.is_boolean()) {
          x.kind = SweepValue::Kind::flag;
          x.flag = v.get<bool>();
        } else {
          x.kind = SweepValue::Kind::text;
          x.text = v.get<std::string>();
        }
        c.values.push_back(x);
      }
      plan.cases.push_back(c);
    }
  } catch (const json::exception& e) {
    throw InputError(path, {}, "", fmt::format("is not a gapflux sweep manifest: {}", e.what()));
  }
  return plan;
}

SweepTable collect_sweep(const SweepPlan& plan) {
  const std::vector<std::string> outputs =
      plan.spec.outputs.empty() ? default_sweep_outputs() : plan.spec.outputs;
  SweepTable table;
  table.columns = {"index", "name", "status"};
  table.units = {"", "", ""};
  for (const SweepParameter& p : plan.spec.parameters) {
    table.columns.push_back(p.key);
    table.units.push_back(unit_of_key(p.key));
  }
  for (const std::string& o : outputs) {
    table.columns.push_back(o);
    table.units.push_back(unit_of_key(o));
  }
  for (const SweepCase& c : plan.cases) {
    std::vector<std::string> row{std::to_string(c.index), c.name};
    const auto s = read_json((fs::path(plan.run_dir(c)) / "summary.json").string());
    const json* failure = s ? at_path(*s, "solver.failure") : nullptr;
    const bool finished = s && (!failure || failure->is_null());
    std::string status = "pending";
    if (finished) {
      status = "finished";
      ++table.finished;
    } else if (s || fs::exists(plan.log_file(c))) {
      status = "failed";
      ++table.failed;
    } else {
      ++table.pending;
    }
    row.push_back(status);
    for (const SweepValue& v : c.values) row.push_back(v.display());
    for (const std::string& o : outputs) row.push_back(finished ? cell_of(at_path(*s, o)) : "");
    table.rows.push_back(row);
  }

  // sweep.csv: titles with their units
  std::string csv;
  for (std::size_t k = 0; k < table.columns.size(); ++k)
    csv +=
        fmt::format("{}{}", k ? "," : "", csv_cell(column_title(table.columns[k], table.units[k])));
  csv += "\n";
  for (const auto& row : table.rows) {
    for (std::size_t k = 0; k < row.size(); ++k)
      csv += fmt::format("{}{}", k ? "," : "", csv_cell(row[k]));
    csv += "\n";
  }
  write_file_whole((fs::path(plan.dir) / "sweep.csv").string(), csv);

  // sweep.h5: a dataset per column (numbers as doubles, NaN where empty; words as strings)
  const std::string h5_path = (fs::path(plan.dir) / "sweep.h5").string();
  {
    ResultsFile h5(h5_path + ".partial");
    h5.attribute("/", "schema", std::string("gapflux-sweep-table/1"));
    h5.attribute("/", "digest", plan.digest);
    h5.attribute("/", "finished", static_cast<long>(table.finished));
    h5.attribute("/", "failed", static_cast<long>(table.failed));
    const std::size_t n_params = plan.spec.parameters.size();
    for (std::size_t k = 0; k < table.columns.size(); ++k) {
      const std::string group = k < 3 ? "" : k < 3 + n_params ? "parameters/" : "outputs/";
      const std::string name = group + table.columns[k];
      std::vector<double> numbers;
      bool numeric = k != 1 && k != 2;
      for (const auto& row : table.rows) {
        if (row[k].empty()) {
          numbers.push_back(std::numeric_limits<double>::quiet_NaN());
          continue;
        }
        char* end = nullptr;
        const double v = std::strtod(row[k].c_str(), &end);
        if (end != row[k].c_str() + row[k].size()) {
          if (row[k] == "true" || row[k] == "false") {
            numbers.push_back(row[k] == "true" ? 1.0 : 0.0);
            continue;
          }
          numeric = false;
          break;
        }
        numbers.push_back(v);
      }
      if (numeric) {
        h5.write(name, numbers, table.units[k].empty() ? "1" : table.units[k]);
      } else {
        std::vector<std::string> words;
        for (const auto& row : table.rows) words.push_back(row[k]);
        h5.write_strings(name, words);
      }
    }
  }
  std::error_code ec;
  fs::rename(h5_path + ".partial", h5_path, ec);
  if (ec) throw OutputError(h5_path, "cannot rename the finished file: " + ec.message());
  return table;
}

}  // namespace gapflux
