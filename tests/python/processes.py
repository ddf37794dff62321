"""Process helpers shared by the Python checks."""
import signal
import subprocess


def run_and_kill(args, after_step):
    """Starts `args` (a gapflux run) and sends SIGKILL once it has logged `step N/`; the log
    line follows that step's flush. Returns the exit status (−SIGKILL when killed)."""
    proc = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    for line in proc.stderr:
        if line.startswith(f"step {after_step}/"):
            proc.send_signal(signal.SIGKILL)
            break
    proc.wait()
    return proc.returncode
