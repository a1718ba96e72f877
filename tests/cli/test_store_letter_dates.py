"""Archive store: letters dated one by one, so that `--years` forms a sub-corpus of the
letters of a span even when one file holds the letters of many years.

A letter's date is where TEI P5 puts it: the date of the sent action of its own correspDesc
(2.4.6; several letters in a file point to theirs with @decls, 16.3.2), else a date in its
dateline (4.2.2, "Openers and Closers") of its own text, not of text the reader leaves out
(a sic beside its corr, a letter enclosed in a floatingText), the first with a year
winning; a text of a teiCorpus is dated by its own header. A letter without a date of its
own takes its file's. Dates are read from att.datable's attributes (13.4: @when, else
@notBefore or @from, then @notAfter or @to), else from the element's text.

The editions are invented and valid TEI (jing with tei_all, checked first). Each letter's
year is given by construction and also read with lxml below, written apart from manicule's
reader; the store's segments must agree with both, and every --years range must take the
letters whose year lies in it, in `batch --analyse` (counts just read) and in
`analyse-store` (counts read back), and two shards merged must hold the same. Last, a
store the previous version wrote of the same editions (format 2, without these columns,
its counts of an earlier reading revision, with an analysis; a fixture) is opened: it is
brought up to this version's format (4, docs/store.md) with every row kept, its analysis keeps its segments with their
file's year, and the next batch reads its files again and dates their letters. The
editions themselves are in tests/pylib/dated_letters.py, shared with that fixture.
"""
import gzip
import hashlib
import json
import os
import shutil
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from tei_dates import TEI, date_value, work_date, work_year, year_of  # noqa: E402
from dated_letters import EDITIONS, write_editions  # noqa: E402

XML_ID = "{http://www.w3.org/XML/1998/namespace}id"


def first_with_year(values):
    dated = [v for v in values if year_of(v) is not None]
    return dated[0] if dated else (values[0] if values else "")


# Where a dateline's date is not the letter's own: the side of an alternation the editor
# does not adopt (sic, orig, abbr; a rdg beside its lem: P5 3.5.1, 3.5.2, 12.1), a deletion
# (11.3.1.4), an editor's note (3.9), a postscript (4.2.2: it has its own date), or another
# text embedded in the letter (floatingText, 4.3.2).
NOT_THE_LETTERS = {TEI + n for n in ("sic", "orig", "abbr", "rdg", "rdgGrp", "del", "note", "postscript",
                                     "floatingText")}


def own_dateline_dates(unit):
    """The values of the dates in the datelines of `unit` itself, in document order."""
    out = []
    for date in unit.iter(TEI + "date"):
        between = []
        for a in date.iterancestors():
            if a is unit:
                break
            between.append(a)
        if any(a.tag == TEI + "dateline" for a in between) and not any(
                a.tag in NOT_THE_LETTERS or (a.tag == TEI + "div" and a.get("type") == "letter") for a in between):
            value = date_value(date)
            if value:
                out.append(value)
    return out


def paired(desc_list, by_id, div, position):
    """The correspDesc of a letter: the first of its @decls that names one (`by_id`: those of
    every TEI header of the file), else the default of its header, else the only, else by
    order."""
    for pointer in (div.get("decls") or "").split():
        if pointer.lstrip("#") in by_id:
            return by_id[pointer.lstrip("#")]
    defaults = [d for d in desc_list if d.get("default") == "true"]
    if defaults:
        return defaults[0]
    if len(desc_list) == 1:
        return desc_list[0]
    return desc_list[position] if position < len(desc_list) else None


def lxml_letter_dates(path):
    """(the file's year, {local id: (its own date as written or None, its year or its
    file's)} for each letter of the file), read with lxml by the rule above."""
    root = etree.parse(path).getroot()
    texts = [root] if root.tag == TEI + "TEI" else root.findall(TEI + "TEI")
    file_year = work_year(texts[0], texts[0].find(TEI + "teiHeader"))
    by_id = {d.get(XML_ID): d for t in texts for d in t.find(TEI + "teiHeader").iter(TEI + "correspDesc")}
    out = {}
    for text in texts:
        header = text.find(TEI + "teiHeader")
        descs = list(header.iter(TEI + "correspDesc"))
        divs = [d for d in text.iter(TEI + "div") if d.get("type") == "letter"]
        # A file of one letter: its body, with the only correspDesc.
        units = [(d.get(XML_ID), d, paired(descs, by_id, d, i)) for i, d in enumerate(divs)] or \
            [(text.get(XML_ID), text.find(TEI + "text"), descs[0])]
        for lid, unit, desc in units:
            sent = [v for a in desc.iter(TEI + "correspAction") if a.get("type") == "sent"
                    for v in (date_value(d) for d in a.iter(TEI + "date")) if v] if desc is not None else []
            in_dateline = own_dateline_dates(unit)
            own, from_dateline = first_with_year(sent), first_with_year(in_dateline)
            if year_of(own) is None and year_of(from_dateline) is not None:
                own = from_dateline
            # A text of a teiCorpus: its own header's date, as written, is the letter's.
            if year_of(own) is None and len(texts) > 1:
                own = work_date(text, header) or own
            year = year_of(own)
            out[lid] = (" ".join(own.split()) or None, year if year is not None else file_year)
    return file_year, out


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    expected = {}  # segment id -> year
    own_dates = {}  # segment id -> its own date as written, or None
    file_year = {}  # file name -> the year of its work (tei_dates.work_year), or None
    for path, (name, _, years) in zip(write_editions(archive), EDITIONS):
        file_year[name], read = lxml_letter_dates(path)
        mtest.check({lid: y for lid, (_, y) in read.items()} == years,
                    "%s: lxml reads %r, the edition was made for %r" % (name, read, years))
        for lid, year in years.items():
            expected[name + "#" + lid] = year
            own_dates[name + "#" + lid] = read[lid][0]
    paths = sorted(os.path.join(archive, n) for n in os.listdir(archive))
    jing = subprocess.run(["jing", mtest.SCHEMA] + paths, capture_output=True, text=True)
    mtest.check(jing.returncode == 0, "the invented editions are not valid TEI: " + jing.stdout[-2000:])

    def segment_years(store):
        db = storecheck.connect(store)
        rows = dict(db.execute("SELECT segment, year FROM segment_list"))
        db.close()
        return rows

    def analysed(store):
        _, tables = storecheck.latest_analysis(store)
        return {row[0] for row in tables["segments"]}

    def analysed_years(store, run_id=None):
        """{segment: year} of an analysis (the newest by default), as analysis_segments keeps them."""
        db = storecheck.connect(store)
        try:
            if run_id is None:
                run_id = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
            return dict(db.execute("SELECT segment, year FROM analysis_segments WHERE run_id = ?", (run_id,)))
        finally:
            db.close()

    # The segments' years in the store: own, else the file's (segment_list.year).
    store = os.path.join(tmp, "letters.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"])
    stored = segment_years(store)
    mtest.check(set(stored) == set(expected), "stored segments %r, expected %r" % (sorted(stored), sorted(expected)))
    for key, year in expected.items():
        mtest.check(stored.get(key) == year, "%s: stored year %r, expected %r" % (key, stored.get(key), year))
    # Each letter's own date as written, in the store and in `segments`.
    db = storecheck.connect(store)
    stored_dates = dict(db.execute("SELECT segment, date FROM segment_list"))
    db.close()
    mtest.check(stored_dates == own_dates, "stored dates %r, lxml reads %r" % (stored_dates, own_dates))
    listed = json.loads(mtest.run(["segments", archive, "--unit", "letter", "--format", "json"]).stdout)["segments"]
    listed_dates = {row["segment"]: row["date"] or None for row in listed}
    mtest.check(listed_dates == own_dates, "`segments` prints dates %r, lxml reads %r" % (listed_dates, own_dates))
    # Pairing by document order is said in the letter's warnings, and only there.
    by_order = {row["segment"] for row in listed if any("by document order" in w for w in row["warnings"])}
    mtest.check(by_order == {"order-letters#O1", "order-letters#O2"}, "letters warned of order pairing: %r" % by_order)

    def check_analysis(proc, store, what, want):
        """The analysis `what` ran and took the segments `want`, each with its year."""
        mtest.check(proc.returncode == 0, "%s failed: %s" % (what, proc.stderr))
        took, years = analysed(store), analysed_years(store)
        mtest.check(took == want, "%s took %r, expected %r" % (what, sorted(took), sorted(want)))
        mtest.check(years == {k: expected[k] for k in want}, "%s: analysis_segments' years %r" % (what, years))

    # --years over letters, on counts just read and on counts read back.
    for years, low, high in (("1845-1849", 1845, 1849), ("1850-1853", 1850, 1853), ("1854-", 1854, 9999),
                             ("-1850", 0, 1850)):
        want = {k for k, y in expected.items() if y is not None and low <= y <= high}
        mtest.check(len(want) >= 2, "the editions give --years %s fewer than two letters to analyse" % years)
        fresh_store = os.path.join(tmp, "fresh-%s.sqlite" % years)
        proc = mtest.run(["batch", archive, "--store", fresh_store, "--unit", "letter", "--analyse",
                          "--min-tokens", "10", "--years", years, "--quiet"], check=False)
        check_analysis(proc, fresh_store, "batch --analyse --years " + years, want)
        proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "10", "--years", years], check=False)
        check_analysis(proc, store, "analyse-store --years " + years, want)
        # The undated file, and the undated letter of a file chosen for a dated one.
        mtest.check("1 file(s) left out by --years for want of a year" in proc.stderr,
                    "--years %s: no note of the undated file: %s" % (years, proc.stderr))
        if low <= 1852 <= high:
            mtest.check("1 segment(s) left out by --years for want of a year" in proc.stderr,
                        "--years %s: no note of the undated letter: %s" % (years, proc.stderr))

    # Two shards merged hold the same dated segments as the one run (merge copies the dates).
    shards = []
    for k in (1, 2):
        shards.append(os.path.join(tmp, "shard%d.sqlite" % k))
        mtest.run(["batch", archive, "--store", shards[-1], "--unit", "letter", "--shard", "%d/2" % k, "--quiet"])
    merged = os.path.join(tmp, "merged.sqlite")
    mtest.run(["merge", merged] + shards)
    merged_tables, one_run_tables = storecheck.logical_tables(merged), storecheck.logical_tables(store)
    mtest.check(merged_tables == one_run_tables, "the merged shards differ from the one run: %s"
                % storecheck.diff_summary(merged_tables, one_run_tables))
    merged_years = segment_years(merged)
    mtest.check(merged_years == stored, "merged segments' years %r" % merged_years)

    # Spans holding no letter: the message says that the years chose nothing. 1858-1859 lies
    # outside every file's years; 1849 inside the harbour letters' (1848-1855), but none of
    # them was sent then (its received action's 1849 is not a sending).
    for years, said in (("1858-1859", "passes the filter (year=1858-1859)"), ("1849-1849", "dated in the years asked")):
        proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "10", "--years", years], check=False)
        mtest.check(proc.returncode == 4 and said in proc.stderr,
                    "--years %s (no letter) gave %d: %s" % (years, proc.returncode, proc.stderr))

    # A store of format 2, as the version before letters were dated wrote it (manicule at
    # be093e5, over these editions in a folder "archive", with an analysis; kept in
    # tests/fixtures/stores, see the README there), is brought up to this version's format
    # (4) when opened, keeping every row.
    old = os.path.join(tmp, "format2.sqlite")
    with gzip.open(os.path.join(mtest.FIXTURES, "stores", "dated-letters-format2.sqlite.gz")) as src, \
            open(old, "wb") as dst:
        shutil.copyfileobj(src, dst)
    db = sqlite3.connect(old)
    mtest.check(db.execute("SELECT value FROM store_info WHERE key = 'format'").fetchone()[0] == "2",
                "the fixture is not a store of format 2")
    # Its files are these editions, under the same relative paths (SHA-256 by hashlib).
    written = {}
    for name, _, _ in EDITIONS:
        with open(os.path.join(archive, name + ".xml"), "rb") as f:
            written["archive/%s.xml" % name] = hashlib.sha256(f.read()).hexdigest()
    mtest.check(dict(db.execute("SELECT path, sha256 FROM files")) == written,
                "the fixture's files are no longer the editions of tests/pylib/dated_letters.py")
    earlier_analysis = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis'").fetchone()[0]
    mtest.check(earlier_analysis is not None, "the fixture holds no analysis")
    before = {t: db.execute("SELECT count(*) FROM %s" % t).fetchone()[0] for t in ("files", "readings", "segments")}
    db.close()
    db = sqlite3.connect(store)
    fresh_columns = {t: [r[1] for r in db.execute("PRAGMA table_info(%s)" % t)]
                     for t in ("segments", "readings", "analysis_segments")}
    db.close()
    mtest.run(["analyse-store", "--store", old, "--min-tokens", "10"])
    # The analysis made before keeps its rows, its segments given their file's year (format
    # 2 dated files only): lxml's year of each file's work (tests/pylib/tei_dates.py).
    got = analysed_years(old, earlier_analysis)
    mtest.check(got == {k: file_year[k.split("#")[0]] for k in got} and len(got) > 0,
                "the reused analysis' years after the upgrade %r, the files' %r" % (got, file_year))
    db = sqlite3.connect(old)
    mtest.check(db.execute("SELECT value FROM store_info WHERE key = 'format'").fetchone()[0] == "4",
                "a format-2 store was not brought up to format 4")
    after = {t: db.execute("SELECT count(*) FROM %s" % t).fetchone()[0] for t in ("files", "readings", "segments")}
    mtest.check(after == before, "rows before %r and after the upgrade %r" % (before, after))
    for table, columns in fresh_columns.items():
        got = [r[1] for r in db.execute("PRAGMA table_info(%s)" % table)]
        mtest.check(sorted(got) == sorted(columns), "%s after the upgrade has %r, a new store %r" % (table, got, columns))
    mtest.check("year" in [r[1] for r in db.execute("PRAGMA table_info(segment_list)")],
                "the upgraded store's segment_list has no year")
    db.close()
    # Its counts were read by an earlier revision (another settings key): batch reads every
    # file again once, and the letters are then dated one by one.
    mtest.run(["batch", "archive", "--store", old, "--unit", "letter", "--quiet"], cwd=tmp)
    files_read = storecheck.last_run(old)["files_read"]
    mtest.check(files_read == len(EDITIONS),
                "batch after the upgrade read %r files, expected %d" % (files_read, len(EDITIONS)))
    mtest.run(["analyse-store", "--store", old, "--min-tokens", "10", "--years", "1850-1853"])
    want = {k for k, y in expected.items() if y is not None and 1850 <= y <= 1853}
    took = analysed(old)
    mtest.check(took == want, "the upgraded store's --years 1850-1853 took %r" % sorted(took))

mtest.done()
