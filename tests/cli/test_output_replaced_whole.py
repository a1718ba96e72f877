"""An output file (-o) of the measuring commands and of export is replaced whole or not at
all: when writing fails half-way, the file keeps what it held. A review found that a full
disk left an earlier run's results cut short, as the file was opened for writing (and so
emptied) before anything was written. And what is not a file of its own stays as it is:
-o /dev/stdout into a log the shell appends to, a symbolic link, a writable file in a
folder where no temporary can be made.

The failure is the kernel's file size limit (setrlimit RLIMIT_FSIZE, with SIGXFSZ ignored so
that write(2) fails with EFBIG instead of ending the process; POSIX), set below the size of
the new output. Outside references: hashlib for the file's bytes, os.listdir for what is
left beside it.
"""
import os
import resource
import signal
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import as_nobody  # noqa: E402
import mtest  # noqa: E402
from storecheck import sha256_of  # noqa: E402

LIMIT = 4096  # bytes: each output below is far larger


def small_files_only():
    signal.signal(signal.SIGXFSZ, signal.SIG_IGN)
    resource.setrlimit(resource.RLIMIT_FSIZE, (LIMIT, LIMIT))



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
        listed = sorted(os.listdir(tmp))
        proc = subprocess.run([mtest.BIN] + args + ["--output", out], capture_output=True, text=True,
                              preexec_fn=small_files_only, timeout=300)
        left = sorted(set(os.listdir(tmp)) - set(listed))
        mtest.check(proc.returncode != 0 and sha256_of(out) == before and not left,
                    "%s past the size limit: exit %d, file %s, left beside it %r: %s"
                    % (name, proc.returncode, "kept" if sha256_of(out) == before else "changed", left,
                       proc.stderr.strip()[-300:]))
        # Without the limit the same command replaces it, with more than the limit allowed.
        mtest.run(args + ["--output", out])
        mtest.check(os.path.getsize(out) > LIMIT and sha256_of(out) != before, "%s did not replace its output" % name)

    # What is not a file of its own is written to as it is, never replaced: /dev/stdout
    # leading to a log the shell appends to keeps its earlier lines (a review found them
    # gone: the log was renamed over), and the output follows them.
    log = os.path.join(tmp, "job.log")
    with open(log, "wb") as f:
        f.write(b"line 1 of the job's log\n")
    with open(log, "ab") as f:
        proc = subprocess.run([mtest.BIN] + commands["distances"] + ["--output", "/dev/stdout"], stdout=f,
                              stderr=subprocess.PIPE, text=True, timeout=300)
    with open(log, "rb") as f:
        text = f.read()
    mtest.check(proc.returncode == 0 and text.startswith(b"line 1 of the job's log\n{") and len(text) > LIMIT,
                "-o /dev/stdout appended to a log: exit %d, log starts %r" % (proc.returncode, text[:60]))

    # A symbolic link keeps pointing at its file, which is replaced, with its mode kept
    # (os.lstat, os.stat).
    real = os.path.join(tmp, "real.tsv")
    with open(real, "wb") as f:
        f.write(b"old\n")
    os.chmod(real, 0o640)
    link = os.path.join(tmp, "link.tsv")
    os.symlink(real, link)
    mtest.run(commands["profile"] + ["--output", link])
    mtest.check(os.path.islink(link) and os.readlink(link) == real and os.path.getsize(real) > LIMIT
                and (os.stat(real).st_mode & 0o777) == 0o640,
                "output through a link: link %s, size %d, mode %o" % (os.path.islink(link), os.path.getsize(real),
                                                                     os.stat(real).st_mode & 0o777))

    # A file one may write in a folder one may not (no temporary can be made beside it) is
    # written in place, as before; run as user 65534 (as_nobody), where the tests run as root.
    if os.geteuid() != 0:
        print("SKIP: the shut folder needs root to run the command as another user")
    else:
        shut = os.path.join(tmp, "shut")
        os.makedirs(shut)
        target = os.path.join(shut, "out.tsv")
        with open(target, "wb") as f:
            f.write(b"old\n")
        os.chmod(target, 0o666)
        os.chmod(tmp, 0o755)
        os.makedirs(os.path.join(tmp, "bin"))
        as_user = as_nobody.runner(os.path.join(tmp, "bin"))
        proc = as_user(*(commands["profile"] + ["--output", target]))
        mtest.check(proc.returncode == 0 and os.path.getsize(target) > LIMIT and os.listdir(shut) == ["out.tsv"],
                    "a writable file in a shut folder: exit %d, %s" % (proc.returncode, proc.stderr))

    # An output that is one of the inputs (given, or found in a folder given, in another
    # spelling) is refused before anything is written: the results would replace the
    # edition (a review found `distances same.xml -o same.xml` did so, exit 0).
    edition = os.path.join(tmp, "letters.xml")
    with open(letters, "rb") as f, open(edition, "wb") as g:
        g.write(f.read())
    for args in (["distances", "--unit", "letter", "--min-tokens", "200", edition, "--output", edition],
                 ["profile", "--unit", "letter", "--min-tokens", "200", tmp, "--output", os.path.join(tmp, ".", "letters.xml")],
                 ["export", annotated, "--output", annotated]):
        before_run = {p: sha256_of(p) for p in (edition, annotated)}
        proc = mtest.run(args, check=False)
        mtest.check(proc.returncode == 2 and "is one of the inputs" in proc.stderr
                    and all(sha256_of(p) == h for p, h in before_run.items()),
                    "%s writing over its input: exit %d, %s" % (args[0], proc.returncode, proc.stderr))

mtest.done()
