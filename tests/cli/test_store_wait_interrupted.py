"""Archive store: Ctrl-C while batch waits for a store another program holds.

batch tries a store held by another connection again for a while before it refuses (exit 5).
A Ctrl-C (SIGINT) in that wait must end it at once as an interrupted run: exit 130, the
shell's code for a process stopped by SIGINT (128 + 2, POSIX `wait` status convention), a
message that says nothing was read or written, and the store's bytes as they were (hashlib).
Before, the stop was noted but answered only when the wait ran out, as the refusal, exit 5.
The moment is found from outside: the signal is sent once batch catches SIGINT (its handler
is installed right before it opens the store), so it lands in the wait or just before it; the
holder keeps every attempt from taking the store, and the old build waited out the 1.5 s.
"""
import os
import shutil
import signal
import subprocess
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402


def catches_sigint(pid):
    """Whether process `pid`, once it runs manicule, has a handler for SIGINT (the SigCgt mask
    of /proc/PID/status, proc(5): bit signum - 1). batch installs it right before it opens
    the store, and nothing earlier does. Before its exec the child of the fork is still this
    script's Python, which catches SIGINT too, hence the look at /proc/PID/exe first."""
    try:
        if os.readlink("/proc/%d/exe" % pid) != os.path.realpath(shutil.which(mtest.BIN)):
            return False
        with open("/proc/%d/status" % pid) as f:
            for line in f:
                if line.startswith("SigCgt:"):
                    return bool(int(line.split()[1], 16) >> (signal.SIGINT - 1) & 1)
    except OSError:
        pass
    return False


tmp = mtest.scratch_folder()
archive = os.path.join(tmp, "archive")
storecheck.copy_plays(storecheck.pick_plays(3), archive)
store = os.path.realpath(os.path.join(tmp, "held.sqlite"))
mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"])
before = storecheck.sha256_of(store)

holder = storecheck.connect(store)
holder.execute("PRAGMA locking_mode = EXCLUSIVE")
holder.execute("BEGIN EXCLUSIVE")
proc = subprocess.Popen([mtest.BIN, "batch", archive, "--store", store, "--unit", "speaker", "--quiet"],
                        stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
deadline = time.monotonic() + 30
while not catches_sigint(proc.pid) and proc.poll() is None and time.monotonic() < deadline:
    time.sleep(0.001)
if proc.poll() is not None:
    mtest.fail("batch ended before it was seen catching SIGINT: %r" % (proc.communicate(),))
proc.send_signal(signal.SIGINT)
out, err = proc.communicate(timeout=60)
holder.rollback()
holder.close()

mtest.check(proc.returncode == 128 + signal.SIGINT,
            "Ctrl-C while waiting for a held store: exit %d, expected %d: %s" % (proc.returncode, 128 + signal.SIGINT, err))
mtest.check("interrupted while waiting for the store" in err and store in err and "nothing read or written" in err,
            "the message does not say what the stop left: %r" % err)
mtest.check("in use by another program" not in err, "the stop was answered as the refusal after the wait: %r" % err)
mtest.check(storecheck.sha256_of(store) == before, "the store's bytes changed")
mtest.check(storecheck.integrity(store) == "ok", "integrity_check of the store after the stop")
mtest.done()
