"""The k nearest rows of each row as an archive's analysis finds them (src/measure/
nearest_rows.h: dot products a block of rows at a time, never the whole distance matrix),
for many block sizes and thread counts, against SciPy's cosine distance over all pairs
(scipy.spatial.distance.cdist), and for the measures summed over each pair of rows (the
Deltas of Burrows, Argamon and Eder, Manhattan, Euclidean) against cdist and for MinMax
against numpy.

The matrix holds the cases the block loop must get right: rows that are equal (ties between
two neighbours, which must be at exactly the same distance from every other row so that the
documented tie rule, row order, decides), a row that is a multiple of another (distance 0 up to rounding), two zero
rows (the documented rule of src/measure/cosine_gram.h: distance 0 between them, 1 to every
other row, where SciPy gives NaN), and more rows than most block sizes, so that pairs fall
inside one block, across two blocks, and in a last block that is shorter. Each case runs
with the single-precision screening (the default) and without it (every pair in double).

A second matrix is made for the screening: a cluster of rows around one direction whose
cosine distances are some 1e-10 apart, far below what single precision resolves near a
similarity of 1 (steps of 6e-8), so that only the double-precision measurement of the
candidates can rank them as SciPy does."""
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import numpy as np  # noqa: E402
from scipy.spatial.distance import cdist  # noqa: E402

import mtest  # noqa: E402
from measure_reference import driver, require_driver, tempdir, write_matrix  # noqa: E402

require_driver()

rng = np.random.default_rng(20261202)
X = rng.standard_normal((41, 23))
X[7] = X[3]          # equal rows: every row is as near to 3 as to 7, and to 10
X[10] = X[3]         # (rows 3 and 7 start 8 bytes past a 16-byte boundary, row 10 on one)
X[12] = 2.5 * X[5]   # same direction: cosine distance 0 (SciPy: rounding noise)
X[20] = 0.0          # zero rows
X[33] = 0.0
ids = ["r%02d" % i for i in range(len(X))]
EQUAL_ROWS = [(3, 7, 10), (20, 33)]
features = ["f%d" % i for i in range(X.shape[1])]
TOLERANCE = 1e-12  # absolute, on distances of order 1; the dot products are summed in another order


def cosine_reference(x):
    """scipy.spatial.distance.cdist(x, x, 'cosine'), with the zero-row rule and the
    rounding floor of src/measure/cosine_gram.h (below 64 machine epsilons -> 0)."""
    with np.errstate(invalid="ignore", divide="ignore"):
        d = cdist(x, x, "cosine")
    zero = ~x.any(axis=1)
    d[zero, :] = 1.0
    d[:, zero] = 1.0
    d[np.ix_(zero, zero)] = 0.0
    d[d < 64 * np.finfo(float).eps] = 0.0
    return d


def check_cases(path, reference, blocks, ks, what):
    """Every block size, one and two threads, every k, with and without screening."""
    for block in blocks:
        for threads in (1, 2):
            for k in ks:
                for screen in ("yes", "no"):
                    out = driver(["nearest", "--measure", "cosine-delta", "--matrix", path, "--k", k,
                                  "--block", block, "--threads", threads, "--screen", screen])
                    check_nearest(out, reference, k, "%s block %d threads %d k %d screen %s"
                                  % (what, block, threads, k, screen))


def check_nearest(text, reference, k, what):
    by_row = {}
    for line in text.splitlines()[1:]:
        row, rank, neighbour, distance = line.split("\t")
        by_row.setdefault(row, []).append((int(rank), neighbour, float(distance)))
    mtest.check(sorted(by_row) == ids, what + ": a list for every row")
    n = len(ids)
    for i, row in enumerate(ids):
        ours = by_row[row]
        expected_k = min(k, n - 1)
        mtest.check([r for r, _, _ in ours] == list(range(1, expected_k + 1)), what + ": ranks of " + row)
        others = sorted((reference[i, j], j) for j in range(n) if j != i)
        for (rank, neighbour, distance), (want, _) in zip(ours, others):
            j = ids.index(neighbour)
            mtest.check(j != i, what + ": " + row + " is not its own neighbour")
            # the distance is SciPy's for that pair, and the one SciPy ranks at that place
            mtest.check(abs(distance - reference[i, j]) <= TOLERANCE,
                        "%s: %s-%s %.17g, SciPy %.17g" % (what, row, neighbour, distance, reference[i, j]))
            mtest.check(abs(distance - want) <= TOLERANCE, "%s: rank %d of %s" % (what, rank, row))
        # Rows of equal values are at exactly the same distance from every row (not an ulp
        # apart, as a sum whose order followed their place in memory once gave), so that the
        # tie rule below decides between them: a later one is listed only after the earlier.
        listed = {ids.index(nb): d for _, nb, d in ours}
        for group in EQUAL_ROWS:
            if i in group:
                continue
            distances = {listed[j] for j in group if j in listed}
            mtest.check(len(distances) <= 1, "%s: %s at %r from rows of equal values %r" % (what, row, distances, group))
            members = [j for j in group if j in listed]
            mtest.check(members == list(group[:len(members)]), "%s: %s lists %r of the equal rows %r"
                        % (what, row, members, group))
        # nearest first; equal distances in row order (the documented tie rule)
        for (_, a, da), (_, b, db) in zip(ours, ours[1:]):
            mtest.check(da < db or (da == db and a < b), what + ": order of " + row)
        # where SciPy's k-th and (k+1)-th differ clearly, the same set of neighbours
        if expected_k < n - 1 and others[expected_k][0] - others[expected_k - 1][0] > TOLERANCE:
            mtest.check({ids.index(nb) for _, nb, _ in ours} == {j for _, j in others[:expected_k]},
                        what + ": neighbours of " + row)


with tempdir() as directory:
    path = write_matrix(directory, "x.tsv", ids, features, X)
    cosine = cosine_reference(X)
    # ties the construction promises, checked on the reference itself
    mtest.check(cosine[20, 33] == 0 and cosine[20, 0] == 1 and abs(cosine[5, 12]) <= TOLERANCE,
                "reference: zero rows and the multiple")
    # block 0: the size the library picks (one block here)
    check_cases(path, cosine, (1, 4, 13, 40, 41, 0), (5, 60), "cosine-delta")
    # the same rows as relative frequencies: 'cosine' takes the same path
    out = driver(["nearest", "--measure", "cosine", "--matrix", path, "--k", 5, "--block", 7])
    check_nearest(out, cosine, 5, "cosine block 7")
    # The measures without a Gram matrix sum each pair a band of rows at a time: every block
    # size, one and two threads, against SciPy (Burrows 2002: cityblock / n; Argamon 2008:
    # sqeuclidean; Eder et al. 2016: cityblock of the rows weighted (n - i + 1) / n at rank
    # i, / n) and numpy for MinMax (Ruzicka: 1 - sum min / sum max, on non-negative rows;
    # two zero rows at distance 0, the documented rule of src/measure/blocked_pairs.h).
    n_features = X.shape[1]
    weights = (n_features - np.arange(n_features)) / n_features
    positive = np.abs(X)
    low = np.minimum(positive[:, None, :], positive[None, :, :]).sum(axis=2)
    high = np.maximum(positive[:, None, :], positive[None, :, :]).sum(axis=2)
    with np.errstate(invalid="ignore"):
        ruzicka = np.where(high > 0, 1 - low / np.where(high > 0, high, 1), 0.0)
    positive_path = write_matrix(directory, "positive.tsv", ids, features, positive)
    pair_sum_cases = [
        ("burrows-delta", path, cdist(X, X, "cityblock") / n_features),
        ("quadratic-delta", path, cdist(X, X, "sqeuclidean")),
        ("eder-delta", path, cdist(X * weights, X * weights, "cityblock") / n_features),
        ("manhattan", path, cdist(X, X, "cityblock")),
        ("euclidean", path, cdist(X, X, "euclidean")),
        ("minmax", positive_path, ruzicka),
    ]
    for measure, matrix, reference in pair_sum_cases:
        for block in (1, 4, 13, 40, 41, 0):
            for threads in (1, 2):
                for k in (5, 60):
                    out = driver(["nearest", "--measure", measure, "--matrix", matrix, "--k", k,
                                  "--block", block, "--threads", threads])
                    check_nearest(out, reference, k, "%s block %d threads %d k %d" % (measure, block, threads, k))

# The near ties. Rows v + t_j w_j, with w_j unit vectors orthogonal to v (|v|^2 about 40):
# 1 - cos(v + t w, v) is about t^2 / (2 |v|^2), so t_j = 1e-4 sqrt(j) puts the cluster's
# distances to v at about 1.25e-10 j, and their distances to each other as close.
cluster_rng = np.random.default_rng(20261203)
v = cluster_rng.standard_normal(40)
near = [v]
for j in range(1, 15):
    w = cluster_rng.standard_normal(40)
    w -= (w @ v) / (v @ v) * v
    near.append(v + 1e-4 * np.sqrt(j) * w / np.linalg.norm(w))
Y = np.vstack(near + [cluster_rng.standard_normal(40) for _ in range(25)])
Y[30] = Y[4]  # an exact tie inside the cluster's reach
EQUAL_ROWS = [(4, 30)]
ids = ["r%02d" % i for i in range(len(Y))]
features = ["f%d" % i for i in range(Y.shape[1])]
with tempdir() as directory:
    path = write_matrix(directory, "y.tsv", ids, features, Y)
    cosine = cosine_reference(Y)
    # what the case needs, checked on SciPy's distances: v's nearest 5 differ by far more
    # than the tolerance, and by far less than single precision resolves near 1
    nearest_to_v = np.sort(cosine[0, 1:15])[:6]
    gaps = np.diff(nearest_to_v)
    mtest.check(gaps.min() > 100 * TOLERANCE and nearest_to_v.max() < 1e-8,
                "reference: the cluster's distances are distinct and below single precision's steps")
    check_cases(path, cosine, (3, 16, 0), (5, 12), "near ties")

mtest.done()
