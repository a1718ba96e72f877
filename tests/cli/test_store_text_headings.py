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
from author_rule import author_passes  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import NS, XML_ID, jing_errors  # noqa: E402

TEI_NS = NS["tei"]
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


def corpus_element(title, texts, responsible="<editor>Wenna Hale</editor>"):
    return ('<teiCorpus><teiHeader><fileDesc><titleStmt><title>%s</title>%s</titleStmt>%s</fileDesc></teiHeader>%s'
            '</teiCorpus>' % (title, responsible, PUBLICATION, "".join(texts)))


def root(element):
    """`element` as a document: the TEI namespace declared on its root."""
    name = element[1:element.index(">")]
    return ('<?xml version="1.0" encoding="UTF-8"?>\n' +
            element.replace("<%s>" % name, '<%s xmlns="%s" xml:lang="en">' % (name, TEI_NS), 1) + "\n")


def corpus(title, texts, responsible="<editor>Wenna Hale</editor>"):
    return root(corpus_element(title, texts, responsible))


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
    # A teiCorpus in a teiCorpus: a text takes the nearest collection's authors, and each
    # collection's title takes the texts inside it.
    "quay-papers": corpus("Quay Papers, Second Series", [
        text("The Pilot's Book", [], ["qp-pilot-1", "qp-pilot-2"]),
        corpus_element("The Inner Packet", [text("Letters Never Sent", [], ["qp-unsent-1", "qp-unsent-2"])],
                       responsible="<author>Pell Ardent</author>"),
        text("Buoys and Marks", [], ["qp-buoys-1", "qp-buoys-2"])], responsible="<author>Merrow Quayle</author>"),
    # A corpus without a title of its own (an empty <title/>): it takes no text by title.
    "untitled-sheaf": corpus("", [
        text("Gull Songs", ["Rill Ashby"], ["us-gulls-1", "us-gulls-2"]),
        text("Rope Lore", ["Dob Fenn"], ["us-rope-1", "us-rope-2"])]),
    # One text in a teiCorpus: named by its own header; the corpus's title takes it too.
    "single-sheaf": corpus("A Single Sheaf", [text("The Lone Tale", ["Rill Ashby"], ["ss-lone-1", "ss-lone-2"])],
                           responsible="<author>Cass Wyler</author>"),
    # TEI elements in a TEI: the outer TEI is the collection of the inner ones.
    "miscellany": root(text("A Harbour Miscellany", ["Oona Sleet"], ["mi-own-1", "mi-own-2"]).replace(
        "</text></TEI>", "</text>%s%s</TEI>" % (text("Nets and Knots", [], ["mi-nets-1", "mi-nets-2"]),
                                                 text("The Far Light", ["Dob Fenn"], ["mi-far-1", "mi-far-2"])))),
    # One text: its header is the file's.
    "logbook": root(text("A Ferryman's Logbook", ["Ned Quill"], ["log-1", "log-2"])),
}


def title_and_authors(header_holder):
    stmt = header_holder.find("tei:teiHeader/tei:fileDesc/tei:titleStmt", NS)
    return stmt.findtext("tei:title", namespaces=NS), [a.text for a in stmt.findall("tei:author", NS)]


def file_title(path):
    """The file's own title: its root's (a teiCorpus's, else its TEI's), else, where the
    root teiCorpus has none, its first text's."""
    document = etree.parse(path).getroot()
    return title_and_authors(document)[0] or title_and_authors(document.find("tei:TEI", NS))[0]


HOLDERS = ("{%s}TEI" % TEI_NS, "{%s}teiCorpus" % TEI_NS)


def headings_by_lxml(path):
    """{chapter xml:id: (title, [authors], [collection titles])} of each chapter's own text
    (its nearest TEI): its own title; its own authors, else those of the nearest TEI or
    teiCorpus around that text that names some; the non-empty titles of the TEI and
    teiCorpus elements around that text."""
    out = {}
    for div in etree.parse(path).getroot().iter("{%s}div" % TEI_NS):
        tei = next(div.iterancestors("{%s}TEI" % TEI_NS))
        title, authors = title_and_authors(tei)
        around = [title_and_authors(a) for a in tei.iterancestors() if a.tag in HOLDERS]  # innermost first
        for _, collection_authors in around:
            authors = authors or collection_authors
        out[div.get(XML_ID)] = (title, authors, [t for t, _ in around if t])
    return out


def title_passes(pattern, title):
    # docs/store.md: * any run of characters, ? one, nothing else special; case ignored.
    regex = "".join(".*" if c == "*" else "." if c == "?" else re.escape(c) for c in pattern.casefold())
    return re.fullmatch(regex, title.casefold(), re.S) is not None


def expected_segments(headings, author=None, title=None):
    return {"%s#%s" % (stem, cid) for stem, chapters in headings.items()
            for cid, (t, authors, collections) in chapters.items()
            if (author is None or author_passes(author, authors))
            and (title is None or any(title_passes(title, c) for c in [t] + collections))}


def analysed(store):
    """The segments the newest analysis took."""
    return {r[0] for r in storecheck.latest_analysis(store)[1]["segments"]}


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
           ("corbel", "*almanac for 186?"), (None, "*nets"), ("pell ardent", None), ("quayle", None),
           (None, "the inner packet"), (None, "quay papers*"), (None, "gull*"), (None, "a single sheaf"),
           ("ashby", None), ("sleet", None), (None, "a harbour miscellany"), ("fenn", None)]
store = os.path.join(tmp, "store.sqlite")
mtest.run(["batch", archive, "--store", store, "--quiet", "--unit", "chapter"])

# The store says which files hold texts of their own, and each segment's text (SQLite).
apart = dict(storecheck.rows(store, "SELECT f.stem, r.texts_apart FROM files f JOIN readings r ON r.sha256 = f.sha256"))
mtest.check(apart == {stem: int(stem != "logbook") for stem in EDITIONS}, "readings.texts_apart: %r" % apart)
titles = dict(storecheck.rows(store, "SELECT f.stem, l.title FROM file_list l JOIN files f ON f.path = l.path"))
mtest.check(titles == {os.path.basename(p)[:-4]: file_title(p) for p in paths}, "file_list.title: %r" % titles)
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
    taken = analysed(fresh_store)
    mtest.check(taken == expected, "batch --analyse %s took %r; by the texts' own headers %r"
                % (described, sorted(taken), sorted(expected)))
    # ... and from the store.
    proc = mtest.run(["analyse-store", "--store", store, "--recompute", "--min-tokens", "50"]
                     + filter_args(author, title))
    taken = analysed(store)
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
mtest.check(proc.returncode == 4 and "passes the filter" in proc.stderr,
            "--author 'wenna hale': exit %d, %s" % (proc.returncode, proc.stderr))

# Speakers: in a collection of plays each play's voices are its own, a CHORUS in two plays
# two segments, each taken by its own play's header. Which words each voice speaks is
# worked out with lxml: the speeches (sp) of each TEI grouped by their speaker label.
def play(title, author, speeches):
    body = "".join('<sp><speaker>%s</speaker><p>%s</p></sp>' % (who, " ".join(
        random.Random(title + str(i)).choices(VOCABULARY, k=40))) for i, who in enumerate(speeches))
    return ('<TEI><teiHeader><fileDesc><titleStmt><title>%s</title><author>%s</author></titleStmt>%s</fileDesc>'
            '</teiHeader><text><body><div type="act">%s</div></body></text></TEI>' % (title, author, PUBLICATION, body))


stage = os.path.join(tmp, "stage")
os.makedirs(stage)
plays_path = os.path.join(stage, "harbour-plays.xml")
with open(plays_path, "w", encoding="utf-8") as f:
    f.write(corpus("Two Harbour Plays", [play("The Ferry Play", "Idris Moll", ["CHORUS", "KEEPER", "CHORUS", "KEEPER"]),
                                         play("The Bell Play", "Fen Ashby", ["CHORUS", "RINGER", "CHORUS"])]))
invalid = {p: e for p, e in jing_errors(mtest.SCHEMA, [plays_path]).items() if e}
mtest.check(not invalid, "the invented plays are not valid TEI: %r" % invalid)
voices = {}  # (play title, speaker label) -> words, by lxml
for tei in etree.parse(plays_path).getroot().iter("{%s}TEI" % TEI_NS):
    play_title = title_and_authors(tei)[0]
    for sp in tei.iter("{%s}sp" % TEI_NS):
        key = (play_title, sp.findtext("tei:speaker", namespaces=NS))
        voices[key] = voices.get(key, 0) + len(sp.findtext("tei:p", namespaces=NS).split())
plays_store = os.path.join(tmp, "plays.sqlite")
mtest.run(["batch", stage, "--store", plays_store, "--quiet", "--unit", "speaker"])
stored_voices = {(t, label): n for t, label, n in storecheck.rows(plays_store, "SELECT title, label, tokens FROM segment_list")}
mtest.check(stored_voices == voices, "each play's voices by lxml %r, stored %r" % (voices, stored_voices))
mtest.run(["analyse-store", "--store", plays_store, "--min-tokens", "10", "--author", "fen ashby"])
taken = {(r[4], r[6]) for r in storecheck.latest_analysis(plays_store)[1]["segments"]}  # label, tokens
mtest.check(taken == {(label, n) for (t, label), n in voices.items() if t == "The Bell Play"},
            "--author 'fen ashby' took the voices %r" % sorted(taken))

# A store merged from this one holds the same texts' headings and filters alike.
merged = os.path.join(tmp, "merged.sqlite")
mtest.run(["merge", merged, store])
a, b = storecheck.logical_tables(store), storecheck.logical_tables(merged)
mtest.check(a == b, "the merged store differs: " + storecheck.diff_summary(a, b))
merged_listed = {seg: (t, a) for seg, t, a in storecheck.rows(merged, "SELECT segment, title, file_author FROM segment_list")}
mtest.check(merged_listed == wanted, "the merged store's titles and authors are not each chapter's own text's (lxml)")
mtest.run(["analyse-store", "--store", merged, "--min-tokens", "50", "--author", "corbel"])
taken = analysed(merged)
mtest.check(taken == expected_segments(headings, "corbel"), "the merged store's analysis took %r" % sorted(taken))

# Dates: a text of a teiCorpus is dated by its own header, else by the collections around
# it, never by the first text's (TEI P5 15.1: the corpus header holds for its texts, not one
# text's for another). The fixture's letters (lxml): l1's correspDesc, named by its @decls,
# is sent 1850-04-02; no other letter is dated by its correspDesc, its text's header or the
# corpus header, so their year is none and --years leaves them out.
letters_path = os.path.join(mtest.ROOT, "tests", "fixtures", "corpus-letters.xml")
letters_root = etree.parse(letters_path).getroot()
by_id = {e.get(XML_ID): e for e in letters_root.iter() if e.get(XML_ID)}
header_dates = [d for h in letters_root.iter("{%s}teiHeader" % TEI_NS)
                for d in h.iter("{%s}date" % TEI_NS) if d.getparent().tag != "{%s}correspAction" % TEI_NS]
mtest.check(not header_dates, "the fixture's headers date something besides sendings: %r" % header_dates)
letter_years = {}
for div in letters_root.iter("{%s}div" % TEI_NS):
    named = by_id.get((div.get("decls") or "").lstrip("#"))
    sent = named.xpath("string(tei:correspAction[@type='sent']/tei:date/@when)", namespaces=NS) if named is not None else ""
    letter_years["corpus-letters#" + div.get(XML_ID)] = int(sent[:4]) if sent else None
mtest.check(list(letter_years.values()).count(None) >= 2, "the fixture has too few undated letters: %r" % letter_years)
letters_store = os.path.join(tmp, "letters.sqlite")
mtest.run(["batch", letters_path, "--store", letters_store, "--quiet", "--unit", "letter"])
stored_years = dict(storecheck.rows(letters_store, "SELECT segment, year FROM segment_list"))
mtest.check(stored_years == letter_years, "the letters' years: stored %r, lxml %r" % (stored_years, letter_years))

mtest.done()
