"""An output file (-o) of the measuring commands and of export is replaced whole or not at
all: when writing fails half-way, the file keeps what it held. A review found that a full
disk left an earlier run's results cut short, as the file was opened for writing (and so
emptied) before anything was written.

The failure is the kernel's file size limit (setrlimit RLIMIT_FSIZE, with SIGXFSZ ignored so
that write(2) fails with EFBIG instead of ending the process; POSIX), set below the size of
the new output. Outside references: hashlib for the file's bytes, os.listdir for what is
left beside it.
"""
import hashlib
import os
import resource
import signal
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402

LIMIT = 4096  # bytes: each output below is far larger


def small_files_only():
    signal.signal(signal.SIGXFSZ, signal.SIG_IGN)
    resource.setrlimit(resource.RLIMIT_FSIZE, (LIMIT, LIMIT))


def sha256_of(path):
    with open(path, "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


play = os.path.join(mtest.ROOT, "examples", "ferry-play.xml")
letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
with tempfile.TemporaryDirectory() as tmp:
    annotated = os.path.join(tmp, "annotated.xml")
    mtest.run(["annotate", letters, "--unit", "letter", "--min-tokens", "200", "--output", annotated])
    commands = {
        "profile": ["profile", "--unit", "speaker", "--min-tokens", "200", play],
        "distances": ["distances", "--unit", "letter", "--min-tokens", "200", "--format", "json", letters],
        "export": ["export", annotated],
    }
    for name, args in commands.items():
        out = os.path.join(tmp, name + ".out")
        earlier = ("earlier results of %s, kept\n" % name).encode() * 10
        with open(out, "wb") as f:
            f.write(earlier)
        before = sha256_of(out)
        proc = subprocess.run([mtest.BIN] + args + ["--output", out], capture_output=True, text=True,
                              preexec_fn=small_files_only, timeout=300)
        left = sorted(n for n in os.listdir(tmp) if n.startswith("."))
        mtest.check(proc.returncode != 0 and sha256_of(out) == before and not left,
                    "%s past the size limit: exit %d, file %s, left beside it %r: %s"
                    % (name, proc.returncode, "kept" if sha256_of(out) == before else "changed", left,
                       proc.stderr.strip()[-300:]))
        # Without the limit the same command replaces it, with more than the limit allowed.
        mtest.run(args + ["--output", out])
        mtest.check(os.path.getsize(out) > LIMIT and sha256_of(out) != before, "%s did not replace its output" % name)

mtest.done()
