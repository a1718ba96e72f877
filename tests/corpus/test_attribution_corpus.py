"""Attribution on real editions: the acceptance figures of the attribution issue that fit
in a test run, each beside a baseline recomputed here with Debian numpy.

Baseline (as the issue defines it): plain Cosine Delta (Smith & Aldridge 2011) on z-scores
taken over ALL segments of the run, a regex tokenizer (letters/digits joined by ' ’ . :,
case-folded, segments without a letter dropped), the most frequent words of the run, and
the nearest author centroid. The texts are those `manicule segments --show-text` selects
(selection itself is checked against lxml in test_selection_corpus.py); tokenizing,
counting, standardising and attributing are done independently (tests/pylib/attribution_baseline.py).

Asserted (defaults of `manicule evaluate`):
- eltec-eng novels, authors with two or more novels in eltec-eng-metadata.tsv (27 novels by
  9 authors), leave-one-novel-out: at least 26 of 27;
- their chapters of 2,000 words or more, each with its own novel left out: at least 92%;
- gerdracor plays (whole, at least 5,000 words, authors with at least three plays in the
  corpus, anonym- files excluded), leave-one-play-out: at least 80%;
- General Impostors on 500 same-author and 500 different-author chapter pairs from
  different novels: AUC at least 0.90 (c@1 and F0.5u printed);
- only long chapters selected: no NaN anywhere in the JSON.
bench/attribution_bench.py runs the larger comparisons recorded in bench/RESULTS.md.
"""
import collections
import csv
import json
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
from attribution_baseline import baseline, regex_tokens, write_labels  # noqa: E402

NOVELS = os.path.join(mtest.CORPORA, "eltec-eng")
PLAYS = os.path.join(mtest.CORPORA, "gerdracor")
METADATA = os.path.join(mtest.CORPORA, "eltec-eng-metadata.tsv")
if not (os.path.isdir(NOVELS) and os.path.isdir(PLAYS) and os.path.isfile(METADATA)):
    print("corpora not found at " + mtest.CORPORA)
    sys.exit(77)
tmp = mtest.scratch_folder()
def strict_json(text):
    def no_constant(name):
        mtest.fail("JSON holds " + name)
    return json.loads(text, parse_constant=no_constant)


def texts(unit, files):
    segs = json.loads(mtest.run(["segments", "--format", "json", "--show-text", "--unit", unit] + files).stdout)
    return [(s["segment"], s["tokens"], " ".join(r["text"] for r in s["text"])) for s in segs["segments"]]


def evaluate(args):
    return strict_json(mtest.run(["evaluate", "--format", "json"] + args).stdout)["evaluation"]


# --- Novels -------------------------------------------------------------------------------
with open(METADATA) as f:
    meta = list(csv.DictReader(f, delimiter="\t"))
present = {n[:-4] for n in os.listdir(NOVELS)}
by_author = collections.Counter(r["author-name"] for r in meta if r["filename"] in present)
chosen = [r for r in meta if r["filename"] in present and by_author[r["author-name"]] >= 2]
author_of = {r["filename"]: r["author-name"] for r in chosen}
files = [os.path.join(NOVELS, r["filename"] + ".xml") for r in chosen]
mtest.check(len(files) == 27 and len(set(author_of.values())) == 9, "27 novels by 9 authors expected")
novel_labels = os.path.join(tmp, "novels.csv")
write_labels(novel_labels, [(s + "#whole1", a) for s, a in author_of.items()])
ours = evaluate(["--labels", novel_labels] + files)
whole = texts("whole", files)
counters = [collections.Counter(regex_tokens(t)) for _, _, t in whole]
labels = [author_of[i.split("#")[0]] for i, _, _ in whole]
base = {m: baseline(counters, labels, list(range(len(labels))), m) for m in (300, 1000, 2000)}
print("novels: ours %d/27 (rules: %s); baseline %s" % (
    ours["correct"], ", ".join("%s %d" % (r["rule"], r["correct"]) for r in ours["rules"]),
    ", ".join("%d MFW %d/27" % kv for kv in base.items())))
mtest.check(ours["evaluated"] == 27 and ours["correct"] >= 26, "novels: %d/27 right, at least 26 needed"
            % ours["correct"])
mtest.check(min(base.values()) >= 25, "the numpy baseline should reach about 26/27 (the issue's figure)")

# --- Chapters -----------------------------------------------------------------------------
chapters = [c for c in texts("chapter", files) if c[1] >= 2000]
chapter_labels = os.path.join(tmp, "chapters.csv")
write_labels(chapter_labels, [(i, author_of[i.split("#")[0]]) for i, _, _ in chapters])
chapter_args = ["--unit", "chapter", "--min-tokens", "2000", "--leave-out-files", "--labels", chapter_labels]
ours = evaluate(chapter_args + ["--pairs", "500"] + files)
counters = [collections.Counter(regex_tokens(t)) for _, _, t in chapters]
labels = [author_of[i.split("#")[0]] for i, _, _ in chapters]
groups = [i.split("#")[0] for i, _, _ in chapters]
base = {m: baseline(counters, labels, groups, m) / len(labels) for m in (500, 2000)}
print("chapters: ours %d/%d = %.3f (rules: %s); baseline %s" % (
    ours["correct"], ours["evaluated"], ours["accuracy"],
    ", ".join("%s %d" % (r["rule"], r["correct"]) for r in ours["rules"]),
    ", ".join("%d MFW %.3f" % kv for kv in base.items())))
mtest.check(ours["evaluated"] == len(chapters), "every chapter of 2,000 words or more is evaluated")
mtest.check(ours["accuracy"] >= 0.92, "chapters: %.3f right, at least 0.92 needed" % ours["accuracy"])
pairs = ours["verification"][0]
print("chapter pairs (General Impostors): AUC %.3f (scores before the band %.3f), c@1 %.3f, F0.5u %.3f"
      % (pairs["auc"], pairs["raw_auc"], pairs["c_at_1"], pairs["f05u"]))
mtest.check(pairs["same"] == 500 and pairs["different"] == 500, "500 pairs of each kind expected")
mtest.check(pairs["raw_auc"] >= 0.90 and pairs["auc"] >= 0.90, "chapter pairs: AUC below 0.90")

# --- Only long chapters: zero-variance features must not turn into NaN -------------------
doc = strict_json(mtest.run(["evaluate", "--format", "json", "--unit", "chapter", "--min-tokens", "9000",
                             "--ranks", "1-5000", "--labels", chapter_labels, "--leave-out-files",
                             "--verification", "--iterations", "20"] + files).stdout)
mtest.check(doc["evaluation"]["evaluated"] > 0, "some chapters have 9,000 words or more")

# --- Plays --------------------------------------------------------------------------------
segs = json.loads(mtest.run(["segments", "--format", "json", PLAYS]).stdout)["segments"]
segs = [s for s in segs if not os.path.basename(s["file"]).startswith("anonym-")]
plays_by = collections.Counter(s["author"] for s in segs)
plays = [s["file"] for s in segs if plays_by[s["author"]] >= 3 and s["tokens"] >= 5000]
ours = evaluate(["--min-tokens", "5000"] + plays)
print("plays: ours %d/%d = %.3f (rules: %s)" % (ours["correct"], ours["evaluated"], ours["accuracy"],
                                               ", ".join("%s %d" % (r["rule"], r["correct"]) for r in ours["rules"])))
mtest.check(ours["evaluated"] == len(plays) and ours["accuracy"] >= 0.80,
            "plays: %.3f right, at least 0.80 needed" % ours["accuracy"])
mtest.done()
