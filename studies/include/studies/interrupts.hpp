#pragma once
// SIGINT and SIGTERM during a time-stepping run. The first signal asks the step loop to stop once
// the step in hand is written (the files stay consistent and the run can be resumed); a second
// one ends the process at once, as a kill does (every finished step is on disk already).
namespace gapflux {

class InterruptWatch {
 public:
  InterruptWatch();   // installs the handlers
  ~InterruptWatch();  // restores the previous ones
  InterruptWatch(const InterruptWatch&) = delete;
  InterruptWatch& operator=(const InterruptWatch&) = delete;

  // The signal received (SIGINT, SIGTERM), 0 if none.
  static int received();
};

// Thrown by a study that stopped on a signal; the CLI exits with 128 + signal.
struct Interrupted {
  int signal_number = 0;
};

}  // namespace gapflux
