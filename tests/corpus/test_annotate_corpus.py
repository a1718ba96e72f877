"""Write-back on real editions: 10 GerDraCor plays (speakers) and 5 ELTeC novels
(chapters), each copied to a temporary folder and annotated in place.

Checked against outside references:
- difflib (Python) finds what changed: only insertions, and removing them gives back the
  input byte for byte; lxml (libxml2) parses each inserted range as a standOff,
  application, change or their wrappers, standing where TEI P5 allows them.
- jing against TEI P5 4.12.0 tei_all.rng: no error in the output that the input did not
  already have (the plays validate cleanly before; the novels carry a few of their own).
- A second run with the same options and SOURCE_DATE_EPOCH gives the same bytes.
- `show` gives back the numbers `distances --format json` computes on the same options, as
  many as lxml finds links in the file, and each equals SciPy's cosine distance of the
  z-scores numpy computes from the run's counts.
"""
import glob
import json
import os
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
from attribution_reference import z_from_relative  # noqa: E402
from mtest import CORPORA, SCHEMA, check, done, read_tsv, run  # noqa: E402
import numpy as np  # noqa: E402
from lxml import etree  # noqa: E402
from scipy.spatial.distance import cosine as cosine_distance  # noqa: E402
from standoff_check import TEI, check_insertions, jing_errors  # noqa: E402

plays = sorted(glob.glob(os.path.join(CORPORA, "gerdracor", "*.xml")))
novels = sorted(glob.glob(os.path.join(CORPORA, "eltec-eng", "*.xml")))
if len(plays) < 10 or len(novels) < 5 or shutil.which("jing") is None:
    print("SKIP: corpora or jing not available")
    sys.exit(77)

chosen = [(p, "speaker") for p in plays[::77][:10]] + [(n, "chapter") for n in novels[::19][:5]]
env = dict(os.environ, SOURCE_DATE_EPOCH="1767225600")  # 2026-01-01T00:00:00Z
work = tempfile.mkdtemp(prefix="manicule-annotate-")
try:
    copies = []
    for source, unit in chosen:
        folder = os.path.join(work, os.path.basename(os.path.dirname(source)))
        os.makedirs(folder, exist_ok=True)
        copy = os.path.join(folder, os.path.basename(source))
        shutil.copyfile(source, copy)
        copies.append((source, copy, unit))

    for source, copy, unit in copies:
        run(["annotate", copy, "--unit", unit, "--in-place"], env=env)
        before = open(source, "rb").read()
        after = open(copy, "rb").read()
        chunks, problems = check_insertions(before, after)
        check(not problems, "%s: %s" % (os.path.basename(source), "; ".join(problems[:5])))
        check(1 <= len(chunks) <= 3, "%s: %d inserted ranges" % (os.path.basename(source), len(chunks)))

    # Validity: batch jing calls (about a second each), errors compared without positions.
    errors_before = jing_errors(SCHEMA, [s for s, _, _ in copies])
    errors_after = jing_errors(SCHEMA, [c for _, c, _ in copies])
    for source, copy, _ in copies:
        new = errors_after[os.path.abspath(copy)] - errors_before[os.path.abspath(source)]
        check(not new, "%s: new jing errors: %s" % (os.path.basename(source), sorted(new)[:3]))
        if "gerdracor" in source:
            check(not errors_before[os.path.abspath(source)], "%s did not validate before" % source)

    # Idempotence: the annotated file annotated again gives the same bytes.
    for _, copy, unit in copies[:2] + copies[-1:]:
        first = open(copy, "rb").read()
        run(["annotate", copy, "--unit", unit, "--in-place"], env=env)
        check(open(copy, "rb").read() == first, "%s changed on a second run" % os.path.basename(copy))

    # Round trip: show returns what distances computes on the same options.
    shown_all = [(json.loads(run(["show", c, "--format", "json"]).stdout), c, u) for _, c, u in copies]
    with_distances = [x for x in shown_all if x[0]["distances"]]
    check(len(with_distances) >= 5, "only %d files hold distances" % len(with_distances))
    shown, copy, unit = with_distances[0]
    # lxml counts the distance links written into the file.
    links = etree.parse(copy).findall(".//{%s}linkGrp[@type='styleDistance']/{%s}link" % (TEI, TEI))
    check(len(links) > 0 and len(shown["distances"]) == len(links),
          "show lists %d distances, lxml finds %d links" % (len(shown["distances"]), len(links)))
    computed = json.loads(run(["distances", copy, "--unit", unit, "--format", "json"]).stdout)
    pairs = {tuple(sorted((p["segment_a"], p["segment_b"]))): p["value"] for p in computed["pairs"]}
    for d in shown["distances"]:
        key = tuple(sorted((d["segment_a"], d["segment_b"])))
        check(key in pairs and pairs[key] == d["value"],
              "stored distance %s = %r, computed %r" % (key, d["value"], pairs.get(key)))
    # Each stored Cosine Delta recomputed with SciPy from the run's counts (relative
    # frequencies of the 1,000 most frequent words, z-scores with ddof=1: Smith & Aldridge 2011).
    rows = read_tsv(run(["profile", copy, "--unit", unit, "--values", "counts"]).stdout)
    ids = [r["segment"] for r in rows]
    words = {s["segment"]: s["tokens"] for s in computed["segments"]}
    counts = np.array([[float(r[f]) for f in rows[0] if f != "segment"] for r in rows])
    z = z_from_relative(counts / np.array([words[i] for i in ids], dtype=float)[:, None], 0)
    for d in shown["distances"]:
        expected = cosine_distance(z[ids.index(d["segment_a"])], z[ids.index(d["segment_b"])])
        check(abs(d["value"] - expected) <= 1e-9 * max(1.0, abs(expected)),
              "stored distance %s-%s = %r, SciPy %r" % (d["segment_a"], d["segment_b"], d["value"], expected))
    tokens = {s["segment"]: (s["tokens"], s["types"]) for s in computed["segments"]}
    for s in shown["segments"]:
        check(tokens.get(s["segment"]) == (s["tokens"], s["types"]), "tokens of %s differ" % s["segment"])
    nearest = {n["segment"]: [(m["segment"], m["distance"]) for m in n["nearest"]]
               for n in computed["nearest_neighbours"]}
    for s in shown["segments"]:
        if "nearest" in s:
            check([(m["segment"], m["distance"]) for m in s["nearest"]] == nearest[s["segment"]],
                  "nearest of %s differ" % s["segment"])
finally:
    shutil.rmtree(work, ignore_errors=True)
done()
