"""Archive store: attribution of questioned segments over stored counts.

The invented ferry correspondence (examples/ferry-letters.xml: letters of three known
senders, L07 unsigned, L10 signed "Unknown", L12 ascribed with cert="low") is read into a
store; analyse-store --attribute must rank the three senders for exactly the questioned
letters (no sender, or one the edition only conjectures: TEI @cert below high, or
@evidence="conjecture"). Outside references: lxml for who sent which letter (correspDesc,
linked by @decls) and how certain the edition is, and so which letters are questioned;
numpy and SciPy, over the features the analysis stored and z-scores clipped to +-2 (the
attribution layer's default z limit, docs/attribution.md), for each candidate's distance
under the weighted-centroid rule, the ranking and the margin, and each candidate's nearest
single letter (tests/pylib/attribution_reference.py). batch --analyse --attribute on a new
store (which analyses the counts just read, from memory) must give those same rows.
"""
import json
import os
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from attribution_reference import cosine, letter_senders, to_candidate, z_from_relative  # noqa: E402
import numpy as np  # noqa: E402
from scipy.spatial.distance import cdist  # noqa: E402

letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")

# Senders by lxml: each letter's div/@decls names its correspDesc; a sure sender is known.
known = letter_senders(letters, "ferry-letters")
questioned = sorted(s for s, who in known.items() if not who)
candidates = sorted(set(who for who in known.values() if who))
mtest.check(questioned == ["ferry-letters#L07", "ferry-letters#L10", "ferry-letters#L12"] and len(candidates) == 3,
            "lxml finds questioned %r and candidates %r" % (questioned, candidates))

with tempfile.TemporaryDirectory() as tmp:
    store = os.path.join(tmp, "ferry.sqlite")
    mtest.run(["batch", letters, "--store", store, "--unit", "letter", "--quiet"])
    shown = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--attribute"]).stdout
    # Every attribution output carries the caution (issue text): on the terminal and in the
    # run's stored parameters, where a query of the attributions table finds it.
    mtest.check("caution: Statistical evidence, not proof" in shown, "analyse-store --attribute prints no caution")
    run, tables = storecheck.latest_analysis(store)
    db = storecheck.connect(store)
    parameters = json.loads(db.execute("SELECT parameters FROM runs WHERE run_id = ?", (run,)).fetchone()[0])
    mtest.check(parameters["attribution"]["caution"].startswith("Statistical evidence, not proof"),
                "the stored analysis parameters lack the caution")
    # The attribute command's features (1-2000, docs/attribution.md) unless --ranks says otherwise.
    mtest.check(parameters["ranks"] == "1-2000", "attribution over the store used ranks %s" % parameters["ranks"])
    # Each command's --help says so beside --attribute: its --ranks line shows 1-1000, the
    # default without it, and a user reading the help alone would expect that.
    for command in ("analyse-store", "batch"):
        lines = mtest.run([command, "--help"]).stdout.splitlines()
        attribute_help = " ".join(line.strip() for line in lines if line.strip().startswith("--attribute"))
        mtest.check("ranks 1-2000" in attribute_help, "%s --help, --attribute: %r" % (command, attribute_help))
    rows = db.execute("SELECT segment, rank, candidate, distance, nearest_segment, nearest_distance, margin, stability "
                      "FROM attributions WHERE run_id = ? ORDER BY segment, rank", (run,)).fetchall()
    forms = dict(db.execute("SELECT feature_id, form FROM vocabulary"))
    measured = db.execute(
        "SELECT a.segment, s.feature_total, s.counts FROM analysis_segments a JOIN segments s "
        "ON s.sha256 = a.sha256 AND s.ordinal = a.ordinal WHERE a.run_id = ? AND a.measured = 1 "
        "ORDER BY a.path, a.ordinal", (run,)).fetchall()
    db.close()

    mtest.check(sorted({r[0] for r in rows}) == questioned, "attributed segments %r" % sorted({r[0] for r in rows}))
    for segment in questioned:
        mine = [r for r in rows if r[0] == segment]
        mtest.check([r[1] for r in mine] == [1, 2, 3], "ranks of %s" % segment)
        mtest.check(sorted(r[2] for r in mine) == candidates, "candidates of %s: %r" % (segment, [r[2] for r in mine]))
        mtest.check(all(a[3] <= b[3] for a, b in zip(mine, mine[1:])), "%s: ranked by distance" % segment)
        mtest.check(mtest.close(mine[0][6], mine[1][3] - mine[0][3], rel=1e-9), "%s: margin" % segment)
        mtest.check(0 <= mine[0][7] <= 1, "%s: stability in [0, 1]" % segment)

    # Nearest single letter of each candidate, by numpy/SciPy from the stored counts.
    features = [r[1] for r in sorted(tables["features"])]
    names = [m[0] for m in measured]
    counts = [{forms[f]: n for f, n in storecheck.decode_counts(m[2])} for m in measured]
    rel = np.array([[c.get(f, 0) for f in features] for c in counts], dtype=float)
    rel /= np.array([m[1] for m in measured], dtype=float)[:, None]
    z = z_from_relative(rel, 2.0)
    d = cdist(z, z, "cosine")
    # Each candidate's distance under the stored rule (weighted centroid, spread 0.2), the
    # ranking and the margin, by numpy (docs/attribution.md; attribution_reference.py).
    mtest.check(parameters["attribution"]["rule"] == "weighted-centroid", "the default rule is stored")
    for segment in questioned:
        i = names.index(segment)
        expected = {c: to_candidate(z[i], z[[j for j, n in enumerate(names) if known.get(n) == c]], "weighted", cosine)
                    for c in candidates}
        order = sorted(candidates, key=expected.get)
        mine = [r for r in rows if r[0] == segment]
        mtest.check([r[2] for r in mine] == order, "%s: ranking %r, numpy %r" % (segment, [r[2] for r in mine], order))
        for r in mine:
            mtest.check(mtest.close(r[3], expected[r[2]], rel=1e-9, abs_=1e-12),
                        "%s / %s: distance %r, numpy %r" % (segment, r[2], r[3], expected[r[2]]))
        mtest.check(mtest.close(mine[0][6], expected[order[1]] - expected[order[0]], rel=1e-9, abs_=1e-12),
                    "%s: margin against numpy" % segment)
    for segment, _, candidate, _, nearest, nearest_distance, _, _ in rows:
        own = [j for j, n in enumerate(names) if known.get(n) == candidate]
        i = names.index(segment)
        j = min(own, key=lambda j: d[i, j])
        mtest.check(nearest == names[j] and mtest.close(nearest_distance, d[i, j], rel=1e-9, abs_=1e-12),
                    "%s / %s: nearest %s %.6f, SciPy %s %.6f" % (segment, candidate, nearest, nearest_distance,
                                                                   names[j], d[i, j]))

    # batch --analyse --attribute on a new store analyses the counts it has just read, from
    # memory: its attributions are those checked against numpy and SciPy above.
    fresh = os.path.join(tmp, "fresh.sqlite")
    mtest.run(["batch", letters, "--store", fresh, "--unit", "letter", "--quiet", "--analyse", "--attribute",
               "--min-tokens", "200"])
    fresh_run, _ = storecheck.latest_analysis(fresh)
    db = storecheck.connect(fresh)
    fresh_rows = db.execute("SELECT segment, rank, candidate, distance, nearest_segment, nearest_distance, margin, "
                            "stability FROM attributions WHERE run_id = ? ORDER BY segment, rank", (fresh_run,)).fetchall()
    db.close()
    mtest.check(len(fresh_rows) == len(rows) and all(
        a[:3] == b[:3] and a[4] == b[4] and all(mtest.close(x, y, rel=1e-12, abs_=1e-15) for x, y in
                                                  ((a[3], b[3]), (a[5], b[5]), (a[6], b[6]), (a[7], b[7])))
        for a, b in zip(fresh_rows, rows)), "batch --analyse --attribute: %r, checked above: %r" % (fresh_rows, rows))

    # A store whose segments all have known authors (the play's speakers, each its own
    # label) gets a note that no attribution was made, with advice the store's commands can
    # follow: it named --labels, an option of the attribute command that analyse-store and
    # batch do not have (their own --help is the reference).
    play = os.path.join(mtest.ROOT, "examples", "ferry-play.xml")
    speakers = os.path.join(tmp, "speakers.sqlite")
    proc = mtest.run(["batch", play, "--store", speakers, "--unit", "speaker", "--quiet", "--analyse", "--attribute",
                      "--min-tokens", "300"])
    offered = mtest.run(["analyse-store", "--help"]).stdout + mtest.run(["batch", "--help"]).stdout
    mtest.check("no attribution: no questioned segment" in proc.stderr, "the note: %r" % proc.stderr)
    mtest.check("--labels" not in offered and "--labels" not in proc.stderr,
                "the note advises only what the store's commands offer: %r" % proc.stderr)

mtest.done()
