"""Attribution recomputed with Debian numpy and scikit-learn from the published formulas.

On nine real novels of three authors (eltec-eng, whole texts, two of them questioned
through a labels file) and on chapters of six of them:
- `attribute`: the distance to every candidate under each rule (weighted centroid, centroid,
  nearest segment; docs/attribution.md), the nearest segment, the margin and the stability
  (SplitMix64, Steele, Lea & Flood 2014, with Lemire's 2019 bounded draw and a partial
  Fisher-Yates shuffle, re-implemented here) agree with numpy working on the raw counts of
  `profile --values counts` (relative frequency = count / words; z with the sample standard
  deviation, ddof=1; limited to +-2; cosine distance);
- Burrows's Delta (Burrows 2002) with the plain centroid and no z limit, likewise;
- `evaluate`: each rule's leave-one-out count agrees with numpy;
- verification metrics: AUC equals sklearn.metrics.roc_auc_score on the problems' scores
  (raw and calibrated); c@1 (Peñas & Rodrigo 2011) and F0.5u (Bevendorff et al. 2019) equal
  the PAN definitions computed here.
"""
import csv
import json
import math
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
from attribution_reference import SplitMix64, burrows, cosine, to_candidate, z_scores  # noqa: E402
import numpy as np  # noqa: E402
from sklearn.metrics import roc_auc_score  # noqa: E402

NOVELS_DIR = os.path.join(mtest.CORPORA, "eltec-eng")
if not os.path.isdir(NOVELS_DIR):
    print("corpora not found at " + mtest.CORPORA)
    sys.exit(77)

# Three authors with three novels each (authors from eltec-eng-metadata.tsv).
AUTHORS = {"Trollope, Anthony": ["ENG18551_Trollope", "ENG18650_Trollope", "ENG18742_Trollope"],
           "Eliot, George [pseud.]": ["ENG18610_Eliot", "ENG18660_Eliot", "ENG18721_Eliot"],
           "Yonge, Charlotte Mary": ["ENG18531_Yonge", "ENG18560_Yonge", "ENG18651_Yonge"]}
QUESTIONED = {"ENG18660_Eliot", "ENG18651_Yonge"}
FILES = [os.path.join(NOVELS_DIR, s + ".xml") for a in AUTHORS for s in AUTHORS[a]]
RANKS = 500
tmp = mtest.scratch_folder()
labels_path = os.path.join(tmp, "labels.csv")
with open(labels_path, "w", newline="") as f:
    w = csv.writer(f)
    w.writerow(["segment", "label"])
    for author, stems in AUTHORS.items():
        for s in stems:
            w.writerow([s + "#whole1", "" if s in QUESTIONED else author])
label_of = {s + "#whole1": ("" if s in QUESTIONED else a) for a in AUTHORS for s in AUTHORS[a]}

def table(extra):
    out = mtest.run(["profile", "--values", "counts", "--ranks", "1-%d" % RANKS] + extra).stdout
    rows = mtest.read_tsv(out)
    ids = [r["segment"] for r in rows]
    features = [k for k in rows[0] if k != "segment"]
    counts = np.array([[float(r[f]) for f in features] for r in rows])
    return ids, counts


def words_of(extra):
    segs = json.loads(mtest.run(["segments", "--format", "json"] + extra).stdout)["segments"]
    return {s["segment"]: s["tokens"] for s in segs}


args = FILES + ["--labels", labels_path]
ids, counts = table(FILES)
words = words_of(FILES)
candidates = sorted(set(l for l in label_of.values() if l))

for rule in ["weighted-centroid", "centroid", "nearest"]:
    Z = z_scores(counts, words, ids, 2.0)
    doc = json.loads(mtest.run(["attribute", "--format", "json", "--rule", rule, "--ranks", "1-%d" % RANKS,
                                "--resamples", "20"] + args).stdout)
    mtest.check(doc["caution"].startswith("Statistical evidence, not proof"), "JSON output lacks the caution")
    mtest.check(len(doc["attributions"]) == 2, "two questioned novels expected")
    subsets = []
    sampler = SplitMix64(1)
    k = max(1, min(RANKS, math.floor(0.5 * Z.shape[1] + 0.5)))
    for _ in range(20):
        subsets.append(sorted(sampler.choose(Z.shape[1], k)))
    for a in doc["attributions"]:
        q = Z[ids.index(a["segment"])]
        expected = {}
        for c in candidates:
            rows = Z[[ids.index(i) for i in ids if label_of[i] == c]]
            expected[c] = to_candidate(q, rows, "nearest" if rule == "nearest" else
                                       "centroid" if rule == "centroid" else "weighted", cosine)
        order = sorted(candidates, key=lambda c: expected[c])
        got = [c["candidate"] for c in a["candidates"]]
        mtest.check(got == order, "%s %s: ranking %s, numpy %s" % (rule, a["segment"], got, order))
        for c in a["candidates"]:
            mtest.check(mtest.close(c["distance"], expected[c["candidate"]], rel=1e-9, abs_=1e-12),
                        "%s %s %s: distance %r, numpy %r" % (rule, a["segment"], c["candidate"], c["distance"],
                                                            expected[c["candidate"]]))
            own = [i for i in ids if label_of[i] == c["candidate"]]
            near = min(own, key=lambda i: cosine(q, Z[ids.index(i)]))
            mtest.check(c["nearest_segment"] == near, "nearest segment %s, numpy %s" % (c["nearest_segment"], near))
        mtest.check(mtest.close(a["margin"], expected[order[1]] - expected[order[0]], rel=1e-9, abs_=1e-12),
                    "margin differs from numpy")
        kept = 0
        for cols in subsets:
            sub = {}
            for c in candidates:
                rows = Z[[ids.index(i) for i in ids if label_of[i] == c]][:, cols]
                sub[c] = to_candidate(q[cols], rows, "nearest" if rule == "nearest" else
                                      "centroid" if rule == "centroid" else "weighted", cosine)
            kept += min(candidates, key=lambda c: (sub[c], candidates.index(c))) == order[0]
        mtest.check(mtest.close(a["stability"], kept / 20.0), "%s %s: stability %r, numpy with SplitMix64 %r"
                    % (rule, a["segment"], a["stability"], kept / 20.0))

# Burrows's Delta, plain centroid, no z limit.
Z = z_scores(counts, words, ids, 0)
doc = json.loads(mtest.run(["attribute", "--format", "json", "--rule", "centroid", "--z-limit", "0",
                            "--measure", "burrows-delta", "--ranks", "1-%d" % RANKS, "--resamples", "0"] + args).stdout)
mtest.check(len(doc["attributions"]) == len(QUESTIONED), "burrows-delta: two questioned novels expected")
for a in doc["attributions"]:
    q = Z[ids.index(a["segment"])]
    for c in a["candidates"]:
        rows = Z[[ids.index(i) for i in ids if label_of[i] == c["candidate"]]]
        mtest.check(mtest.close(c["distance"], to_candidate(q, rows, "centroid", burrows), rel=1e-9),
                    "burrows-delta distance differs from numpy")

# Leave-one-out: every rule's count.
Z = z_scores(counts, words, ids, 2.0)
doc = json.loads(mtest.run(["evaluate", "--format", "json", "--ranks", "1-%d" % RANKS] + args).stdout)
known = [i for i in ids if label_of[i]]
mtest.check(sorted(r["rule"] for r in doc["evaluation"]["rules"]) == ["centroid", "nearest", "weighted-centroid"],
            "evaluate reports the three rules")
for r in doc["evaluation"]["rules"]:
    rule = {"weighted-centroid": "weighted", "centroid": "centroid", "nearest": "nearest"}[r["rule"]]
    correct = 0
    for i in known:
        q = Z[ids.index(i)]
        scores = {}
        for c in candidates:
            rows = [j for j in known if label_of[j] == c and j != i]
            scores[c] = to_candidate(q, Z[[ids.index(j) for j in rows]], rule, cosine)
        correct += min(candidates, key=lambda c: (scores[c], candidates.index(c))) == label_of[i]
    mtest.check(r["correct"] == correct and r["evaluated"] == len(known),
                "evaluate %s: %d/%d, numpy %d/%d" % (r["rule"], r["correct"], r["evaluated"], correct, len(known)))

# Verification metrics on chapter pairs of six of the novels.
chapter_files = [os.path.join(NOVELS_DIR, s + ".xml") for a in list(AUTHORS)[:2] for s in AUTHORS[a]]
segs = json.loads(mtest.run(["segments", "--format", "json", "--unit", "chapter"] + chapter_files).stdout)["segments"]
chapter_labels = os.path.join(tmp, "chapters.csv")
with open(chapter_labels, "w", newline="") as f:
    w = csv.writer(f)
    for s in segs:
        w.writerow([s["segment"], label_of[s["segment"].split("#")[0] + "#whole1"] or "Eliot, George [pseud.]"])
doc = json.loads(mtest.run(["evaluate", "--format", "json", "--unit", "chapter", "--min-tokens", "2000",
                            "--leave-out-files", "--pairs", "60", "--labels", chapter_labels,
                            "--iterations", "40"] + chapter_files).stdout)
v = doc["evaluation"]["verification"][0]
same = [p["same"] for p in v["scores"]]
raw = [p["score"] for p in v["scores"]]
cal = [p["calibrated_score"] for p in v["scores"]]
mtest.check(sum(same) == 60 and len(same) == 120, "60 same-author and 60 different-author pairs expected")
mtest.check(mtest.close(v["raw_auc"], roc_auc_score(same, raw), rel=1e-12), "raw AUC differs from scikit-learn")
mtest.check(mtest.close(v["auc"], roc_auc_score(same, cal), rel=1e-12), "AUC differs from scikit-learn")
n = len(cal)
nc = sum(1 for s, c in zip(same, cal) if c != 0.5 and (c > 0.5) == s)
nu = sum(1 for c in cal if c == 0.5)
mtest.check(mtest.close(v["c_at_1"], (nc + nu * nc / n) / n, rel=1e-12), "c@1 differs from its definition")
tp = sum(1 for s, c in zip(same, cal) if c > 0.5 and s)
fp = sum(1 for s, c in zip(same, cal) if c > 0.5 and not s)
fn = sum(1 for s, c in zip(same, cal) if c < 0.5 and s)
f05u = 1.25 * tp / (1.25 * tp + 0.25 * (fn + nu) + fp) if tp else 0.0
mtest.check(mtest.close(v["f05u"], f05u, rel=1e-12), "F0.5u differs from its definition")
print("pairs: AUC %.3f (raw %.3f), c@1 %.3f, F0.5u %.3f" % (v["auc"], v["raw_auc"], v["c_at_1"], v["f05u"]))
mtest.done()
