"""One battery of reference checks for a list of real segments [(id, tokens)], shared by
tests/reference/test_measures_eltec.py and test_measures_dracor.py. Each check names the
outside library it compares with."""
import numpy as np
from scipy.cluster.hierarchy import linkage
from scipy.spatial.distance import pdist
from sklearn.decomposition import PCA
from sklearn.feature_extraction.text import CountVectorizer

import mtest
from measure_reference import (align_sign, check_matrix_close, driver, full_counts, newick_clades,
                               read_matrix, reference_distances, reference_table, scipy_clades,
                               tempdir, tie_free_last, write_matrix)

MEASURES = ["burrows-delta", "quadratic-delta", "eder-delta", "cosine-delta", "manhattan",
            "euclidean", "cosine", "minmax"]


def check_segments(segments, min_tokens, near_last):
    kept = [(sid, tokens) for sid, tokens in segments if len(tokens) >= min_tokens and tokens]
    small = [(sid, len(tokens)) for sid, tokens in segments if len(tokens) < min_tokens or not tokens]
    mtest.check(len(kept) >= 4, "the test data needs at least four segments")
    size = ["--min-tokens", min_tokens]

    # Small segments are left out and reported with their sizes, not dropped silently.
    excluded = mtest.read_tsv(driver(["profile", "--table", "excluded"] + size, segments))
    mtest.check([(e["id"], int(e["tokens"])) for e in excluded] == small,
                "excluded segments %r, expected %r" % (excluded, small))

    # Relative frequencies of the N most frequent words against scikit-learn's
    # CountVectorizer(max_features=N) divided by each segment's token count. N and the first
    # rank are chosen where the totals do not tie, as CountVectorizer breaks ties its own way.
    forms, counts = full_counts(kept)
    last = tie_free_last(forms, counts, near_last)
    vectorizer = CountVectorizer(analyzer=lambda tokens: tokens, max_features=last)
    cv_counts = vectorizer.fit_transform([t for _, t in kept]).toarray()
    cv_relative = cv_counts / np.array([len(t) for _, t in kept], dtype=float)[:, None]
    cv_forms = list(vectorizer.get_feature_names_out())
    rows, columns, relative = read_matrix(driver(["profile", "--last", last, "--table", "relative"] + size, segments))
    mtest.check(rows == [sid for sid, _ in kept], "segment order differs from the input order")
    mtest.check(set(columns) == set(cv_forms), "the %d most frequent words differ from CountVectorizer's" % last)
    by_form = [cv_forms.index(f) for f in columns]
    check_matrix_close(relative, cv_relative[:, by_form], "relative frequencies (CountVectorizer)")

    # z-scores and feature statistics against numpy (mean, std with ddof=1), ranks first..last.
    first = tie_free_last(forms, counts, 10) + 1
    ranks = ["--first", first, "--last", last] + size
    ref_forms, ref_relative, ref_z, ref_sd = reference_table(kept, first, last)
    _, columns, z = read_matrix(driver(["profile", "--table", "z"] + ranks, segments))
    mtest.check(columns == ref_forms, "feature order (total count, then UTF-8 bytes) differs")
    check_matrix_close(z, ref_z, "z-scores (numpy, ddof=1)")
    stats = mtest.read_tsv(driver(["profile", "--table", "stats"] + ranks, segments))
    check_matrix_close([float(s["sd"]) for s in stats], ref_sd, "standard deviations (numpy ddof=1)")

    # Every distance against scipy.spatial.distance on the same numbers.
    reference = reference_distances(ref_z, ref_relative)
    for measure in MEASURES:
        _, _, ours = read_matrix(driver(["distance", "--measure", measure] + ranks, segments))
        check_matrix_close(ours, reference[measure], measure + " (scipy.spatial.distance)")

    # PCA against sklearn.decomposition.PCA (full SVD), up to the sign of each component.
    for source, matrix in (("z", ref_z), ("relative", ref_relative)):
        pca = PCA(n_components=3, svd_solver="full").fit(matrix)
        expected = pca.transform(matrix)
        args = ["pca", "--input", source, "--components", 3] + ranks
        _, _, coordinates = read_matrix(driver(args + ["--table", "coordinates"], segments))
        scale = max(1.0, np.abs(expected).max())
        check_matrix_close(align_sign(coordinates, expected), expected, "PCA coordinates on " + source,
                           rel=1e-6, abs_=1e-6 * scale)
        _, _, loadings = read_matrix(driver(args + ["--table", "loadings"], segments))
        check_matrix_close(align_sign(loadings, pca.components_.T), pca.components_.T,
                           "PCA loadings on " + source, rel=1e-6, abs_=1e-8)
        variance = mtest.read_tsv(driver(args + ["--table", "variance"], segments))
        check_matrix_close([float(v["variance"]) for v in variance], pca.explained_variance_,
                           "explained variance on " + source, rel=1e-6)
        check_matrix_close([float(v["ratio"]) for v in variance], pca.explained_variance_ratio_,
                           "explained variance ratio on " + source, rel=1e-6)

    # Linkage against scipy.cluster.hierarchy.linkage: Ward on the z-score vectors, average
    # and complete on the condensed Burrows's Delta matrix; Newick against SciPy's tree.
    ids = [sid for sid, _ in kept]
    with tempdir() as directory:
        z_path = write_matrix(directory, "z.tsv", ids, ref_forms, ref_z)
        cases = (("ward", "euclidean", linkage(ref_z, "ward")),
                 ("average", "burrows-delta", linkage(pdist(ref_z, "cityblock") / ref_z.shape[1], "average")),
                 ("complete", "burrows-delta", linkage(pdist(ref_z, "cityblock") / ref_z.shape[1], "complete")))
        for method, measure, expected in cases:
            args = ["linkage", "--method", method, "--measure", measure, "--matrix", z_path]
            merges = mtest.read_tsv(driver(args))
            ours = np.array([[float(m["a"]), float(m["b"]), float(m["height"]), float(m["size"])] for m in merges])
            check_matrix_close(ours[:, 2], expected[:, 2], method + " merge heights (scipy linkage)")
            if np.all(np.diff(expected[:, 2]) > 1e-9 * expected[-1, 2]):  # no tied heights
                mtest.check(np.array_equal(ours[:, [0, 1, 3]], expected[:, [0, 1, 3]]),
                            method + " merges differ from scipy's linkage matrix")
            ours_clades = newick_clades(driver(args + ["--newick"]).strip())
            theirs = scipy_clades(expected, ids)
            mtest.check(set(ours_clades) == set(theirs), method + " Newick clades differ from scipy's tree")
            for clade, height in theirs.items():
                mtest.check(mtest.close(ours_clades[clade], height, rel=1e-9), method + " Newick branch lengths")

    # Consensus over growing feature ranges against majority counts of SciPy trees.
    lasts = sorted({tie_free_last(forms, counts, near) for near in (near_last // 4, near_last // 2,
                                                                   3 * near_last // 4, near_last)})
    appearances = {}
    for range_last in lasts:
        _, _, range_z, _ = reference_table(kept, 1, range_last)
        tree = linkage(pdist(range_z, "cosine"), "ward")
        for clade in scipy_clades(tree, ids):
            if len(clade) < len(ids):
                appearances[clade] = appearances.get(clade, 0) + 1
    expected = {clade: n for clade, n in appearances.items() if 2 * n > len(lasts)}
    out = driver(["consensus", "--measure", "cosine-delta", "--method", "ward",
                  "--ranges", ",".join("1-%d" % l for l in lasts)] + size, segments)
    ours = {frozenset(c["members"].split(",")): int(c["appearances"]) for c in mtest.read_tsv(out)}
    mtest.check(ours == expected, "consensus clades %r, expected %r" % (ours, expected))
    newick = out.splitlines()[0][2:]
    mtest.check(set(newick_clades(newick)) == set(expected) | {frozenset(ids)},
                "consensus Newick does not hold the majority clades")
