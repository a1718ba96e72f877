"""Archive store: which of a header's dates becomes a file's `date` and `year` (what
`--years` chooses by), on invented editions that each put the work's date somewhere else.

docs/store.md orders them, the first with a year winning: profileDesc/creation (TEI P5
2.4.1, "information about the creation of a text"), the earliest date a letter was sent
(correspAction of type sent, 2.4.6), the earliest dated event of the work in standOff
(written, print, premiere), the date of a sourceDesc bibl of type firstEdition, the first
sourceDesc date outside the bibl of a digital source, the header's first outside
publicationStmt, editionStmt and revisionDesc (which date the file: TEI P5 2.2.4, 2.2.2,
2.6). Dates are read
from att.datable's attributes (P5 13.4: @when, else a range's @notBefore or @from, then
@notAfter or @to), else from the element's text; empty dates are passed by. Each file's expected year is
given by construction and also read with lxml by tests/pylib/tei_dates.py; the store must
agree with both, and --years must take the files in range. The editions are valid TEI
(jing with tei_all, checked first).
"""
import os
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from tei_dates import TEI, work_date, work_year  # noqa: E402

WORDS = " ".join(["the ferry left the north pier at dawn and the keeper wrote it down"] * 8)


def edition(title, file_desc_dates="", source="<p>Invented.</p>", profile="", standoff="", second_source=""):
    second = "<sourceDesc>%s</sourceDesc>" % second_source if second_source else ""
    return ('<?xml version="1.0" encoding="UTF-8"?>\n'
            '<TEI xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en"><teiHeader><fileDesc>'
            '<titleStmt><title>%s</title><author>Ada Pellow</author></titleStmt>'
            '<publicationStmt><publisher>Invented test data of the manicule project</publisher>%s</publicationStmt>'
            '<sourceDesc>%s</sourceDesc>%s</fileDesc>%s</teiHeader>%s'
            '<text><body><p>%s</p></body></text></TEI>\n'
            % (title, file_desc_dates, source, second, profile, standoff, WORDS))


EDITIONS = {
    # The creation date wins over everything, its range's start taken.
    "creation": (1802, edition(
        "Ferry log with a creation date", '<date when="2024-05-01"/>',
        '<bibl type="firstEdition"><date when="1810"/></bibl>',
        '<profileDesc><creation><date notBefore="1802" notAfter="1805">1802-1805</date></creation></profileDesc>',
        '<standOff><listEvent><event type="print" when="1807"><desc/></event></listEvent></standOff>')),
    # Events: the earliest of written, print and premiere; a reading event is not the work's.
    "events": (1798, edition(
        "Ferry play with events", '<date when="2024-05-01"/>',
        '<bibl type="digitalSource"><date>2019</date><bibl type="originalSource"><date>1977</date></bibl></bibl>',
        "",
        '<standOff><listEvent><event type="reading" when="1790"><desc/></event>'
        '<event type="print" when="1801"><desc/></event>'
        '<event type="written" notBefore="1798" notAfter="1799"><desc/></event></listEvent></standOff>')),
    # The first edition over the electronic edition dated before it in sourceDesc.
    "first-edition": (1844, edition(
        "Ferry novel with a first edition", '<date when="2021-04-09"/>',
        '<bibl type="digitalSource"><date>November 19, 2011</date></bibl>'
        '<bibl type="firstEdition"><date>1844</date></bibl>')),
    # Without a first edition: the print source, not the digital one dated before it.
    "print-source": (1851, edition(
        "Ferry letters from a print source", '<date when="2021-04-09"/>',
        '<bibl type="digitalSource"><date>2000</date></bibl><bibl type="printSource"><date>1851</date></bibl>')),
    # A nested original source inside the digital one: the innermost typed bibl decides.
    "nested-source": (1977, edition(
        "Ferry play from a modern edition", '<date when="2024-05-01"/>',
        '<bibl type="digitalSource"><date>2019</date><bibl type="originalSource"><date>1977</date></bibl></bibl>')),
    # Letters: the earliest sending date, before a printed edition's in sourceDesc.
    "letters": (1848, edition(
        "Ferry letters sent over two years", '<date when="2024-05-01"/>',
        '<bibl type="printSource"><date>1902</date></bibl>',
        '<profileDesc><correspDesc><correspAction type="sent"><persName>Ada Pellow</persName>'
        '<date when="1849-11-02"/></correspAction><correspAction type="received"><persName>Kit Dunnock</persName>'
        '<date when="1847-01-01"/></correspAction></correspDesc>'
        '<correspDesc><correspAction type="sent"><persName>Ada Pellow</persName><date>May 1848</date>'
        '</correspAction></correspDesc></profileDesc>')),
    # Letters of one year not in order: the earliest date, not the first of the earliest year.
    "letters-one-year": (1876, edition(
        "Ferry letters of one summer", '<date when="2024-05-01"/>', "<p>Invented.</p>",
        '<profileDesc>' + "".join(
            '<correspDesc><correspAction type="sent"><persName>Ada Pellow</persName><date when="%s"/>'
            '</correspAction></correspDesc>' % when for when in ("1877-05-02", "1876-05-15", "1876-06-18", "1876-05-07"))
        + '</profileDesc>')),
    # The same with a time zone (XML Schema's date, as teidata.temporal.w3c allows it), and
    # a date written in words, which comes after every date of its year in that form.
    "letters-with-zones": (1876, edition(
        "Ferry letters of another summer", '<date when="2024-05-01"/>', "<p>Invented.</p>",
        '<profileDesc>' + "".join(
            '<correspDesc><correspAction type="sent"><persName>Ada Pellow</persName>%s'
            '</correspAction></correspDesc>' % date
            for date in ('<date>Whitsun 1876</date>', '<date when="1876-06-02"/>', '<date when="1876-05-20+01:00"/>'))
        + '</profileDesc>')),
    # Empty dates say nothing and are passed by: the creation's, and the first in a bibl.
    "empty-dates": (1850, edition(
        "Ferry log with empty dates", "",
        '<bibl><date/><date when="1850"/></bibl>',
        '<profileDesc><creation><date/></creation></profileDesc>')),
    # A date without a year does not hide a later source that has one.
    "no-year": (1856, edition(
        "Ferry log made in the spring", '<date when="2024-05-01"/>',
        '<bibl type="firstEdition"><date>1856</date></bibl>',
        '<profileDesc><creation><date>in the spring</date></creation></profileDesc>')),
    # A second sourceDesc (fileDesc allows several) is read as well as the first.
    "second-source": (1862, edition(
        "Ferry letters from a second source", '<date when="2020-02-29"/>',
        "<p>Transcribed from two sources.</p>", second_source='<bibl type="printSource"><date>1862</date></bibl>')),
    # Nothing but the publication date of the file itself, which dates the file, not the
    # work (TEI P5 2.2.4): no year.
    "file-only": (None, edition("Ferry notes dated only as a file", '<date when="2020-02-29"/>')),
    # No date anywhere: no year, left out by any --years.
    "undated": (None, edition("Ferry notes without a date")),
}

FULL_DATES = {"letters-one-year": "1876-05-07", "letters-with-zones": "1876-05-20+01:00"}

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    for name, (_, text) in EDITIONS.items():
        with open(os.path.join(archive, name + ".xml"), "w", encoding="utf-8") as f:
            f.write(text)
    paths = sorted(os.path.join(archive, n) for n in os.listdir(archive))
    jing = subprocess.run(["jing", mtest.SCHEMA] + paths, capture_output=True, text=True)
    mtest.check(jing.returncode == 0, "the invented editions are not valid TEI: " + jing.stdout[-2000:])
    store = os.path.join(tmp, "store.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "whole", "--quiet"])
    db = storecheck.connect(store)
    stored = {os.path.basename(p)[:-4]: (d, y) for p, d, y in db.execute("SELECT path, date, year FROM file_list")}
    db.close()
    for name, (year, _) in EDITIONS.items():
        root = etree.parse(os.path.join(archive, name + ".xml")).getroot()
        read = work_year(root, root.find(TEI + "teiHeader"))
        mtest.check(read == year, "%s: lxml reads %r, the edition was made for %r" % (name, read, year))
        mtest.check((stored[name][1] or None) == year, "%s: stored date %r, year %r; expected %r" % (
            name, stored[name][0], stored[name][1], year))

    # The full date where the edition was made for one (docs/store.md: the earliest date a
    # letter was sent), by construction and by lxml (tests/pylib/tei_dates.py).
    for name, date in FULL_DATES.items():
        root = etree.parse(os.path.join(archive, name + ".xml")).getroot()
        read = work_date(root, root.find(TEI + "teiHeader"))
        mtest.check(read == date and stored[name][0] == date, "%s: stored date %r, lxml reads %r; expected %r" % (
            name, stored[name][0], read, date))

    # --years takes the files dated in range; an undated file is in none.
    # (the files of each range by the years the editions were made for)
    undated = sum(1 for year, _ in EDITIONS.values() if year is None)
    for years, low, high in (("1795-1803", 1795, 1803), ("1840-1860", 1840, 1860), ("1861-", 1861, 9999)):
        names = {name for name, (year, _) in EDITIONS.items() if year is not None and low <= year <= high}
        proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "10", "--years", years])
        _, tables = storecheck.latest_analysis(store)
        got = {os.path.basename(row[1])[:-4] for row in tables["segments"]}
        mtest.check(got == names and len(names) >= 2, "--years %s took %r, expected %r" % (years, sorted(got), sorted(names)))
        mtest.check("%d file(s) left out by --years for want of a year" % undated in proc.stderr,
                    "--years %s does not say that the %d undated files were left out: %s" % (years, undated, proc.stderr))

mtest.done()
