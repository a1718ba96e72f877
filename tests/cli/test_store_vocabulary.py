"""Archive store: the vocabulary kept in blocks (a JSON array of forms a row of
`vocabulary_blocks`) and opened by the `vocabulary` view.

An invented edition whose punctuation is counted (--keep-punctuation), so that a double
quote and a backslash are features, beside letters outside ASCII. Outside references:
every block is an RFC 8259 JSON array of strings for Python's json module (strict), and
the view's rows, which SQLite's json_each decodes, are the same forms in the same order;
the features an analysis read back from the store (through manicule's own decoding) are
forms the view holds, the quote and the backslash among them; a merged copy keeps the same
view. A damaged block is refused with a message naming the store, and a non-zero exit.
"""
import contextlib
import json
import os
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402

TEI = """<?xml version="1.0" encoding="UTF-8"?>
<TEI xmlns="http://www.tei-c.org/ns/1.0"><teiHeader><fileDesc>
<titleStmt><title>Harbour log</title><author>Tamsin Quayle</author></titleStmt>
<publicationStmt><p>Invented for the tests.</p></publicationStmt>
<sourceDesc><p>None.</p></sourceDesc></fileDesc></teiHeader>
<text><body>
<div type="chapter" xml:id="c1"><p>The pilot said "hold" \\ the mate said "let go" and the café shut.</p></div>
<div type="chapter" xml:id="c2"><p>"Ebb," wrote the clerk \\ "flood," wrote the pilot; Łódź and 日本 on the chart.</p></div>
<div type="chapter" xml:id="c3"><p>No quote here, only the café and the chart and the pilot.</p></div>
</body></text></TEI>
"""


def view_and_blocks(store):
    with contextlib.closing(sqlite3.connect(store)) as db:
        view = db.execute("SELECT settings_id, feature_id, form FROM vocabulary ORDER BY settings_id, feature_id").fetchall()
        blocks = db.execute("SELECT settings_id, first_feature_id, forms FROM vocabulary_blocks "
                            "ORDER BY settings_id, first_feature_id").fetchall()
    return view, blocks


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    with open(os.path.join(archive, "harbour-log.xml"), "w", encoding="utf-8") as f:
        f.write(TEI)
    store = os.path.join(tmp, "s.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "chapter", "--keep-punctuation", "--quiet"])

    view, blocks = view_and_blocks(store)
    decoded = []
    for settings_id, first, text in blocks:
        forms = json.loads(text)  # Python's decoder, strict RFC 8259
        mtest.check(isinstance(forms, list) and all(isinstance(f, str) for f in forms), "a block is an array of strings")
        mtest.check(first == len([d for d in decoded if d[0] == settings_id]), "blocks follow on from id %d" % first)
        decoded += [(settings_id, first + i, form) for i, form in enumerate(forms)]
    mtest.check(view == decoded, "the view (SQLite's json_each) gives the forms Python's json module reads")
    forms = {form for _, _, form in view}
    for expected in ['"', "\\", "café", "łódź", "日本", "pilot"]:  # in the text above, case-folded
        mtest.check(expected in forms, "the form %r is in the vocabulary" % expected)
    mtest.check(len(forms) == len(view), "every form once")

    # Read back through manicule's own decoding (an analysis of the store, not of memory):
    # the features it names are forms the view holds, the quote and the backslash among them.
    mtest.run(["analyse-store", "--store", store, "--min-tokens", "1", "--recompute"])
    with contextlib.closing(sqlite3.connect(store)) as db:
        features = [row[0] for row in db.execute(
            "SELECT form FROM features WHERE run_id = (SELECT max(run_id) FROM runs WHERE kind = 'analysis')")]
    mtest.check(features and set(features) <= forms, "the analysis' features are stored forms")
    mtest.check('"' in features and "\\" in features, "the quote and the backslash come back as themselves")

    # A merged copy: the same view.
    merged = os.path.join(tmp, "merged.sqlite")
    mtest.run(["merge", merged, store])
    mtest.check(view_and_blocks(merged)[0] == view, "the merged store's vocabulary")

    # A damaged block: refused, the store named, nothing analysed.
    damaged = os.path.join(tmp, "damaged.sqlite")
    shutil.copy(store, damaged)
    with contextlib.closing(sqlite3.connect(damaged)) as db:
        db.execute("UPDATE vocabulary_blocks SET forms = substr(forms, 1, length(forms) - 1)")
        db.commit()
    proc = mtest.run(["analyse-store", "--store", damaged, "--min-tokens", "1", "--recompute"], check=False)
    mtest.check(proc.returncode != 0, "a damaged vocabulary: exit %d" % proc.returncode)
    mtest.check(damaged in proc.stderr and "damaged vocabulary" in proc.stderr, "the message: " + proc.stderr[-400:])

mtest.done()
