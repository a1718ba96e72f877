"""The baseline of the attribution issue, computed independently of manicule with Debian
numpy: plain Cosine Delta (Smith & Aldridge 2011) on z-scores taken over ALL segments of
the run, a regex tokenizer (letters/digits joined by ' ’ . : ·, case-folded, tokens
without a letter dropped), the most frequent words of the run, and the nearest author
centroid with the held-out group left out. Shared by tests/corpus/test_attribution_corpus.py
and bench/attribution_bench.py.
"""
import collections
import csv
import re

import numpy as np

WORD = re.compile(r"\w+(?:['’.:·]\w+)*")


def regex_tokens(text):
    return [w.casefold() for w in WORD.findall(text) if any(c.isalpha() for c in w)]


def write_labels(path, rows):
    """A labels file `segment,label` (the format of docs/attribution.md) with a header row."""
    with open(path, "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["segment", "label"])
        w.writerows(rows)


def baseline(counters, labels, groups, mfw):
    """How many segments the nearest author centroid puts with their own author, each
    segment's group (its file) left out of the centroids."""
    total = collections.Counter()
    for c in counters:
        total.update(c)
    vocab = [w for w, _ in sorted(total.items(), key=lambda x: (-x[1], x[0]))[:mfw]]
    rel = np.array([[c[w] / sum(c.values()) for w in vocab] for c in counters])
    sd = rel.std(axis=0, ddof=1)
    z = (rel - rel.mean(axis=0)) / np.where(sd > 0, sd, 1)
    z[:, sd == 0] = 0
    z /= np.linalg.norm(z, axis=1, keepdims=True)
    labels, groups = np.array(labels), np.array(groups)
    authors = sorted(set(labels))
    correct = 0
    for i in range(len(labels)):
        train = groups != groups[i]
        names = [a for a in authors if (train & (labels == a)).any()]
        cent = np.array([z[train & (labels == a)].mean(axis=0) for a in names])
        sims = cent @ z[i] / np.linalg.norm(cent, axis=1)
        correct += names[int(np.argmax(sims))] == labels[i]
    return correct
