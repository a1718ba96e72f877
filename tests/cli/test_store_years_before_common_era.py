"""Archive store: `--years` over works dated before the common era.

An edition of ancient texts dates them as TEI does, with XML Schema's dates (TEI P5 13.4,
att.datable.w3c: @when is an xsd date or gYear): a year before the common era is written
with a minus, "-0450" for 450 BCE (XML Schema 1.0 Part 2, 3.2.7: no year 0000, "-0001" is
the year before "0001"). `--years` writes those years with BCE ("450BCE-400BCE",
docs/store.md). Each file's year is read here with lxml and a regular expression written
from that rule, apart from manicule's reader, and every range must take exactly the files
whose year lies in it (also for dates in ISO 8601, @when-iso, whose years before the
common era count from a year 0: ISO 8601:2004, 3.2.1 and 4.1.2.4, cited from memory); a range's bounds out of order, a year 0, and an upper bound alone
below 1000 without its era ("-0044", the header's own spelling of 44 BCE), are usage errors.

The editions are invented (the harbour hymns of old Quillmouth) and valid TEI (jing with
tei_all, checked first).
"""
import os
import re
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import jing_errors  # noqa: E402
from tei_dates import signed_year  # noqa: E402

TEI = "{http://www.tei-c.org/ns/1.0}"
WORDS = " ".join(["the hymn of the harbour was sung when the boats came home across the bar"] * 4)

# (file stem, the creation date's attribute="value", or None for an undated work); two in
# ISO 8601 (att.datable.iso), whose years before the common era count from a year 0.
WORKS = [("hymn-of-the-bar", 'when="-0450"'), ("hymn-of-the-nets", 'when="-0420-05"'),
         ("lament-for-the-pier", 'when="-0044-03-15"'), ("lament-for-the-oars", 'when-iso="-0043-03"'),
         ("dirge-for-the-bell", 'when-iso="-0043/-0040"'),
         ("ode-to-the-ferry", 'when="0014"'), ("ode-to-the-lamp", 'notBefore-iso="+0000"'),
         ("song-of-the-tide", 'when="0212"'), ("undated-fragment", None)]


def edition(stem, when):
    creation = '<profileDesc><creation><date %s/></creation></profileDesc>' % when if when else ""
    return ('<?xml version="1.0" encoding="UTF-8"?>\n<TEI xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en">'
            '<teiHeader><fileDesc><titleStmt><title>%s</title><author>A harbour poet</author></titleStmt>'
            '<publicationStmt><p>Invented test data of the manicule project; CC0.</p></publicationStmt>'
            '<sourceDesc><p>No source: invented.</p></sourceDesc></fileDesc>%s</teiHeader>'
            '<text><body><p>%s</p></body></text></TEI>\n' % (stem.replace("-", " "), creation, WORDS))


def iso_year(value):
    """The year of an ISO 8601 date, as a year of the common era or (negative) before it:
    ISO 8601 numbers years astronomically, 0000 being 1 BCE and -0043 44 BCE; an expanded
    year may carry a plus ("+0000")."""
    match = re.match(r"([-+]?)(\d{4,})", value or "")
    if not match:
        return None
    number = int(match.group(2))
    return -(number + 1) if match.group(1) == "-" or number == 0 else number


tmp = mtest.scratch_folder()
archive = os.path.join(tmp, "hymns")
os.makedirs(archive)
for stem, when in WORKS:
    with open(os.path.join(archive, stem + ".xml"), "w", encoding="utf-8") as f:
        f.write(edition(stem, when))

# The editions are valid TEI (tei_all.rng, TEI P5 4.12.0), dates before the common era included.
errors = jing_errors(mtest.SCHEMA, sorted(os.path.join(archive, n) for n in os.listdir(archive)))
mtest.check(not any(errors.values()), "the invented editions are not valid TEI: %s" % errors)

# Each file's year, read with lxml from its creation date (reference: XML Schema 1.0's years).
year_of_file = {}
for stem, _ in WORKS:
    root = etree.parse(os.path.join(archive, stem + ".xml")).getroot()
    dates = root.findall(".//%screation/%sdate" % (TEI, TEI))
    if not dates:
        year_of_file[stem + ".xml"] = None
    elif dates[0].get("when"):
        year_of_file[stem + ".xml"] = signed_year(dates[0].get("when"))
    else:
        year_of_file[stem + ".xml"] = iso_year(dates[0].get("when-iso") or dates[0].get("notBefore-iso"))
mtest.check(year_of_file["hymn-of-the-bar.xml"] == -450 and year_of_file["lament-for-the-oars.xml"] == -44
            and year_of_file["ode-to-the-lamp.xml"] == -1 and year_of_file["undated-fragment.xml"] is None,
            "the reference reading of the dates is wrong: %r" % year_of_file)

store = os.path.join(tmp, "hymns.sqlite")
mtest.run(["batch", archive, "--store", store, "--unit", "whole", "--quiet"])
stored = {os.path.basename(path): year for path, year in storecheck.rows(store, "SELECT path, year FROM file_list")}
mtest.check(stored == year_of_file, "stored years %r, lxml reads %r" % (stored, year_of_file))
# An ISO interval is two dates, each in XML Schema 1.0's years as the store keeps dates.
interval = storecheck.rows(store, "SELECT date FROM file_list WHERE path LIKE '%dirge-for-the-bell.xml'")[0][0]
want = "/".join("-%04d" % -iso_year(half) for half in "-0043/-0040".split("/"))
mtest.check(interval == want, "the ISO interval is stored as %r, expected %r" % (interval, want))


def analysed_files(years):
    proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "10", "--years", years], check=False)
    if proc.returncode != 0:
        return proc, None
    _, tables = storecheck.latest_analysis(store)
    return proc, {os.path.basename(row[1]) for row in tables["segments"]}


# (--years as given, the range it means in signed years; None: no bound)
RANGES = [("450BCE-400BCE", -450, -400), ("44BCE-14", -44, 14), ("-44BCE", None, -44), ("420BCE-", -420, None),
          ("44 bc", -44, -44), ("1BCE-300CE", -1, 300), ("14AD-", 14, None), ("-100CE", None, 100), ("-1000", None, 1000)]
for years, low, high in RANGES:
    want = {name for name, year in year_of_file.items()
            if year is not None and (low is None or year >= low) and (high is None or year <= high)}
    proc, took = analysed_files(years)
    if len(want) < 2:  # an analysis needs two segments: the message says the years chose too few
        # (one segment a file with --unit whole, all of them long enough: not "lower --min-tokens")
        mtest.check(proc.returncode == 4 and "hold %d segment(s) of this unit: widen the filter" % len(want)
                    in proc.stderr, "--years %s (%d file) gave %d: %s" % (years, len(want), proc.returncode,
                                                                         proc.stderr))
        continue
    mtest.check(proc.returncode == 0, "--years %s failed: %s" % (years, proc.stderr))
    mtest.check(took == want, "--years %s took %r, the dates read with lxml give %r" % (years, sorted(took), sorted(want)))
    # The undated fragment is said to be left out for want of a year (docs/store.md).
    mtest.check("1 file(s) left out by --years for want of a year" in proc.stderr,
                "--years %s: no note of the undated file: %s" % (years, proc.stderr))

# Out of order (450 BCE comes before 400 BCE); a year 0, which neither calendar has; and an
# early year as an upper bound alone without its era: "-0044" is how a header writes 44 BCE.
for years in ("400BCE-450BCE", "0-14", "0BCE-14", "14-0", "-0044", " -0044", "-44", "-999"):
    proc = mtest.run(["analyse-store", "--store", store, "--years", years], check=False)
    mtest.check(proc.returncode == 2 and "--years" in proc.stderr,
                "--years %s: exit %d, %s" % (years, proc.returncode, proc.stderr))
# The era written once, after both years: each year takes its own, which the message says.
proc = mtest.run(["analyse-store", "--store", store, "--years", "450-400BCE"], check=False)
mtest.check(proc.returncode == 2 and "450BCE-400BCE" in proc.stderr, "--years 450-400BCE: %s" % proc.stderr)

# A file of several texts each dated by its own header (a teiCorpus): readings keeps the span
# of its texts' years (docs/store.md, first_segment_year and last_segment_year), read here
# with lxml by the XML Schema rule, both before the common era.
corpus_folder = os.path.join(tmp, "corpus")
os.makedirs(corpus_folder)
texts = [edition(stem, when).split("\n", 1)[1] for stem, when in (("hymn-of-the-bar", 'when="-0050"'),
                                                                  ("hymn-of-the-nets", 'when="-0040"'))]
with open(os.path.join(corpus_folder, "two-hymns.xml"), "w", encoding="utf-8") as f:
    f.write('<?xml version="1.0" encoding="UTF-8"?>\n<teiCorpus xmlns="http://www.tei-c.org/ns/1.0">'
            '<teiHeader><fileDesc><titleStmt><title>Two hymns</title></titleStmt><publicationStmt><p>Invented test '
            'data of the manicule project; CC0.</p></publicationStmt><sourceDesc><p>No source: invented.</p>'
            '</sourceDesc></fileDesc></teiHeader>%s</teiCorpus>\n' % "".join(texts))
errors = jing_errors(mtest.SCHEMA, [os.path.join(corpus_folder, "two-hymns.xml")])
mtest.check(not any(errors.values()), "the invented teiCorpus is not valid TEI: %s" % errors)
root = etree.parse(os.path.join(corpus_folder, "two-hymns.xml")).getroot()
text_years = [signed_year(d.get("when")) for d in root.iter(TEI + "date")]
corpus_store = os.path.join(tmp, "corpus.sqlite")
mtest.run(["batch", corpus_folder, "--store", corpus_store, "--unit", "whole", "--quiet"])
span = storecheck.rows(corpus_store, "SELECT first_segment_year, last_segment_year FROM readings")
mtest.check(span == [(min(text_years), max(text_years))], "stored span of the texts' years %r, lxml reads %r"
            % (span, text_years))

mtest.done()
