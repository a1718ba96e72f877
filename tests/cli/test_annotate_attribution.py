"""`annotate --attribute --verify`: attribution and verification written into the invented
edition examples/ferry-letters.xml as TEI standoff, checked without our own code:
- the edition's bytes are kept: difflib finds only insertions, of elements write-back may
  add, where TEI allows them (tests/pylib/standoff_check.py);
- the result validates against TEI P5 4.12.0 tei_all.rng (jing);
- which letters are questioned and who the candidates are is read with lxml from
  correspDesc/correspAction[@type='sent']/persName (tests/pylib/attribution_reference.py:
  a sender with @ref, not conjectured, is known), and each questioned letter has one
  annotation with motivation "assessing" and each verification "classifying" when its
  calibrated band decides and "assessing" when undecided or the band is not calibrated
  (tei-conventions.md section 6, after W3C Web Annotation motivations);
- the candidate distances in the fs are recomputed with numpy from `profile --values
  counts` (tests/pylib/attribution_reference.py: z-scores over the run, limited to +-2,
  cosine distance, weighted centroid);
- every attribution and verification annotation carries the caution, in TEI and in the
  W3C Web Annotation export (a body with purpose "commenting"); `show` reads back the
  candidates and distances lxml reads in the file;
- with --impostors and --standoff-file, the impostor edition is read but never written
  (SHA-256 by hashlib) and nothing of it is written as a profile.
"""
import hashlib
import json
import os
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from attribution_reference import cosine, letter_senders, to_candidate, z_scores  # noqa: E402
import numpy as np  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import NS, PARSER, check_insertions, id_targets, jing_errors  # noqa: E402

TEI = "{http://www.tei-c.org/ns/1.0}"
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"
LETTERS = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
CAUTION = "Statistical evidence, not proof"
BASE = ["--unit", "letter", "--min-tokens", "200"]
SETTINGS = ["--resamples", "20", "--iterations", "40"]
tmp = mtest.scratch_folder()


def fs_value(fs, name):
    f = fs.find("tei:f[@name='%s']" % name, NS)
    if f is None:
        return None
    v = f[0]
    return float(v.get("value")) if v.tag == TEI + "numeric" else v.get("value") if v.tag == TEI + "symbol" else v.text


# --- in place ------------------------------------------------------------------------------
edition = os.path.join(tmp, "ferry-letters.xml")
shutil.copy(LETTERS, edition)
before = open(edition, "rb").read()
proc = mtest.run(["annotate"] + BASE + SETTINGS + ["--attribute", "--verify", "--in-place", edition])
mtest.check(CAUTION in proc.stderr, "annotate --attribute does not print the caution: " + proc.stderr)
# Each line says what it is, as the other commands' do: a note, the caution, what was written
# (notes once began "manicule: ranks 1-1000 reach past ...", like an error).
kinds = ("manicule: note: ", "manicule: caution: ", "manicule: wrote ")
mtest.check(proc.stderr.strip() and all(line.startswith(kinds) for line in proc.stderr.splitlines()),
            "annotate's stderr lines: %r" % proc.stderr.splitlines())
after = open(edition, "rb").read()
_, problems = check_insertions(before, after)
mtest.check(not problems, "edition bytes not kept or insertions misplaced: %s" % problems[:3])
errors = jing_errors(mtest.SCHEMA, [edition])
mtest.check(not any(errors.values()), "tei_all (jing) rejects the annotated edition: %s" % errors)

tree = etree.fromstring(after, PARSER)
ids = id_targets(tree)
# The application's description says which text the results point into: this document, by
# the SHA-256 of its bytes before the run (hashlib), not a path to where it was read from.
desc = "".join(tree.find(".//tei:appInfo/tei:application/tei:desc", NS).itertext())
mtest.check("Results point into: this document (SHA-256 %s" % hashlib.sha256(before).hexdigest() in desc,
            "the application's desc: %r" % desc[-300:])
who = {k.split("#")[1]: v for k, v in letter_senders(LETTERS, "ferry-letters").items()}
questioned = sorted(k for k, v in who.items() if not v)
candidates = sorted(set(v for v in who.values() if v))
mtest.check(questioned == ["L07", "L10", "L12"], "lxml finds questioned letters %s" % questioned)

# numpy: the run's counts and sizes, the same feature ranks as annotate --attribute (1-2000).
rows = mtest.read_tsv(mtest.run(["profile", "--values", "counts", "--ranks", "1-2000"] + BASE + [LETTERS]).stdout)
seg_ids = [r["segment"] for r in rows]
features = [k for k in rows[0] if k != "segment"]
counts = np.array([[float(r[f]) for f in features] for r in rows])
words = {s["segment"]: s["tokens"] for s in
         json.loads(mtest.run(["segments", "--format", "json", "--unit", "letter", LETTERS]).stdout)["segments"]}
Z = z_scores(counts, words, seg_ids, 2.0)

annotations = tree.findall(".//tei:standOff[@type='stylometry']//tei:annotation", NS)
attribution_targets = []
uncalibrated_decisions = 0
for ann in annotations:
    result = ann.find("tei:ptr[@type='result']", NS)
    if result is None:
        continue
    fs = ids[result.get("target").lstrip("#")]
    notes = [n for n in ann.findall("tei:note", NS) if n.get("type") == "caution"]
    mtest.check(len(notes) == 1 and notes[0].text.startswith(CAUTION), "%s lacks its caution note" % ann.get(XML_ID))
    mtest.check(fs_value(fs, "caution").startswith(CAUTION), "%s lacks the caution" % fs.get(XML_ID))
    letter = ann.get("target").lstrip("#")
    mtest.check(letter in questioned, "result for %s, which the edition does not question" % letter)
    if fs.get("type") == "attributionResult":
        mtest.check(ann.get("motivation") == "assessing", "attribution motivation %s" % ann.get("motivation"))
        attribution_targets.append(letter)
        q = Z[seg_ids.index("ferry-letters#" + letter)]
        expected = {c: to_candidate(q, Z[[seg_ids.index("ferry-letters#" + k) for k, v in who.items() if v == c]],
                                    "weighted", cosine)
                    for c in candidates}
        order = sorted(candidates, key=lambda c: expected[c])
        got = [(e.find("tei:f[@name='candidate']/tei:string", NS).text, fs_value(e, "distance"))
               for e in fs.findall("tei:f[@name='candidates']/tei:vColl/tei:fs", NS)]
        mtest.check([c for c, _ in got] == order, "%s: ranking %s, numpy %s" % (letter, got, order))
        for c, d in got:
            mtest.check(mtest.close(d, expected[c], rel=1e-9), "%s %s: distance %r, numpy %r" % (letter, c, d, expected[c]))
        mtest.check(mtest.close(fs_value(fs, "margin"), expected[order[1]] - expected[order[0]], rel=1e-9),
                    "%s: margin differs from numpy" % letter)
        pointer = ann.find("tei:ptr[@type='candidate']", NS)
        mtest.check(pointer is not None and pointer.get("target") == order[0] and order[0].lstrip("#") in ids,
                    "%s: the candidate pointer does not name the first candidate's person" % letter)
    else:
        mtest.check(fs.get("type") == "verificationResult", "unexpected result fs %s" % fs.get("type"))
        decision = fs_value(fs, "decision")
        # A score read against an uncalibrated band is not a calibrated one: none is written.
        calibrated = fs.find("tei:f[@name='bandCalibrated']/tei:binary", NS).get("value") == "true"
        mtest.check(calibrated or fs_value(fs, "calibratedScore") is None,
                    "%s: a calibratedScore without a calibrated band" % fs.get(XML_ID))
        score = fs_value(fs, "score")
        mtest.check(0 <= score <= 1, "verification score %r outside [0, 1]" % score)
        # docs/write-back.md: classifying when the calibrated band decides, else assessing.
        expected = "classifying" if decision != "undecided" and calibrated else "assessing"
        uncalibrated_decisions += decision != "undecided" and not calibrated
        mtest.check(ann.get("motivation") == expected, "verification %s: motivation %s for decision %s"
                    % (ann.get(XML_ID), ann.get("motivation"), decision))
mtest.check(sorted(attribution_targets) == questioned, "attributions written for %s" % attribution_targets)
mtest.check(uncalibrated_decisions > 0, "no decision of an uncalibrated band was written: the rule went untried")

# `show --format json` reads back what lxml reads in the file, with the caution.
shown = json.loads(mtest.run(["show", "--format", "json", edition]).stdout)
mtest.check(shown.get("caution", "").startswith(CAUTION), "show --format json lacks the caution")
by_lxml = {}
for fs in tree.iterfind(".//tei:fs[@type='attributionResult']", NS):
    by_lxml[fs_value(fs, "segment")] = [(e.find("tei:f[@name='candidate']/tei:string", NS).text, fs_value(e, "distance"))
                                        for e in fs.findall("tei:f[@name='candidates']/tei:vColl/tei:fs", NS)]
by_show = {a["segment"]: [(c["candidate"], c["distance"]) for c in a["candidates"]] for a in shown["attributions"]}
mtest.check(by_show == by_lxml, "show lists %s, lxml reads %s" % (by_show, by_lxml))
mtest.check(len(shown.get("verifications", [])) == len(questioned) * len(candidates), "show lists the verifications")
# Each verification's seed, a 64-bit unsigned number, comes back to the digit: with it the
# run can be repeated. lxml reads the digits; Python's int holds them exactly.
seeds_lxml = sorted(int(fs.find("tei:f[@name='problemSeed']/tei:numeric", NS).get("value"))
                    for fs in tree.iterfind(".//tei:fs[@type='verificationResult']", NS))
mtest.check(any(s >= 2 ** 63 for s in seeds_lxml), "a seed above 2^63 to check against: %s" % seeds_lxml)
seeds_show = sorted(v["problemSeed"] for v in shown["verifications"])
mtest.check(seeds_show == seeds_lxml, "show's seeds %s, lxml reads %s" % (seeds_show, seeds_lxml))
# `show` as TSV keeps each result's warnings beside it, and a verification's band status:
# every warning string lxml reads in a result fs is a "warning" row of that result.
rows = [line.split("\t") for line in mtest.run(["show", edition]).stdout.splitlines() if not line.startswith("#")]
for fs in tree.iterfind(".//tei:fs", NS):
    kind = {"attributionResult": "attribution", "verificationResult": "verification"}.get(fs.get("type"))
    if not kind:
        continue
    segment = fs_value(fs, "segment")
    other = fs_value(fs, "candidate") if kind == "verification" else ""
    wanted = sorted(s.text for s in fs.findall("tei:f[@name='warnings']//tei:string", NS))
    shown_rows = sorted(r[4] for r in rows if r[:4] == [kind, segment, other, "warning"])
    mtest.check(wanted and shown_rows == wanted, "show's warnings of %s %s %s: %r, lxml %r"
                % (kind, segment, other, shown_rows, wanted))
    if kind == "verification":
        band = fs.find("tei:f[@name='bandCalibrated']/tei:binary", NS).get("value")
        mtest.check([kind, segment, other, "bandCalibrated", band] in rows, "show lacks bandCalibrated %s" % band)
verified = [a for a in annotations if "verif" in (a.get(XML_ID) or "")]
mtest.check(len(verified) == len(questioned) * len(candidates),
            "%d verification annotations, expected one per questioned letter and candidate" % len(verified))

# W3C Web Annotation export: the caution travels with every attribution annotation.
doc = json.loads(mtest.run(["export", edition]).stdout)
items = doc["first"]["items"] if "first" in doc else doc["items"]
results = [a for a in items if "-attr-" in a["id"] or "-verif-" in a["id"]]
mtest.check(len(results) == len(questioned) * (1 + len(candidates)), "%d results exported" % len(results))
for a in results:
    mtest.check(any(b.get("purpose") == "commenting" and b.get("value", "").startswith(CAUTION) for b in a["body"]),
                "exported %s lacks the caution body" % a["id"])
seeds_export = sorted(json.loads(b["value"])["problemSeed"] for a in results if "-verif-" in a["id"]
                      for b in a["body"] if b.get("format") == "application/json")
mtest.check(seeds_export == seeds_lxml, "exported seeds %s, lxml reads %s" % (seeds_export, seeds_lxml))

# --- impostors, separate results file -----------------------------------------------------------
impostor = os.path.join(tmp, "impostor-letters.xml")
with open(LETTERS, encoding="utf-8") as f:
    text = f.read()
with open(impostor, "w", encoding="utf-8") as f:  # the same letters under other ids, all known
    f.write(text.replace('xml:id="L', 'xml:id="X').replace('cert="low" ', ""))
impostor_sha = hashlib.sha256(open(impostor, "rb").read()).hexdigest()
letters_copy = os.path.join(tmp, "letters.xml")
shutil.copy(LETTERS, letters_copy)
letters_sha = hashlib.sha256(open(letters_copy, "rb").read()).hexdigest()
results_file = os.path.join(tmp, "results.xml")
mtest.run(["annotate"] + BASE + SETTINGS + ["--verify", "--impostors", impostor, "--standoff-file", results_file,
                                            letters_copy])
mtest.check(hashlib.sha256(open(impostor, "rb").read()).hexdigest() == impostor_sha, "the impostor file was changed")
mtest.check(hashlib.sha256(open(letters_copy, "rb").read()).hexdigest() == letters_sha, "--standoff-file changed the edition")
res = etree.parse(results_file, PARSER)
profiled = [f.find("tei:f[@name='segment']/tei:string", NS).text for f in res.iterfind(".//tei:fs[@type='styleProfile']", NS)]
mtest.check(profiled and all(p.startswith("letters#") for p in profiled), "profiles written for %s" % profiled)
# An impostor is another author (with all their letters) or an impostor file (docs/attribution.md):
# against each of the three sure senders, the two others and the one file, that is 3; their
# segments include the impostor file's 12 letters.
results = list(res.iterfind(".//tei:fs[@type='verificationResult']", NS))
pools = [fs_value(f, "impostorPool") for f in results]
segments = [fs_value(f, "impostorSegments") for f in results]
mtest.check(pools and all(p == 3 for p in pools), "impostor pools %s: two other senders and the impostor file" % pools)
mtest.check(segments and all(n > 12 for n in segments), "impostor segments %s do not include the impostor file's letters"
            % segments)
errors = jing_errors(mtest.SCHEMA, [results_file])
mtest.check(not any(errors.values()), "tei_all (jing) rejects the results file: %s" % errors)

# --- a sender's @ref that points at no person entry ------------------------------------------
# An edition may point at an entry it lacks (no schema checks it): the candidate is still
# ranked, but no pointer is written through it, since it would lead nowhere. Every
# candidate pointer and @corresp written must name an xml:id of the document (lxml), and the
# sender whose entry was taken out keeps its place among the candidates.
lacking = os.path.join(tmp, "lacking-entry.xml")
with open(LETTERS, encoding="utf-8") as f:
    text = f.read()
entry_start = text.index('<person xml:id="p-pellow">')
entry_end = text.index("</person>", entry_start) + len("</person>")
with open(lacking, "w", encoding="utf-8") as f:
    f.write(text[:entry_start] + text[entry_end:])
mtest.run(["annotate"] + BASE + SETTINGS + ["--attribute", "--in-place", lacking])
tree = etree.parse(lacking, PARSER).getroot()
ids = id_targets(tree)
mtest.check("p-pellow" not in ids and tree.find(".//tei:persName[@ref='#p-pellow']", NS) is not None,
            "the fixture should keep @ref='#p-pellow' and lack its entry")
pointers = [p.get("target") for p in tree.iterfind(".//tei:annotation/tei:ptr[@type='candidate']", NS)]
pointers += [s.get("corresp") for s in tree.iterfind(".//tei:f[@name='candidate']/tei:string[@corresp]", NS)]
mtest.check(pointers and all(p.startswith("#") and p[1:] in ids for p in pointers),
            "candidate pointers naming no element of the edition: %s" % [p for p in pointers if p[1:] not in ids])
ranked = {s.text for s in tree.iterfind(".//tei:f[@name='candidate']/tei:string", NS)}
mtest.check("#p-pellow" in ranked, "the sender lacking an entry is no longer ranked: %s" % sorted(ranked))
errors = jing_errors(mtest.SCHEMA, [lacking])
mtest.check(not any(errors.values()), "tei_all (jing) rejects the annotated edition: %s" % errors)

# Two editions in one run, the second's person entries under other ids (its @refs lead
# nowhere in it): each attribution points at the first candidate's entry wherever the run
# has it, in itself or in the other edition, and every pointer resolves (lxml).
two = os.path.join(tmp, "two")
os.makedirs(two)
first, second = os.path.join(two, "harbour.xml"), os.path.join(two, "quay.xml")
shutil.copy(LETTERS, first)
with open(second, "w", encoding="utf-8") as f:
    f.write(text.replace('<person xml:id="p-', '<person xml:id="q-'))
# quay.xml first: a tie between the copies goes to its segments, so that the nearest segment of
# a candidate lies in the edition lacking the entries.
mtest.run(["annotate"] + BASE + SETTINGS + ["--attribute", "--in-place", second, first])
trees = {name: etree.parse(os.path.join(two, name), PARSER).getroot() for name in ("harbour.xml", "quay.xml")}
targets = {name: id_targets(tree) for name, tree in trees.items()}
for name, tree in trees.items():
    attributions = []
    for a in tree.iterfind(".//tei:standOff[@type='stylometry']//tei:annotation", NS):
        result = a.find("tei:ptr[@type='result']", NS)
        fs = targets[name].get(result.get("target")[1:]) if result is not None else None
        if result is not None:
            mtest.check(fs is not None, "%s: result pointer %s leads nowhere" % (name, result.get("target")))
        if fs is not None and fs.get("type") == "attributionResult":
            attributions.append(a)
    mtest.check(attributions, "%s: no attribution written" % name)
    for a in attributions:
        pointer = a.find("tei:ptr[@type='candidate']", NS)
        mtest.check(pointer is not None, "%s: an attribution without a candidate pointer, though harbour.xml has "
                    "every sender's entry" % name)
        document, _, fragment = pointer.get("target").partition("#")
        mtest.check(fragment in targets[document or name], "%s: candidate pointer %s leads nowhere"
                    % (name, pointer.get("target")))
errors = jing_errors(mtest.SCHEMA, [first, second])
mtest.check(not any(errors.values()), "tei_all (jing) rejects the annotated editions: %s" % errors)

# --- a speaker as candidate --------------------------------------------------------------------
# A speaker's label is qualified by its play ("ferry-play#jem", docs/attribution.md); its
# pointer goes to the person the play's @who names (lxml: the xml:ids of the play's
# particDesc), in the play itself, and the result is valid TEI (jing).
play = os.path.join(tmp, "ferry-play.xml")
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), play)
speaker_labels = os.path.join(tmp, "speakers.csv")
with open(speaker_labels, "w") as f:
    f.write("segment,label\nferry-play#hester,\n")  # Hester's speeches questioned
mtest.run(["annotate", "--unit", "speaker", "--min-tokens", "200", "--attribute", "--labels", speaker_labels]
          + SETTINGS + ["--in-place", play])
root = etree.parse(play, PARSER).getroot()
persons = {e.get(XML_ID) for e in root.iter(TEI + "person")}
who = {w.lstrip("#") for sp in root.iter(TEI + "sp") for w in (sp.get("who") or "").split()}
strings = root.xpath("//tei:fs[@type='candidateDistance']/tei:f[@name='candidate']/tei:string", namespaces=NS)
mtest.check(strings and all(s.text.startswith("ferry-play#") and s.get("corresp") == "#" + s.text.split("#")[1]
                            and s.text.split("#")[1] in persons & who for s in strings),
            "speaker candidates and their pointers: %r" % [(s.text, s.get("corresp")) for s in strings])
ptrs = root.xpath("//tei:ptr[@type='candidate']/@target", namespaces=NS)
mtest.check(len(ptrs) == 1 and ptrs[0].lstrip("#") in persons, "the candidate ptr: %r" % ptrs)
errors = jing_errors(mtest.SCHEMA, [play])[play]
mtest.check(not errors, "tei_all (jing) rejects the annotated play: %s" % errors)

mtest.done()
