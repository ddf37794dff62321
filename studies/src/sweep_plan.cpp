// plan_sweep: the sweep file's cases expanded, each checked as `check` checks a case, and only
// then written into DIR/cases/ with the manifest that maps each name to its values.
#include <fmt/format.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "cases/case_fingerprint.hpp"
#include "cases/case_reader.hpp"
#include "postproc/output_file.hpp"
#include "studies/prepared_case.hpp"
#include "studies/run_folder.hpp"
#include "studies/sweep.hpp"
#include "sweep_names.hpp"

namespace gapflux {

namespace fs = std::filesystem;

std::string SweepPlan::case_file(const SweepCase& c) const {
  return (fs::path(dir) / "cases" / (c.name + ".toml")).string();
}
std::string SweepPlan::run_dir(const SweepCase& c) const {
  return (fs::path(dir) / "runs" / c.name).string();
}
std::string SweepPlan::log_file(const SweepCase& c) const {
  return (fs::path(dir) / "logs" / (c.name + ".log")).string();
}

namespace {

std::string read_text(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// The value combinations, in the order of the cases: the first key varies slowest.
std::vector<std::vector<SweepValue>> combinations(const SweepSpec& spec) {
  std::vector<std::vector<SweepValue>> out;
  if (spec.combine == SweepCombine::zip) {
    for (std::size_t i = 0; i < spec.parameters.front().values.size(); ++i) {
      std::vector<SweepValue> row;
      for (const SweepParameter& p : spec.parameters) row.push_back(p.values[i]);
      out.push_back(row);
    }
    return out;
  }
  std::vector<std::size_t> at(spec.parameters.size(), 0);
  while (true) {
    std::vector<SweepValue> row;
    for (std::size_t k = 0; k < at.size(); ++k) row.push_back(spec.parameters[k].values[at[k]]);
    out.push_back(row);
    std::size_t k = at.size();
    while (k > 0 && ++at[k - 1] == spec.parameters[k - 1].values.size()) at[--k] = 0;
    if (k == 0) return out;
  }
}

std::string values_text(const SweepSpec& spec, const std::vector<SweepValue>& values) {
  std::string out;
  for (std::size_t k = 0; k < values.size(); ++k)
    out += fmt::format("{}{} = {}", k ? ", " : "", spec.parameters[k].key,
                       values[k].kind == SweepValue::Kind::text ? quote_text(values[k].text)
                                                                : values[k].display());
  return out;
}

// The varied key an error is about (its key path starts with it), else the first.
const SweepParameter& blamed(const SweepSpec& spec, const std::string& key_path) {
  for (const SweepParameter& p : spec.parameters)
    if (!key_path.empty() && (key_path == p.key || key_path.starts_with(p.key + ".") ||
                              p.key.starts_with(key_path + ".")))
      return p;
  return spec.parameters.front();
}

std::string manifest_json(const SweepPlan& plan) {
  nlohmann::ordered_json j;
  j["schema"] = "gapflux-sweep/1";
  j["sweep_file"] = fs::absolute(plan.spec.file).lexically_normal().string();
  j["base_case"] = fs::absolute(plan.spec.base_case).lexically_normal().string();
  j["digest"] = plan.digest;
  j["combine"] = plan.spec.combine == SweepCombine::product ? "product" : "zip";
  j["lean"] = plan.spec.lean;
  j["threads_per_case"] = plan.spec.threads_per_case;
  j["outputs"] = plan.spec.outputs.empty() ? default_sweep_outputs() : plan.spec.outputs;
  for (const SweepParameter& p : plan.spec.parameters)
    j["parameters"].push_back({{"key", p.key}, {"unit", unit_of_key(p.key)}});
  for (const SweepCase& c : plan.cases) {
    nlohmann::ordered_json row;
    row["index"] = c.index;
    row["name"] = c.name;
    row["time_stepping"] = c.time_stepping;
    row["unknowns"] = c.unknowns;
    row["steps"] = c.steps;
    for (std::size_t k = 0; k < c.values.size(); ++k) {
      const SweepValue& v = c.values[k];
      auto& cell = row["values"][plan.spec.parameters[k].key];
      switch (v.kind) {
        case SweepValue::Kind::number:
          cell = v.number;
          break;
        case SweepValue::Kind::integer:
          cell = v.integer;
          break;
        case SweepValue::Kind::text:
          cell = v.text;
          break;
        case SweepValue::Kind::flag:
          cell = v.flag;
          break;
      }
    }
    j["cases"].push_back(row);
  }
  return j.dump(2) + "\n";
}

std::string manifest_csv(const SweepPlan& plan) {
  std::string out = "index,name";
  for (const SweepParameter& p : plan.spec.parameters)
    out += fmt::format(",{}", csv_cell(column_title(p.key, unit_of_key(p.key))));
  out += "\n";
  for (const SweepCase& c : plan.cases) {
    out += fmt::format("{},{}", c.index, c.name);
    for (const SweepValue& v : c.values) out += fmt::format(",{}", csv_cell(v.display()));
    out += "\n";
  }
  return out;
}

}  // namespace

SweepPlan plan_sweep(const std::string& sweep_file, const std::string& dir, SweepFolderUse use) {
  SweepPlan plan;
  plan.spec = read_sweep_file(sweep_file);
  plan.dir = dir;
  const SweepSpec& spec = plan.spec;
  std::error_code ec;
  if (!fs::is_regular_file(spec.base_case, ec))
    throw InputError(sweep_file, {}, "sweep.base_case",
                     fmt::format("no case file {} (a path relative to the sweep file)",
                                 quote_text(spec.base_case)));
  const std::string base_text = read_text(spec.base_case);
  const Case base = read_case_file(spec.base_case);  // the base itself must be a valid case
  std::vector<std::string> settings = spec.settings;
  for (const std::string& line : case_fingerprint(spec.base_case, base, "").lines)
    settings.push_back("base: " + line);
  plan.digest = lines_digest(settings);

  // Expand and check every case before anything is written or run.
  const std::string cases_dir = (fs::path(dir) / "cases").string();
  const auto rows = combinations(spec);
  const int width = std::max<int>(4, static_cast<int>(std::to_string(rows.size() - 1).size()));
  std::vector<std::string> texts;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    SweepCase c;
    c.index = static_cast<int>(i);
    c.name = fmt::format("case_{:0{}d}", i, width);
    c.values = rows[i];
    std::vector<std::pair<std::string, SweepValue>> set;
    for (std::size_t k = 0; k < rows[i].size(); ++k)
      set.emplace_back(spec.parameters[k].key, rows[i][k]);
    const std::string path = plan.case_file(c);
    // The comment line is part of the checked text, so that the lines of any later message match
    // the file.
    const std::string header = fmt::format("# generated by gapflux sweep from {}: {}\n",
                                           spec.base_case, values_text(spec, c.values));
    std::string text;
    try {
      text = header + case_text_with(base_text, spec.base_case, set, cases_dir);
      const PreparedCase p = prepare_case(path, read_case_text(text, path));
      c.time_stepping = p.c.study.kind == StudyKind::time_stepping;
      c.steps = c.time_stepping ? p.grid.steps : 1;
      c.unknowns = static_cast<long long>(p.mesh_settings.forecast.triangles *
                                          (p.c.mesh.order == 2 ? 2.0 : 0.5));
      c.cost = static_cast<double>(c.unknowns) * c.steps;
    } catch (const InputError& e) {
      // The refused case is kept for the user to read; its lines are those of the message.
      const SweepParameter& p = blamed(spec, e.key_path());
      std::string where = (fs::path(dir) / ("refused_" + c.name + ".toml")).string();
      fs::create_directories(dir, ec);
      if (!text.empty())
        write_file_whole(where, header + case_text_with(base_text, spec.base_case, set, dir));
      else
        where.clear();
      throw InputError(
          sweep_file, p.pos, "sweep.vary",
          fmt::format("case {} of {} ({}) is refused before any case ran:\n  {}:{}: {}{}{}", c.name,
                      rows.size(), values_text(spec, c.values),
                      where.empty() ? spec.base_case : where, e.pos().line,
                      e.key_path().empty() ? "" : e.key_path() + ": ", e.message(),
                      where.empty() ? "" : fmt::format("\n  (the generated case is {})", where)));
    }
    plan.cases.push_back(c);
    texts.push_back(text);
  }

  // The folder: the same sweep continues; another is refused unless replaced.
  const std::string manifest = (fs::path(dir) / "manifest.json").string();
  FolderUse folder_use = use == SweepFolderUse::replace ? FolderUse::replace : FolderUse::fresh;
  if (use == SweepFolderUse::continue_same && fs::exists(manifest, ec)) {
    std::string stored;
    try {
      stored = nlohmann::json::parse(read_text(manifest)).value("digest", "");
    } catch (const nlohmann::json::exception&) {
    }
    if (stored != plan.digest)
      throw InputError(sweep_file, {}, "",
                       fmt::format("{} holds another sweep (its manifest.json differs from this "
                                   "sweep's settings or base case); use --replace to remove its "
                                   "outputs, or another folder",
                                   dir));
    folder_use = FolderUse::keep;
  }
  {
    RunFolder folder(dir, sweep_outputs(), folder_use);
    for (const auto& entry : fs::directory_iterator(dir, ec))
      if (entry.path().filename().string().starts_with("refused_")) fs::remove(entry.path(), ec);
    fs::create_directories(cases_dir);
    fs::create_directories(fs::path(dir) / "runs");
    fs::create_directories(fs::path(dir) / "logs");
    for (std::size_t i = 0; i < plan.cases.size(); ++i) {
      const std::string path = plan.case_file(plan.cases[i]);
      if (read_text(path) != texts[i]) write_file_whole(path, texts[i]);
    }
    write_file_whole(manifest, manifest_json(plan));
    write_file_whole((fs::path(dir) / "manifest.csv").string(), manifest_csv(plan));
  }
  return plan;
}

}  // namespace gapflux
