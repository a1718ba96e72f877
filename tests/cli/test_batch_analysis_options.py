"""batch: options that only the analysis reads need --analyse.

`batch --help` gives --pca, --attribute and --recompute "with --analyse", and the analysis
and sub-corpus options (--ranks, --min-tokens, --author, --years ...) choose what an
analysis takes in (docs/store.md, "Sub-corpora": the header filters "only choose what
--analyse takes in"). Without --analyse they were taken and did nothing, exit 0. Each is
now a usage error (exit 2) that names the option and --analyse, prints nothing on stdout
and leaves no store behind (os.path).

With --analyse each is taken, and does what it says. The archive holds the invented ferry
letters and a second invented edition that every sub-corpus option here leaves out (no
author, no date, in German, another title), and the stored analysis (read with Python's
sqlite3) is compared with one worked out here: the letters and their words from lxml and
re (reading_text.letter_words), each letter's header facts from lxml by docs/store.md's
rules, the feature table from numpy (measure_reference.reference_table: ranks, stop words,
culling, sd with ddof=1), the neighbours from scipy.spatial.distance
(measure_reference.reference_distances), the principal components from
sklearn.decomposition.PCA, the questioned letters and their candidates from lxml
(attribution_reference.letter_senders). A second run with the same options returns the
stored analysis (sqlite3 counts the analysis runs); with --recompute it makes a new one.
"""
import fnmatch
import os
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import invented_letters  # noqa: E402
import storecheck  # noqa: E402
from author_rule import author_passes  # noqa: E402
from attribution_reference import letter_senders  # noqa: E402
from measure_reference import reference_distances, reference_table  # noqa: E402
from reading_text import TEI, XML_ID, letter_words  # noqa: E402
from tei_dates import date_value, work_year, year_of  # noqa: E402

import numpy as np  # noqa: E402
from lxml import etree  # noqa: E402
from sklearn.decomposition import PCA  # noqa: E402

MIN_TOKENS = 300  # the ferry letter L05 has 285 words (lxml), L12 301: one left out, one kept
NEIGHBOURS = 5  # batch --help: --neighbours, 5 by default

tmp = mtest.scratch_folder("manicule-batch-options-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), archive)
# The second edition: invented letters of three senders, with no author in its titleStmt,
# no date anywhere, another title, and German as its language (its words are invented
# English ones; the language is the one the edition declares).
harbour = etree.fromstring(invented_letters.letters_tei(invented_letters.three_hands()).encode())
harbour.set("{http://www.w3.org/XML/1998/namespace}lang", "de")
etree.ElementTree(harbour).write(os.path.join(archive, "harbour-letters.xml"), encoding="UTF-8", xml_declaration=True)


def letters_of(path):
    """{segment: facts} of each letter of an edition, read with lxml: its words
    (reading_text), its file's title and authors (titleStmt: the main title, else the first
    that is not a subtitle; each author's text), its language (the xml:lang it inherits) and
    its year (the sent date of the correspDesc its @decls names, else the file's year:
    tei_dates, by docs/store.md's order)."""
    root = etree.parse(path).getroot()
    header = root.find(TEI + "teiHeader")
    stmt = header.find("%sfileDesc/%stitleStmt" % (TEI, TEI))
    titles = stmt.findall(TEI + "title")
    title = ([t for t in titles if t.get("type") == "main"] or [t for t in titles if t.get("type") != "sub"])[0]
    authors = [" ".join("".join(a.itertext()).split()) for a in stmt.findall(TEI + "author")]
    sent = {}
    for desc in header.iter(TEI + "correspDesc"):
        dates = [date_value(d) for a in desc.iter(TEI + "correspAction") if a.get("type") == "sent"
                 for d in a.iter(TEI + "date")]
        sent[desc.get(XML_ID)] = year_of(dates[0]) if dates else None
    words = letter_words(path)
    facts = {}
    for div in root.iter(TEI + "div"):
        if div.get("type") == "letter":
            sid = os.path.splitext(os.path.basename(path))[0] + "#" + div.get(XML_ID)
            own = sent.get((div.get("decls") or "").lstrip("#"))
            facts[sid] = {"words": words[sid], "title": " ".join("".join(title.itertext()).split()),
                          "authors": authors,
                          "language": div.xpath("string(ancestor-or-self::*[@xml:lang][1]/@xml:lang)"),
                          "year": own if own is not None else work_year(root, header)}
    return facts


LETTERS = {}
SENDERS = {}
for name in sorted(os.listdir(archive)):
    path = os.path.join(archive, name)
    LETTERS.update(letters_of(path))
    SENDERS.update(letter_senders(path, os.path.splitext(name)[0]))  # "" for a questioned letter

stop_file = os.path.join(tmp, "stop.txt")
with open(stop_file, "w", encoding="utf-8") as f:
    f.write("the\n")

# Each option, and what the reference analysis then takes: which letters (by their header
# facts, lxml) and which parameters.
CASES = [
    (["--pca"], {}),
    (["--attribute"], {}),
    (["--recompute"], {}),
    (["--ranks", "1-200"], {"last": 200}),
    (["--culling", "10"], {"culling": 10}),
    (["--measure", "burrows-delta"], {"measure": "burrows-delta"}),
    (["--neighbours", "3"], {"neighbours": 3}),
    (["--stop-words", stop_file], {"stop": {"the"}}),
    (["--author", "Pellow"], {"keep": lambda f: author_passes("Pellow", f["authors"])}),
    (["--years", "1850-1900"], {"keep": lambda f: f["year"] is not None and 1850 <= f["year"] <= 1900}),
    # RFC 4647 basic filtering: the tag or one that extends it
    (["--language", "en"], {"keep": lambda f: f["language"] == "en" or f["language"].startswith("en-")}),
    # a shell pattern, case ignored (fnmatch on str.casefold)
    (["--title", "*Ferry*"], {"keep": lambda f: fnmatch.fnmatchcase(f["title"].casefold(), "*ferry*")}),
]


def analyses(store):
    return storecheck.rows(store, "SELECT count(*) FROM runs WHERE kind = 'analysis' AND status = 'done'")[0][0]


def check_analysis(store, option, keep=lambda f: True, last=1000, culling=0, stop=(), measure="cosine-delta",
                   neighbours=NEIGHBOURS):
    """The store's newest analysis against the reference one (numpy, SciPy, scikit-learn)."""
    what = " ".join(option)
    run, tables = storecheck.latest_analysis(store)
    kept = [(sid, f["words"]) for sid, f in LETTERS.items() if keep(f) and len(f["words"]) >= MIN_TOKENS]
    ids = [sid for sid, _ in kept]
    # reference: lxml and re, the letters measured and their words
    measured = {row[0]: row[6] for row in tables["segments"]}
    mtest.check(measured == {sid: len(words) for sid, words in kept},
                "%s: measured %r, lxml gives %r"
                % (what, sorted(measured.items()), sorted((s, len(w)) for s, w in kept)))
    # reference: numpy (measure_reference.reference_table), the features by rank, mean and sd
    forms, relative, z, sd = reference_table(kept, 1, last, stop=stop, culling=culling)
    features = tables["features"]
    mtest.check([row[:2] for row in features] == list(enumerate(forms, start=1)),
                "%s: %d features, reference %d; first apart %r" % (what, len(features), len(forms), next(
                    ((row[1], f) for row, f in zip(features, forms) if row[1] != f), None)))
    # (1e-9: rounding of sums in another order; common practice, no source)
    mtest.check(np.allclose([row[3] for row in features], relative.mean(axis=0), rtol=1e-9, atol=1e-15)
                and np.allclose([row[4] for row in features], sd, rtol=1e-9, atol=1e-15),
                "%s: feature means or sds differ from numpy's (ddof=1)" % what)
    # reference: scipy.spatial.distance (measure_reference.reference_distances), the nearest
    # segments of each, by distance; a neighbour's id where no other lies at its distance
    d = reference_distances(z, relative)[measure]
    stored = {}
    for segment, rank, neighbour, distance in tables["neighbours"]:
        stored.setdefault(segment, []).append((rank, neighbour, distance))
    # (a tie: another distance within 1e-9, relative; common practice, no source)
    mtest.check(sorted(stored) == sorted(ids), "%s: neighbours of %r" % (what, sorted(stored)))
    for i, sid in enumerate(ids):
        nearest = sorted((d[i, j], ids[j]) for j in range(len(ids)) if j != i)
        rows = sorted(stored[sid])
        mtest.check([r[0] for r in rows] == list(range(1, min(neighbours, len(ids) - 1) + 1)),
                    "%s: %s has neighbour ranks %r" % (what, sid, [r[0] for r in rows]))
        for (rank, neighbour, distance), (want, want_id) in zip(rows, nearest):
            tied = sum(1 for other, _ in nearest if abs(other - want) <= 1e-9 * max(1.0, want)) > 1
            mtest.check(mtest.close(distance, want, rel=1e-9, abs_=1e-12) and (tied or neighbour == want_id),
                        "%s: %s's neighbour %d is %s at %r, SciPy gives %s at %r"
                        % (what, sid, rank, neighbour, distance, want_id, want))
    return run, ids, z


def check_pca(store, run, z):
    """The stored components' explained variance (ratio) against sklearn's PCA of the z-scores."""
    rows = storecheck.rows(store, "SELECT component, explained_variance, explained_variance_ratio FROM pca_components "
                           "WHERE run_id = ? ORDER BY component", (run,))
    # reference: sklearn.decomposition.PCA on the reference z-scores (1e-6, as
    # test_map_tree_commands compares coordinates; common practice, no source)
    reference = PCA(n_components=len(rows), svd_solver="full").fit(z)
    mtest.check(rows and [r[0] for r in rows] == list(range(1, len(rows) + 1))
                and np.allclose([r[1] for r in rows], reference.explained_variance_, rtol=1e-6)
                and np.allclose([r[2] for r in rows], reference.explained_variance_ratio_, atol=1e-6),
                "--pca: components %r, sklearn %r %r" % (rows, reference.explained_variance_,
                                                         reference.explained_variance_ratio_))


def check_attributions(store, run, ids):
    """Each measured letter without a sure sender (lxml) is ranked against every sender of a
    measured letter, and no other letter is."""
    rows = storecheck.rows(store, "SELECT segment, rank, candidate FROM attributions WHERE run_id = ?", (run,))
    candidates = {SENDERS[sid] for sid in ids if SENDERS[sid]}
    questioned = {sid for sid in ids if not SENDERS[sid]}
    # reference: lxml (attribution_reference.letter_senders: no sender, or a conjectured one)
    got = {}
    for segment, rank, candidate in rows:
        got.setdefault(segment, {})[rank] = candidate
    mtest.check(questioned and candidates and set(got) == questioned and all(sorted(r) == list(range(1, len(candidates) + 1))
                                                and set(r.values()) == candidates for r in got.values()),
                "--attribute: ranked %r; lxml: questioned %r, candidates %r"
                % (got, sorted(questioned), sorted(candidates)))


# The test data: every sub-corpus option leaves some letters out, and so does MIN_TOKENS
# (reference: lxml, the header facts and words of letters_of).
mtest.check(all(any(not given["keep"](f) for f in LETTERS.values()) for _, given in CASES if "keep" in given)
            and any(len(f["words"]) < MIN_TOKENS for f in LETTERS.values()), "the archive's letters (lxml): %r"
            % {sid: (len(f["words"]), f["year"], f["language"]) for sid, f in LETTERS.items()})
for option, given in CASES:
    store = os.path.join(tmp, "s.sqlite")
    p = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"] + option, check=False)
    # reference: os.path.exists, no store left
    mtest.check(p.returncode == 2 and option[0] in p.stderr and "--analyse" in p.stderr and not p.stdout
                and not os.path.exists(store),
                "%r without --analyse: exit %d, store left %s, %s%s" % (option, p.returncode, os.path.exists(store),
                                                                       p.stdout, p.stderr))
    common = ["batch", archive, "--store", store, "--unit", "letter", "--quiet", "--min-tokens", str(MIN_TOKENS)]
    p = mtest.run(common + option + ["--analyse"], check=False)
    # reference: Python's sqlite3, the analysis runs stored
    mtest.check(p.returncode == 0 and analyses(store) == 1, "%r with --analyse: exit %d, %d analyses, %s"
                % (option, p.returncode, analyses(store), p.stderr))
    run, ids, z = check_analysis(store, option, **given)
    if option == ["--pca"]:
        check_pca(store, run, z)
    if option == ["--attribute"]:
        check_attributions(store, run, ids)
    # The same question again: the stored analysis, unless --recompute asks for a new one.
    if option in (["--pca"], ["--recompute"]):
        mtest.run(common + option + ["--analyse"])
        mtest.check(analyses(store) == (2 if option == ["--recompute"] else 1),
                    "%r asked again: %d analyses" % (option, analyses(store)))
    for suffix in ("", "-wal", "-shm"):
        if os.path.exists(store + suffix):
            os.remove(store + suffix)
# --min-tokens alone, the same way (reference: os.path.exists, no store left).
p = mtest.run(["batch", archive, "--store", os.path.join(tmp, "t.sqlite"), "--unit", "letter", "--min-tokens",
               str(MIN_TOKENS)], check=False)
mtest.check(p.returncode == 2 and "--min-tokens" in p.stderr and not os.path.exists(os.path.join(tmp, "t.sqlite")),
            "--min-tokens without --analyse: exit %d, %s" % (p.returncode, p.stderr))
mtest.done()
