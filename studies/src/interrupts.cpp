#include "studies/interrupts.hpp"

#include <unistd.h>

#include <csignal>
#include <cstring>

namespace gapflux {
namespace {

volatile std::sig_atomic_t received_signal = 0;
struct sigaction previous_int {
}, previous_term{};

extern "C" void on_signal(int sig) {
  if (received_signal != 0) {
    // Second signal: stop now, with the default action (the exit status says which signal).
    std::signal(sig, SIG_DFL);
    std::raise(sig);
    return;
  }
  received_signal = sig;
  const char* text =
      "\ninterrupted: stopping after the step in hand (signal again to stop at once)\n";
  const ssize_t ignored = ::write(STDERR_FILENO, text, std::strlen(text));
  (void)ignored;
}

}  // namespace

InterruptWatch::InterruptWatch() {
  received_signal = 0;
  struct sigaction action {};
  action.sa_handler = on_signal;
  sigemptyset(&action.sa_mask);
  sigaction(SIGINT, &action, &previous_int);
  sigaction(SIGTERM, &action, &previous_term);
}

InterruptWatch::~InterruptWatch() {
  sigaction(SIGINT, &previous_int, nullptr);
  sigaction(SIGTERM, &previous_term, nullptr);
}

int InterruptWatch::received() {
  return received_signal;
}

}  // namespace gapflux
