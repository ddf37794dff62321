#pragma once
// Helpers shared by the tests: example paths, temporary directories, running the CLI.
#include <sys/wait.h>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace gapflux::test {

inline std::string example(const std::string& name) {
  return std::string(GAPFLUX_EXAMPLES_DIR) + "/" + name;
}

inline std::string read_text(const std::string& path) {
  std::ifstream in(path);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

inline std::filesystem::path temp_dir(const std::string& name) {
  const auto dir = std::filesystem::path(GAPFLUX_TEST_TMP) / name;
  std::filesystem::create_directories(dir);
  return dir;
}

inline void write_text(const std::filesystem::path& path, const std::string& text) {
  std::ofstream out(path);
  out << text;
}

struct CommandResult {
  int exit_code = -1;
  std::string output;  // stdout and stderr together
};

inline CommandResult run_command(const std::string& command) {
  CommandResult r;
  FILE* pipe = popen((command + " 2>&1").c_str(), "r");
  if (!pipe) return r;
  char buffer[4096];
  while (std::fgets(buffer, sizeof buffer, pipe)) r.output += buffer;
  const int status = pclose(pipe);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

}  // namespace gapflux::test
