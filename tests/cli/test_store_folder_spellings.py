"""Sub-corpora by folder: `--folder DIR` names "a folder below an input folder, or a path"
(docs/store.md), and a path may be spelled otherwise than the inputs were: relative where
the batch was given an absolute input, absolute where it was given a relative one, with
"./" or "x/../". Such spellings selected nothing ("widen it", or exit 4 in batch).

Which files a spelling names is worked out with Python's os.path (abspath, normpath) over
the files os.walk finds; the analysis must take exactly those (analysis_segments, read
with Python's sqlite3), and batch --folder must read exactly those (its runs row). Folders
whose names begin alike ("de", "de_1") must stay apart, and a bare name ("x") means the
folder below an input alone, even when run from a folder that holds an x of its own. A
folder or an input reached through a link is compared as the system resolves it.
"""
import os
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

tmp = mtest.scratch_folder("manicule-folder-spellings-")
letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
for folder, count in (("de", 3), ("de_1", 2), ("en", 2)):
    os.makedirs(os.path.join(tmp, "archive", folder))
    for i in range(count):
        shutil.copy(letters, os.path.join(tmp, "archive", folder, "letters-%d.xml" % i))


def walked(folder):
    """Every file below `folder`, as os.walk finds it."""
    return {os.path.join(d, n) for d, _, names in os.walk(folder) for n in names}


files = sorted(walked(os.path.join(tmp, "archive")))  # tmp is absolute (tempfile.mkdtemp)


def named_by(spelling):
    """The files below `spelling`, a path taken from the working folder tmp (Python's os.path)."""
    folder = os.path.normpath(os.path.join(tmp, spelling))
    return {f for f in files if f.startswith(folder + os.sep)}


def placed(path):
    """A stored path as a file: relative ones from tmp, where the batches ran (os.path)."""
    return os.path.abspath(os.path.join(tmp, path))


def analysed(store, spelling, cwd, recompute=True, env=None):
    """Runs analyse-store --folder `spelling` from `cwd`; returns (the process, the files
    the new analysis took, read with Python's sqlite3)."""
    proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--folder", spelling]
                     + (["--recompute"] if recompute else []), check=False, cwd=cwd, env=env)
    _, tables = storecheck.latest_analysis(store)
    return proc, {placed(row[1]) for row in tables["segments"]}


def batch_folder(input_spelling, store, spelling, cwd):
    """Runs batch --folder `spelling` from `cwd` into a new store; returns its batch run and
    the paths it stored, as stored (Python's sqlite3)."""
    for suffix in ("", "-wal"):
        if os.path.exists(store + suffix):
            os.remove(store + suffix)
    mtest.run(["batch", input_spelling, "--store", store, "--unit", "letter", "--quiet", "--folder", spelling],
              cwd=cwd)
    db = storecheck.connect(store)
    stored = {r[0] for r in db.execute("SELECT path FROM files")}
    db.close()
    return storecheck.last_run(store), stored


spellings = ["archive/de", "./archive/de", os.path.join(tmp, "archive", "de"), "archive/de_1/../de",
             "archive/de/", os.path.join(tmp, "archive", "en", "..", "de_1")]
for input_spelling in ("archive", os.path.join(tmp, "archive")):
    store = os.path.join(tmp, "store-%d.sqlite" % len(input_spelling))
    mtest.run(["batch", input_spelling, "--store", store, "--unit", "letter", "--quiet"], cwd=tmp)
    asked = set()  # the files each folder asked so far names (os.path)
    for spelling in spellings:
        want = named_by(spelling)
        mtest.check(len(want) in (2, 3), "%s names %d files" % (spelling, len(want)))
        proc, got = analysed(store, spelling, tmp, recompute=False)
        mtest.check(proc.returncode == 0, "input %s, --folder %s: exit %d, %s"
                    % (input_spelling, spelling, proc.returncode, proc.stderr))
        mtest.check(got == want, "input %s, --folder %s: analysed %r, os.path gives %r"
                    % (input_spelling, spelling, sorted(got), sorted(want)))
        # A spelling of a folder asked before is answered by the analysis stored then (the
        # files it names are in the analysis' key already); a folder asked first is not.
        mtest.check(("(unchanged, reused)" in proc.stdout) == (frozenset(want) in asked),
                    "input %s, --folder %s: reused %s after the folders %r"
                    % (input_spelling, spelling, "(unchanged, reused)" in proc.stdout, asked))
        asked.add(frozenset(want))

        # batch --folder reads just those files, into a store of its own.
        run, read = batch_folder(input_spelling, os.path.join(tmp, "part.sqlite"), spelling, tmp)
        read = {placed(path) for path in read}
        # (The folder's files are copies of one edition: one file is parsed for each content,
        # hashlib's, the others hashed as known, and each is stored.)
        contents = {storecheck.sha256_of(f) for f in want}
        mtest.check(run["files_read"] == len(contents) and run["files_hashed"] == len(want) - len(contents)
                    and read == want,
                    "batch input %s --folder %s read %r, os.path "
                    "gives %r" % (input_spelling, spelling, sorted(read), sorted(want)))

# Stored paths relative to where batch ran (the store from the input "archive"), asked from
# inside the archive as "./de": the folder de below the input, which it is.
relative_store = os.path.join(tmp, "store-%d.sqlite" % len("archive"))
proc, got = analysed(relative_store, "./de", os.path.join(tmp, "archive"))
mtest.check(proc.returncode == 0 and got == named_by("archive/de"),
            "from inside the archive, ./de over relative stored paths: exit %d, %r, %s"
            % (proc.returncode, sorted(got), proc.stderr))

# Run from a folder reached through a link, as the shell spells it ($PWD, POSIX sh): a
# relative path names the same files either way (os.path.realpath).
link = os.path.join(tmp, "through-link")
os.symlink(tmp, link)
physical_store = os.path.join(tmp, "store-%d.sqlite" % len(os.path.join(tmp, "archive")))
proc, got = analysed(physical_store, "archive/de", link, env=dict(os.environ, PWD=link))
got = {os.path.realpath(f) for f in got}
mtest.check(proc.returncode == 0 and got == {os.path.realpath(f) for f in named_by("archive/de")},
            "through a link, --folder archive/de: exit %d, %r, %s" % (proc.returncode, sorted(got), proc.stderr))

# The folder, or the input, given through a link to the archive ("lnk" -> archive): the
# files taken are those os.path.realpath places in the folder, either way round (docs/
# store.md: "also through a link"). They selected nothing ("widen it"; exit 4 in batch).
os.symlink(os.path.join(tmp, "archive"), os.path.join(tmp, "lnk"))
real_de = {os.path.realpath(f) for f in named_by("archive/de")}
for store, spelling in ((physical_store, "./lnk/de"), (physical_store, os.path.join(tmp, "lnk", "de")),
                        (relative_store, "lnk/de")):
    proc, got = analysed(store, spelling, tmp)
    mtest.check(proc.returncode == 0 and {os.path.realpath(f) for f in got} == real_de,
                "--folder %s through a link: exit %d, %r, %s" % (spelling, proc.returncode, sorted(got), proc.stderr))
    run, read = batch_folder("archive", os.path.join(tmp, "linked.sqlite"), spelling, tmp)
    mtest.check({os.path.realpath(placed(p)) for p in read} == real_de,
                "batch --folder %s through a link read %r" % (spelling, sorted(read)))
linked_input = os.path.join(tmp, "store-linked-input.sqlite")
mtest.run(["batch", "lnk", "--store", linked_input, "--unit", "letter", "--quiet"], cwd=tmp)
proc, got = analysed(linked_input, os.path.join(tmp, "archive", "de"), tmp)
mtest.check(proc.returncode == 0 and {os.path.realpath(f) for f in got} == real_de,
            "input through a link, --folder by the real path: exit %d, %r, %s" % (proc.returncode, sorted(got), proc.stderr))
os.remove(os.path.join(tmp, "lnk"))

# A bare name is a folder below an input, and only that: run from inside the archive
# (archive/de, which holds a folder x of its own), --folder x must not also take de/x; a
# name written as a path from the working folder (".", "./x") is that folder alone, not
# also the x below the input.
for target in (os.path.join(tmp, "archive", "x"), os.path.join(tmp, "archive", "de", "x")):
    os.makedirs(target)
    shutil.copy(letters, os.path.join(target, "letters-x.xml"))
inside = os.path.join(tmp, "archive", "de")
for i, (spelling, folder) in enumerate((("x", os.path.join(tmp, "archive", "x")), ("x/", os.path.join(tmp, "archive", "x")),
                                        (".", inside), ("./x", os.path.join(inside, "x")))):
    _, got = batch_folder(os.path.join(tmp, "archive"), os.path.join(tmp, "inside-%d.sqlite" % i), spelling, inside)
    want = walked(folder)
    mtest.check(got == want, "from archive/de, --folder %s read %r, os.walk of %s gives %r"
                % (spelling, sorted(got), folder, sorted(want)))

# analyse-store over paths stored relative to where batch ran (tmp), asked from inside the
# archive: "./x", "." and an absolute path are taken from the working folder (archive/de),
# the stored paths from where batch ran, as its run recorded (os.path gives the files).
mtest.run(["batch", "archive", "--store", relative_store, "--unit", "letter", "--quiet"], cwd=tmp)
for spelling, folder in (("./x", os.path.join(inside, "x")), (".", inside),
                         (os.path.join(tmp, "archive", "x"), os.path.join(tmp, "archive", "x"))):
    proc, got = analysed(relative_store, spelling, inside)
    want = walked(folder)
    mtest.check(proc.returncode == 0 and got == want, "from archive/de, analyse-store --folder %s: exit %d, %r, "
                "os.walk of %s gives %r; %s" % (spelling, proc.returncode, sorted(got), folder, sorted(want), proc.stderr))

mtest.done()
