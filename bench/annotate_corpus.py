"""Write-back over whole corpora: every GerDraCor play (speakers) and every ELTeC novel
(chapters) is copied to a temporary folder and annotated in place, one run per file, as
an editor would. Per file it records the run's wall time and the bytes added, and checks
with difflib that the output is the input plus insertions only (removing them gives the
input back byte for byte). With --jing, it also validates the outputs against TEI P5
tei_all.rng in batches and compares the errors with the inputs'.

Run from the project root (Debian's Python for lxml):
  /usr/bin/python3 bench/annotate_corpus.py --bin build/manicule [--jing] [--limit N]
Never writes into the corpora: only into a temporary folder, removed at the end.
"""
import argparse
import glob
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "tests", "pylib"))
from standoff_check import inserted_chunks, jing_errors, remove_chunks  # noqa: E402


def annotate_all(binary, files, unit, work):
    rows, refused = [], []
    for source in files:
        copy = os.path.join(work, os.path.basename(source))
        shutil.copyfile(source, copy)
        start = time.monotonic()
        proc = subprocess.run([binary, "annotate", copy, "--unit", unit, "--in-place"], capture_output=True, text=True)
        seconds = time.monotonic() - start
        if proc.returncode != 0:
            refused.append((os.path.basename(source), proc.returncode, proc.stderr.strip().splitlines()[-1:]))
            continue
        before, after = open(source, "rb").read(), open(copy, "rb").read()
        check_start = time.monotonic()
        try:
            chunks = inserted_chunks(before, after)
            preserved = remove_chunks(after, chunks) == before
        except AssertionError:
            chunks, preserved = [], False
        rows.append({"file": source, "copy": copy, "seconds": seconds, "bytes": len(before),
                     "added": len(after) - len(before), "ranges": len(chunks), "preserved": preserved,
                     "check_seconds": time.monotonic() - check_start})
    return rows, refused


def compare_with_distances(binary, rows, unit, count):
    """Wall time of `distances` (the same reading and measuring, no write-back) on the
    first `count` files, beside annotate's, to show what the write-back itself costs."""
    pairs = []
    for r in rows[:count]:
        start = time.monotonic()
        proc = subprocess.run([binary, "distances", r["file"], "--unit", unit, "--format", "json"],
                              capture_output=True)
        if proc.returncode == 0:
            pairs.append((time.monotonic() - start, r["seconds"]))
    if pairs:
        d = sum(p[0] for p in pairs)
        a = sum(p[1] for p in pairs)
        print("on %d files: distances %.1f s, annotate %.1f s (write-back adds %.0f%%)"
              % (len(pairs), d, a, 100 * (a - d) / d))


def report(name, rows, refused, elapsed):
    total_mb = sum(r["bytes"] for r in rows) / 1e6
    times = [r["seconds"] for r in rows]
    print("## %s" % name)
    print("files annotated: %d, refused or failed: %d" % (len(rows), len(refused)))
    for f, code, message in refused[:10]:
        print("  refused %s (exit %d): %s" % (f, code, " ".join(message)))
    print("byte preservation (difflib: insertions only, input recovered): %d of %d"
          % (sum(r["preserved"] for r in rows), len(rows)))
    print("inserted ranges per file: %s" % sorted({r["ranges"] for r in rows}))
    if rows:
        print("input: %.1f MB; added: %.1f MB (%.1f%% of the input)"
              % (total_mb, sum(r["added"] for r in rows) / 1e6, 100 * sum(r["added"] for r in rows) / 1e6 / total_mb))
        print("annotate per file: median %.3f s, mean %.3f s, max %.3f s; sum %.1f s (%.1f MB/s)"
              % (statistics.median(times), statistics.mean(times), max(times), sum(times), total_mb / sum(times)))
    print("wall time of the whole loop (with copies and checks): %.1f s" % elapsed)


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--bin", default="build/manicule")
    parser.add_argument("--corpora", default=os.path.join("..", "shared", "corpora"))
    parser.add_argument("--limit", type=int, default=0)
    parser.add_argument("--jing", action="store_true")
    parser.add_argument("--compare", type=int, default=0, help="time distances on the first N files too")
    parser.add_argument("--schema", default=os.path.join("..", "shared", "schemas", "tei_all.rng"))
    args = parser.parse_args()
    binary = os.path.abspath(args.bin)
    for corpus, unit in (("gerdracor", "speaker"), ("eltec-eng", "chapter")):
        files = sorted(glob.glob(os.path.join(args.corpora, corpus, "*.xml")))
        if args.limit:
            files = files[:args.limit]
        work = tempfile.mkdtemp(prefix="manicule-bench-annotate-")
        try:
            start = time.monotonic()
            rows, refused = annotate_all(binary, files, unit, work)
            report("%s (%s)" % (corpus, unit), rows, refused, time.monotonic() - start)
            if args.compare:
                compare_with_distances(binary, rows, unit, args.compare)
            if args.jing:
                new = 0
                batch = 50
                for i in range(0, len(rows), batch):
                    part = rows[i:i + batch]
                    before = jing_errors(args.schema, [r["file"] for r in part])
                    after = jing_errors(args.schema, [r["copy"] for r in part])
                    for r in part:
                        extra = after[os.path.abspath(r["copy"])] - before[os.path.abspath(r["file"])]
                        if extra:
                            new += 1
                            print("  new jing errors in %s: %s" % (os.path.basename(r["file"]), sorted(extra)[:2]))
                print("jing: files with errors the input did not have: %d of %d" % (new, len(rows)))
        finally:
            shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    main()
