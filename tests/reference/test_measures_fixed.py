"""Distances, PCA and linkage on a small fixed matrix, and z-scores of a fixed token
example with a zero-variance feature, against numpy, SciPy and scikit-learn."""
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import numpy as np  # noqa: E402
from scipy.cluster.hierarchy import linkage  # noqa: E402
from scipy.spatial.distance import pdist  # noqa: E402
from sklearn.decomposition import PCA  # noqa: E402

import mtest  # noqa: E402
from measure_reference import (align_sign, check_matrix_close, driver, read_matrix,  # noqa: E402
                               reference_distances, reference_table, require_driver, tempdir,
                               write_matrix)

require_driver()

# Six segments x five features; odd sizes on purpose (the blocked loops work in pairs of
# rows and packs of four values). Values are non-negative so that MinMax is meaningful.
X = np.array([[0.061, 0.030, 0.012, 0.0071, 0.0],
              [0.055, 0.034, 0.010, 0.0040, 0.0013],
              [0.049, 0.041, 0.019, 0.0000, 0.0022],
              [0.072, 0.022, 0.008, 0.0093, 0.0004],
              [0.050, 0.039, 0.021, 0.0012, 0.0030],
              [0.066, 0.027, 0.011, 0.0080, 0.0001]])
ids = ["s%d" % i for i in range(len(X))]
features = ["f%d" % i for i in range(X.shape[1])]

with tempdir() as directory:
    path = write_matrix(directory, "x.tsv", ids, features, X)
    # The matrix is the measure's input as it stands (z-scores for the Delta measures).
    reference = reference_distances(X, X)
    for measure, expected in reference.items():
        rows, _, ours = read_matrix(driver(["distance", "--measure", measure, "--matrix", path]))
        mtest.check(rows == ids, "row labels")
        check_matrix_close(ours, expected, measure + " (scipy.spatial.distance)")
        mtest.check(np.all(np.diag(ours) == 0) and np.array_equal(ours, ours.T), measure + " shape")

    # PCA: sklearn.decomposition.PCA with the full SVD, up to each component's sign.
    pca = PCA(n_components=3, svd_solver="full").fit(X)
    _, _, coordinates = read_matrix(driver(["pca", "--matrix", path, "--components", 3, "--table", "coordinates"]))
    check_matrix_close(align_sign(coordinates, pca.transform(X)), pca.transform(X), "PCA coordinates",
                       rel=1e-6, abs_=1e-9)
    variance = mtest.read_tsv(driver(["pca", "--matrix", path, "--components", 3, "--table", "variance"]))
    check_matrix_close([float(v["variance"]) for v in variance], pca.explained_variance_, "explained variance", rel=1e-6)
    check_matrix_close([float(v["ratio"]) for v in variance], pca.explained_variance_ratio_, "variance ratio", rel=1e-6)
    # The sign rule: the largest |loading| of each component is positive.
    _, _, loadings = read_matrix(driver(["pca", "--matrix", path, "--components", 3, "--table", "loadings"]))
    for c in range(3):
        mtest.check(loadings[np.argmax(np.abs(loadings[:, c])), c] > 0, "sign rule of component %d" % c)

    # Linkage: scipy.cluster.hierarchy.linkage, Ward on the vectors, the others on the
    # condensed Euclidean matrix.
    for method in ("ward", "average", "complete"):
        expected = linkage(X, "ward") if method == "ward" else linkage(pdist(X, "euclidean"), method)
        merges = mtest.read_tsv(driver(["linkage", "--method", method, "--measure", "euclidean", "--matrix", path]))
        ours = np.array([[float(m[k]) for k in ("a", "b", "height", "size")] for m in merges])
        check_matrix_close(ours, expected, method + " linkage matrix (scipy)")

    # Tied distances (a square's corners): heights still agree with SciPy.
    square = np.array([[0.0, 0.0], [0.0, 1.0], [1.0, 0.0], [1.0, 1.0], [3.0, 3.0]])
    square_path = write_matrix(directory, "square.tsv", ["a", "b", "c", "d", "e"], ["x", "y"], square)
    for method in ("ward", "average", "complete"):
        expected = linkage(square, "ward") if method == "ward" else linkage(pdist(square), method)
        merges = mtest.read_tsv(driver(["linkage", "--method", method, "--measure", "euclidean", "--matrix", square_path]))
        check_matrix_close([float(m["height"]) for m in merges], expected[:, 2], method + " tied heights (scipy)")

# z-scores with a feature whose relative frequency is the same everywhere ("x": a quarter
# of every segment). numpy's std(ddof=1) is 0 there; the documented z-score is 0, not NaN.
segments = [("a", ["x", "y", "y", "z"]), ("b", ["x", "y", "z", "w"]),
            ("c", ["x", "z", "z", "z"]), ("d", ["x", "w", "y", "w"])]
out = driver(["profile", "--min-tokens", 1, "--table", "z"], segments)
_, columns, z = read_matrix(out)
forms, _, ref_z, ref_sd = reference_table(segments, 1, 1000)
mtest.check(columns == forms, "feature order %r, expected %r" % (columns, forms))
mtest.check(ref_sd[forms.index("x")] == 0 and not np.isnan(z).any(), "zero-variance feature gives no NaN")
check_matrix_close(z, ref_z, "z-scores (numpy ddof=1, 0 where sd = 0)")
report = {r["key"]: r["value"] for r in mtest.read_tsv(driver(["profile", "--min-tokens", 1, "--table", "report"], segments))}
mtest.check(report["zero_variance"] == "1", "one zero-variance feature reported")

# A single segment cannot give distances: a usage error (exit 2), not NaN.
single = driver(["distance", "--measure", "burrows-delta", "--min-tokens", 1], segments[:1], expect_rc=None)
mtest.check(single.returncode == 2 and "two segments" in single.stderr, "single segment is a clear usage error")
mtest.done()
