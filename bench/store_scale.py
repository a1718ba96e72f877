"""How the archive store grows with the archive (a benchmark, not a test): `manicule batch`
over 1, 5, 10 and 20 copies of all GerDraCor plays (unit speaker), each copy made another
file by a comment after its XML declaration (a new content hash, the same text).

For each size, round by round (sizes interleaved, so that a busy moment on a shared machine
hits each alike):
  first     batch into a new store, nothing analysed (walk, read, count, store)
  rerun     batch again, nothing changed (every file's size and time checked, no XML read)
  analyse   analyse-store --recompute: Cosine Delta over the 1,000 most frequent words of
            the segments of at least 1,500 words, the 5 nearest of each, stored
Wall time from a microsecond clock around the process, CPU time and peak memory from the
kernel's rusage of the child (wait4); medians. The peer is the one-copy archive measured in
the same run: reading and storing should grow with the bytes (time per MB level), a re-run
with the files, the analysis' nearest-segment search with the square of the segments.

The copies repeat the plays' words, so the store's vocabulary does not grow as a real
archive's would (a real one adds forms with every file), and each segment has copies at
distance 0; the work the program does is the same whatever the values.

Usage: /usr/bin/python3 bench/store_scale.py BUILD/manicule [ROUNDS [SIZES [WORKDIR]]]
  (SIZES comma-separated copy counts, default 1,5,10,20; WORKDIR default a temporary
  folder, removed at the end: every size's copies are made first, so 1,5,10,20 needs
  about 6 GB free, 5.4 GB of copies and 0.6 GB of stores)
"""
import os
import shutil
import sqlite3
import statistics
import sys
import tempfile
import time

from archive_copies import as_copy, date_back, remove_store  # bench/, as child_usage
from child_usage import timed  # bench/, which Python puts first on the path of its scripts

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CORPORA = os.environ.get("MANICULE_CORPORA", os.path.join(ROOT, "..", "shared", "corpora"))
PLAYS = os.path.join(CORPORA, "gerdracor")


def make_archive(folder, copies):
    """`copies` copies of the plays under folder/copyNN/ (bench/archive_copies.py)."""
    targets = [os.path.join(folder, "copy%02d" % k) for k in range(copies)]
    for target in targets:
        os.makedirs(target)
    total = 0
    names = sorted(n for n in os.listdir(PLAYS) if n.endswith(".xml"))
    for name in names:
        with open(os.path.join(PLAYS, name), "rb") as f:
            data = f.read()
        for k, target in enumerate(targets):
            copy = as_copy(data, k)
            with open(os.path.join(target, name), "wb") as f:
                f.write(copy)
            total += len(copy)
    date_back(folder)
    return len(names) * copies, total


def main():
    binary = os.path.abspath(sys.argv[1])
    rounds = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    sizes = [int(s) for s in sys.argv[3].split(",")] if len(sys.argv) > 3 else [1, 5, 10, 20]
    own_work = len(sys.argv) <= 4
    work = sys.argv[4] if not own_work else tempfile.mkdtemp(prefix="manicule-scale-")
    try:
        measure(binary, rounds, sizes, work)
    finally:
        if own_work:
            shutil.rmtree(work, ignore_errors=True)


def measure(binary, rounds, sizes, work):
    archives = {}
    for copies in sizes:
        folder = os.path.join(work, "x%d" % copies)
        shutil.rmtree(folder, ignore_errors=True)
        archives[copies] = (folder,) + make_archive(folder, copies)
    times = {(c, v): [] for c in sizes for v in ("first", "rerun", "analyse")}
    segments = {}
    load_before = os.getloadavg()[0]
    for r in range(rounds):
        for copies in sizes:
            folder = archives[copies][0]
            store = os.path.join(work, "x%d.sqlite" % copies)
            remove_store(store)
            batch = [binary, "batch", folder, "--store", store, "--unit", "speaker", "--quiet"]
            times[(copies, "first")].append(timed(batch))
            times[(copies, "rerun")].append(timed(batch))
            times[(copies, "analyse")].append(
                timed([binary, "analyse-store", "--store", store, "--recompute"]))
            with sqlite3.connect(store) as db:
                segments[copies] = (
                    db.execute("SELECT count(*) FROM segments").fetchone()[0],
                    db.execute("SELECT count(*) FROM analysis_segments WHERE measured = 1 AND run_id = "
                               "(SELECT max(run_id) FROM analysis_segments)").fetchone()[0],
                    os.path.getsize(store))
            print("round %d, %d copies done" % (r + 1, copies), file=sys.stderr)
    load_after = os.getloadavg()[0]

    def median(copies, variant, what):
        return statistics.median(t[what] for t in times[(copies, variant)])

    print("%s, %d rounds, load average %.2f before and %.2f after\n" % (
        time.strftime("%Y-%m-%d %H:%M"), rounds, load_before, load_after))
    print("| copies | files | MB | segments (measured) | store MB | first: wall s | CPU s | peak MiB "
          "| s per 100 MB | rerun: wall s | peak MiB | analyse: wall s | CPU s | peak MiB |")
    print("| ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |")
    for copies in sizes:
        _, files, size = archives[copies]
        stored, measured, store_size = segments[copies]
        first = median(copies, "first", 0)
        print("| %d | %d | %.0f | %d (%d) | %.0f | %.2f | %.2f | %.0f | %.3f | %.3f | %.0f | %.2f | %.2f | %.0f |" % (
            copies, files, size / 1e6, stored, measured, store_size / 1e6, first, median(copies, "first", 1),
            median(copies, "first", 2), first / (size / 1e8), median(copies, "rerun", 0),
            median(copies, "rerun", 2), median(copies, "analyse", 0), median(copies, "analyse", 1),
            median(copies, "analyse", 2)))
    base = sizes[0]
    print("\nAgainst %d cop%s (the peer in this run):" % (base, "y" if base == 1 else "ies"))
    for copies in sizes[1:]:
        k = copies / base
        print("- %d copies (x%g): first run x%.2f (bytes x%.2f), rerun x%.2f (files x%g), "
              "analysis x%.2f (segments measured squared x%.1f)" % (
                  copies, k, median(copies, "first", 0) / median(base, "first", 0),
                  archives[copies][2] / archives[base][2],
                  median(copies, "rerun", 0) / median(base, "rerun", 0), k,
                  median(copies, "analyse", 0) / median(base, "analyse", 0),
                  (segments[copies][1] / segments[base][1]) ** 2))


if __name__ == "__main__":
    main()
