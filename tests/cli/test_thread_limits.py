"""Threads: what a run asks of the system, and what it does when the system grants less.

1. `--threads` takes 1-256: 100,000 once started hundreds of threads for a few files and,
   under a process limit, aborted ("terminate called without an active exception", exit
   134, the run left 'running'). Refused as a usage error (exit 2) before a store is made.
2. Under a process limit (RLIMIT_NPROC, setrlimit(2), which counts a user's threads; root
   is exempt, so the run is made as the user nobody, 65534), a batch asking for 8 readers
   and an analysis gets fewer threads, and must finish all the same: exit 0, every TEI
   file of the folder in the store (os.walk against the files table, read with Python's
   sqlite3 module), the run 'done'; and an analysis granted no thread beyond its own
   stores its result (OpenBLAS, which raises SIGINT when it cannot start its threads, is
   asked for one). Run only as root, which may change user.
"""
import os
import resource
import shutil
import sqlite3
import subprocess
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402

NOBODY = 65534

tmp = mtest.scratch_folder("manicule-threads-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
for name in ("ferry-letters.xml", "ferry-play.xml"):
    shutil.copy(os.path.join(mtest.ROOT, "examples", name), os.path.join(archive, name))

store = os.path.join(tmp, "many.sqlite")
p = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--threads", "100000"], check=False)
mtest.check(p.returncode == 2 and "manicule: --threads" in p.stderr and "1 to 256" in p.stderr
            and not os.path.exists(store), "--threads 100000: exit %d, %s" % (p.returncode, p.stderr))

if os.geteuid() != 0:
    print("note: not root, so the process-limit check (2) is not run")
else:
    def tasks_of(uid):
        """Threads of every process of `uid` now (what RLIMIT_NPROC counts), from /proc."""
        count = 0
        for pid in filter(str.isdigit, os.listdir("/proc")):
            try:
                if os.stat("/proc/" + pid).st_uid == uid:
                    count += len(os.listdir("/proc/%s/task" % pid))
            except OSError:
                pass
        return count

    os.chmod(tmp, 0o777)
    os.chmod(archive, 0o777)
    # A copy of the program that nobody may run, wherever the build lies (a home folder may
    # be closed to other users).
    program = os.path.join(tmp, "manicule")
    shutil.copy(mtest.BIN, program)
    os.chmod(program, 0o755)
    limit = tasks_of(NOBODY) + 2  # the process itself and one thread more

    def as_nobody_with_few_threads():
        os.setgroups([])
        os.setgid(NOBODY)
        os.setuid(NOBODY)
        resource.setrlimit(resource.RLIMIT_NPROC, (limit, limit))

    store = os.path.join(tmp, "limited.sqlite")
    p = subprocess.run([program, "batch", archive, "--store", store, "--unit", "letter", "--threads", "8",
                        "--analyse", "--min-tokens", "50"], capture_output=True, text=True,
                       preexec_fn=as_nobody_with_few_threads, timeout=300)
    on_disk = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names if n.endswith(".xml"))
    stored, status = [], None
    if os.path.exists(store):
        db = sqlite3.connect(store)
        stored = sorted(r[0] for r in db.execute("SELECT path FROM files"))
        status = db.execute("SELECT status FROM runs WHERE kind = 'batch' ORDER BY run_id DESC").fetchone()
        db.close()
    mtest.check(p.returncode == 0 and stored == on_disk and status == ("done",),
                "a batch under a limit of %d threads: exit %d, stored %r of %r, run %r, %s"
                % (limit, p.returncode, stored, on_disk, status, p.stderr))

    # No thread beyond the process' own: the analysis' BLAS (OpenBLAS, which raises SIGINT
    # when it cannot start its threads) is asked for one, and the analysis is stored.
    limit = tasks_of(NOBODY) + 1
    p = subprocess.run([program, "analyse-store", "--store", store, "--min-tokens", "50", "--recompute", "--quiet"],
                       capture_output=True, text=True, preexec_fn=as_nobody_with_few_threads, timeout=300)
    db = sqlite3.connect(store)
    analyses = db.execute("SELECT count(*) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    db.close()
    mtest.check(p.returncode == 0 and analyses == 2 and "interrupted" not in p.stderr,
                "analyse-store with no thread to spare: exit %d, %d analyses, %s" % (p.returncode, analyses, p.stderr))

mtest.done()
