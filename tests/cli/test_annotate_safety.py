"""Safe writing of editions (annotate --in-place):
- SIGKILL at random moments, also while the temporary file is being written (slowed by
  the test hook MANICULE_TEST_SLOW_WRITE): the edition is always either the original or
  the complete new file, byte for byte; a temporary file left behind is hidden, does not
  end in .xml, is not listed by a folder run, and the next run removes it.
- A file changed on disk between reading and writing is refused with exit 6 and a clear
  message (test hook MANICULE_TEST_PAUSE_BEFORE_WRITE): by size, by content with the
  size and modification time put back, and by modification time alone.
- --backup keeps the edition as it was.
- A read-only edition or one with several hard links is refused; its owner is kept.
The reference for "original" and "complete" is the bytes on disk, compared with Python.
"""
import os
import random
import shutil
import signal
import subprocess
import sys
import tempfile
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
from mtest import BIN, ROOT, check, done, run  # noqa: E402

ARGS = ["--unit", "letter", "--min-tokens", "50"]
ENV = dict(os.environ, SOURCE_DATE_EPOCH="1767225600")
random.seed(4)
work = tempfile.mkdtemp(prefix="manicule-safety-")


def big_edition(path):
    """The example letters with about 3 MB of comment before the root: a large file whose
    analysis stays quick, so that most of a run is writing."""
    text = open(os.path.join(ROOT, "examples", "ferry-letters.xml"), "rb").read()
    head, rest = text.split(b"<TEI ", 1)
    padding = b"".join(b"<!-- padding line %06d: the ferry crosses the grey river at dawn -->\n" % i
                       for i in range(50000))
    open(path, "wb").write(head + padding + b"<TEI " + rest)


def temporaries(folder):
    return [f for f in os.listdir(folder) if "manicule-tmp" in f]


try:
    folder = os.path.join(work, "edition")
    os.makedirs(folder)
    edition = os.path.join(folder, "letters.xml")
    big_edition(edition)
    original = open(edition, "rb").read()
    expected_path = os.path.join(work, "expected", "letters.xml")
    os.makedirs(os.path.dirname(expected_path))
    shutil.copyfile(edition, expected_path)
    # The expected result, written with slow writes (the output is the same) so that this
    # one run also times a whole run from the original, as the killed runs start.
    slow = dict(ENV, MANICULE_TEST_SLOW_WRITE="15")  # ms per 64 KiB: about a second per file
    start = time.monotonic()
    run(["annotate", expected_path, "--in-place"] + ARGS, env=slow)
    full_run = time.monotonic() - start
    expected = open(expected_path, "rb").read()
    check(len(expected) > len(original) > 3_000_000, "the test edition is not large")

    # Kills while the temporary file is being written, then at any moment of a run.
    kills = [("writing", random.uniform(0.05, 0.6)) for _ in range(3)] + \
            [("anytime", random.uniform(0, full_run * 1.1)) for _ in range(3)]
    saw_partial = False
    for when, delay in kills:
        proc = subprocess.Popen([BIN, "annotate", edition, "--in-place"] + ARGS, env=slow,
                                stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        if when == "writing":
            deadline = time.monotonic() + 60
            while not temporaries(folder) and proc.poll() is None and time.monotonic() < deadline:
                time.sleep(0.005)
        time.sleep(delay)
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        now = open(edition, "rb").read()
        check(now in (original, expected), "after a kill (%s, %.2f s) the edition is neither the original "
                                           "nor the complete new file (%d bytes)" % (when, delay, len(now)))
        left = temporaries(folder)
        for name in left:
            saw_partial = saw_partial or os.path.getsize(os.path.join(folder, name)) > 0
            check(name.startswith(".") and not name.endswith(".xml"), "temporary file %s looks like an edition" % name)
        listed = run(["segments", folder, "--unit", "letter"]).stdout
        check("manicule-tmp" not in listed, "a folder run read a temporary file")
        if now == expected:
            open(edition, "wb").write(original)  # start the next round from the original
    check(saw_partial, "no kill happened while the temporary file was being written")
    run(["annotate", edition, "--in-place"] + ARGS, env=ENV)
    check(open(edition, "rb").read() == expected, "the run after the kills did not write the expected file")
    check(not temporaries(folder), "stale temporary files were not removed: %s" % temporaries(folder))

    # Changed on disk between reading and writing: refused, the change kept.
    small = os.path.join(work, "small", "letters.xml")
    os.makedirs(os.path.dirname(small))
    source = os.path.join(ROOT, "examples", "ferry-letters.xml")

    def change_size(path):
        with open(path, "ab") as f:
            f.write(b"<!-- the editor saved a correction -->\n")

    def change_content_keep_size_and_time(path):
        st = os.stat(path)
        data = bytearray(open(path, "rb").read())
        i = data.index(b"Quillmouth")
        data[i:i + 10] = b"Quillmoutt"
        open(path, "wb").write(bytes(data))
        os.utime(path, ns=(st.st_atime_ns, st.st_mtime_ns))

    def touch(path):
        st = os.stat(path)
        os.utime(path, ns=(st.st_atime_ns, st.st_mtime_ns + 1_000_000_000))

    for change in (change_size, change_content_keep_size_and_time, touch):
        shutil.copyfile(source, small)
        paused = dict(ENV, MANICULE_TEST_PAUSE_BEFORE_WRITE="3")
        proc = subprocess.Popen([BIN, "annotate", small, "--in-place"] + ARGS, env=paused,
                                stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
        messages = []
        for line in proc.stderr:
            messages.append(line)
            if "pausing before writing" in line:
                break
        change(small)
        changed = open(small, "rb").read()
        rest = proc.communicate(timeout=120)[1]
        message = "".join(messages) + rest
        check(proc.returncode == 6, "%s: exit %d instead of 6: %s" % (change.__name__, proc.returncode, message))
        check("changed" in message or "modified" in message, "%s: unclear message: %s" % (change.__name__, message))
        check("nothing was written" in message, "%s: the message does not say nothing was written" % change.__name__)
        check(open(small, "rb").read() == changed, "%s: the edited file was overwritten" % change.__name__)
        check(not temporaries(os.path.dirname(small)), "temporary file left after a refusal")

    # --backup keeps the edition as it was before each write.
    shutil.copyfile(source, small)
    run(["annotate", small, "--in-place", "--backup"] + ARGS, env=ENV)
    check(open(small + ".bak", "rb").read() == open(source, "rb").read(), "the backup is not the original")
    once = open(small, "rb").read()
    run(["annotate", small, "--in-place", "--backup", "--all-pairs"] + ARGS, env=ENV)
    check(open(small + ".bak", "rb").read() == once, "the second backup is not the file as it was")

    # --who: a "#id" pointer must name an xml:id of the edition (lxml lists them), else the
    # change would point at nothing, which tei_all does not check: refused before anything
    # is written (exit 2, no output file); one that names a person entry is written as given.
    from lxml import etree
    ids = set(etree.parse(source).xpath("//@xml:id"))
    person = next(i for i in sorted(ids) if i.startswith("p-"))
    out = os.path.join(work, "who.xml")
    proc = run(["annotate", source, "--output", out, "--who", "#nobody"] + ARGS, check=False, env=ENV)
    check("nobody" not in ids and proc.returncode == 2 and "--who #nobody names no xml:id" in proc.stderr
          and not os.path.exists(out), "--who #nobody: exit %d, output %s, %s"
          % (proc.returncode, os.path.exists(out), proc.stderr))
    run(["annotate", source, "--output", out, "--who", "#" + person] + ARGS, env=ENV)
    whos = etree.parse(out).xpath("//tei:revisionDesc/tei:change/@who", namespaces={"tei": "http://www.tei-c.org/ns/1.0"})
    check(whos[-1:] == ["#" + person], "--who #%s written as %r" % (person, whos))
    # In a results file of its own, a "#id" would point into that file: refused, with the
    # pointer as the results file reaches the edition (os.path.relpath from its folder).
    results = os.path.join(work, "results", "letters-results.xml")
    os.makedirs(os.path.dirname(results), exist_ok=True)
    proc = run(["annotate", source, "--standoff-file", results, "--who", "#" + person] + ARGS, check=False, env=ENV)
    advice = os.path.relpath(source, os.path.dirname(results)) + "#" + person
    check(proc.returncode == 2 and "(%s)" % advice in proc.stderr and not os.path.exists(results),
          "--who #%s with --standoff-file: exit %d, advice %s wanted: %s" % (person, proc.returncode, advice, proc.stderr))
    # The default, our own application (#mcl-app), may also be given by name.
    run(["annotate", source, "--output", out, "--who", "#mcl-app"] + ARGS, env=ENV)

    # --output naming a pipe (a FIFO another program reads; /dev/stdout is one behind a
    # link): written through it, not replaced by a file renamed over it (as root, --output
    # /dev/null made /dev/null a plain file). POSIX stat: still a FIFO afterwards, and the
    # bytes read from it are those written to a plain file.
    import stat
    import threading
    fifo = os.path.join(work, "annotated.pipe")
    os.mkfifo(fifo)
    received = []
    reader = threading.Thread(target=lambda: received.append(open(fifo, "rb").read()), daemon=True)
    reader.start()
    proc = run(["annotate", source, "--output", fifo] + ARGS, check=False, env=ENV)
    reader.join(timeout=30)
    run(["annotate", source, "--output", out] + ARGS, env=ENV)
    check(proc.returncode == 0 and stat.S_ISFIFO(os.stat(fifo).st_mode) and received == [open(out, "rb").read()],
          "--output to a pipe: exit %d, still a pipe: %s, %d bytes read; %s" % (
              proc.returncode, stat.S_ISFIFO(os.stat(fifo).st_mode), len(received[0]) if received else -1, proc.stderr))
    # The same for a results file (--standoff-file), which was first read to see whether it
    # is one of ours: a pipe then held the run waiting for a writer, for ever.
    received = []
    reader = threading.Thread(target=lambda: received.append(open(fifo, "rb").read()), daemon=True)
    reader.start()
    proc = run(["annotate", source, "--standoff-file", fifo] + ARGS, check=False, env=ENV, timeout=60)
    reader.join(timeout=30)
    check(proc.returncode == 0 and stat.S_ISFIFO(os.stat(fifo).st_mode) and received and b"<standOff" in received[0],
          "--standoff-file to a pipe: exit %d, %s" % (proc.returncode, proc.stderr))

    # What an edition's file says of itself is honoured (POSIX stat, hashlib): a read-only
    # mode (0444) or a second hard link is refused with exit 5 (write_failed), the file
    # left byte for byte, its mode and links as they were; a file that another user owns
    # keeps its owner and group when root annotates it (before, the new file was root's).
    import hashlib
    def digest(path):
        return hashlib.sha256(open(path, "rb").read()).hexdigest()
    locked = os.path.join(work, "locked.xml")
    shutil.copyfile(source, locked)
    os.chmod(locked, 0o444)
    before = digest(locked)
    proc = run(["annotate", locked, "--in-place"] + ARGS, check=False, env=ENV)
    check(proc.returncode == 5 and "read-only (mode 0444)" in proc.stderr and digest(locked) == before
          and os.stat(locked).st_mode & 0o777 == 0o444,
          "--in-place on a read-only edition: exit %d, %s" % (proc.returncode, proc.stderr))
    # With another edition beside it in one run, neither is written: the refusal comes
    # before the first write, so that a run's results are not split between files.
    other = os.path.join(work, "beside-locked.xml")
    shutil.copyfile(source, other)
    proc = run(["annotate", other, locked, "--in-place"] + ARGS, check=False, env=ENV)
    check(proc.returncode == 5 and digest(other) == digest(source) and digest(locked) == before,
          "--in-place on two editions, one read-only: exit %d, the other written: %s; %s"
          % (proc.returncode, digest(other) != digest(source), proc.stderr))
    linked = os.path.join(work, "linked.xml")
    shutil.copyfile(source, linked)
    os.link(linked, linked + ".other-name")
    proc = run(["annotate", linked, "--in-place"] + ARGS, check=False, env=ENV)
    check(proc.returncode == 5 and "2 hard links" in proc.stderr and digest(linked) == digest(source)
          and os.stat(linked).st_nlink == 2 and os.path.samefile(linked, linked + ".other-name"),
          "--in-place on an edition with two hard links: exit %d, %s" % (proc.returncode, proc.stderr))
    if os.geteuid() != 0:
        print("SKIP: the owner kept when root annotates another user's edition (not run as root)")
    else:
        owned = os.path.join(work, "owned.xml")
        shutil.copyfile(source, owned)
        os.chown(owned, 65534, 65534)
        run(["annotate", owned, "--in-place", "--backup"] + ARGS, env=ENV)
        for path in (owned, owned + ".bak"):
            st = os.stat(path)
            check((st.st_uid, st.st_gid) == (65534, 65534),
                  "annotated by root, %s is owned by %d:%d, was 65534:65534" % (path, st.st_uid, st.st_gid))
        check(digest(owned) != digest(source) and digest(owned + ".bak") == digest(source),
              "the edition and its backup after --in-place --backup")

    # --output /dev/stdout with stdout a log opened for appending (the shell's >>): the
    # edition follows what the log held, which is kept (a file renamed over the log's
    # path, where the link /dev/stdout leads, took it away). Reference: the edition as
    # written to a plain file.
    log = os.path.join(work, "job.log")
    with open(log, "w") as f:
        f.write("an earlier line of the job\n")
    with open(log, "ab") as f:
        proc = subprocess.run([BIN, "annotate", source, "--output", "/dev/stdout"] + ARGS, stdout=f,
                              stderr=subprocess.PIPE, env=ENV)
    run(["annotate", source, "--output", out] + ARGS, env=ENV)
    check(proc.returncode == 0 and open(log, "rb").read() == b"an earlier line of the job\n" + open(out, "rb").read(),
          "--output /dev/stdout appended to a log: exit %d, %s" % (proc.returncode, proc.stderr))
finally:
    shutil.rmtree(work, ignore_errors=True)
done()
