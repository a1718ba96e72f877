"""Archive store: the SQL queries that README.md and docs/store.md show, run as printed.

The invented ferry edition (examples/) is read into a store and analysed as docs/store.md
says (batch --unit letter, then analyse-store --min-tokens 200). Every statement of every
```sql block of both files must run on it (a renamed column or view would break them
silently otherwise), and what the main ones answer is checked against the edition read with
lxml (TEI P5 correspDesc/correspAction[@type='sent']/persName/@ref for a letter's sender,
titleStmt/author for a file's authors) and against the neighbours table read row by row
with Python's sqlite3 module. The queries take the analysis the command names (`:run`):
another question is asked between, then the first again, which the store answers without a
new run. docs/store.md's second query is also run over invented chapters, whose labels are
their headings, one row for each author. When there is nothing to analyse, analyse-store says why
(no file stored, none passing the filter, segments too short), checked against lxml's count
of the letters.
"""
import os
import random
import re
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from attribution_reference import letter_senders  # noqa: E402
from invented_letters import zipf_words  # noqa: E402
from lxml import etree  # noqa: E402

TEI = "{http://www.tei-c.org/ns/1.0}"
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"


def sql_blocks(path):
    """The statements of each ```sql block of a Markdown file, in order."""
    with open(path, encoding="utf-8") as f:
        text = f.read()
    blocks = re.findall(r"```sql\n(.*?)```", text, re.S)
    mtest.check(blocks, "no ```sql block in " + path)
    return [[s.strip() for s in block.split(";") if s.strip()] for block in blocks]


def printed_run(stdout):
    """The run id of the analysis `analyse-store` names ("analysis run 2: ...")."""
    found = re.search(r"analysis run (\d+)", stdout)
    mtest.check(found, "analyse-store named no run: %r" % stdout)
    return int(found.group(1))


def header_authors(path):
    """The file's authors as titleStmt gives them, joined as the store keeps them ("; ")."""
    stmt = etree.parse(path).find("%steiHeader/%sfileDesc/%stitleStmt" % (TEI, TEI, TEI))
    return "; ".join(" ".join("".join(a.itertext()).split()) for a in stmt.findall(TEI + "author"))


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "examples")
    os.makedirs(archive)
    editions = [os.path.join(mtest.ROOT, "examples", name) for name in ("ferry-letters.xml", "ferry-play.xml")]
    for path in editions:
        shutil.copy(path, archive)
    store = os.path.join(tmp, "ferry.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"])
    mtest.run(["analyse-store", "--store", store, "--min-tokens", "200"])
    # Another question, then the first asked again: answered from the store, with no new run,
    # so the queries must take the run the command names, not the last one made.
    mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--measure", "burrows-delta"])
    again = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200"]).stdout
    run_id = printed_run(again)
    mtest.check("(unchanged, reused)" in again, "the first question asked again was not reused: %r" % again)

    db = sqlite3.connect(store)
    last_made = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    mtest.check(run_id < last_made, "the reused run %d is the last made (%d): the check below would show nothing"
                % (run_id, last_made))
    results = {}
    for doc in ("README.md", os.path.join("docs", "store.md")):
        for b, block in enumerate(sql_blocks(os.path.join(mtest.ROOT, doc))):
            for s, statement in enumerate(block):
                try:
                    cursor = db.execute(statement, {"run": run_id} if ":run" in statement else {})
                except sqlite3.Error as e:
                    mtest.fail("%s, query block %d, statement %d does not run: %s\n%s" % (doc, b + 1, s + 1, e, statement))
                mtest.check(cursor.description is not None, "%s block %d: not a query" % (doc, b + 1))
                results[(doc, b, s)] = [dict(zip([c[0] for c in cursor.description], row)) for row in cursor]

    letters = os.path.join(archive, "ferry-letters.xml")
    # Sure or conjectured: analysis_segments.author keeps a conjectured sender (L12's).
    sender = letter_senders(letters, "ferry-letters", sure_only=False)
    # Each letter's year: its correspDesc's sent date (TEI P5 2.4.6), the one it points to
    # with @decls (16.3.2); every ferry letter has one. (All of them, and the file, are of
    # 1870, so these checks show that the queries run as printed; that each letter is dated
    # by its own date is checked in test_store_letter_dates, over letters of many years.)
    root = etree.parse(letters).getroot()
    descs = {d.get(XML_ID): d for d in root.iter(TEI + "correspDesc")}
    sent_action = {}  # segment id -> its sent correspAction
    for div in root.iter(TEI + "div"):
        if div.get("type") == "letter":
            sent_action["ferry-letters#" + div.get(XML_ID)] = [
                a for a in descs[div.get("decls").lstrip("#")].iter(TEI + "correspAction") if a.get("type") == "sent"][0]
    sent_year = {k: int(a.find(TEI + "date").get("when")[:4]) for k, a in sent_action.items()}
    stored = db.execute("SELECT rank, neighbour, distance FROM neighbours WHERE run_id = ? AND segment = ? ORDER BY rank",
                        (run_id, "ferry-letters#L07")).fetchall()
    mtest.check(len(stored) == 5, "L07 has %d neighbours stored, 5 expected (the default k)" % len(stored))

    # The first query of each file: L07's neighbours, nearest first, each with its sender.
    for doc in ("README.md", os.path.join("docs", "store.md")):
        rows = results[(doc, 0, 0)]
        mtest.check([(r["rank"], r["neighbour"]) for r in rows] == [(k, n) for k, n, _ in stored],
                    "%s: the neighbours query gives %r, the table %r" % (doc, rows, stored))
        mtest.check(all(abs(r["distance"] - round(d, 4)) < 1e-12 for r, (_, _, d) in zip(rows, stored)),
                    doc + ": distances are not the table's, rounded to 4 places")
        mtest.check([r["author"] for r in rows] == [sender[r["neighbour"]] for r in rows],
                    "%s: senders %r, lxml reads %r" % (doc, [r["author"] for r in rows],
                                                       [sender[r["neighbour"]] for r in rows]))
        # Authorship as TEI P5 gives it (lxml, letter_senders with sure_only): a sender with
        # @cert below high is a conjecture, shown as such beside the sender it names.
        sure = letter_senders(letters, "ferry-letters", sure_only=True)
        expected_authorship = ["known" if sure[r["neighbour"]] else "conjectured" if sender[r["neighbour"]] else "unknown"
                               for r in rows]
        mtest.check([r["authorship"] for r in rows] == expected_authorship,
                    "%s: authorship %r, lxml reads %r" % (doc, [r["authorship"] for r in rows], expected_authorship))
        mtest.check([r["year"] for r in rows] == [sent_year[r["neighbour"]] for r in rows],
                    "%s: years %r, lxml reads %r" % (doc, [r["year"] for r in rows],
                                                     [sent_year[r["neighbour"]] for r in rows]))

    # docs/store.md's second query: each letter without a sure sender in the edition (lxml:
    # L07 and L10 name none, L12 a conjectured one), with how many of its neighbours each
    # sure sender wrote; a conjectured letter is no candidate's known text.
    sure_sender = letter_senders(letters, "ferry-letters", sure_only=True)
    questioned = sorted(s for s, who in sure_sender.items() if not who)
    mtest.check(questioned == ["ferry-letters#L07", "ferry-letters#L10", "ferry-letters#L12"],
                "lxml finds letters without a sure sender: %r" % questioned)
    rows = results[(os.path.join("docs", "store.md"), 1, 0)]
    mtest.check(sorted({r["questioned"] for r in rows}) == questioned, "questioned in the query: %r" % rows)
    for segment in questioned:
        links = {}
        for _, neighbour in db.execute("SELECT rank, neighbour FROM neighbours WHERE run_id = ? AND segment = ?",
                                       (run_id, segment)):
            if sure_sender[neighbour]:
                links[sure_sender[neighbour]] = links.get(sure_sender[neighbour], 0) + 1
        got = {r["candidate"]: r["links"] for r in rows if r["questioned"] == segment}
        mtest.check(got == links, "%s: links %r, from the neighbours and lxml's senders %r" % (segment, got, links))

    # The third block: files per author, as the headers name them (lxml), of the files that
    # hold letters (div type="letter", or a body described by a correspDesc), and the runs.
    def holds_letters(path):
        tree = etree.parse(path)
        return bool(tree.xpath("//t:body//t:div[@type='letter']|//t:teiHeader//t:correspDesc",
                               namespaces={"t": TEI[1:-1]}))
    for doc, block in (("README.md", 2), (os.path.join("docs", "store.md"), 2)):
        rows = results[(doc, block, 0)]
        expected = sorted(header_authors(p) for p in editions if holds_letters(p))
        mtest.check(len(expected) == 1, "lxml finds letters in %d of the editions; one expected" % len(expected))
        mtest.check(sorted(r["author"] for r in rows) == expected and all(r["files"] == 1 for r in rows),
                    "%s: authors %r, lxml %r" % (doc, rows, expected))
        mtest.check(results[(doc, block, 1)] == [], doc + ": no file failed, yet the query lists some")
        mtest.check([(r["kind"], r["status"]) for r in results[(doc, block, 2)]] == [("analysis", "done")] * 2 + [("batch", "done")],
                    doc + ": the last runs are %r" % results[(doc, block, 2)])

    # docs/store.md's fourth block: letters per year and sender, by each letter's own date
    # (above), its sent action's persName where the sender is sure, the others together.
    per_year = {}
    for segment, sent in sent_action.items():
        names = [" ".join("".join(n.itertext()).split()) for n in sent.iter(TEI + "persName")]
        key = (sent_year[segment], names[0] if sure_sender[segment] else "(unsigned or conjectured)")
        per_year[key] = per_year.get(key, 0) + 1
    rows = results[(os.path.join("docs", "store.md"), 3, 0)]
    got = {(r["year"], r["sender"]): r["letters"] for r in rows}
    mtest.check(got == per_year, "letters per year and sender %r, lxml reads %r" % (got, per_year))
    db.close()

    # README's second query: whose writing the files in unsigned/ resemble. The archive gets
    # unsigned/anon.xml, the letters with every sender struck out (lxml), so each of its
    # letters is unsigned; each of their neighbours outside unsigned/ counts for its own
    # sure sender (lxml, as above), never for the file's authors or a conjectured one.
    unsigned_archive = os.path.join(tmp, "with-unsigned")
    os.makedirs(os.path.join(unsigned_archive, "unsigned"))
    shutil.copy(letters, unsigned_archive)
    anon = etree.parse(letters)
    for action in anon.iter(TEI + "correspAction"):
        if action.get("type") == "sent":
            for name in action.findall(TEI + "persName"):
                action.remove(name)
    for author in anon.iter(TEI + "author"):
        author.getparent().remove(author)
    anon.write(os.path.join(unsigned_archive, "unsigned", "anon.xml"), encoding="UTF-8", xml_declaration=True)
    store2 = os.path.join(tmp, "unsigned.sqlite")
    mtest.run(["batch", unsigned_archive, "--store", store2, "--unit", "letter", "--quiet"])
    run2 = printed_run(mtest.run(["analyse-store", "--store", store2, "--min-tokens", "200", "--neighbours", "8"]).stdout)
    db = sqlite3.connect(store2)
    query = sql_blocks(os.path.join(mtest.ROOT, "README.md"))[1][0]
    cursor = db.execute(query, {"run": run2})
    columns = [c[0] for c in cursor.description]
    got = {row[columns.index("author")]: row[columns.index("nearest_links")] for row in cursor}
    expected = {}
    for segment, neighbour in db.execute("SELECT segment, neighbour FROM neighbours WHERE run_id = ?", (run2,)):
        if segment.startswith("anon#") and neighbour.startswith("ferry-letters#") and sure_sender[neighbour]:
            expected[sure_sender[neighbour]] = expected.get(sure_sender[neighbour], 0) + 1
    mtest.check(expected and got == expected, "README: links per author %r, from the neighbours and lxml %r"
                % (got, expected))
    db.close()
    # The same when the folders are the inputs, named from inside the archive: the paths are
    # then stored as given, "unsigned/anon.xml", with no folder before it (a review found the
    # query empty then).
    store2b = os.path.join(tmp, "unsigned-by-folder.sqlite")
    mtest.run(["batch", "unsigned", "ferry-letters.xml", "--store", store2b, "--unit", "letter", "--quiet"],
              cwd=unsigned_archive)
    run2b = printed_run(mtest.run(["analyse-store", "--store", store2b, "--min-tokens", "200", "--neighbours", "8"]).stdout)
    db = sqlite3.connect(store2b)
    mtest.check(db.execute("SELECT count(*) FROM files WHERE path = 'unsigned/anon.xml'").fetchone()[0] == 1,
                "the path is not stored as given: %r" % db.execute("SELECT path FROM files").fetchall())
    cursor = db.execute(query, {"run": run2b})
    columns = [c[0] for c in cursor.description]
    got = {row[columns.index("author")]: row[columns.index("nearest_links")] for row in cursor}
    mtest.check(got == expected, "README, the folders named from inside: links per author %r, expected %r" % (got, expected))
    db.close()

    # Nothing to analyse: the message says which reason holds (exit code 4, README). The
    # letters, counted with lxml, are 12 in 2 files, each far under 1,500 words even split
    # at white space; no file's header author contains "Nobody".
    letter_divs = [d for d in root.iter(TEI + "div") if d.get("type") == "letter"]
    longest = max(len(" ".join(d.itertext()).split()) for d in letter_divs)
    mtest.check(len(letter_divs) == 12 and longest < 1500, "lxml: %d letters, longest %d words" % (len(letter_divs), longest))
    for args, expected in (
            (["--author", "Nobody"], "none of the 2 stored file(s) passes the filter (author~Nobody)"),
            ([], "of the 12 segment(s) of the 2 stored file(s), 0 have 1500 words or more: lower --min-tokens")):
        proc = mtest.run(["analyse-store", "--store", store] + args, check=False)
        mtest.check(proc.returncode == 4 and expected in proc.stderr,
                    "analyse-store %s: exit %d, %s" % (" ".join(args), proc.returncode, proc.stderr))
    empty = os.path.join(tmp, "empty")
    os.makedirs(empty)
    mtest.run(["batch", empty, "--store", os.path.join(tmp, "empty.sqlite"), "--unit", "letter", "--quiet"])
    proc = mtest.run(["analyse-store", "--store", os.path.join(tmp, "empty.sqlite")], check=False)
    mtest.check(proc.returncode == 4 and "the store holds no file" in proc.stderr,
                "an empty store: exit %d, %s" % (proc.returncode, proc.stderr))

    # docs/store.md's second query over chapters, whose labels are their headings: each
    # author is one candidate of a questioned chapter, however many headings its chapters
    # have. Invented novels, three signed (titleStmt/author) and one "Anonymous" (a
    # placeholder: its chapters are questioned, docs/attribution.md); the links expected are
    # counted from the neighbours table and the authors lxml reads.
    novels = os.path.join(tmp, "novels")
    os.makedirs(novels)
    rng = random.Random(20261205)
    for author, bias in (("Ada Cole", {"the": 1.6, "of": 0.6}), ("Reuben Lusk", {"and": 1.8, "so": 3.0}),
                         ("Ines Marr", {"a": 1.7, "would": 3.0}), ("Anonymous", {"the": 1.5, "of": 0.7})):
        chapters = "".join('<div type="chapter" xml:id="c%d"><head>Chapter %s</head><p>%s</p></div>'
                           % (k + 1, "I II III IV".split()[k], " ".join(zipf_words(rng, 300, bias)))
                           for k in range(4))
        with open(os.path.join(novels, author.split()[-1].lower() + ".xml"), "w", encoding="utf-8") as f:
            f.write('<?xml version="1.0" encoding="UTF-8"?>\n<TEI xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en">'
                    '<teiHeader><fileDesc><titleStmt><title>An invented novel</title><author>%s</author></titleStmt>'
                    '<publicationStmt><p>Invented test data; CC0.</p></publicationStmt><sourceDesc><p>Invented.</p>'
                    '</sourceDesc></fileDesc></teiHeader><text><body>%s</body></text></TEI>\n' % (author, chapters))
    author_of = {}
    for name in os.listdir(novels):
        stmt = etree.parse(os.path.join(novels, name)).find("%steiHeader/%sfileDesc/%stitleStmt" % (TEI, TEI, TEI))
        author_of[name[:-4]] = stmt.findtext(TEI + "author")
    store3 = os.path.join(tmp, "novels.sqlite")
    mtest.run(["batch", novels, "--store", store3, "--unit", "chapter", "--quiet"])
    run3 = printed_run(mtest.run(["analyse-store", "--store", store3, "--min-tokens", "200", "--neighbours", "6"]).stdout)
    db = sqlite3.connect(store3)
    query = sql_blocks(os.path.join(mtest.ROOT, "docs", "store.md"))[1][0]
    cursor = db.execute(query, {"run": run3})
    columns = [c[0] for c in cursor.description]
    got = {}
    for row in cursor:
        key = (row[columns.index("questioned")], row[columns.index("candidate")])
        mtest.check(key not in got, "docs/store.md over chapters: %r in more than one row" % (key,))
        got[key] = row[columns.index("links")]
    expected = {}
    for segment, neighbour in db.execute("SELECT segment, neighbour FROM neighbours WHERE run_id = ?", (run3,)):
        asked, by = author_of[segment.split("#")[0]], author_of[neighbour.split("#")[0]]
        if asked == "Anonymous" and by != "Anonymous":
            expected[(segment, by)] = expected.get((segment, by), 0) + 1
    mtest.check(len({q for q, _ in expected}) == 4 and got == expected,
                "docs/store.md over chapters: links %r, from the neighbours and lxml %r" % (got, expected))
    db.close()

mtest.done()
