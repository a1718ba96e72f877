"""`manicule profile` against outside references, on invented letters whose tokens are
plain lower-case ASCII words separated by spaces (so every tokenizer agrees on them):
  - relative frequencies with --ranks 1-N equal scikit-learn's
    CountVectorizer(max_features=N) counts divided by each letter's token count
  - raw counts (--values counts) equal CountVectorizer's counts
  - z-scores (--values z) equal numpy's (f - mean) / std(ddof=1)
  - the provenance names each input with the SHA-256 that Python's hashlib computes
"""
import hashlib
import os
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import invented_letters  # noqa: E402
from measure_tables import read_profile  # noqa: E402

import numpy as np  # noqa: E402
from sklearn.feature_extraction.text import CountVectorizer  # noqa: E402

N = 40


with tempfile.TemporaryDirectory() as tmp:
    letters = invented_letters.three_hands()
    path = invented_letters.write_letters(tmp, "letters.xml", letters)
    base = [path, "--unit", "letter", "--min-tokens", "100", "--ranks", "1-%d" % N]
    params, features, relative = read_profile(mtest.run(["profile"] + base).stdout)
    _, features_c, counts = read_profile(mtest.run(["profile", "--values", "counts"] + base).stdout)
    _, features_z, z = read_profile(mtest.run(["profile", "--values", "z"] + base).stdout)

    ids = ["letters#" + lid for lid, _, _, _ in letters]
    mtest.check(list(relative) == ids, "one row per letter in document order: %s" % list(relative))
    mtest.check(len(features) == N and features == features_c == features_z, "N features, same in every table")

    # Reference: scikit-learn's CountVectorizer(max_features=N) on the same token lists.
    # Its token_pattern keeps one-letter words ("a"), as our tokenizer does.
    documents = [" ".join(words) for _, _, _, words in letters]
    vectorizer = CountVectorizer(max_features=N, token_pattern=r"(?u)\b\w+\b", lowercase=True)
    matrix = vectorizer.fit_transform(documents).toarray()
    chosen = vectorizer.get_feature_names_out()
    # Ties at rank N: CountVectorizer breaks them its own way, we by the form's bytes. Only
    # forms more frequent than the N-th are compared as a set; tied forms must be tied.
    totals = {}
    for words in (w for _, _, _, w in letters):
        for w in words:
            totals[w] = totals.get(w, 0) + 1
    cut = sorted(totals.values(), reverse=True)[N - 1]
    sure = {f for f, t in totals.items() if t > cut}
    mtest.check(sure <= set(features) and sure <= set(chosen),
                "forms above the cut chosen by both (sklearn CountVectorizer)")
    mtest.check(all(totals[f] >= cut for f in features), "no form below the cut chosen")
    token_counts = [len(words) for _, _, _, words in letters]
    compared = 0
    for form in sure:
        ours_col = features.index(form)
        ref_col = list(chosen).index(form)
        for r, seg in enumerate(ids):
            reference = matrix[r, ref_col] / token_counts[r]  # CountVectorizer, row-normalised by all tokens
            mtest.check(mtest.close(relative[seg][ours_col], reference, rel=1e-12),
                        "relative %s in %s: %r vs CountVectorizer %r" % (form, seg, relative[seg][ours_col], reference))
            mtest.check(counts[seg][ours_col] == matrix[r, ref_col], "count %s in %s" % (form, seg))
            compared += 1
    mtest.check(compared >= 20 * len(ids), "compared enough values (%d)" % compared)

    # Reference: numpy z-scores with the sample standard deviation (ddof=1).
    f = np.array([relative[s] for s in ids])
    zr = (f - f.mean(axis=0)) / f.std(axis=0, ddof=1)
    zo = np.array([z[s] for s in ids])
    mtest.check(np.allclose(zo, zr, rtol=1e-9, atol=1e-12), "z-scores equal numpy (ddof=1)")

    # Reference: hashlib's SHA-256 of the input file.
    with open(path, "rb") as fh:
        digest = hashlib.sha256(fh.read()).hexdigest()
    mtest.check(any(v.endswith("sha256:" + digest) for v in params.get("input", [])),
                "provenance names the input with its SHA-256: %s" % params.get("input"))
    for key in ("tool", "created", "selection", "tokenizer", "features", "feature ranks", "values"):
        mtest.check(key in params, "parameter header has '%s'" % key)

# --n above 1 with word features (the default) asks for n-grams it would not count: refused
# with exit 2 naming the features that take it (common practice for contradictory options).
example = os.path.join(mtest.ROOT, "examples", "ferry-play.xml")
proc = mtest.run(["profile", "--n", "3", "--unit", "speaker", example], check=False)
mtest.check(proc.returncode == 2 and "--features word-ngram or char-ngram" in proc.stderr and not proc.stdout,
            "--n 3 with words: exit %d, %s" % (proc.returncode, proc.stderr))
proc = mtest.run(["profile", "--n", "0", "--unit", "speaker", example], check=False)
mtest.check(proc.returncode == 2 and "--n takes 1 or more" in proc.stderr, "--n 0: exit %d, %s" % (proc.returncode, proc.stderr))

mtest.done()
