"""Archive store: the header metadata that sub-corpora are chosen by, on the real corpora.

- Years. A novel's stored year must be its first edition's as the ELTeC project's own
  metadata gives it (eltec-eng-metadata.tsv, column first-edition, else reference-year;
  CC BY 4.0, an open dataset beside the corpus), not the year of the electronic edition
  its header also dates. A play's must be the work's as read here with lxml by the order
  of docs/store.md (tests/pylib/tei_dates.py): the plays date the work by events in their
  standOff (written, print, premiere), and the edition they were taken from in sourceDesc.
  Then `--years` on the plays takes exactly the files lxml dates in the range.
- Languages. One language spelt in each of its ISO 639 codes, as Debian's iso-codes lists
  them (iso_639-2.json: alpha_2, alpha_3 and the bibliographic code), must choose the same
  segments; the plays say their language by xml:lang ("de") and a copy of two of them
  only by langUsage ("ger"), the novels by xml:lang ("en") and langUsage ("eng", "en").
  A range holds the tags that extend it (RFC 4647 3.3.1): "en-GB" holds no file tagged "en".
  A file without a segment of the unit keeps its TEI element's xml:lang, else its
  langUsage's language (TEI P5 1.3.1.1.2 and 2.4.2, as tei-conventions.md section 4 orders
  them: xml:lang, and langUsage only where there is no value at all).
- Letter case in any script. `--author` and `--title` with a name in capitals other than
  ASCII ("ÖDÖN", "*R?UBER*") choose the files whose header Python's str.casefold and
  fnmatch.fnmatchcase choose (the patterns hold no character whose full and simple case
  foldings differ, such as ß). `--author "George Eliot"` finds ELTeC's "Eliot, George".
"""
import csv
import fnmatch
import glob
import json
import os
import re
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from tei_dates import TEI, work_year, year_of, date_value  # noqa: E402

ISO_639_2 = "/usr/share/iso-codes/json/iso_639-2.json"
PLAYS = os.path.join(mtest.CORPORA, "gerdracor")
NOVELS = os.path.join(mtest.CORPORA, "eltec-eng")
if not (os.path.isdir(PLAYS) and os.path.isdir(NOVELS)):
    print("SKIP: the corpora are not at %s" % mtest.CORPORA)
    sys.exit(77)


def stored(store, column):
    """{path: the store's `column` of file_list} (title, author, year, language)."""
    db = storecheck.connect(store)
    values = dict(db.execute("SELECT path, %s FROM file_list" % column))
    db.close()
    return values


def files_with_segments(store, min_tokens):
    """The stored files holding a segment of at least `min_tokens` words."""
    db = storecheck.connect(store)
    paths = {p for (p,) in db.execute("SELECT DISTINCT f.path FROM files f JOIN segments s ON s.sha256 = f.sha256 "
                                      "WHERE s.tokens >= ?", (min_tokens,))}
    db.close()
    return paths


def analysed_files(store, args, min_tokens="1"):
    """The files an analysis takes segments from; empty when it finds nothing (exit 4)."""
    proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", min_tokens] + args, check=False)
    if proc.returncode == 4:
        return set(), proc.stderr
    mtest.check(proc.returncode == 0, "analyse-store %r exited %d: %s" % (args, proc.returncode, proc.stderr))
    _, tables = storecheck.latest_analysis(store)
    return {row[1] for row in tables["segments"]}, proc.stderr


with tempfile.TemporaryDirectory() as tmp:
    # Years of the novels against ELTeC's metadata.
    novels = os.path.join(tmp, "novels.sqlite")
    mtest.run(["batch", NOVELS, "--store", novels, "--unit", "chapter", "--quiet"])
    years = {os.path.splitext(os.path.basename(p))[0]: y for p, y in stored(novels, "year").items()}
    with open(os.path.join(mtest.CORPORA, "eltec-eng-metadata.tsv"), newline="", encoding="utf-8") as f:
        metadata = {row["filename"]: row for row in csv.DictReader(f, delimiter="\t")}
    expected = {}
    for stem in years:
        row = metadata[stem]
        expected[stem] = int(row["first-edition"] if row["first-edition"] != "NA" else row["reference-year"])
    wrong = {s: (years[s], expected[s]) for s in years if years[s] != expected[s]}
    mtest.check(len(years) == 93 and not wrong,
                "%d of %d novels stored with another year than ELTeC's first edition: %r" % (len(wrong), len(years), wrong))

    # Years of the plays against lxml; the edition's year would differ for many.
    plays = os.path.join(tmp, "plays.sqlite")
    mtest.run(["batch", PLAYS, "--store", plays, "--unit", "speaker", "--quiet"])
    stored_year = stored(plays, "year")
    lxml_years, edition_years = {}, {}
    for path in sorted(glob.glob(os.path.join(PLAYS, "*.xml"))):
        root = etree.parse(path).getroot()
        header = root.find(TEI + "teiHeader")
        lxml_years[path] = work_year(root, header)
        source = header.find("%sfileDesc/%ssourceDesc" % (TEI, TEI))
        first = next(source.iter(TEI + "date"), None) if source is not None else None
        edition_years[path] = year_of(date_value(first)) if first is not None else None
    wrong = {os.path.basename(p): (stored_year[p], lxml_years[p]) for p in lxml_years if (stored_year[p] or None) != lxml_years[p]}
    mtest.check(len(stored_year) == len(lxml_years) == 773 and not wrong,
                "%d plays stored with another year than lxml reads: %r" % (len(wrong), dict(list(wrong.items())[:10])))
    later_editions = sum(1 for p in lxml_years if edition_years[p] and lxml_years[p] and edition_years[p] > lxml_years[p])
    mtest.check(later_editions >= 100, "only %d plays date their source edition after the work: the check "
                "above would not tell the two apart" % later_editions)
    # e.g. Scheerbart's "Der Regierungswechsel": printed 1897, taken from an edition of 1977.
    mtest.check(stored_year[os.path.join(PLAYS, "scheerbart-der-regierungswechsel.xml")] == 1897,
                "Der Regierungswechsel is not dated 1897")

    with_segments = files_with_segments(plays, 1500)
    got, _ = analysed_files(plays, ["--years", "1890-1900"], "1500")
    want = {p for p, y in lxml_years.items() if y and 1890 <= y <= 1900} & with_segments
    mtest.check(len(want) >= 20 and got == want, "--years 1890-1900: %d files analysed, lxml dates %d in range: %r" % (
        len(got), len(want), sorted(os.path.basename(p) for p in got ^ want)[:10]))

    # Letter case in any script, on the plays' authors and titles.
    titles, authors = stored(plays, "title"), stored(plays, "author")
    with_any = files_with_segments(plays, 1)
    for args, keep in [
        (["--author", "ÖDÖN"], lambda p: "ödön" in authors[p].casefold()),
        (["--author", "HORVÁTH"], lambda p: "horváth" in authors[p].casefold()),
        (["--title", "*R?UBER*"], lambda p: fnmatch.fnmatchcase(titles[p].casefold(), "*r?uber*")),
        (["--title", "*KÄTHCHEN*"], lambda p: fnmatch.fnmatchcase(titles[p].casefold(), "*käthchen*")),
        (["--title", "die j?ger"], lambda p: fnmatch.fnmatchcase(titles[p].casefold(), "die j?ger")),
    ]:
        want = {p for p in titles if keep(p)} & with_any
        got, stderr = analysed_files(plays, args)
        mtest.check(len(want) >= 1 and got == want, "%r: analysed %r, Python's case folding gives %r (%s)" % (
            args, sorted(map(os.path.basename, got)), sorted(map(os.path.basename, want)), stderr.strip()))

    # Inverted names: each word of --author, in any order, as Python finds them.
    novel_authors = stored(novels, "author")
    got, stderr = analysed_files(novels, ["--author", "George Eliot"])
    want = {p for p, a in novel_authors.items() if all(w in a.casefold() for w in ("george", "eliot"))}
    mtest.check(len(want) >= 2 and got == want, "--author 'George Eliot': analysed %r, Python finds %r (%s)" % (
        sorted(map(os.path.basename, got)), sorted(map(os.path.basename, want)), stderr.strip()))
    # The words must all be in one author's name: of the plays' joint authors
    # ("Arno Holz; Johannes Schlaf"), "Holz Arno" finds them and "Arno Schlaf" does not.
    for words in (["Holz", "Arno"], ["Arno", "Schlaf"]):
        got, stderr = analysed_files(plays, ["--author", " ".join(words)])
        want = {p for p in authors if any(all(w.casefold() in a.casefold() for w in words)
                                          for a in authors[p].split("; "))} & with_any
        mtest.check(got == want and (len(want) >= 1) == (words[1] == "Arno"),
                    "--author %r: analysed %r, Python finds %r" % (" ".join(words), sorted(map(os.path.basename, got)),
                                                                  sorted(map(os.path.basename, want))))
    # A title pattern matches whole titles; the refusal says how to find a word inside one.
    proc = mtest.run(["analyse-store", "--store", novels, "--title", "Middlemarch"], check=False)
    mtest.check(proc.returncode == 4 and "'*Middlemarch*'" in proc.stderr,
                "--title Middlemarch: exit %d, %s" % (proc.returncode, proc.stderr))

    # Languages: five plays and four novels, two more plays saying their language only by
    # langUsage in ISO 639-2's bibliographic code.
    archive = os.path.join(tmp, "mixed")
    os.makedirs(archive)
    picked_plays = storecheck.pick_plays(7, 60000, 200000)
    for name in picked_plays[:5]:
        shutil.copy(os.path.join(PLAYS, name), archive)
    stripped = []
    for name in picked_plays[5:]:
        text = open(os.path.join(PLAYS, name), encoding="utf-8").read()
        text, n = re.subn(r'(<TEI\b[^>]*?)\s+xml:lang="de"', r"\1", text, count=1)
        # The plays declare no langUsage: one goes first in profileDesc (whose parts may come
        # in any order, TEI P5 2.4).
        text, m = re.subn(r"<profileDesc>", '<profileDesc><langUsage><language ident="ger">Deutsch</language>'
                          "</langUsage>", text, count=1)
        mtest.check(n == 1 and m >= 1 and ' xml:lang="de"' not in text,
                    "%s: could not make a copy declaring German only by langUsage" % name)
        copy = os.path.join(archive, "langusage-" + name)
        with open(copy, "w", encoding="utf-8") as f:
            f.write(text)
        stripped.append(copy)
    novel_names = sorted(os.listdir(NOVELS))[:4]
    for name in novel_names:
        shutil.copy(os.path.join(NOVELS, name), archive)
    mixed = os.path.join(tmp, "mixed.sqlite")
    mtest.run(["batch", archive, "--store", mixed, "--unit", "whole", "--quiet"])
    declared = stored(mixed, "language")
    mtest.check(all(declared[p] == "ger" for p in stripped), "the copies' declared language: %r" %
                {os.path.basename(p): declared[p] for p in stripped})
    german = {p for p in declared if os.path.basename(p) in picked_plays[:5]} | set(stripped)
    english = {p for p in declared if os.path.basename(p) in novel_names}
    with open(ISO_639_2, encoding="utf-8") as f:
        iso = {e["alpha_2"]: e for e in json.load(f)["639-2"] if "alpha_2" in e}
    for alpha_2, files in (("de", german), ("en", english)):
        entry = iso[alpha_2]
        codes = [entry[k] for k in ("alpha_2", "alpha_3", "bibliographic") if k in entry]
        mtest.check(len(codes) >= 2, "iso-codes gives %r for %s" % (codes, alpha_2))
        for code in codes + [alpha_2.upper()]:
            got, stderr = analysed_files(mixed, ["--language", code], "1500")
            mtest.check(got == files, "--language %s (%s): analysed %r, expected %r (%s)" % (
                code, entry["name"], sorted(map(os.path.basename, got)), sorted(map(os.path.basename, files)),
                stderr.strip()))
    # A file without a segment of the unit (no letters in plays and novels) still has its
    # language: its TEI element's xml:lang, else langUsage's, as lxml reads them.
    no_letters = os.path.join(tmp, "no-letters.sqlite")
    mtest.run(["batch", archive, "--store", no_letters, "--unit", "letter", "--quiet"])
    languages = stored(no_letters, "language")
    for path, language in languages.items():
        root = etree.parse(path).getroot()
        # langUsage's language of highest @usage (the first of equals), TEI P5 2.4.2.
        languages = [l for l in root.iter(TEI + "language") if l.get("ident")]
        best = max(languages, key=lambda l: int(l.get("usage", "0") or 0), default=None)
        want = root.get("{http://www.w3.org/XML/1998/namespace}lang") or (best.get("ident") if best is not None else None)
        mtest.check(language == want, "%s without letters: language %r, lxml reads %r" % (
            os.path.basename(path), language, want))
    got, stderr = analysed_files(mixed, ["--language", "en-GB"], "1500")
    mtest.check(not got and "is in language en-GB" in stderr, "--language en-GB took %r: %s" % (got, stderr))
    # No ISO 639 code: a private-use tag, and a language's name (well-formed BCP 47, but no code).
    for value in ("x-private", "german"):
        proc = mtest.run(["analyse-store", "--store", mixed, "--language", value], check=False)
        mtest.check(proc.returncode == 2 and ("--language %s: not a language code" % value) in proc.stderr,
                    "--language %s: exit %d, %s" % (value, proc.returncode, proc.stderr))

mtest.done()
