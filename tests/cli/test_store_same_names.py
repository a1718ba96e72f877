"""Files of one name in several folders of an archive (1850/letters.xml, 1851/letters.xml)
are analysed together from the store: their segment ids begin with the end of their path
that tells them apart (here the path below the input folder), a file whose name is unique
keeps its stem, and nothing is refused. Before,
the analysis stopped with a usage error asking to narrow it with --folder, so such an
archive could not be compared across its folders at all.

Outside references: the expected id prefixes come from os.path.relpath; the nearest
neighbours are checked against a plain fact of the data, that a letter and its copy with
one word changed are each other's nearest, a third copy with many words changed being
farther (the copies are made here with str.replace), and
the count of neighbour rows against 5 per measured segment (the documented default).
"""
import os
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

EXAMPLE = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
with open(EXAMPLE, encoding="utf-8") as f:
    letters = f.read()

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    files = {
        os.path.join(archive, "1850", "letters.xml"): letters,
        # The same letters with one word changed in each (the first "the" of every <p>).
        os.path.join(archive, "1851", "letters.xml"): letters.replace("<p>The ", "<p>This "),
        # Many words changed: farther from both than they are from each other.
        os.path.join(archive, "misc", "stray.xml"): letters.replace(" the ", " a ").replace(" and ", " or "),
    }
    for path, text in files.items():
        os.makedirs(os.path.dirname(path), exist_ok=True)
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
    mtest.check(files[os.path.join(archive, "1851", "letters.xml")] != letters, "the copy was not changed")

    store = os.path.join(tmp, "archive.sqlite")
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--min-tokens", "200", "--analyse",
                      "--quiet"], check=False)
    mtest.check(proc.returncode == 0, "batch --analyse: exit %d, %s" % (proc.returncode, proc.stderr))

    db = sqlite3.connect(store)
    run = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    rows = db.execute("SELECT segment, path FROM analysis_segments WHERE run_id = ? AND measured = 1",
                      (run,)).fetchall()
    nearest = dict(db.execute("SELECT segment, neighbour FROM neighbours WHERE run_id = ? AND rank = 1", (run,)))
    neighbour_rows = db.execute("SELECT count(*) FROM neighbours WHERE run_id = ?", (run,)).fetchone()[0]
    # The segment_list view names each stored segment as the analysis does, so the two join.
    listed = db.execute("SELECT segment, path FROM segment_list").fetchall()
    joined = db.execute("SELECT count(*) FROM segment_list s JOIN neighbours n ON n.segment = s.segment "
                        "WHERE n.run_id = ?", (run,)).fetchone()[0]
    db.close()

    # A failing file of the name stray.xml in another folder, and an analysis of one folder
    # only: ids are worked out over every stored file, so stray's become misc/stray#... in
    # the view and in an analysis alike, and an analysis of 1850/ alone still names its
    # letters 1850/letters#... (os.path.relpath gives the expected prefixes).
    broken = os.path.join(archive, "broken", "stray.xml")
    os.makedirs(os.path.dirname(broken))
    with open(broken, "w", encoding="utf-8") as f:
        f.write(letters[: len(letters) // 3])
    mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
    for extra in ([], ["--folder", "1850"]):
        mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--quiet", "--recompute"] + extra)
        db = sqlite3.connect(store)
        last = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
        analysed = db.execute("SELECT segment, path FROM analysis_segments WHERE run_id = ?", (last,)).fetchall()
        view = set(db.execute("SELECT segment FROM segment_list").fetchall())
        db.close()
        for segment, path in analysed:
            rel = os.path.splitext(os.path.relpath(path, archive))[0]
            mtest.check(segment.startswith(rel + "#"), "%s: %s of %s, expected %s#..." % (extra, segment, path, rel))
            mtest.check((segment,) in view, "%s: %s is not in segment_list" % (extra, segment))

    def expected_prefix(path):
        if os.path.basename(path) == "stray.xml":  # the one name found once
            return "stray"
        return os.path.splitext(os.path.relpath(path, archive))[0]

    mtest.check(len(rows) == 36, "measured segments: %d, 12 letters in each of 3 files expected" % len(rows))
    for segment, path in rows:
        mtest.check(segment.startswith(expected_prefix(path) + "#"), "segment %s of %s" % (segment, path))
    mtest.check(len({s for s, _ in rows}) == len(rows), "segment ids are not distinct")
    for segment, path in listed:
        mtest.check(segment.startswith(expected_prefix(path) + "#"), "segment_list: %s of %s" % (segment, path))
    mtest.check(len({s for s, _ in listed}) == len(listed), "segment_list's ids are not distinct")
    mtest.check(joined == neighbour_rows, "segment_list joins %d of the %d neighbour rows" % (joined, neighbour_rows))
    mtest.check(neighbour_rows == 5 * len(rows), "neighbour rows %d for %d segments" % (neighbour_rows, len(rows)))
    for segment, _ in rows:
        if segment.startswith("1850/letters#"):
            twin = "1851/letters#" + segment.split("#", 1)[1]
            mtest.check(nearest.get(segment) == twin and nearest.get(twin) == segment,
                        "%s and %s are not each other's nearest: %s, %s"
                        % (segment, twin, nearest.get(segment), nearest.get(twin)))

    # An analysis asked again after a file of the same name as one it took joins the store:
    # nothing it took has changed, but its ids have (stray#... becomes misc/stray#...), so
    # the stored analysis must not be given back with the ids of before (os.path.relpath
    # gives the expected prefix; segment_list names the stored segments now).
    second = os.path.join(tmp, "second")
    os.makedirs(os.path.join(second, "misc"))
    with open(os.path.join(second, "misc", "stray.xml"), "w", encoding="utf-8") as f:
        f.write(letters)
    second_store = os.path.join(tmp, "second.sqlite")
    mtest.run(["batch", second, "--store", second_store, "--unit", "letter", "--quiet"])
    ask = ["analyse-store", "--store", second_store, "--min-tokens", "200", "--quiet", "--folder", "misc"]
    mtest.run(ask)
    os.makedirs(os.path.join(second, "other"))
    with open(os.path.join(second, "other", "stray.xml"), "w", encoding="utf-8") as f:
        f.write(letters.replace("<p>The ", "<p>This "))
    mtest.run(["batch", second, "--store", second_store, "--unit", "letter", "--quiet"])
    mtest.run(ask)
    db = sqlite3.connect(second_store)
    last = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    analysed = db.execute("SELECT segment FROM analysis_segments WHERE run_id = ?", (last,)).fetchall()
    view = set(db.execute("SELECT segment FROM segment_list").fetchall())
    db.close()
    # (lxml: the letter divs of misc/stray.xml)
    divs = etree.parse(os.path.join(second, "misc", "stray.xml")).getroot().xpath(
        "//tei:div[@type='letter']", namespaces={"tei": "http://www.tei-c.org/ns/1.0"})
    mtest.check(len(analysed) == len(divs) > 0 and all(s.startswith("misc/stray#") and (s,) in view for (s,) in analysed),
                "the analysis asked again names its segments %r" % sorted(analysed)[:3])

mtest.done()
