"""Archive store: `--author` and `--title` take each text of a teiCorpus by its own header.

A teiCorpus gathers texts that each have a teiHeader of their own (TEI P5 15.1), often by
different authors: an almanac of tales, a packet of letters. A sub-corpus by author or
title must take a text's segments by that text's titleStmt, not by the first text's; the
corpus's own header says what holds for all its texts (15.1, from memory): its title
takes all of them, and its authors are those of a text whose header names none. Which
segments each filter takes is worked out here with lxml from the editions (each chapter's
nearest enclosing TEI and its titleStmt, the teiCorpus's titleStmt) and the filter rules
of docs/store.md (each word of --author a whole word of one author, letter case ignored;
--title a pattern where * and ? alone are special), apart from manicule's reader. Checked
on both ways an analysis gets its segments: straight from the batch that read them, and
from the store (analyse-store --recompute), and on a store merged from this one.

The editions are invented (the almanacs of Quillmouth) and valid TEI (jing with tei_all,
checked first).
"""
import os
import random
import re
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import jing_errors  # noqa: E402

TEI_NS = "http://www.tei-c.org/ns/1.0"
NS = {"tei": TEI_NS}
VOCABULARY = ("the a of and to in at tide ferry keeper lamp bell harbour boat rope net slipway winter "
              "water light came went saw said old new long low high under over wind rain salt quay "
              "shore song cold grey bright never always once again home far near").split()
PUBLICATION = ('<publicationStmt><p>Invented test data of the manicule project; CC0.</p></publicationStmt>'
               '<sourceDesc><p>No source: invented.</p></sourceDesc>')


def chapter(chapter_id, seed):
    words = random.Random(seed).choices(VOCABULARY, k=120)
    return '<div type="chapter" xml:id="%s"><head>%s</head><p>%s</p></div>' % (chapter_id, chapter_id, " ".join(words))


def text(title, authors, chapter_ids):
    """A TEI with its own header; `authors` its titleStmt's authors."""
    header = "<title>%s</title>%s" % (title, "".join("<author>%s</author>" % a for a in authors))
    body = "".join(chapter(c, c) for c in chapter_ids)
    return ('<TEI><teiHeader><fileDesc><titleStmt>%s</titleStmt>%s</fileDesc></teiHeader>'
            '<text><body>%s</body></text></TEI>' % (header, PUBLICATION, body))


def corpus(title, texts, responsible="<editor>Wenna Hale</editor>"):
    return ('<?xml version="1.0" encoding="UTF-8"?>\n<teiCorpus xmlns="%s" xml:lang="en"><teiHeader><fileDesc>'
            '<titleStmt><title>%s</title>%s</titleStmt>%s</fileDesc></teiHeader>%s'
            '</teiCorpus>\n' % (TEI_NS, title, responsible, PUBLICATION, "".join(texts)))


EDITIONS = {
    # Its first text by Ned Quill, the second by Tamsin Corbel, the third by two authors.
    "almanac-1862": corpus("The Quillmouth Almanac for 1862", [
        text("Tide Tables Explained", ["Ned Quill"], ["a62-tides-1", "a62-tides-2"]),
        text("The Keeper's Winter", ["Tamsin Corbel"], ["a62-winter-1", "a62-winter-2"]),
        text("Songs of the Slipway", ["Orrin Vale", "Ned Quill"], ["a62-songs-1", "a62-songs-2"])]),
    "almanac-1863": corpus("The Quillmouth Almanac for 1863", [
        text("Lanterns at Low Water", ["Tamsin Corbel"], ["a63-lanterns-1", "a63-lanterns-2"]),
        text("The Drowned Bell", ["Orrin Vale"], ["a63-bell-1", "a63-bell-2"])]),
    # Its texts name no author: the corpus header's is theirs.
    "almanac-1864": corpus("The Quillmouth Almanac for 1864", [
        text("A Year of Weather", [], ["a64-weather-1", "a64-weather-2"]),
        text("Notes on Nets", [], ["a64-nets-1", "a64-nets-2"])], responsible="<author>Orrin Vale</author>"),
    # One text: its header is the file's.
    "logbook": ('<?xml version="1.0" encoding="UTF-8"?>\n' +
                text("A Ferryman's Logbook", ["Ned Quill"], ["log-1", "log-2"])
                .replace("<TEI>", '<TEI xmlns="%s" xml:lang="en">' % TEI_NS, 1) + "\n"),
}


def title_and_authors(header_holder):
    stmt = header_holder.find("tei:teiHeader/tei:fileDesc/tei:titleStmt", NS)
    return stmt.findtext("tei:title", namespaces=NS), [a.text for a in stmt.findall("tei:author", NS)]


def collection_title(path):
    """The file's own title: a teiCorpus's, else its TEI's."""
    return title_and_authors(etree.parse(path).getroot())[0]


def headings_by_lxml(path):
    """{chapter xml:id: (title, [authors], collection title)} of each chapter's own text (its
    nearest TEI): its own title, its own authors or else the teiCorpus's, and the
    teiCorpus's title (None in a file of one TEI)."""
    root = etree.parse(path).getroot()
    corpus_title, corpus_authors = (title_and_authors(root) if root.tag == "{%s}teiCorpus" % TEI_NS
                                    else (None, []))
    out = {}
    for div in root.iter("{%s}div" % TEI_NS):
        title, authors = title_and_authors(next(div.iterancestors("{%s}TEI" % TEI_NS)))
        out[div.get("{http://www.w3.org/XML/1998/namespace}id")] = (title, authors or corpus_authors, corpus_title)
    return out


def author_passes(wanted, authors):
    # docs/store.md: each word of --author (parted by spaces, commas, semicolons) a whole
    # word of one of the authors, in any order, letter case ignored.
    words = [w.casefold() for w in re.split(r"[ \t,;]+", wanted) if w]
    return any(all(w in re.findall(r"\w+", a.casefold()) for w in words) for a in authors)


def title_passes(pattern, title):
    # docs/store.md: * any run of characters, ? one, nothing else special; case ignored.
    regex = "".join(".*" if c == "*" else "." if c == "?" else re.escape(c) for c in pattern.casefold())
    return re.fullmatch(regex, title.casefold(), re.S) is not None


def expected_segments(headings, author=None, title=None):
    return {"%s#%s" % (stem, cid) for stem, chapters in headings.items()
            for cid, (t, authors, corpus_title) in chapters.items()
            if (author is None or author_passes(author, authors))
            and (title is None or title_passes(title, t) or (corpus_title and title_passes(title, corpus_title)))}


def analysed(store):
    """The segments the newest analysis took, and the run's notes."""
    run, tables = storecheck.latest_analysis(store)
    return {r[0] for r in tables["segments"]}, run


def filter_args(author, title):
    return (["--author", author] if author else []) + (["--title", title] if title else [])


tmp = mtest.scratch_folder()
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
paths = []
for stem, xml in EDITIONS.items():
    paths.append(os.path.join(archive, stem + ".xml"))
    with open(paths[-1], "w", encoding="utf-8") as f:
        f.write(xml)
invalid = {p: e for p, e in jing_errors(mtest.SCHEMA, paths).items() if e}
mtest.check(not invalid, "the invented editions are not valid TEI: %r" % invalid)
headings = {os.path.basename(p)[:-4]: headings_by_lxml(p) for p in paths}

FILTERS = [("quill", None), ("Tamsin Corbel", None), ("corbel, tamsin", None), (None, "*bell*"),
           ("vale", "songs*"), ("quill", "*explained"), ("vale", None), (None, "The Quillmouth Almanac for 1863"),
           ("corbel", "*almanac for 186?"), (None, "*nets")]
store = os.path.join(tmp, "store.sqlite")
mtest.run(["batch", archive, "--store", store, "--quiet", "--unit", "chapter"])

# The store says which files hold texts of their own, and each segment's text (SQLite).
apart = dict(storecheck.rows(store, "SELECT f.stem, r.texts_apart FROM files f JOIN readings r ON r.sha256 = f.sha256"))
mtest.check(apart == {"almanac-1862": 1, "almanac-1863": 1, "almanac-1864": 1, "logbook": 0},
            "readings.texts_apart: %r" % apart)
# A file's own title is its teiCorpus's (file_list, as --title takes it for all its texts).
titles = dict(storecheck.rows(store, "SELECT f.stem, l.title FROM file_list l JOIN files f ON f.path = l.path"))
mtest.check(titles == {os.path.basename(p)[:-4]: collection_title(p) for p in paths}, "file_list.title: %r" % titles)
listed = {seg: (t, a) for seg, t, a in storecheck.rows(store, "SELECT segment, title, file_author FROM segment_list")}
wanted = {"%s#%s" % (stem, cid): (t, "; ".join(a)) for stem, chapters in headings.items()
          for cid, (t, a, _) in chapters.items()}
mtest.check(listed == wanted, "segment_list's title and file_author are not each chapter's own text's:\n%r\n%r"
            % (sorted(listed.items()), sorted(wanted.items())))

# A chapter's author (docs/store.md: its text's authors) is its own text's, else the
# collection's: the chapters of the 1864 almanac are Orrin Vale's.
authors = {seg: a for seg, a in storecheck.rows(store, "SELECT segment, author FROM segment_list")}
mtest.check(authors == {seg: a for seg, (_, a) in wanted.items()}, "segments.author: %r" % sorted(authors.items()))

for author, title in FILTERS:
    expected = expected_segments(headings, author, title)
    described = "--author %r --title %r" % (author, title)
    mtest.check(len(expected) >= 2, "the filter %s takes too little to analyse: %r" % (described, expected))
    # Straight from the batch that reads the files (a new store each time) ...
    fresh_store = os.path.join(tmp, "fresh-%d.sqlite" % len(os.listdir(tmp)))
    mtest.run(["batch", archive, "--store", fresh_store, "--quiet", "--unit", "chapter", "--analyse",
               "--min-tokens", "50"] + filter_args(author, title))
    taken, _ = analysed(fresh_store)
    mtest.check(taken == expected, "batch --analyse %s took %r; by the texts' own headers %r"
                % (described, sorted(taken), sorted(expected)))
    # ... and from the store.
    proc = mtest.run(["analyse-store", "--store", store, "--recompute", "--min-tokens", "50"]
                     + filter_args(author, title))
    taken, _ = analysed(store)
    mtest.check(taken == expected, "analyse-store %s took %r; by the texts' own headers %r"
                % (described, sorted(taken), sorted(expected)))
    # The segments of chosen files left out for their own text's header are counted.
    chosen_stems = {s.split("#")[0] for s in expected}
    left_out = sum(1 for stem in chosen_stems for cid in headings[stem] if "%s#%s" % (stem, cid) not in expected)
    said = re.search(r"(\d+) segment\(s\) of the files chosen left out by --author or --title", proc.stderr)
    mtest.check((int(said.group(1)) if said else 0) == left_out,
                "%s: %d segments of the chosen files' other texts; the note says %r"
                % (described, left_out, said.group(0) if said else proc.stderr))

# A file none of whose texts passes is left out whole, counted with the files the filter
# passes by.
proc = mtest.run(["analyse-store", "--store", store, "--recompute", "--min-tokens", "50", "--author", "orrin vale"])
files_left = sum(1 for stem, chapters in headings.items()
                 if not any(author_passes("orrin vale", a) for _, a, _ in chapters.values()))
mtest.check(("%d of the %d stored file(s) left out by the filter" % (files_left, len(paths))) in proc.stderr,
            "%d file(s) hold no text by Orrin Vale; stderr: %s" % (files_left, proc.stderr))

# The editor of the almanacs is no author of theirs: nothing passes, said so.
mtest.check(not expected_segments(headings, "wenna hale"), "Wenna Hale is an author")
proc = mtest.run(["analyse-store", "--store", store, "--recompute", "--author", "wenna hale"], check=False)
mtest.check(proc.returncode != 0 and "passes the filter" in proc.stderr,
            "--author 'wenna hale': exit %d, %s" % (proc.returncode, proc.stderr))

# A store merged from this one holds the same texts' headings and filters alike.
merged = os.path.join(tmp, "merged.sqlite")
mtest.run(["merge", merged, store])
a, b = storecheck.logical_tables(store), storecheck.logical_tables(merged)
mtest.check(a == b, "the merged store differs: " + storecheck.diff_summary(a, b))
mtest.run(["analyse-store", "--store", merged, "--min-tokens", "50", "--author", "corbel"])
taken, _ = analysed(merged)
mtest.check(taken == expected_segments(headings, "corbel"), "the merged store's analysis took %r" % sorted(taken))

mtest.done()
