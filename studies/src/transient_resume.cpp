// TransientStudy, continuing and guarding a run's file: the resume of a killed or stopped run
// (its settings must be the stored ones), the rows of an unfinished step, and the disk room
// checked before each step so that a full disk stops the run between steps, not inside one.
#include <fmt/format.h>

#include <algorithm>
#include <filesystem>

#include "cases/input_error.hpp"
#include "postproc/output_file.hpp"
#include "transient_study.hpp"
#include "version.hpp"

namespace gapflux {

namespace fs = std::filesystem;

void TransientStudy::check_fingerprint() const {
  const auto stored = ResultsFile::open_existing(folder_->path("results.h5"));
  const std::string digest = stored->read_string_attribute("/", "case_fingerprint");
  if (digest.empty())
    throw InputError(case_path_, {}, "",
                     fmt::format("cannot resume the run in {}: its results.h5 holds no case "
                                 "fingerprint (an older gapflux wrote it), so its settings cannot "
                                 "be compared; run afresh with --replace",
                                 out_dir_));
  if (digest == fingerprint_.digest) {
    // A lean run lacks the rows a full one keeps (and the other way round): the two do not mix.
    std::string detail = stored->read_string_attribute("/", "output_detail");
    if (detail.empty()) detail = "full";  // written before lean runs existed
    if (detail != to_string(detail_))
      throw InputError(case_path_, {}, "",
                       fmt::format("cannot resume the run in {}: it was started {} --lean; "
                                   "resume it the same way",
                                   out_dir_, detail == "lean" ? "with" : "without"));
    return;
  }
  const std::vector<std::string> changes =
      fingerprint_changes(stored->read_strings("case/settings"), fingerprint_.lines);
  std::string list;
  for (const std::string& c : changes) list += "\n  " + c;
  throw InputError(case_path_, {}, "",
                   fmt::format("cannot resume the run in {}: it was made with other settings, and "
                               "continuing would mix them. Changed since it started:{}\nRestore "
                               "them, or run afresh with --replace or into another folder",
                               out_dir_, list));
}

int TransientStudy::resume_results(const std::string& path) {
  h5_ = ResultsFile::open_existing(path);
  const long done = h5_->read_long_attribute("/", "steps_done");
  if (h5_->rows("mesh/nodes") != mesh_.nodes.size() ||
      static_cast<long>(h5_->read_long_attribute("/", "steps_total")) != grid_.steps)
    throw std::runtime_error("results.h5 in " + out_dir_ +
                             " was not written by this case and mesh; cannot resume");
  steps_done_ = static_cast<int>(done);
  drop_unfinished_rows();
  if (h5_->has_attribute("/", "settled_at_period")) {
    // It stopped when settled: nothing is left to step; the summary is made again.
    settled_at_period_ = static_cast<int>(h5_->read_long_attribute("/", "settled_at_period"));
    grid_.steps = steps_done_;
    grid_.discarded_steps = steps_done_ - grid_.steps_per_period;
  }
  // The solver's totals carry over, so the summary counts the whole run.
  const auto total_of = [&](const char* d) {
    if (done == 0 || !h5_->exists(d)) return 0;
    double sum = 0.0;
    for (double v : h5_->read(d)) sum += v;
    return static_cast<int>(sum);
  };
  newton_total_ = total_of("steps/newton_iterations");
  factorizations_total_ = total_of("steps/newton_factorizations");
  cg_total_ = total_of("steps/cg_iterations");
  if (done > 0) {
    const std::vector<double> x = h5_->read("restart/x");
    x_last_ = Eigen::Map<const Eigen::VectorXd>(x.data(), static_cast<long>(x.size()));
    const std::vector<double> psi = h5_->read("steps/flux_linkage");
    for (int k = 0; k < 3; ++k) psi_last_[k] = psi[(done - 1) * 3 + k];
    have_last_ = true;
    if (circuit_) {
      // The circuit's history: total linkages Λ = L_end·i + ψ of the last two steps.
      const std::vector<double> i = h5_->read("steps/phase_current");
      std::vector<Triple> history;
      for (long n = done - 1; n >= std::max(0L, done - 2); --n) {
        Triple l{};
        for (int k = 0; k < 3; ++k)
          l[k] = impedance_.end_inductance_h * i[n * 3 + k] + psi[n * 3 + k];
        history.push_back(l);
      }
      // After one step, the start's virtual history still counts (BDF2 needs two values).
      if (done == 1 && h5_->exists("circuit/start_history")) {
        const std::vector<double> v = h5_->read("circuit/start_history");
        history.push_back({v[0], v[1], v[2]});
      }
      circuit_->set_history(history);
    }
  }
  for (int n = 0; n < done; ++n)
    if (snapshot_at(n)) snapshot_steps_.emplace_back(grid_.time(n), n);
  if (settled_at_period_ > 0)
    fmt::print(stderr, "the run settled after period {}: nothing is left to step; summarising\n",
               settled_at_period_);
  else
    fmt::print(stderr, "resuming at step {} of {}\n", done + 1, grid_.steps);
  return static_cast<int>(done);
}

void TransientStudy::drop_unfinished_rows() {
  // Rows past steps_done belong to a step whose writes did not all finish (a kill, a full disk).
  try {
    for (const std::string& d : h5_->members("steps"))
      h5_->truncate_rows("steps/" + d, static_cast<std::size_t>(steps_done_));
    h5_->flush();
  } catch (const OutputError&) {
    // The disk refuses even this: the rows stay, past steps_done, and a resume drops them.
  }
}

std::uint64_t TransientStudy::estimated_step_bytes() const {
  if (step_bytes_ > 0) return step_bytes_;
  // Before the first step is measured: the per-step rows of results.h5 (A per node, B per
  // triangle, the solution for the restart, the airgap samples) plus HDF5's chunk headers.
  const std::uint64_t values = mesh_.nodes.size() + 2 * mesh_.n_triangles() +
                               2 * mesh_.nodes.size() + 3 * airgap_samples_ + 64;
  return 8 * values + 64 * 1024;
}

std::uint64_t TransientStudy::estimated_snapshot_bytes() const {
  if (snapshot_bytes_ > 0) return snapshot_bytes_;
  // A snapshot repeats each corner (coordinates, A, connectivity: 40 bytes) and keeps five
  // values per triangle, base64-encoded (4/3).
  const std::uint64_t per = mesh_.nodes_per_triangle();
  // The EnSight copy adds about half of that.
  return mesh_.n_triangles() * (per * 40 + 48) * 2 + 64 * 1024;
}

void TransientStudy::ensure_room_for_step(int n) const {
  // What the step is expected to write with a quarter to spare, plus 2 MB for the summary and
  // the analysis: a step starts only if its writes will fit.
  std::uint64_t bytes = estimated_step_bytes() * 5 / 4 + (std::uint64_t{2} << 20);
  if (snapshot_at(n)) bytes += estimated_snapshot_bytes() * 5 / 4;
  if (n >= first_b_step()) bytes += 16 * mesh_.n_triangles();  // a lean run's last period
  folder_->ensure_room(bytes, fmt::format("step {}", n + 1));
}

void TransientStudy::warn_if_run_will_not_fit() const {
  const int steps = grid_.steps - steps_done_;
  const int snapshots = detail_ == OutputDetail::lean
                            ? 0
                            : (steps + case_.output.fields_every - 1) / case_.output.fields_every;
  const double need = static_cast<double>(steps) * estimated_step_bytes() +
                      static_cast<double>(snapshots) * estimated_snapshot_bytes();
  const double free = static_cast<double>(free_bytes_at(out_dir_));
  if (need > free)
    fmt::print(stderr,
               "warning: this run writes about {:.0f} MB into {} and {:.0f} MB are free: it will "
               "stop when the disk is full (the finished steps are kept; free space and "
               "continue with --resume). [output] fields_every sets how many snapshots it keeps\n",
               need / 1e6, out_dir_, free / 1e6);
}

void TransientStudy::measure_step_bytes(std::uint64_t file_bytes_before, bool snapshot) {
  std::error_code ec;
  const std::uint64_t after = fs::file_size(folder_->path("results.h5"), ec);
  if (!ec && after > file_bytes_before)
    step_bytes_ = std::max(step_bytes_, after - file_bytes_before);
  if (snapshot && !snapshot_steps_.empty()) {
    // The .vtu and the EnSight files of a snapshot are about the same size.
    const std::uint64_t size =
        2 * fs::file_size(folder_->path(snapshot_file(snapshot_steps_.back().second)), ec);
    if (!ec) snapshot_bytes_ = std::max(snapshot_bytes_, size);
  }
}

}  // namespace gapflux
