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
store of the previous format (2, without these columns, its counts of an earlier reading
revision) is opened: it is brought up to format 3 with every row kept, and the next batch
reads its files again and dates their letters.
"""
import json
import os
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from tei_dates import TEI, date_value, work_year, year_of  # noqa: E402

WORDS = " ".join(["the ferry crossed at the turn of the tide and the keeper wrote it down"] * 3)
HEADER = ('<titleStmt><title>%s</title><author>Tamsin Corbel</author></titleStmt>'
          '<publicationStmt><p>Invented test data of the manicule project; CC0.</p></publicationStmt>'
          '<sourceDesc><p>No source: invented.</p></sourceDesc>')


def corresp(cd_id, sent_date="", received_date="", default=False):
    """A correspDesc with a sent action (Tamsin Corbel) holding `sent_date` (a date element)."""
    received = ('<correspAction type="received"><persName>Ned Quill</persName>%s</correspAction>' % received_date
                if received_date else "")
    return ('<correspDesc xml:id="%s"%s><correspAction type="sent"><persName ref="#tc">Tamsin Corbel</persName>%s'
            '</correspAction>%s</correspDesc>' % (cd_id, ' default="true"' if default else "", sent_date, received))


def letter(lid, dateline="", decls=True, after=""):
    opener = '<opener><dateline>Quillmouth%s</dateline></opener>' % (", " + dateline if dateline else "")
    pointer = ' decls="%s"' % (decls if isinstance(decls, str) else "#cd-" + lid) if decls else ""
    return '<div type="letter" xml:id="%s"%s>%s<p>%s</p>%s</div>' % (lid, pointer, opener, WORDS, after)


def tei(title, correspondence, body, lang=' xml:lang="en"'):
    return ('<TEI xmlns="http://www.tei-c.org/ns/1.0"%s><teiHeader><fileDesc>%s</fileDesc>'
            '<profileDesc>%s<particDesc><listPerson><person xml:id="tc"><persName>Tamsin Corbel</persName>'
            '</person></listPerson></particDesc></profileDesc></teiHeader><text><body>%s</body></text></TEI>'
            % (lang, HEADER % title, correspondence, body))


XML = '<?xml version="1.0" encoding="UTF-8"?>\n'
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"

# (file name, text, {segment id: year by construction, None for none})
EDITIONS = [
    # Six letters in one file over seven years; the file is dated by its earliest sending (1848).
    ("harbour-letters", XML + tei(
        "Letters from the harbour office",
        corresp("cd-H1", '<date when="1848-04-02"/>', '<date when="1849-01-20"/>')  # received: not the sending
        + corresp("cd-H2", '<date notBefore="1850-01-01" notAfter="1850-06-30">early 1850</date>')
        + corresp("cd-H3", "<date>Michaelmas 1851</date>")
        + corresp("cd-H4")  # no date in its sent action: its dateline dates it
        + corresp("cd-H5", "<date>Tuesday</date>")  # no year: the dateline's year wins
        + corresp("cd-H6")  # no date anywhere: the file's
        + corresp("cd-H7") + corresp("cd-H8"),
        letter("H1") + letter("H2") + letter("H3")
        + letter("H4", '<date when="1853-02-11">11 February 1853</date>')
        + letter("H5", "<date>the 3rd of May, 1855</date>") + letter("H6")
        # The editor's correction dates it, not the error it corrects (3.5.1).
        + letter("H7", '<choice><sic><date when="1805-06-01">1 June 1805</date></sic>'
                       '<corr><date when="1852-06-01">1 June 1852</date></corr></choice>')
        # A letter it encloses (floatingText, 4.3.2) has its own date; this one's is in its closer.
        + letter("H8", after='<floatingText><body><opener><dateline><date when="1790-01-01">New Year 1790</date>'
                             '</dateline></opener><p>%s</p></body></floatingText>'
                             '<closer><dateline><date when="1852-10-10">10 October 1852</date></dateline></closer>'
                             % WORDS)),
     {"H1": 1848, "H2": 1850, "H3": 1851, "H4": 1853, "H5": 1855, "H6": 1848, "H7": 1852, "H8": 1852}),
    # Letters without @decls take the default correspDesc (2.4.6).
    ("default-letters", XML + tei(
        "Letters under one default correspDesc",
        corresp("cd-X", '<date when="1854-03-01"/>', default=True) + corresp("cd-Y", '<date when="1849-01-01"/>'),
        letter("X1", decls=False) + letter("X2", decls=False)),
     {"X1": 1854, "X2": 1854}),
    # Neither @decls nor a default: letters pair with the correspDescs in document order.
    ("order-letters", XML + tei(
        "Letters paired by their order",
        corresp("cd-O1", '<date when="1847-02-02"/>') + corresp("cd-O2", '<date when="1856-07-07"/>'),
        letter("O1", decls=False) + letter("O2", decls=False)),
     {"O1": 1847, "O2": 1856}),
    # @decls pointing at two declarations, the langUsage first: the correspDesc pairs.
    ("two-declarations", XML + tei(
        "A letter declaring its language and its correspondence",
        '<langUsage xml:id="lu-M"><language ident="en">English</language></langUsage>'
        + corresp("cd-M0", '<date when="1845-01-01"/>') + corresp("cd-M1", '<date when="1853-05-05"/>'),
        letter("M1", decls="#lu-M #cd-M1")),
     {"M1": 1853}),
    # Letters dated only in their datelines; the file has no year, so the undated one has none.
    ("dateline-letters", XML + tei(
        "Letters dated in their openers",
        corresp("cd-D1") + corresp("cd-D2"),
        letter("D1", '<date when="1852-08-30">30 August 1852</date>') + letter("D2")),
     {"D1": 1852, "D2": None}),
    # One letter, one file: the body is the letter, dated by the file's only correspDesc.
    ("single-letter", XML + tei(
        "A single letter", corresp("cd-S", '<date when="1860-12-24"/>'), "<p>%s</p>" % WORDS,
        ' xml:id="S1" xml:lang="en"'),
     {"S1": 1860}),
    # A packet of two letters as a teiCorpus, each TEI with its own header and date.
    ("packet", XML + '<teiCorpus xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en"><teiHeader><fileDesc>'
     + HEADER % "A packet of two letters" + '</fileDesc></teiHeader>'
     + tei("First of the packet", corresp("cd-P1", '<date when="1846-05-01"/>'), "<p>%s</p>" % WORDS,
           ' xml:id="P1"').replace(' xmlns="http://www.tei-c.org/ns/1.0"', "")
     + tei("Second of the packet", corresp("cd-P2", '<date when="1857-09-09"/>'), "<p>%s</p>" % WORDS,
           ' xml:id="P2"').replace(' xmlns="http://www.tei-c.org/ns/1.0"', "")
     .replace('"tc"', '"tc2"').replace('"#tc"', '"#tc2"')  # ids are unique in the whole file
     # A third text, without a correspDesc of its own, whose letter points at the second's.
     + tei("Third of the packet", "", letter("P3a", decls="#cd-P2"), ' xml:id="P3"')
     .replace(' xmlns="http://www.tei-c.org/ns/1.0"', "").replace('"tc"', '"tc3"')
     + "</teiCorpus>\n",
     {"P1": 1846, "P2": 1857, "P3a": 1857}),
    # No date anywhere: the file is left out by any --years.
    ("undated-letters", XML + tei("Undated letters", corresp("cd-U1") + corresp("cd-U2"), letter("U1") + letter("U2")),
     {"U1": None, "U2": None}),
]


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
    """{local id: (its own date as written or None, its year or its file's)} for each letter
    of the file, read with lxml by the rule above."""
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
            year = year_of(own)
            if year is None and len(texts) > 1:
                year = work_year(text, header)
            out[lid] = (" ".join(own.split()) or None, year if year is not None else file_year)
    return out


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    expected = {}  # segment id -> year
    own_dates = {}  # segment id -> its own date as written, or None
    for name, text, years in EDITIONS:
        path = os.path.join(archive, name + ".xml")
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
        read = lxml_letter_dates(path)
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

    # A store of format 2 (as written before letters were dated: no date columns) is
    # brought up to format 3 when opened, keeping every row. Format 2's shape is made
    # from this one with SQLite's own ALTER TABLE ... DROP COLUMN.
    old = os.path.join(tmp, "format2.sqlite")
    mtest.run(["batch", archive, "--store", old, "--unit", "letter", "--quiet"])
    mtest.run(["analyse-store", "--store", old, "--min-tokens", "10"])
    db = sqlite3.connect(old)
    earlier_analysis = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis'").fetchone()[0]
    fresh_columns = {t: [r[1] for r in db.execute("PRAGMA table_info(%s)" % t)]
                     for t in ("segments", "readings", "analysis_segments")}
    db.executescript("""
        DROP VIEW segment_list;
        ALTER TABLE segments DROP COLUMN date;
        ALTER TABLE segments DROP COLUMN year;
        ALTER TABLE readings DROP COLUMN first_segment_year;
        ALTER TABLE readings DROP COLUMN last_segment_year;
        ALTER TABLE analysis_segments DROP COLUMN year;
        CREATE VIEW segment_list AS SELECT s.settings_id, f.path FROM files f JOIN segments s ON s.sha256 = f.sha256;
        UPDATE store_info SET value = '2' WHERE key = 'format';
        UPDATE settings SET key = key || '-of-reading-revision-2';
    """)
    before = {t: db.execute("SELECT count(*) FROM %s" % t).fetchone()[0] for t in ("files", "readings", "segments")}
    db.close()
    mtest.run(["analyse-store", "--store", old, "--min-tokens", "10"])
    # The analysis made before keeps its rows, its segments given their file's year (format
    # 2 dated files only): lxml's year of each file's work (tests/pylib/tei_dates.py).
    file_year = {}
    for name, _, _ in EDITIONS:
        root = etree.parse(os.path.join(archive, name + ".xml")).getroot()
        first = root if root.tag == TEI + "TEI" else root.find(TEI + "TEI")
        file_year[name] = work_year(first, first.find(TEI + "teiHeader"))
    got = analysed_years(old, earlier_analysis)
    mtest.check(got == {k: file_year[k.split("#")[0]] for k in got} and len(got) > 0,
                "the reused analysis' years after the upgrade %r, the files' %r" % (got, file_year))
    db = sqlite3.connect(old)
    mtest.check(db.execute("SELECT value FROM store_info WHERE key = 'format'").fetchone()[0] == "3",
                "a format-2 store was not brought up to format 3")
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
    mtest.run(["batch", archive, "--store", old, "--unit", "letter", "--quiet"])
    files_read = storecheck.last_run(old)["files_read"]
    mtest.check(files_read == len(EDITIONS),
                "batch after the upgrade read %r files, expected %d" % (files_read, len(EDITIONS)))
    mtest.run(["analyse-store", "--store", old, "--min-tokens", "10", "--years", "1850-1853"])
    want = {k for k, y in expected.items() if y is not None and 1850 <= y <= 1853}
    took = analysed(old)
    mtest.check(took == want, "the upgraded store's --years 1850-1853 took %r" % sorted(took))

mtest.done()
