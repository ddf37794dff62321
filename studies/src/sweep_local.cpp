// run_sweep_locally: the sweep's unfinished cases on worker processes of this machine. Each case
// is `gapflux run` in a process of its own (its log in DIR/logs/), so one case's crash, memory or
// numerical failure ends that case only; a rerun skips finished cases and resumes stopped ones.
#include <fcntl.h>
#include <sys/prctl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <fmt/format.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <csignal>
#include <filesystem>
#include <fstream>
#include <thread>

#include "studies/interrupts.hpp"
#include "studies/run_folder.hpp"
#include "studies/sweep.hpp"
#include "sweep_names.hpp"

namespace gapflux {

namespace fs = std::filesystem;

namespace {

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

std::string duration_text(double s) {
  if (s < 90) return fmt::format("{:.0f} s", s);
  if (s < 5400) return fmt::format("{:.0f} min", s / 60);
  return fmt::format("{:.1f} h", s / 3600);
}

struct Worker {
  pid_t pid = -1;
  const SweepCase* c = nullptr;
  double start_s = 0.0;
};

std::vector<std::string> case_command(const SweepPlan& plan, const SweepCase& c,
                                      const std::string& program, int threads) {
  std::vector<std::string> args{program,           "--threads", std::to_string(threads), "run",
                                plan.case_file(c), "--out",     plan.run_dir(c)};
  if (plan.spec.lean && c.time_stepping) args.push_back("--lean");
  // A folder left by an earlier attempt: a time-stepping run continues from its last step; a
  // static one (a single solve) starts again.
  std::error_code ec;
  if (fs::exists(plan.run_dir(c), ec) && !fs::is_empty(plan.run_dir(c), ec))
    args.push_back(c.time_stepping ? "--resume" : "--replace");
  return args;
}

pid_t launch(const std::vector<std::string>& args, const std::string& log) {
  std::vector<char*> argv;
  for (const std::string& a : args) argv.push_back(const_cast<char*>(a.c_str()));
  argv.push_back(nullptr);
  {
    std::ofstream head(log, std::ios::app);
    head << "\n# ";
    for (const std::string& a : args) head << a << ' ';
    head << "\n";
  }
  const int fd = ::open(log.c_str(), O_WRONLY | O_APPEND | O_CREAT | O_CLOEXEC, 0644);
  if (fd < 0) throw std::runtime_error("cannot open the log " + log);
  const pid_t parent = ::getpid();
  const pid_t pid = ::fork();
  if (pid < 0) {
    ::close(fd);
    throw std::runtime_error("cannot start a worker process (fork failed)");
  }
  if (pid == 0) {
    // The worker: its own process group (a Ctrl-C reaches the sweep, which stops the workers
    // once, after their step in hand), and a SIGTERM if the sweep dies without stopping it.
    ::setpgid(0, 0);
    ::prctl(PR_SET_PDEATHSIG, SIGTERM);
    if (::getppid() != parent) ::_exit(143);
    ::dup2(fd, STDOUT_FILENO);
    ::dup2(fd, STDERR_FILENO);
    ::execv(argv[0], argv.data());
    ::_exit(127);
  }
  ::close(fd);
  return pid;
}

std::string last_line(const std::string& path) {
  std::ifstream in(path);
  std::string line, last;
  while (std::getline(in, line)) {
    // The progress bar's carriage returns: keep what was printed last on the line.
    if (const auto cr = line.rfind('\r'); cr != std::string::npos) line = line.substr(cr + 1);
    if (line.find_first_not_of(" \t") != std::string::npos) last = line;
  }
  return last;
}

std::string exit_text(int status) {
  if (WIFEXITED(status)) return fmt::format("exit {}", WEXITSTATUS(status));
  if (WIFSIGNALED(status)) return fmt::format("killed by signal {}", WTERMSIG(status));
  return "ended";
}

}  // namespace

std::vector<std::string> sweep_case_command(const SweepPlan& plan, const SweepCase& c,
                                            const std::string& program, int threads) {
  return case_command(plan, c, program, threads);
}

int run_sweep_case(const SweepPlan& plan, int index, const std::string& program, int threads) {
  if (index < 0 || index >= static_cast<int>(plan.cases.size()))
    throw std::runtime_error(
        fmt::format("{} has cases 0 to {}; no case {}", plan.dir, plan.cases.size() - 1, index));
  const SweepCase& c = plan.cases[static_cast<std::size_t>(index)];
  if (case_finished(plan, c)) {
    fmt::print("{}: finished already\n", c.name);
    return 0;
  }
  const std::vector<std::string> args = case_command(plan, c, program, threads);
  fmt::print("{}: {}\n", c.name, plan.log_file(c));
  std::fflush(stdout);
  const pid_t pid = launch(args, plan.log_file(c));
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0 && errno == EINTR) {
  }
  return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

int run_sweep_locally(const SweepPlan& plan, const std::string& program, int workers) {
  // Held while the workers run: a second runner on the same folder is refused.
  const RunFolder lock(plan.dir, sweep_outputs(), FolderUse::keep);
  const InterruptWatch interrupts;
  std::vector<const SweepCase*> todo;
  for (const SweepCase& c : plan.cases)
    if (!case_finished(plan, c)) todo.push_back(&c);
  const int total = static_cast<int>(plan.cases.size());
  const int already = total - static_cast<int>(todo.size());
  workers = std::max(1, std::min<int>(workers, std::max<int>(1, todo.size())));
  fmt::print(
      "sweep: {} case(s) in {}; {} finished already; running {} on {} worker(s), {} "
      "thread(s) each{}\n",
      total, plan.dir, already, todo.size(), workers, plan.spec.threads_per_case,
      plan.spec.lean ? " (lean outputs)" : "");
  std::fflush(stdout);

  std::vector<Worker> running;
  std::vector<std::pair<const SweepCase*, std::string>> failures;
  std::size_t next = 0;
  int done = already;
  double busy_s = 0.0;  // worker time of the cases finished here
  int finished_here = 0;
  bool stopping = false;
  const double start_s = now_s();
  while (next < todo.size() || !running.empty()) {
    if (!stopping && InterruptWatch::received()) {
      stopping = true;
      fmt::print(
          "sweep: stopping {} running case(s) after their step in hand; rerun the same "
          "command to continue\n",
          running.size());
      for (const Worker& w : running) ::kill(w.pid, SIGTERM);
    }
    while (!stopping && next < todo.size() && static_cast<int>(running.size()) < workers) {
      const SweepCase* c = todo[next++];
      running.push_back(
          {launch(case_command(plan, *c, program, plan.spec.threads_per_case), plan.log_file(*c)),
           c, now_s()});
    }
    int status = 0;
    const pid_t pid = ::waitpid(-1, &status, WNOHANG);
    if (pid <= 0) {
      std::this_thread::sleep_for(std::chrono::milliseconds(100));
      continue;
    }
    const auto it =
        std::find_if(running.begin(), running.end(), [&](const Worker& w) { return w.pid == pid; });
    if (it == running.end()) continue;
    const Worker w = *it;
    running.erase(it);
    const double took = now_s() - w.start_s;
    const bool ok = WIFEXITED(status) && WEXITSTATUS(status) == 0 && case_finished(plan, *w.c);
    if (ok) {
      ++done;
      ++finished_here;
      busy_s += took;
    } else if (!stopping) {
      failures.emplace_back(w.c, exit_text(status) + ": " + last_line(plan.log_file(*w.c)));
    }
    const std::size_t waiting = todo.size() - next;
    std::string left;
    if (finished_here > 0 && (waiting + running.size()) > 0)
      left = fmt::format(", about {} left",
                         duration_text(busy_s / finished_here *
                                       static_cast<double>(waiting + running.size()) / workers));
    fmt::print("[{}/{}] {} {} in {}{}{}\n", done, total, w.c->name,
               ok         ? "finished"
               : stopping ? "stopped"
                          : "FAILED (" + exit_text(status) + ")",
               duration_text(took), left,
               failures.empty() ? "" : fmt::format(" ({} failed)", failures.size()));
    std::fflush(stdout);
  }

  const SweepTable table = collect_sweep(plan);
  fmt::print(
      "sweep: {} of {} finished, {} failed, {} not run; wall {}; table in {}/sweep.csv "
      "and sweep.h5\n",
      table.finished, total, table.failed, table.pending, duration_text(now_s() - start_s),
      plan.dir);
  if (!failures.empty()) {
    fmt::print("\nfailed cases (logs in {}/logs):\n", plan.dir);
    for (const auto& [c, why] : failures) fmt::print("  {}  {}\n", c->name, why);
  }
  if (const int sig = InterruptWatch::received()) return 128 + sig;
  return failures.empty() && table.finished == total ? 0 : 1;
}

}  // namespace gapflux
