"""What one command costs, for the store benchmarks: wall time, CPU time, peak memory."""
import os
import subprocess
import sys
import tempfile
import time


def run_with_usage(args, exit_codes=(0,)):
    """(wall s, rusage) of one command: wall time from a microsecond clock (a re-run takes
    some 30 ms, where /usr/bin/time's hundredths would be too coarse) and the kernel's
    rusage of the child (wait4). An exit code outside exit_codes stops the benchmark with
    the command's messages."""
    with tempfile.TemporaryFile("w+") as errors:
        start = time.perf_counter()
        proc = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=errors)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.perf_counter() - start
        if os.waitstatus_to_exitcode(status) not in exit_codes:
            errors.seek(0)
            sys.exit("failed: %s\n%s" % (" ".join(args), errors.read()[-2000:]))
    return wall, usage


def timed(args, exit_codes=(0,)):
    """(wall s, cpu s, peak MiB) of one command (run_with_usage). The kernel counts a
    child's peak from before it starts its program, when it is still a copy of this script,
    so a peak at the script's own size (some 12 MiB) means "no more than that"."""
    wall, usage = run_with_usage(args, exit_codes)
    return wall, usage.ru_utime + usage.ru_stime, usage.ru_maxrss / 1024
