"""Word and character n-gram profiles against scikit-learn's CountVectorizer on the same
token lists: character n-grams over the tokens joined by single spaces (analyzer='char'),
word n-grams over the tokens (ngram_range=(n, n)). Relative frequencies divide by all
n-grams of the segment. Real text: chapters of an ELTeC novel, read crudely."""
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import numpy as np  # noqa: E402
from sklearn.feature_extraction.text import CountVectorizer  # noqa: E402

import mtest  # noqa: E402
from measure_reference import check_matrix_close, driver, eltec_chapters, read_matrix, require_driver  # noqa: E402

require_driver()
if not os.path.isdir(os.path.join(mtest.CORPORA, "eltec-eng")):
    print("SKIP: the ELTeC corpus is not present")
    sys.exit(77)

segments = [(sid, tokens[:800]) for sid, tokens in eltec_chapters(mtest.CORPORA, [("ENG18471_Bronte", [2, 3, 4, 6])])]
texts = [" ".join(tokens) for _, tokens in segments]
cases = {
    ("char-ngram", 3): CountVectorizer(analyzer="char", ngram_range=(3, 3), lowercase=False),
    ("char-ngram", 1): CountVectorizer(analyzer="char", ngram_range=(1, 1), lowercase=False),
    ("word-ngram", 2): CountVectorizer(analyzer="word", ngram_range=(2, 2), lowercase=False,
                                       tokenizer=str.split, token_pattern=None),
}
for (kind, n), vectorizer in cases.items():
    counts = vectorizer.fit_transform(texts).toarray()
    forms = list(vectorizer.get_feature_names_out())
    relative = counts / counts.sum(axis=1, keepdims=True)
    # All features (a range longer than the vocabulary uses what exists), compared by form.
    out = driver(["profile", "--kind", kind, "--n", n, "--min-tokens", 1, "--last", 10 ** 6,
                  "--table", "relative"], segments)
    _, columns, ours = read_matrix(out)
    mtest.check(sorted(columns) == sorted(forms), "%s %d: feature forms differ from CountVectorizer's" % (kind, n))
    order = [forms.index(f) for f in columns]
    check_matrix_close(ours, relative[:, order], "%s %d relative frequencies (CountVectorizer)" % (kind, n))
    totals = counts.sum(axis=0)[order]
    mtest.check(np.all(np.diff(totals) <= 0), "%s %d: columns not in descending total order" % (kind, n))
    report = {r["key"]: r["value"] for r in mtest.read_tsv(driver(
        ["profile", "--kind", kind, "--n", n, "--min-tokens", 1, "--last", 10 ** 6, "--table", "report"], segments))}
    mtest.check(report["fewer_than_asked"] == "1", "more features asked than exist is reported")
mtest.done()
