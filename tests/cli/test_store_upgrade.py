"""Archive store: a store written by an earlier version (format 2, made by manicule at
be093e5, and format 3, made at 45c7dfe, kept in tests/fixtures/stores, see the README
there) is brought up to this version's format when opened, and nothing in it is lost.

Outside references: the store file itself, written by the earlier build, and SQLite's own
account of it (Python's sqlite3 module): its tables' rows before and after, and the shape
of its tables and views against a store this version creates from the same edition. The
analysis of its counts, read by the earlier version and decoded by Python, is checked
against numpy and SciPy (Cosine Delta of the z-scores), and is the same as this version's
reading of the same edition (the earlier readings differ in dates and in the headings of a
teiCorpus's texts only, which an unfiltered analysis does not use), table for table.
"""
import gzip
import os
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
import numpy as np  # noqa: E402
from scipy.spatial.distance import cdist  # noqa: E402

FIXTURES = {"2": os.path.join(mtest.ROOT, "tests", "fixtures", "stores", "ferry-format2.sqlite.gz"),
            "3": os.path.join(mtest.ROOT, "tests", "fixtures", "stores", "ferry-format3.sqlite.gz")}
# This version's store format (docs/store.md, the store_info table).
FORMAT = "4"
TABLES = ("files", "readings", "segments", "vocabulary_blocks", "runs", "settings")


def shape(path):
    """{table or view name: its columns in order}, as SQLite describes them."""
    db = sqlite3.connect(path)
    try:
        names = [n for (n,) in db.execute("SELECT name FROM sqlite_master WHERE type IN ('table', 'view') "
                                          "AND name NOT LIKE 'sqlite_%' ORDER BY name")]
        return {n: [r[1] for r in db.execute("PRAGMA table_info(%s)" % n)] for n in names}
    finally:
        db.close()


def rows(path):
    db = sqlite3.connect(path)
    try:
        return {t: sorted(db.execute("SELECT * FROM %s" % t)) for t in TABLES}
    finally:
        db.close()


def fixture_copy(fixture, path):
    with gzip.open(fixture) as src, open(path, "wb") as dst:
        shutil.copyfileobj(src, dst)


def store_format(path):
    return storecheck.rows(path, "SELECT value FROM store_info WHERE key = 'format'")[0][0]


def earlier_counts(path):
    """{(sha256, ordinal): {feature id: count}} as the earlier version stored them, decoded
    by Python (storecheck.decode_counts), with each segment's stored total checked."""
    out = {}
    for sha, ordinal, total, blob in storecheck.rows(path, "SELECT sha256, ordinal, feature_total, counts FROM segments"):
        counts = dict(storecheck.decode_counts(blob))
        mtest.check(sum(counts.values()) == total, "segment %d: counts sum to %d, its total says %d" % (
            ordinal, sum(counts.values()), total))
        out[(sha, ordinal)] = counts
    return out


def check_against_numpy(path, counts):
    """The upgraded store's analysis of the earlier counts against numpy and SciPy: with
    fewer than 1,000 forms in all, every form is a feature (no tie at the cut decides which),
    so the features' totals by rank, the z-scores (sample sd) and the Cosine Delta of the
    nearest segments follow from the counts alone."""
    _, tables = storecheck.latest_analysis(path)
    ids = {(sha, ordinal): segment for segment, _, sha, ordinal, *_ in tables["segments"]}
    mtest.check(sorted(ids) == sorted(counts), "the analysis took %d of the %d stored segments" % (len(ids), len(counts)))
    keys = sorted(ids)
    columns = sorted({f for key in keys for f in counts[key]})
    mtest.check(0 < len(columns) < 1000, "%d forms: the check needs every form to be a feature" % len(columns))
    matrix = np.array([[counts[key].get(f, 0) for f in columns] for key in keys], dtype=float)
    mtest.check([row[2] for row in tables["features"]] == sorted(matrix.sum(axis=0), reverse=True),
                "the features' totals by rank differ from the counts' (numpy)")
    relative = matrix / matrix.sum(axis=1)[:, None]
    z = (relative - relative.mean(axis=0)) / relative.std(axis=0, ddof=1)
    distances = cdist(z, z, "cosine")  # Cosine Delta: the cosine distance of the z-scores
    stored = {}
    for segment, rank, neighbour, distance in tables["neighbours"]:
        stored.setdefault(segment, []).append((rank, neighbour, distance))
    for i, key in enumerate(keys):
        nearest = sorted((distances[i, j], ids[keys[j]]) for j in range(len(keys)) if j != i)
        rows = sorted(stored.get(ids[key], []))
        mtest.check(len(rows) == min(5, len(keys) - 1), "%s has %d neighbours" % (ids[key], len(rows)))
        for (rank, neighbour, distance), (want, want_id) in zip(rows, nearest):
            # (1e-9: sums in another order; a tie, another distance that near; common practice, no source)
            tied = sum(1 for other, _ in nearest if abs(other - want) <= 1e-9 * max(1.0, want)) > 1
            mtest.check(mtest.close(distance, want, rel=1e-9, abs_=1e-12) and (tied or neighbour == want_id),
                        "%s's neighbour %d is %s at %r, SciPy gives %s at %r" % (
                            ids[key], rank, neighbour, distance, want_id, want))


def check_upgrade(earlier, fixture):
    with tempfile.TemporaryDirectory() as tmp:
        old = os.path.join(tmp, "old.sqlite")
        fixture_copy(fixture, old)
        mtest.check(store_format(old) == earlier, "the fixture is not a store of format " + earlier)
        before = rows(old)
        mtest.check(len(before["segments"]) == 12 and len(before["files"]) == 1,
                    "the fixture holds %d segments of %d files; 12 letters of one file expected" % (
                        len(before["segments"]), len(before["files"])))

        # A store of this version from the same edition, for the shape and the analysis: the
        # example must still be the content the fixture read (SHA-256 by Python's hashlib).
        letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
        example_sha256 = storecheck.sha256_of(letters)
        fixture_contents = {v for r in before["files"] for v in r if isinstance(v, str)}
        mtest.check(example_sha256 in fixture_contents, "examples/ferry-letters.xml is no longer the content the fixture read")
        archive = os.path.join(tmp, "f2in")
        os.makedirs(archive)
        shutil.copy(letters, archive)
        new = os.path.join(tmp, "new.sqlite")
        mtest.run(["batch", archive, "--store", new, "--unit", "letter", "--quiet"])
        mtest.run(["analyse-store", "--store", new, "--min-tokens", "200"])

        stored_counts = earlier_counts(old)
        proc = mtest.run(["analyse-store", "--store", old, "--min-tokens", "200"])
        mtest.check("another version" in proc.stderr, "no note that the counts are another version's: " + proc.stderr)
        check_against_numpy(old, stored_counts)

        mtest.check(store_format(old) == FORMAT, "the store was not brought up to format " + FORMAT)
        db = sqlite3.connect(old)
        mtest.check(storecheck.integrity(old) == "ok", "the upgraded store fails integrity_check")
        dated = db.execute("SELECT count(*) FROM segments WHERE date IS NOT NULL OR year IS NOT NULL").fetchone()[0]
        # Format 2 dated files alone (format 3 dated letters one by one); the ferry letters,
        # one text, have no text heading of their own.
        if earlier == "2":
            mtest.check(dated == 0, "%d segments read by the earlier version have dates of their own" % dated)
        headed = db.execute("SELECT count(*) FROM segments WHERE text_title IS NOT NULL OR text_author IS NOT NULL "
                            "UNION ALL SELECT count(*) FROM readings WHERE texts_apart != 0").fetchall()
        mtest.check(headed == [(0,), (0,)], "rows read by the earlier version have text headings: %r" % headed)
        db.close()
        after = rows(old)
        for table in TABLES:
            # The earlier rows come back with the new columns NULL at the end; the runs table
            # gains the analysis just made.
            kept = [r[:len(before[table][0])] for r in after[table]] if before[table] else after[table]
            if table == "runs":
                kept = kept[:len(before[table])]
            mtest.check(kept == before[table], "%s: rows changed in the upgrade" % table)
        mtest.check(shape(old) == shape(new), "the upgraded store's tables and views %r differ from a new store's %r" % (
            shape(old), shape(new)))

        # The earlier version's counts give the same analysis as this version's reading.
        _, old_tables = storecheck.latest_analysis(old)
        _, new_tables = storecheck.latest_analysis(new)
        for table in ("features", "neighbours"):
            mtest.check(old_tables[table] == new_tables[table], "%s differ between the earlier counts and these" % table)
        # Each segment as the analysis took it, but for its path (the fixture's archive was
        # f2in/ below another folder).
        mtest.check([r[:1] + r[2:] for r in old_tables["segments"]] == [r[:1] + r[2:] for r in new_tables["segments"]],
                    "the analyses took different segments")

        # A store of the earlier format changed by hand so that the upgrade cannot run (it
        # already has a column the upgrade adds) is refused (exit 5: the store could not be
        # written) with SQLite's reason, and left as it was.
        odd = os.path.join(tmp, "odd.sqlite")
        fixture_copy(fixture, odd)
        db = sqlite3.connect(odd)
        # (a column its upgrade adds: 2 -> 3 the segments' year, 3 -> 4 their text's title)
        db.execute("ALTER TABLE segments ADD COLUMN %s" % ("year INTEGER" if earlier == "2" else "text_title TEXT"))
        db.commit()
        db.close()
        odd_before = (rows(odd), shape(odd))
        proc = mtest.run(["analyse-store", "--store", odd, "--min-tokens", "200"], check=False)
        refusal = "has format %s but cannot be brought up to format %s" % (earlier, FORMAT)
        mtest.check(proc.returncode == 5 and refusal in proc.stderr
                    and ("duplicate column name: " + ("year" if earlier == "2" else "text_title")) in proc.stderr
                    and "left unchanged" in proc.stderr,
                    "a store that cannot be upgraded: exit %d, %s" % (proc.returncode, proc.stderr))
        mtest.check((rows(odd), shape(odd)) == odd_before, "a store that could not be upgraded was changed")
        mtest.check(store_format(odd) == earlier, "a store that could not be upgraded no longer says format " + earlier)


for earlier_format, fixture_path in sorted(FIXTURES.items()):
    check_upgrade(earlier_format, fixture_path)

mtest.done()
