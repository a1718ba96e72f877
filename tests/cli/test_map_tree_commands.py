"""`manicule map` and `manicule tree` against scikit-learn and SciPy, on the speakers of
one GerDraCor play (30 speakers at a lowered minimum size). The z-scores every reference
starts from are worked out here, not taken from the program: each speaker's words read
with lxml (the reading preset's text, tests/pylib/reading_text.py), cut by a regular
expression after UAX #29 and counted, ranked and standardised by numpy and scikit-learn
(measure_reference.reference_table); `profile --values z` must give the same table.
  - map JSON coordinates and explained variance ratios equal
    sklearn.decomposition.PCA on those z-scores, up to each component's
    sign, within 1e-6; each pole lists the features with the largest / most negative
    components_ values
  - tree merge heights (ward, average, complete) equal scipy.cluster.hierarchy.linkage on
    SciPy's cosine distances of the same z-scores, and so do the clusters each merge makes
  - the Newick parses (a small reader below), holds every segment once, and its branch
    lengths add up to the top merge height on every root-to-leaf path
  - a bootstrap consensus over feature ranges: Newick support labels match the JSON groups
"""
import collections
import json
import os
import re
import sys
import unicodedata

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from measure_reference import check_matrix_close, reference_table  # noqa: E402
from measure_tables import read_profile  # noqa: E402
from reading_text import LEFT_OUT, TEI, text_without_left_out  # noqa: E402

import numpy as np  # noqa: E402
from lxml import etree  # noqa: E402
from scipy.cluster.hierarchy import linkage  # noqa: E402
from scipy.spatial import distance  # noqa: E402
from sklearn.decomposition import PCA  # noqa: E402

PLAY = os.path.join(mtest.CORPORA, "gerdracor", "hauptmann-florian-geyer.xml")
if not os.path.exists(PLAY):
    print("SKIP: the GerDraCor play is not there")
    sys.exit(77)
MIN_TOKENS = 300
SELECT = [PLAY, "--unit", "speaker", "--min-tokens", str(MIN_TOKENS), "--ranks", "1-500"]
# Words as UAX #29 finds them in this play (README.md: "Words are found by Unicode word
# breaking"), written as a regular expression: runs of letters and "_", joined by an
# apostrophe (WB6/WB7) and by U+202F NARROW NO-BREAK SPACE (WordBreakProperty.txt:
# ExtendNumLet, which WB13a/WB13b keep inside a word); a U+202F at a word's edge, as in the
# play's "haben\u202f!", is left out of the word (README.md). Numbers dropped, NFC, full case
# folding (str.casefold), ' and its look-alikes ’ ʼ one character (README.md).
LETTERS = r"(?:[^\W\d_]|_)+"
WORD = re.compile(LETTERS + "(?:(?:'|\u202f+)" + LETTERS + ")*")


def speaker_words(path):
    """[(segment id, tokens)] of each @who of the play's speeches, in order of first speech:
    the text the reading preset selects (reading_text, lxml), cut into words by WORD."""
    stem = os.path.splitext(os.path.basename(path))[0]
    words = {}
    for sp in etree.parse(path).getroot().iter(TEI + "sp"):
        if any(a.tag.replace(TEI, "") in LEFT_OUT for a in sp.iterancestors()):
            continue
        parts = []
        text_without_left_out(sp, parts)
        text = unicodedata.normalize("NFC", "".join(parts)).replace("\u2019", "'").replace("\u02bc", "'")
        tokens = [w.casefold() for w in WORD.findall(text) if re.search(r"[^\W\d_]", w)]
        for who in sp.get("who").split():
            words.setdefault("%s#%s" % (stem, who.lstrip("#")), []).extend(tokens)
    return list(words.items())


def parse_newick(text):
    """A small Newick reader: returns (leaves, list of (internal label, leaf set), paths)
    where paths maps each leaf to the sum of branch lengths from the root."""
    text = re.sub(r"\[[^\]]*\]", "", text).strip()  # comments
    assert text.endswith(";"), "Newick ends with ';'"
    pos = 0
    leaves, groups, paths = [], [], {}

    def label():
        nonlocal pos
        if text[pos] == "'":
            end = pos + 1
            out = ""
            while True:
                q = text.index("'", end)
                out += text[end:q]
                if q + 1 < len(text) and text[q + 1] == "'":
                    out += "'"
                    end = q + 2
                else:
                    pos = q + 1
                    return out
        m = re.match(r"[^\s(),:;'\[\]]*", text[pos:])
        pos += m.end()
        return m.group(0)

    def length():
        nonlocal pos
        if text[pos] != ":":
            return 0.0
        m = re.match(r":([-+0-9.eE]+)", text[pos:])
        pos += m.end()
        return float(m.group(1))

    def node(depth):
        nonlocal pos
        if text[pos] == "(":
            pos += 1
            members = []
            children = []
            while True:
                child_members, child_paths = node(depth)
                members += child_members
                children.append(child_paths)
                if text[pos] == ",":
                    pos += 1
                    continue
                assert text[pos] == ")", "')' at %d" % pos
                pos += 1
                break
            name = label()
            own = length()
            groups.append((name, frozenset(members)))
            merged = {leaf: d + own for c in children for leaf, d in c.items()}
            return members, merged
        name = label()
        leaves.append(name)
        return [name], {name: length()}

    _, paths = node(0)
    assert text[pos] == ";", "tree ends at %d" % pos
    return leaves, groups, paths


# reference: lxml, re and numpy (ddof=1) through sklearn's CountVectorizer
speakers = [(sid, tokens) for sid, tokens in speaker_words(PLAY) if len(tokens) >= MIN_TOKENS]
ids = [sid for sid, _ in speakers]
features, _, z, _ = reference_table(speakers, 1, 500)
mtest.check(len(ids) >= 20, "20+ speakers of %d words or more (lxml), got %d" % (MIN_TOKENS, len(ids)))
_, ours_features, z_rows = read_profile(mtest.run(["profile", "--values", "z"] + SELECT).stdout)
mtest.check(list(z_rows) == ids, "profile rows %s, lxml's speakers %s" % (list(z_rows), ids))
mtest.check(ours_features == features, "profile features differ from the reference ranking (first apart: %r)"
            % (next(((a, b) for a, b in zip(ours_features, features) if a != b), None),))
check_matrix_close([z_rows[i] for i in ids], z, "profile z-scores (lxml, re, numpy ddof=1)")

# --- map: PCA --------------------------------------------------------------------------
# More components asked than the segments span: as many as the centred z-scores' rank
# (numpy.linalg.matrix_rank), and a note saying so.
asked = len(ids) + 5
proc = mtest.run(["map", "--format", "json", "--components", str(asked)] + SELECT)
rank = int(np.linalg.matrix_rank(z - z.mean(axis=0)))
got = len(json.loads(proc.stdout)["pca"]["components"])
mtest.check(got == rank and "%d components asked, %d computed" % (asked, rank) in proc.stderr,
            "%d components asked of rank %d: %d computed, %s" % (asked, rank, got, proc.stderr))
doc = json.loads(mtest.run(["map", "--format", "json", "--components", "3", "--top", "5"] + SELECT).stdout)
reference = PCA(n_components=3, svd_solver="full").fit(z)  # sklearn.decomposition.PCA
ref_coords = reference.transform(z)
coords = np.array([c["coordinates"] for c in doc["coordinates"]])
mtest.check([c["segment"] for c in doc["coordinates"]] == ids, "coordinates in row order")
scale = max(1.0, np.abs(ref_coords).max())
for k, component in enumerate(doc["pca"]["components"]):
    sign = 1.0 if np.dot(coords[:, k], ref_coords[:, k]) >= 0 else -1.0
    err = np.abs(coords[:, k] - sign * ref_coords[:, k]).max()
    mtest.check(err <= 1e-6 * scale, "PC%d coordinates equal sklearn's up to sign (max error %.2e)" % (k + 1, err))
    mtest.check(abs(component["explained_variance_ratio"] - reference.explained_variance_ratio_[k]) <= 1e-6,
                "PC%d explained variance ratio %r, sklearn %r" % (k + 1, component["explained_variance_ratio"],
                                                                  reference.explained_variance_ratio_[k]))
    weights = sign * reference.components_[k]
    top = [features[i] for i in np.argsort(-weights)[:5]]
    bottom = [features[i] for i in np.argsort(weights)[:5]]
    mtest.check([w["feature"] for w in component["positive_pole"]] == top,
                "PC%d positive pole %s, sklearn %s" % (k + 1, [w["feature"] for w in component["positive_pole"]], top))
    mtest.check([w["feature"] for w in component["negative_pole"]] == bottom, "PC%d negative pole" % (k + 1))
    loadings = np.array([entry["loadings"][k] for entry in doc["loadings"]])
    mtest.check(np.abs(loadings - weights).max() <= 1e-6, "PC%d loadings equal sklearn components_" % (k + 1))

# --- tree: linkage heights and clusters ----------------------------------------------------
PLAY_SHA256 = storecheck.sha256_of(PLAY)
condensed = distance.pdist(z, "cosine")  # Cosine Delta, scipy.spatial.distance.pdist
for method in ("ward", "average", "complete"):
    tree = json.loads(mtest.run(["tree", "--format", "json", "--linkage", method] + SELECT).stdout)["tree"]
    mtest.check(tree["leaves"] == ids, "%s: leaves in row order" % method)
    ref = linkage(condensed, method=method)  # scipy.cluster.hierarchy.linkage
    ours = sorted(m["height"] for m in tree["merges"])
    worst = max(abs(a - b) / max(abs(b), 1e-300) for a, b in zip(ours, ref[:, 2]))
    mtest.check(worst <= 1e-9, "%s merge heights equal SciPy's (worst relative error %.2e)" % (method, worst))

    def clusters(merges, n):
        sets = [frozenset([i]) for i in range(n)]
        for a, b in merges:
            sets.append(sets[int(a)] | sets[int(b)])
        return set(sets[n:])
    mtest.check(clusters([(m["a"], m["b"]) for m in tree["merges"]], len(ids)) == clusters(ref[:, :2], len(ids)),
                "%s: the same clusters as SciPy" % method)

    newick = mtest.run(["tree", "--linkage", method] + SELECT).stdout
    # reference: hashlib (storecheck.sha256_of), the play's SHA-256 in the parameter comment
    mtest.check(newick.startswith("[") and "sha256:" + PLAY_SHA256 in newick.split("]")[0],
                "Newick starts with the parameters, the input's SHA-256 among them: " + newick[:300])
    leaves, groups, paths = parse_newick(newick)
    mtest.check(sorted(leaves) == sorted(ids), "%s Newick has every segment once" % method)
    top = ref[-1, 2]
    mtest.check(all(abs(d - top) <= 1e-9 * top for d in paths.values()),
                "%s Newick branch lengths add up to SciPy's top height on every path" % method)

# --- bootstrap consensus -------------------------------------------------------------------
ranges = "1-100,1-200,1-300,1-400,1-500"
cons = json.loads(mtest.run(["tree", "--format", "json", "--bootstrap", ranges] + SELECT).stdout)["tree"]
mtest.check(cons["consensus"]["trees"] == 5 and cons["consensus"]["ranges"] == [[1, r] for r in (100, 200, 300, 400, 500)],
            "consensus of five trees over the ranges asked")
newick = mtest.run(["tree", "--bootstrap", ranges] + SELECT).stdout
leaves, groups, _ = parse_newick(newick)
mtest.check(sorted(leaves) == sorted(ids), "consensus Newick has every segment once")
json_groups = {frozenset(g["segments"]): round(g["support"] * 100) for g in cons["consensus"]["groups"]}
newick_groups = {members: int(name) for name, members in groups if name}
mtest.check(newick_groups == json_groups, "Newick support labels are the JSON groups' support")
mtest.check(all(50 < s <= 100 for s in newick_groups.values()), "majority-rule supports lie in (50, 100]")
# Each single run of the consensus, as SciPy clusters it: a group with 100 % support must
# be a cluster of every one of the five trees, and the groups and their supports are the
# majority-rule consensus of SciPy's five trees (clusters in more than half of them).
in_trees = collections.Counter()
for last in (100, 200, 300, 400, 500):
    _, _, zm, _ = reference_table(speakers, 1, last)  # lxml, re and numpy, as above
    ref = linkage(distance.pdist(zm, "cosine"), method="ward")  # scipy.cluster.hierarchy.linkage
    sets = [frozenset([ids[i]]) for i in range(len(ids))]
    for a, b in ref[:, :2]:
        sets.append(sets[int(a)] | sets[int(b)])
    for members, support in json_groups.items():
        if support == 100:
            mtest.check(members in set(sets), "a group of 100 %% support is a SciPy cluster at ranks 1-%d" % last)
    in_trees.update(set(sets[len(ids):]))  # the clusters the merges make, root included
majority = {m: round(100 * c / 5) for m, c in in_trees.items() if c * 2 > 5}
without_root = {m: v for m, v in majority.items() if len(m) < len(ids)}
mtest.check(len(json_groups) > 0 and json_groups in (majority, without_root),
            "consensus groups %s, SciPy's majority rule %s" % (sorted(map(sorted, json_groups)), sorted(map(sorted, majority))))

mtest.done()
