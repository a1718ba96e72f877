"""Helpers for tests/reference/test_measures_*.py: run measure_driver (MANICULE_MEASURE_DRIVER)
and compute the same numbers with Debian's numpy, SciPy and scikit-learn.

The documented rules the references follow (src/profile/feature_space.h, feature_table.h):
features rank by total count, ties by the form's UTF-8 bytes; relative frequency = count /
all tokens of the segment; z-scores use the sample sd (ddof=1) and are 0 where sd is 0.
"""
import os
import re
import subprocess
import sys
import tempfile

import numpy as np
from lxml import etree
from sklearn.feature_extraction.text import CountVectorizer

import mtest

DRIVER = os.environ.get("MANICULE_MEASURE_DRIVER", "")
TEI = {"t": "http://www.tei-c.org/ns/1.0"}
WORD = re.compile(r"[^\W\d_]+")  # a crude tokenizer: this tests measures, not tokenisation


def require_driver():
    if not DRIVER or not os.path.exists(DRIVER):
        print("SKIP: MANICULE_MEASURE_DRIVER is not set or not built")
        sys.exit(77)


def driver(args, segments=None, expect_rc=0):
    """Runs measure_driver with tokens on stdin; returns stdout (or the process)."""
    stdin = None
    if segments is not None:
        stdin = "".join(sid + "\t" + "\t".join(tokens) + "\n" for sid, tokens in segments)
    proc = subprocess.run([DRIVER] + [str(a) for a in args], input=stdin, capture_output=True,
                          text=True, timeout=300)
    if expect_rc is None:
        return proc
    if proc.returncode != expect_rc:
        mtest.fail("measure_driver %s exited %d: %s" % (" ".join(map(str, args)), proc.returncode,
                                                         proc.stderr[-2000:]))
    return proc.stdout


def read_matrix(text):
    """TSV with a header (id, column names) -> (row ids, column names, float array)."""
    lines = [l for l in text.splitlines() if l and not l.startswith("#")]
    columns = lines[0].split("\t")[1:]
    rows, values = [], []
    for line in lines[1:]:
        fields = line.split("\t")
        rows.append(fields[0])
        values.append([float(v) for v in fields[1:]])
    return rows, columns, np.array(values, dtype=float).reshape(len(rows), len(columns))


def write_matrix(directory, name, rows, columns, values):
    path = os.path.join(directory, name)
    with open(path, "w", encoding="utf-8") as out:
        out.write("id\t" + "\t".join(columns) + "\n")
        for rid, row in zip(rows, values):
            out.write(rid + "\t" + "\t".join(repr(float(v)) for v in row) + "\n")
    return path


def tempdir():
    return tempfile.TemporaryDirectory(prefix="manicule-measures-")


# ---- real segments -------------------------------------------------------------------

def eltec_chapters(corpora, files_and_chapters):
    """[(file stem, [chapter numbers])] -> [(id, tokens)] from the chapters' paragraphs."""
    segments = []
    for stem, chapters in files_and_chapters:
        doc = etree.parse(os.path.join(corpora, "eltec-eng", stem + ".xml"))
        divs = doc.xpath('//t:body//t:div[@type="chapter"]', namespaces=TEI)
        for number in chapters:
            text = " ".join("".join(p.itertext()) for p in divs[number - 1].xpath(".//t:p", namespaces=TEI))
            segments.append(("%s#ch%d" % (stem, number), WORD.findall(text.lower())))
    return segments


def dracor_speakers(corpora, stem):
    """All speakers of a play -> [(id, tokens)], the text of p and l outside stage."""
    doc = etree.parse(os.path.join(corpora, "gerdracor", stem + ".xml"))
    speakers = {}
    for sp in doc.xpath("//t:body//t:sp[@who]", namespaces=TEI):
        who = sp.get("who").split()[0].lstrip("#")
        words = speakers.setdefault("%s#%s" % (stem, who), [])
        for text in sp.xpath(".//t:p//text()[not(ancestor::t:stage)] | .//t:l//text()[not(ancestor::t:stage)]",
                             namespaces=TEI):
            words.extend(WORD.findall(text.lower()))
    return sorted(speakers.items())


# ---- reference numbers ---------------------------------------------------------------

def full_counts(segments, analyzer=lambda tokens: tokens):
    """CountVectorizer over all features -> (forms, counts array, per-segment totals)."""
    vectorizer = CountVectorizer(analyzer=analyzer, lowercase=False)
    counts = vectorizer.fit_transform([tokens for _, tokens in segments]).toarray()
    return list(vectorizer.get_feature_names_out()), counts


def ranked(forms, counts):
    """Column order by total count, descending, ties by UTF-8 bytes (the documented rule)."""
    totals = counts.sum(axis=0)
    return sorted(range(len(forms)), key=lambda c: (-totals[c], forms[c].encode("utf-8")))


def tie_free_last(forms, counts, near):
    """A rank near `near` where the next feature has a smaller total, so that no tie-break
    decides which features are in (CountVectorizer breaks ties its own way)."""
    totals = sorted(counts.sum(axis=0), reverse=True)
    for last in sorted(range(1, len(totals)), key=lambda r: abs(r - near)):
        if totals[last - 1] > totals[last]:
            return last
    mtest.fail("no tie-free rank near %d" % near)


def reference_table(segments, first, last, analyzer=lambda tokens: tokens, stop=(), culling=0):
    """Relative frequencies and z-scores of ranks first..last, with numpy (ddof=1). As
    docs/measures.md orders it: the `stop` words are left out of the ranking but still count
    in each segment's total, and with `culling` a feature must occur in at least that % of
    the segments."""
    forms, counts = full_counts(segments, analyzer)
    segment_totals = counts.sum(axis=1).astype(float)
    present = (counts > 0).sum(axis=0)
    order = [c for c in ranked(forms, counts)
             if forms[c] not in stop and present[c] * 100 >= culling * len(segments)][first - 1:last]
    relative = counts[:, order] / segment_totals[:, None]
    mean = relative.mean(axis=0)
    sd = relative.std(axis=0, ddof=1)
    with np.errstate(invalid="ignore", divide="ignore"):
        z = np.where(sd > 0, (relative - mean) / np.where(sd > 0, sd, 1), 0.0)
    return [forms[c] for c in order], relative, z, sd


def check_matrix_close(ours, reference, what, rel=1e-9, abs_=1e-12):
    ours = np.asarray(ours)
    reference = np.asarray(reference)
    mtest.check(ours.shape == reference.shape, "%s: shape %s, expected %s" % (what, ours.shape, reference.shape))
    bound = np.maximum(abs_, rel * np.maximum(np.abs(ours), np.abs(reference)))
    worst = np.unravel_index(np.argmax(np.abs(ours - reference) - bound), ours.shape)
    mtest.check(np.all(np.abs(ours - reference) <= bound),
                "%s differs at %s: %r vs reference %r" % (what, worst, ours[worst], reference[worst]))


def align_sign(ours, reference):
    """Flips each column of `ours` to the sign of the reference column (PCA signs)."""
    signs = np.sign(np.sum(ours * reference, axis=0))
    signs[signs == 0] = 1
    return ours * signs


def reference_distances(z, relative):
    """Every measure of src/measure/distance_measure.h, computed pair by pair with
    scipy.spatial.distance (and numpy for MinMax, which SciPy does not have)."""
    from scipy.spatial import distance as sd
    n = z.shape[1]
    eder_weights = (n - np.arange(n)) / n  # (n - i + 1) / n for rank positions i = 1..n
    pair = {
        "burrows-delta": lambda a, b: sd.cityblock(z[a], z[b]) / n,
        "quadratic-delta": lambda a, b: sd.sqeuclidean(z[a], z[b]),
        "eder-delta": lambda a, b: sd.cityblock(z[a], z[b], w=eder_weights) / n,
        "cosine-delta": lambda a, b: sd.cosine(z[a], z[b]),
        "manhattan": lambda a, b: sd.cityblock(relative[a], relative[b]),
        "euclidean": lambda a, b: sd.euclidean(relative[a], relative[b]),
        "cosine": lambda a, b: sd.cosine(relative[a], relative[b]),
        "minmax": lambda a, b: 1 - np.minimum(relative[a], relative[b]).sum()
        / np.maximum(relative[a], relative[b]).sum(),
    }
    rows = z.shape[0]
    result = {}
    for name, f in pair.items():
        d = np.zeros((rows, rows))
        for a in range(rows):
            for b in range(a + 1, rows):
                d[a, b] = d[b, a] = f(a, b)
        result[name] = d
    return result


def newick_clades(text):
    """Parses Newick as measure_driver writes it -> {frozenset of leaf labels: height},
    the height of a node being the branch-length sum down to its leaves."""
    position = 0

    def label():
        nonlocal position
        if text[position] == "'":
            out, position = [], position + 1
            while True:
                if text[position] == "'" and text[position + 1:position + 2] == "'":
                    out.append("'")
                    position += 2
                elif text[position] == "'":
                    position += 1
                    return "".join(out)
                else:
                    out.append(text[position])
                    position += 1
        start = position
        while text[position] not in ",():;":
            position += 1
        return text[start:position]

    def length():
        nonlocal position
        if text[position] != ":":
            return 0.0
        start = position = position + 1
        while text[position] not in ",();":
            position += 1
        return float(text[start:position])

    clades = {}

    def node():  # -> (leaves, height)
        nonlocal position
        if text[position] != "(":
            return frozenset([label()]), 0.0
        position += 1
        leaves, heights = set(), []
        while True:
            child, height = node()
            heights.append(height + length())
            leaves |= child
            if text[position] == ",":
                position += 1
                continue
            position += 1  # ')'
            break
        label()  # internal node label (support), if any
        leaves = frozenset(leaves)
        clades[leaves] = heights[0]
        for h in heights[1:]:
            mtest.check(mtest.close(h, heights[0], rel=1e-9), "Newick children of unequal height")
        return leaves, heights[0]

    node()
    mtest.check(text[position] == ";", "Newick tree must end with ';'")
    return clades


def scipy_clades(Z, labels):
    """Leaf sets and heights of every internal node of a SciPy linkage matrix."""
    from scipy.cluster.hierarchy import to_tree
    _, nodes = to_tree(Z, rd=True)
    return {frozenset(labels[i] for i in node.pre_order()): node.dist
            for node in nodes if not node.is_leaf()}
