"""Archive store: analyses over stored counts against numpy, SciPy and scikit-learn, and
sub-corpora by header metadata against lxml.

20 plays (every fourth in a subfolder) and a copy of one of them under another name are
read into a store once; then analyse-store
works from the store alone. The same analysis is also made by batch --analyse on a new
store (from the counts just read, kept in memory) and after a run that stored the
subfolder only (those from the store, the rest from memory). Each time, the features it
chose, the k nearest segments with their Cosine Delta (Smith & Aldridge 2011: cosine
distance of z-scores) and the PCA explained variance are recomputed in Python from the
stored counts (blobs decoded by the format in docs/store.md): ranking by total then UTF-8 bytes, numpy for z-scores (sample sd),
scipy.spatial.distance.cdist(..., 'cosine'), sklearn.decomposition.PCA. The filters
(--author, --years, --title, --folder, --language) are checked against the files lxml
finds matching in the TEI headers. A store closed after batch --analyse is one file: copied
without anything beside it, it holds the same analysis.
"""
import os
import re
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from author_rule import author_passes  # noqa: E402
from tei_dates import work_year  # noqa: E402
import numpy as np  # noqa: E402
from lxml import etree  # noqa: E402
from scipy.spatial.distance import cdist  # noqa: E402
from sklearn.decomposition import PCA  # noqa: E402

TEI = "{http://www.tei-c.org/ns/1.0}"
MIN_TOKENS, K = 500, 3


def header_facts(path):
    """Title, the authors (one name each) and the work's year, read with lxml."""
    root = etree.parse(path).getroot()
    header = root.find(TEI + "teiHeader")
    stmt = header.find("%sfileDesc/%stitleStmt" % (TEI, TEI))
    title = [e for e in stmt.findall(TEI + "title") if e.get("type") != "sub"][0]
    # The author's name without its idno identifiers (Wikidata, GND), as the header reader keeps it.
    authors = [" ".join("".join(a.xpath(".//text()[not(ancestor::t:idno)]", namespaces={"t": TEI[1:-1]})).split())
               for a in stmt.findall(TEI + "author")]
    return " ".join("".join(title.itertext()).split()), authors, work_year(root, header)


def analysed_paths(store, args):
    """The paths the analysis took in, and its stderr (None when it had too little)."""
    proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200"] + args, check=False)
    if proc.returncode == 4:
        return set(), None
    mtest.check(proc.returncode == 0, "analyse-store %r exited %d: %s" % (args, proc.returncode, proc.stderr))
    _, tables = storecheck.latest_analysis(store)
    return {row[1] for row in tables["segments"]}, proc.stderr


def check_against_python(store, how):
    """The latest analysis in `store` (made `how`) against the same computed in Python."""
    run, tables = storecheck.latest_analysis(store)

    # The measured segments' counts, from the store, by feature form.
    db = storecheck.connect(store)
    forms = dict(db.execute("SELECT feature_id, form FROM vocabulary"))
    rows = db.execute(
        "SELECT a.segment, s.feature_total, s.counts FROM analysis_segments a JOIN segments s "
        "ON s.sha256 = a.sha256 AND s.ordinal = a.ordinal WHERE a.run_id = ? AND a.measured = 1 "
        "ORDER BY a.path, a.ordinal", (run,)).fetchall()
    pca_ratio = [r[0] for r in db.execute(
        "SELECT explained_variance_ratio FROM pca_components WHERE run_id = ? ORDER BY component", (run,))]
    db.close()
    names = [r[0] for r in rows]
    counts = [{forms[f]: n for f, n in storecheck.decode_counts(r[2])} for r in rows]
    totals = np.array([r[1] for r in rows], dtype=float)
    mtest.check(len(names) >= 10, "%s: only %d segments measured" % (how, len(names)))

    summed = {}
    for c in counts:
        for form, n in c.items():
            summed[form] = summed.get(form, 0) + n
    ranked = sorted(summed, key=lambda f: (-summed[f], f.encode("utf-8")))[:1000]
    stored_features = [r[1] for r in sorted(tables["features"])]
    mtest.check(stored_features == ranked, "%s: the features chosen differ from the Python ranking" % how)

    rel = np.array([[c.get(f, 0) for f in ranked] for c in counts], dtype=float) / totals[:, None]
    sd = rel.std(axis=0, ddof=1)
    z = np.where(sd > 0, (rel - rel.mean(axis=0)) / np.where(sd > 0, sd, 1), 0.0)
    d = cdist(z, z, "cosine")
    expected = []
    for i, name in enumerate(names):
        order = sorted((j for j in range(len(names)) if j != i), key=lambda j: (d[i, j], j))[:K]
        expected += [(name, k + 1, names[j], d[i, j]) for k, j in enumerate(order)]
    got = sorted(tables["neighbours"])
    expected.sort()
    mtest.check([g[:3] for g in got] == [e[:3] for e in expected], "%s: nearest segments differ from SciPy's" % how)
    mtest.check(all(mtest.close(g[3], e[3], rel=1e-9, abs_=1e-12) for g, e in zip(got, expected)),
                "%s: Cosine Delta values differ from SciPy's" % how)
    ratio = PCA(n_components=2, svd_solver="full").fit(z).explained_variance_ratio_
    mtest.check(len(pca_ratio) == 2 and all(mtest.close(a, b, rel=1e-6) for a, b in zip(pca_ratio, ratio)),
                "%s: PCA explained variance ratio %r, scikit-learn %r" % (how, pca_ratio, list(ratio)))
    return names


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    paths = storecheck.copy_plays(storecheck.pick_plays(20), archive, subfolder_every=4)
    # A second copy of a play under another name: two files, one content (read once, stored once).
    twin = os.path.join(archive, "zz-twin-" + os.path.basename(paths[0]))
    shutil.copyfile(paths[0], twin)
    paths.append(twin)
    store = os.path.join(tmp, "s.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"])
    analysis_args = ["--min-tokens", str(MIN_TOKENS), "--neighbours", str(K), "--pca"]
    mtest.run(["analyse-store", "--store", store] + analysis_args)
    names = check_against_python(store, "analyse-store over a stored archive")
    # The same analysis right after reading, in one batch run (it takes the counts just
    # read from memory), and after a run that stored the subfolder's plays before (those
    # come from the store, the rest from memory).
    first = os.path.join(tmp, "first.sqlite")
    mtest.run(["batch", archive, "--store", first, "--unit", "speaker", "--quiet", "--analyse"] + analysis_args)
    # A closed store is one file (docs/store.md): what the batch logged, its counts and then
    # its analysis (the counts' log checkpointed on another thread while the analysis ran),
    # is in the .sqlite itself, with no -wal file left beside it; copied alone, it holds
    # the whole analysis, checked like the original.
    mtest.check(not os.path.exists(first + "-wal"), "batch --analyse left a -wal file beside the store")
    alone = os.path.join(tmp, "alone", "first.sqlite")
    os.makedirs(os.path.dirname(alone))
    shutil.copyfile(first, alone)
    check_against_python(alone, "the store's .sqlite copied alone after batch --analyse")
    check_against_python(first, "batch --analyse on a new store")
    # Known by construction: each segment of the copy has the same counts as the original's,
    # so its nearest segment is that one, at distance 0 (up to rounding).
    _, tables = storecheck.latest_analysis(first)
    nearest = {n[0]: (n[2], n[3]) for n in tables["neighbours"] if n[1] == 1}
    twin_stem, original_stem = (os.path.splitext(os.path.basename(p))[0] for p in (twin, paths[0]))
    copies = [s for s in nearest if s.startswith(twin_stem + "#")]
    mtest.check(copies and all(nearest[s][0] == original_stem + s[len(twin_stem):] and nearest[s][1] < 1e-12
                               for s in copies),
                "batch --analyse: the copy's segments are not nearest their originals: %r" %
                {s: nearest[s] for s in copies})
    mixed = os.path.join(tmp, "mixed.sqlite")
    mtest.run(["batch", archive, "--store", mixed, "--unit", "speaker", "--quiet", "--folder", "more"])
    mtest.run(["batch", archive, "--store", mixed, "--unit", "speaker", "--quiet", "--analyse"] + analysis_args)
    run = storecheck.last_run(mixed)
    # (The twin and its original, both new to this run, are one content: one is parsed, the
    # other hashed as known.)
    mtest.check(run["files_read"] == 15 and run["files_hashed"] == 1 and run["files_unchanged"] == 5,
                "the mixed run read %d files, hashed %d, found %d unchanged"
                % (run["files_read"], run["files_hashed"], run["files_unchanged"]))
    check_against_python(mixed, "batch --analyse after the subfolder was stored")

    # Files without a segment long enough are said to be left out, as many as the archive's
    # files (21, by construction) less those the analysis's rows hold (counted with SQL).
    proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "4000"])
    _, tables = storecheck.latest_analysis(store)
    held = len({row[1] for row in tables["segments"]})
    note = "%d of the %d file(s) selected hold no segment of 4000 words or more" % (len(paths) - held, len(paths))
    mtest.check(len(paths) == 21 and 2 <= held < len(paths) and note in proc.stderr,
                "the note on files without a long segment: %d of %d held, stderr %r" % (held, len(paths), proc.stderr))

    # Sub-corpora: the files an analysis takes in are those lxml finds matching.
    facts = {p: header_facts(p) for p in paths}
    db = storecheck.connect(store)
    with_long = {r[0] for r in db.execute(
        "SELECT DISTINCT f.path FROM files f JOIN segments s ON s.sha256 = f.sha256 WHERE s.tokens >= 200")}
    db.close()

    def expect(keep):
        chosen = {p for p in paths if keep(p)} & with_long
        return chosen if len(chosen) >= 1 else set()

    # --author takes whole words (docs/store.md, tests/pylib/author_rule.py).
    def by_author(p):
        return author_passes("von", facts[p][1])

    cases = [
        (["--author", "VON"], by_author),
        (["--years", "1780-1850"], lambda p: facts[p][2] is not None and 1780 <= facts[p][2] <= 1850),
        (["--title", "*der*"], lambda p: "der" in facts[p][0].lower()),
        (["--folder", "more"], lambda p: os.path.basename(os.path.dirname(p)) == "more"),
        (["--language", "de"], lambda p: True),
        (["--language", "en"], lambda p: False),
        (["--author", "von", "--years", "1800-"], lambda p: by_author(p)
         and facts[p][2] is not None and facts[p][2] >= 1800),
    ]
    for args, keep in cases:
        want = expect(keep)
        got_paths, stderr = analysed_paths(store, args)
        if len(want) == 1 and not got_paths:
            continue  # one file may hold fewer than two long segments: nothing to compare
        mtest.check(got_paths == want, "filter %r: analysed %d files, lxml gives %d (%r)" % (
            args, len(got_paths), len(want), sorted(os.path.basename(p) for p in got_paths ^ want)))
        # The files the filter passed by whole are counted in a note, those without a year
        # for --years apart (lxml's headers again; --language goes by segment, no file is
        # passed by whole).
        if stderr is not None and "--language" not in args:
            # undated: of the files the other filters pass (store.md: "for want of a year")
            header_ok = by_author if "--author" in args else (lambda p: True)
            undated = sum(1 for p in paths if facts[p][2] is None and header_ok(p)) if "--years" in args else 0
            outside = sum(1 for p in paths if not keep(p)) - undated
            said = re.search(r"(\d+) of the (\d+) stored file\(s\) left out by the filter", stderr)
            mtest.check((said is None and outside == 0) or
                        (said is not None and (int(said.group(1)), int(said.group(2))) == (outside, len(paths))),
                        "filter %r: lxml leaves out %d of %d files, the note says %r" % (
                            args, outside, len(paths), said.group(0) if said else None))
    mtest.check(len(expect(cases[0][1])) >= 2, "the author case picks too few files to mean anything")

    # Asking the same again reuses the stored analysis; ids of segments carry the file stem.
    proc = mtest.run(["analyse-store", "--store", store] + analysis_args)
    mtest.check("reused" in proc.stdout, "an identical analysis was computed again: " + proc.stdout)
    # The reused analysis's report counts what its rows hold (counted here with SQL).
    reused = int(re.search(r"analysis run (\d+)", proc.stdout).group(1))
    db = storecheck.connect(store)
    files, measured = db.execute("SELECT count(DISTINCT path), sum(measured) FROM analysis_segments WHERE run_id = ?",
                                 (reused,)).fetchone()
    db.close()
    mtest.check("%d file(s), %d segment(s) measured" % (files, measured) in proc.stdout,
                "reused analysis: the report %r, the rows %d files, %d measured" % (proc.stdout, files, measured))
    file_stems = {os.path.splitext(os.path.basename(p))[0] for p in paths}  # the copied plays' names
    mtest.check(names and all(n.split("#")[0] in file_stems for n in names), "segment ids without their file stem")

mtest.done()
