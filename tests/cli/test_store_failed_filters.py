"""Archive store: files stored as failed, and the sub-corpus filters of analyse-store.

An archive of the invented ferry letters in a/, beside a malformed file and an XHTML file
in b/. A failing file is named by its own path wherever it is reported, also when its
content was first read under another path (a copy, a rename). Which files fail is decided here by lxml (a file that does not parse, or whose root
is not TEI P5's <TEI> or <teiCorpus>, TEI P5 ch. 4 and 15.1); which files a folder holds,
by os.walk. A failed file has no header, so it can pass no author, title, year or language
filter, and lies in one folder only: analyse-store counts it as left out only where the
sub-corpus could have held it, and when nothing passes says so instead of advising to run
batch again.
"""
import os
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

TEI = "http://www.tei-c.org/ns/1.0"
TEI_ROOTS = {"{%s}TEI" % TEI, "{%s}teiCorpus" % TEI}


def fails_by_lxml(path):
    try:
        return etree.parse(path).getroot().tag not in TEI_ROOTS
    except etree.XMLSyntaxError:
        return True


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(os.path.join(archive, "a"))
    os.makedirs(os.path.join(archive, "b"))
    shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), os.path.join(archive, "a"))
    with open(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), encoding="utf-8") as f:
        text = f.read()
    with open(os.path.join(archive, "b", "broken.xml"), "w", encoding="utf-8") as f:
        f.write(text[: len(text) // 2])  # cut in the middle of the body
    with open(os.path.join(archive, "b", "notes.xml"), "w", encoding="utf-8") as f:
        f.write('<html xmlns="http://www.w3.org/1999/xhtml"><body><p>Shelf list</p></body></html>\n')

    on_disk = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names if n.endswith(".xml"))
    failing = [p for p in on_disk if fails_by_lxml(p)]
    failing_in = {folder: sum(1 for p in failing if os.path.basename(os.path.dirname(p)) == folder)
                  for folder in ("a", "b")}
    mtest.check(len(on_disk) == 3 and failing_in == {"a": 0, "b": 2}, "lxml: %r fail of %r" % (failing, on_disk))

    store = os.path.join(tmp, "store.sqlite")
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
    mtest.check(proc.returncode == 1, "batch with failing files exited %d (1 expected)" % proc.returncode)

    # The malformed file copied into a/, the XHTML file renamed: the same contents, known to
    # the store, under paths it has not seen. Each failing file is reported under its own
    # path on stderr and in the file_list view (the paths on disk: os.walk).
    shutil.copy(os.path.join(archive, "b", "broken.xml"), os.path.join(archive, "a", "broken-copy.xml"))
    os.rename(os.path.join(archive, "b", "notes.xml"), os.path.join(archive, "b", "notes-renamed.xml"))
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
    on_disk_now = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names if n.endswith(".xml"))
    failing_now = [p for p in on_disk_now if fails_by_lxml(p)]
    reported = [line[len("manicule: failed: "):] for line in proc.stderr.splitlines()
                if line.startswith("manicule: failed: ")]
    named = sorted(next((p for p in failing_now if line.startswith(p + ":")), line) for line in reported)
    mtest.check(proc.returncode == 1 and named == failing_now,
                "failing files as reported: %r, lxml finds %r" % (reported, failing_now))
    db = sqlite3.connect(store)
    rows = db.execute("SELECT path, error FROM file_list WHERE error IS NOT NULL ORDER BY path").fetchall()
    db.close()
    mtest.check(sorted(p for p, _ in rows) == failing_now and all(e.startswith(p + ":") for p, e in rows),
                "file_list's errors: %r" % rows)
    failing = failing_now
    on_disk = on_disk_now

    def analyse(*extra):
        return mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--quiet"] + list(extra),
                         check=False)

    # The whole archive: both failing files are left out, and said to be.
    proc = analyse()
    mtest.check(proc.returncode == 0 and "%d file(s) stored as failed" % len(failing) in proc.stderr,
                "whole archive: exit %d, %s" % (proc.returncode, proc.stderr))
    # The analysis run records them as its runs row's files_failed (docs/store.md, runs).
    db = sqlite3.connect(store)
    recorded = db.execute("SELECT files_failed FROM runs WHERE kind = 'analysis' ORDER BY run_id DESC LIMIT 1").fetchone()
    db.close()
    mtest.check(recorded == (len(failing),), "the analysis run records %r failing files, lxml finds %d"
                % (recorded, len(failing)))
    # A folder with one failing file (the copy): that one is said to be left out.
    proc = analyse("--folder", "a")
    in_a = sum(1 for p in failing if os.path.basename(os.path.dirname(p)) == "a")
    mtest.check(proc.returncode == 0 and in_a == 1 and "%d file(s) stored as failed" % in_a in proc.stderr,
                "--folder a: exit %d, %s" % (proc.returncode, proc.stderr))
    # A file read well but holding no letter (lxml: no div[@type='letter']) is said to hold
    # no segment of the unit at all, not none long enough. The example play joins a/.
    shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), os.path.join(archive, "a"))
    play = os.path.join(archive, "a", "ferry-play.xml")
    mtest.check(not etree.parse(play).xpath("//tei:div[@type='letter']", namespaces={"tei": TEI}),
                "the example play holds a letter")
    mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
    in_a = [os.path.join(archive, "a", n) for n in os.listdir(os.path.join(archive, "a")) if n.endswith(".xml")]
    selected = sum(1 for p in in_a if not fails_by_lxml(p))  # failed files are left out, not selected
    proc = analyse("--folder", "a")
    mtest.check("1 of the %d file(s) selected hold no segment of this unit at all" % selected in proc.stderr
                and "words or more" not in proc.stderr, "a file without letters: %s" % proc.stderr)
    os.remove(play)
    mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)

    # Filters that nothing passes: exit 4 (nothing selected), the filter named, no advice
    # to read the files again (they were read).
    for extra in (["--folder", "no-such-folder"], ["--author", "Nobody Here"], ["--title", "No such title"],
                  ["--years", "1500-1501"]):
        proc = analyse(*extra)
        expected = "none of the %d stored file(s) passes the filter" % len(on_disk)
        mtest.check(proc.returncode == 4 and expected in proc.stderr and "run batch" not in proc.stderr,
                    "%s: exit %d, %s" % (" ".join(extra), proc.returncode, proc.stderr))

mtest.done()
