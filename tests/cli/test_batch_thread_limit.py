"""`batch --threads N` limits the analysis' BLAS too, not only the reading.

A review on a shared node asked for one thread with `batch ... --analyse --threads 1` and
saw two busy threads in the nearest-segment search: OpenBLAS starts its own pool of
threads, one per core, whatever the program's loops take. The run is held after its
analysis is committed (the test hook MANICULE_TEST_PAUSE_AFTER_COMMIT), when OpenBLAS's
pool stands, and its threads are counted in /proc/PID/task (Linux proc(5)); with
--threads 1 there must be one fewer than with --threads 2 (OpenBLAS's one worker beside
the calling thread), everything else being equal. OPENBLAS_NUM_THREADS, which a user may
set and which wins, is left unset here. Needs two cores.
"""
import os
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

if len(os.sched_getaffinity(0)) < 2:
    print("SKIP: one core to run on, so OpenBLAS starts no worker either way")
    raise SystemExit(77)


def threads_after_commit(archive, store, threads):
    """The process' thread count while it pauses after committing its analysis."""
    env = {k: v for k, v in os.environ.items() if k != "OPENBLAS_NUM_THREADS"}
    env["MANICULE_TEST_PAUSE_AFTER_COMMIT"] = "20"
    proc = subprocess.Popen([mtest.BIN, "batch", archive, "--store", store, "--unit", "speaker", "--analyse",
                             "--min-tokens", "300", "--quiet", "--threads", str(threads)],
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True, env=env)
    count, openblas = None, False
    for line in proc.stderr:
        if "pausing after committing" in line:
            count = len(os.listdir("/proc/%d/task" % proc.pid))
            with open("/proc/%d/maps" % proc.pid) as maps:  # which BLAS was loaded (proc(5))
                openblas = "libopenblas" in maps.read()
            proc.terminate()
            break
    proc.communicate(timeout=60)
    if count is not None and not openblas:
        print("SKIP: the BLAS loaded is not OpenBLAS, which alone starts a pool of threads")
        raise SystemExit(77)
    return count


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "plays")
    storecheck.copy_plays(storecheck.pick_plays(12), archive)
    one = threads_after_commit(archive, os.path.join(tmp, "one.sqlite"), 1)
    two = threads_after_commit(archive, os.path.join(tmp, "two.sqlite"), 2)
    mtest.check(one is not None and two is not None and two - one == 1,
                "threads after the analysis: %r with --threads 1, %r with --threads 2" % (one, two))

mtest.done()
