"""Shared helpers for the script tests (reference, corpus, cli).

Each test script is run by CTest with Debian's /usr/bin/python3 and these variables:
MANICULE_BIN (the built command), MANICULE_ROOT (project root), MANICULE_BUILD,
MANICULE_CORPORA (../shared/corpora), MANICULE_SCHEMA (tei_all.rng), MANICULE_PLUGIN.
A script exits 0 when every check holds, 1 on the first failed check, 77 to skip.
"""
import atexit
import os
import shutil
import subprocess
import sys
import tempfile

BIN = os.environ.get("MANICULE_BIN", "manicule")
ROOT = os.environ.get("MANICULE_ROOT", os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__)))))
CORPORA = os.environ.get("MANICULE_CORPORA", os.path.join(ROOT, "..", "shared", "corpora"))
SCHEMA = os.environ.get("MANICULE_SCHEMA", os.path.join(ROOT, "..", "shared", "schemas", "tei_all.rng"))
FIXTURES = os.path.join(ROOT, "tests", "fixtures")

_checks = 0


def scratch_folder(prefix="manicule-test-"):
    """A new temporary folder, removed when the script exits (whether its checks held or
    not), so that a test run leaves nothing behind in the system's temporary folder; set
    MANICULE_KEEP_SCRATCH=1 to keep it for a look after a failure."""
    folder = tempfile.mkdtemp(prefix=prefix)
    if not os.environ.get("MANICULE_KEEP_SCRATCH"):
        atexit.register(shutil.rmtree, folder, True)
    return folder


def run(args, check=True, input=None, env=None, timeout=600, cwd=None):
    """Runs the manicule command (in the folder `cwd` if given); returns CompletedProcess
    with text output."""
    proc = subprocess.run([BIN] + list(args), capture_output=True, text=True, input=input,
                          env=env, timeout=timeout, cwd=cwd)
    if check and proc.returncode != 0:
        fail("manicule %s exited %d\nstdout: %s\nstderr: %s"
             % (" ".join(args), proc.returncode, proc.stdout[-2000:], proc.stderr[-2000:]))
    return proc


def fail(message):
    print("FAIL: " + message)
    sys.exit(1)


def check(condition, message):
    global _checks
    _checks += 1
    if not condition:
        fail(message)


def close(a, b, rel=1e-9, abs_=1e-12):
    return abs(a - b) <= max(abs_, rel * max(abs(a), abs(b)))


def done():
    if _checks == 0:
        fail("no check was made")
    print("%d checks passed" % _checks)
    sys.exit(0)


def read_tsv(text):
    lines = [l for l in text.splitlines() if l and not l.startswith("#")]
    header = lines[0].split("\t")
    return [dict(zip(header, l.split("\t"))) for l in lines[1:]]
