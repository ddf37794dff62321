#include "solver/assembly.hpp"

#include <omp.h>

#include <algorithm>
#include <cmath>

namespace gapflux {

int total_dofs(const DofMap& dofs, const BandMesh* band) {
  return dofs.n_dofs + (band ? band->n_extra_nodes : 0);
}

std::vector<ElementRecord> build_element_records(const Mesh& mesh, const BandMesh* band,
                                                 const DofMap& dofs) {
  std::vector<ElementRecord> out;
  const int per = mesh.nodes_per_triangle();
  const Eigen::Rotation2Dd turn(band ? band->rotor_angle_rad : 0.0);
  out.reserve(mesh.n_triangles() + (band ? band->elements.size() : 0));
  for (std::size_t t = 0; t < mesh.n_triangles(); ++t) {
    ElementRecord r;
    r.nodes.order = mesh.order;
    r.region = mesh.triangle_region[t];
    for (int i = 0; i < max_element_nodes; ++i) {
      r.dof[i] = -1;
      r.sign[i] = 0.0;
    }
    for (int i = 0; i < per; ++i) {
      const int node = mesh.triangles[t * per + i];
      r.nodes.x[i] = mesh.node_on_rotor[node] ? Vec2(turn * mesh.nodes[node]) : mesh.nodes[node];
      r.dof[i] = dofs.dof_of_node[node];
      r.sign[i] = dofs.sign_of_node[node];
    }
    out.push_back(r);
  }
  if (band) {
    const int band_region = mesh.region_index("moving_band");
    const int n_nodes = static_cast<int>(mesh.nodes.size());
    for (const BandElement& e : band->elements) {
      ElementRecord r;
      r.nodes.order = mesh.order;
      r.region = band_region;
      for (int i = 0; i < max_element_nodes; ++i) {
        r.dof[i] = -1;
        r.sign[i] = 0.0;
      }
      for (int i = 0; i < per; ++i) {
        const BandNodeRef& c = e.corners[i];
        r.nodes.x[i] = c.position_m;
        if (c.node < n_nodes) {
          r.dof[i] = dofs.dof_of_node[c.node];
          r.sign[i] = c.sign * dofs.sign_of_node[c.node];
        } else {
          r.dof[i] = dofs.n_dofs + (c.node - n_nodes);
          r.sign[i] = c.sign;
        }
      }
      out.push_back(r);
    }
  }
  return out;
}

Assembler::Assembler(std::vector<ElementRecord> elements, int n_dofs)
    : elements_(std::move(elements)), n_dofs_(n_dofs) {
  // Pattern of the lower triangle: per column, the sorted distinct rows.
  std::vector<std::vector<int>> rows_of(n_dofs_);
  for (const ElementRecord& e : elements_) {
    const int n = e.nodes.n_nodes();
    for (int i = 0; i < n; ++i)
      for (int k = 0; k < n; ++k) {
        const int a = e.dof[i], b = e.dof[k];
        if (a < 0 || b < 0 || a < b) continue;
        rows_of[b].push_back(a);
      }
  }
  col_.assign(n_dofs_ + 1, 0);
  for (int j = 0; j < n_dofs_; ++j) {
    auto& r = rows_of[j];
    r.push_back(j);  // keep the diagonal even if an element set leaves it empty
    std::sort(r.begin(), r.end());
    r.erase(std::unique(r.begin(), r.end()), r.end());
    col_[j + 1] = col_[j] + static_cast<int>(r.size());
  }
  row_.reserve(col_.back());
  for (const auto& r : rows_of) row_.insert(row_.end(), r.begin(), r.end());
  values_.assign(row_.size(), 0.0);
  scatter_.assign(elements_.size() * max_element_nodes * max_element_nodes, -1);
  for (std::size_t e = 0; e < elements_.size(); ++e) {
    const ElementRecord& rec = elements_[e];
    const int n = rec.nodes.n_nodes();
    for (int i = 0; i < n; ++i)
      for (int k = 0; k < n; ++k) {
        const int a = rec.dof[i], b = rec.dof[k];
        if (a < 0 || b < 0 || a < b) continue;
        const auto begin = row_.begin() + col_[b], end = row_.begin() + col_[b + 1];
        const auto it = std::lower_bound(begin, end, a);
        scatter_[(e * max_element_nodes + i) * max_element_nodes + k] =
            static_cast<int>(it - row_.begin());
      }
  }
  residual_.setZero(n_dofs_);
}

LocalVector Assembler::local_values(std::size_t element, const Eigen::VectorXd& x) const {
  const ElementRecord& rec = elements_[element];
  LocalVector a = LocalVector::Zero();
  for (int i = 0; i < rec.nodes.n_nodes(); ++i)
    if (rec.dof[i] >= 0) a[i] = rec.sign[i] * x[rec.dof[i]];
  return a;
}

void Assembler::assemble(const Eigen::VectorXd& x, const RegionModel& model, bool tangent) {
  // Each thread sums its share of the elements into buffers of its own (thread 0 into the
  // results themselves); the buffers are then added in thread order. No atomics, and the same
  // thread count gives the same sums bit for bit, run after run.
  const int threads = std::max(1, omp_get_max_threads());
  const std::size_t nnz = values_.size();
  const std::size_t n = static_cast<std::size_t>(n_dofs_);
  thread_values_.resize(threads - 1);
  thread_residual_.resize(threads - 1);
  thread_load_.resize(threads - 1);
  load_.assign(n, 0.0);
  residual_.setZero(n_dofs_);
  if (tangent) std::fill(values_.begin(), values_.end(), 0.0);
  const long n_elements = static_cast<long>(elements_.size());
#pragma omp parallel num_threads(threads)
  {
    const int t = omp_get_thread_num();
    double* values = values_.data();
    double* residual = residual_.data();
    double* load = load_.data();
    if (t > 0) {
      if (tangent) thread_values_[t - 1].assign(nnz, 0.0);
      thread_residual_[t - 1].assign(n, 0.0);
      thread_load_[t - 1].assign(n, 0.0);
      values = thread_values_[t - 1].data();
      residual = thread_residual_[t - 1].data();
      load = thread_load_[t - 1].data();
    }
#pragma omp for schedule(static)
    for (long e = 0; e < n_elements; ++e) {
      const ElementRecord& rec = elements_[e];
      const int nodes = rec.nodes.n_nodes();
      const LocalVector a = local_values(static_cast<std::size_t>(e), x);
      LocalMatrix k_local;
      LocalVector r_local, f_local;
      const Material& material = *model.material[rec.region];
      const ElementSource& source = model.source[rec.region];
      magnetostatic_element(rec.nodes, a, material, source, tangent, k_local, r_local, f_local);
      bool loaded = source.function != nullptr || source.constant_a_per_m2 != 0.0;
      const double sigma =
          model.eddy_s_per_m.empty() || !model.eddy_history ? 0.0 : model.eddy_s_per_m[rec.region];
      if (sigma > 0.0) {
        // The history's part of the eddy term is a known source: it counts in the load too.
        const LocalVector a_h = local_values(static_cast<std::size_t>(e), *model.eddy_history);
        const double sigma_rate = sigma * model.eddy_rate;
        eddy_element(rec.nodes, a - a_h, sigma_rate, tangent, k_local, r_local);
        LocalMatrix unused;
        LocalVector history_load = LocalVector::Zero();
        eddy_element(rec.nodes, a_h, sigma_rate, false, unused, history_load);
        f_local += history_load;
        loaded = true;
      }
      for (int i = 0; i < nodes; ++i) {
        if (rec.dof[i] < 0) continue;
        residual[rec.dof[i]] += rec.sign[i] * r_local[i];
        if (loaded) load[rec.dof[i]] += rec.sign[i] * f_local[i];
        if (!tangent) continue;
        for (int k = 0; k < nodes; ++k) {
          const int at =
              scatter_[(static_cast<std::size_t>(e) * max_element_nodes + i) * max_element_nodes +
                       k];
          if (at >= 0) values[at] += rec.sign[i] * rec.sign[k] * k_local(i, k);
        }
      }
    }
    // The buffers, added in thread order (each entry by one thread).
#pragma omp for schedule(static)
    for (long i = 0; i < static_cast<long>(n); ++i)
      for (int u = 0; u + 1 < threads; ++u) {
        residual_[i] += thread_residual_[u][i];
        load_[i] += thread_load_[u][i];
      }
    if (tangent) {
#pragma omp for schedule(static)
      for (long i = 0; i < static_cast<long>(nnz); ++i)
        for (int u = 0; u + 1 < threads; ++u) values_[i] += thread_values_[u][i];
    }
  }
  load_norm_ = Eigen::Map<const Eigen::VectorXd>(load_.data(), n_dofs_).norm();
}

}  // namespace gapflux
