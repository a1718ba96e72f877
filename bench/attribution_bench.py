"""Attribution on real corpora: what each choice contributes, beside the issue's baseline.

Runs `manicule evaluate`, `attribute` and `verify` on
- the 27 eltec-eng novels whose authors have two or more novels (eltec-eng-metadata.tsv),
- their chapters of 2,000 words or more, each held out with its whole novel,
- gerdracor plays (whole, >= 5,000 words, anonym- excluded): authors with >= 3 plays in the
  corpus (the issue's set) and, stricter, authors with >= 3 such long plays,
- General Impostors on chapter pairs and on held-out segments against their rivals,
- the 17 anonym- plays against the known authors (a worked example; no truth is known),
and recomputes the baseline (plain Cosine Delta, z over all segments of the run, regex
tokens, nearest author centroid) with numpy. Prints Markdown for bench/RESULTS.md.

Usage, from the project root, after building:
  /usr/bin/python3 bench/attribution_bench.py [path/to/manicule] > /tmp/attribution.md
The corpora are read from ../shared/corpora (or MANICULE_CORPORA).
"""
import collections
import csv
import json
import os
import re
import subprocess
import sys
import tempfile
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
sys.path.insert(0, os.path.join(ROOT, "tests", "pylib"))
from attribution_baseline import baseline, regex_tokens, write_labels  # noqa: E402
BIN = sys.argv[1] if len(sys.argv) > 1 else os.path.join(ROOT, "build", "manicule")
CORPORA = os.environ.get("MANICULE_CORPORA", os.path.join(ROOT, "..", "shared", "corpora"))
NOVELS, PLAYS = os.path.join(CORPORA, "eltec-eng"), os.path.join(CORPORA, "gerdracor")
TMP = tempfile.mkdtemp()


def run(args):
    started = time.time()
    proc = subprocess.run([BIN] + args, capture_output=True, text=True)
    if proc.returncode != 0:
        sys.exit("manicule %s failed: %s" % (" ".join(args[:6]), proc.stderr[-1000:]))
    return proc.stdout, time.time() - started


def evaluate(args):
    out, seconds = run(["evaluate", "--format", "json"] + args)
    return json.loads(out)["evaluation"], seconds


def labels_file(name, rows):
    path = os.path.join(TMP, name)
    write_labels(path, rows)
    return path


def baseline_texts(unit, files, keep):
    out, _ = run(["segments", "--format", "json", "--show-text", "--unit", unit] + files)
    result = []
    for s in json.loads(out)["segments"]:
        if keep(s):
            text = " ".join(r["text"] for r in s["text"])
            result.append((s["segment"], collections.Counter(regex_tokens(text))))
    return result


VARIANTS = [("default: words 1-2000, z limited to +-2", []),
            ("words 1-1000", ["--ranks", "1-1000"]),
            ("words 1-3000", ["--ranks", "1-3000"]),
            ("words 1-2000, no z limit", ["--z-limit", "0"]),
            ("character 3-grams 1-3000", ["--features", "char-ngram", "--n", "3", "--ranks", "1-3000"]),
            ("character 4-grams 1-5000", ["--features", "char-ngram", "--n", "4", "--ranks", "1-5000"]),
            ("word 2-grams 1-2000", ["--features", "word-ngram", "--n", "2", "--ranks", "1-2000"])]


def variant_table(title, args, total):
    print("\n### %s\n" % title)
    print("| features | weighted centroid (default) | centroid | nearest segment | seconds |")
    print("| --- | ---: | ---: | ---: | ---: |")
    for name, extra in VARIANTS:
        e, seconds = evaluate(args + extra)
        cells = ["%d/%d (%.1f%%)" % (r["correct"], r["evaluated"], 100.0 * r["correct"] / r["evaluated"])
                 for r in e["rules"]]
        print("| %s | %s | %.1f |" % (name, " | ".join(cells), seconds))


def baseline_line(title, counters, labels, groups, mfws):
    cells = []
    for m in mfws:
        c = baseline(counters, labels, groups, m)
        cells.append("%d MFW %d/%d (%.1f%%)" % (m, c, len(labels), 100.0 * c / len(labels)))
    print("\nBaseline (%s, numpy): %s." % (title, "; ".join(cells)))


# Novels and chapters.
with open(os.path.join(CORPORA, "eltec-eng-metadata.tsv")) as f:
    meta = list(csv.DictReader(f, delimiter="\t"))
present = {n[:-4] for n in os.listdir(NOVELS)}
count = collections.Counter(r["author-name"] for r in meta if r["filename"] in present)
author_of = {r["filename"]: r["author-name"] for r in meta if r["filename"] in present and count[r["author-name"]] >= 2}
novel_files = [os.path.join(NOVELS, s + ".xml") for s in sorted(author_of)]
novel_labels = labels_file("novels.csv", [(s + "#whole1", a) for s, a in author_of.items()])
print("## Attribution (bench/attribution_bench.py)")
variant_table("Novels: 27 by 9 authors, leave one novel out", ["--labels", novel_labels] + novel_files, 27)
texts = baseline_texts("whole", novel_files, lambda s: True)
baseline_line("novels", [c for _, c in texts], [author_of[i.split("#")[0]] for i, _ in texts],
              list(range(len(texts))), [300, 500, 1000, 2000])

chapters = baseline_texts("chapter", novel_files, lambda s: s["tokens"] >= 2000)
chapter_labels = labels_file("chapters.csv", [(i, author_of[i.split("#")[0]]) for i, _ in chapters])
chapter_args = ["--unit", "chapter", "--min-tokens", "2000", "--leave-out-files", "--labels", chapter_labels]
variant_table("Chapters of >= 2,000 words (%d), each held out with its novel" % len(chapters),
              chapter_args + novel_files, len(chapters))
baseline_line("chapters", [c for _, c in chapters], [author_of[i.split("#")[0]] for i, _ in chapters],
              [i.split("#")[0] for i, _ in chapters], [300, 500, 1000, 2000])

# Plays.
out, _ = run(["segments", "--format", "json", PLAYS])
segs = [s for s in json.loads(out)["segments"] if not os.path.basename(s["file"]).startswith("anonym-")]
in_corpus = collections.Counter(s["author"] for s in segs)
issue_set = [s for s in segs if in_corpus[s["author"]] >= 3 and s["tokens"] >= 5000]
long_count = collections.Counter(s["author"] for s in segs if s["tokens"] >= 5000)
strict_set = [s for s in segs if long_count[s["author"]] >= 3 and s["tokens"] >= 5000]
for title, chosen in [("Plays: authors with >= 3 plays in the corpus", issue_set),
                      ("Plays: authors with >= 3 plays of >= 5,000 words", strict_set)]:
    files = [s["file"] for s in chosen]
    variant_table("%s (%d plays, %d authors), leave one play out" % (title, len(files),
                                                                    len({s["author"] for s in chosen})),
                  ["--min-tokens", "5000"] + files, len(files))
    keep = {s["segment"] for s in chosen}
    texts = baseline_texts("whole", files, lambda s: s["segment"] in keep)
    author = {s["segment"]: s["author"] for s in chosen}
    baseline_line("plays", [c for _, c in texts], [author[i] for i, _ in texts], list(range(len(texts))),
                  [300, 500, 1000, 2000])

# Verification.
print("\n### General Impostors verification\n")
print("| problems | impostors | same / different | undecided | AUC (PAN, calibrated) | AUC of the scores | c@1 | F0.5u | seconds |")
print("| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |")
plays_issue = ["--min-tokens", "5000"] + [s["file"] for s in issue_set]
for title, args in [("eltec-eng chapter pairs", chapter_args + ["--pairs", "1000"] + novel_files),
                    ("eltec-eng chapters vs own author / nearest rival", chapter_args + ["--verification"] + novel_files),
                    ("gerdracor plays vs own author / nearest rival", plays_issue + ["--verification"])]:
    for absent in (False, True):
        e, seconds = evaluate(args + (["--author-absent"] if absent else []))
        for v in e["verification"]:
            print("| %s | %s | %d / %d | %d | %.3f | %.3f | %.3f | %.3f | %.0f |" % (
                title, "own author absent" if absent else "all other authors", v["same"], v["different"],
                v["undecided"], v["auc"], v["raw_auc"], v["c_at_1"], v["f05u"], seconds))

# The anonymous plays.
anonym = sorted(os.path.join(PLAYS, n) for n in os.listdir(PLAYS) if n.startswith("anonym-"))
anonym_labels = labels_file("anonym.csv", [(os.path.basename(f)[:-4] + "#whole1", "") for f in anonym])
args = ["--min-tokens", "800", "--labels", anonym_labels] + [s["file"] for s in issue_set] + anonym
out, _ = run(["attribute", "--format", "json"] + args)
attributions = json.loads(out)["attributions"]
out, _ = run(["verify", "--format", "json"] + args)
verified = json.loads(out)
decision = {(v["segment"], v["candidate"]): v for v in verified["verifications"]}
band = verified["band"]
print("\n### The 17 anonymous plays against the known authors (worked example)\n")
print("Undecided band for verify: [%.2f, %.2f] (%s).\n" % (band["low"], band["high"], band["method"]))
print("| play | words | first (distance) | second (distance) | third | margin | stability | verify first |")
print("| --- | ---: | --- | --- | --- | ---: | ---: | --- |")


def short(name):
    return re.sub(r"( Q\d+| [0-9X]{8,})+$", "", name)


for a in attributions:
    c = a["candidates"]
    v = decision[(a["segment"], c[0]["candidate"])]
    print("| %s | %d | %s (%.3f) | %s (%.3f) | %s | %.3f | %.2f | %s, %.2f |" % (
        a["segment"].split("#")[0], a["words"], short(c[0]["candidate"]), c[0]["distance"],
        short(c[1]["candidate"]), c[1]["distance"], short(c[2]["candidate"]), a["margin"], a["stability"],
        v["decision"], v["score"]))
