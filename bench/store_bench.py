"""Benchmark of the archive store (not a test): `manicule batch` over whole corpora
against the Python baseline (bench/baseline_archive.py), in one session.

For each corpus (all GerDraCor plays by speaker, all ELTeC-eng novels by chapter), each
round runs, measuring wall time with a microsecond clock and CPU time and peak memory
from the kernel's accounting of the child process (wait4):
  first      batch --analyse into a new store, on all cores
  first-1    the same with --threads 1 (one reading thread, and since 2026-12-05 one
             thread for the analysis, its BLAS included; the store's checkpoint may
             still use the other core)
  first-1core  the same pinned to one core (taskset -c 0): the one-core time
  rerun      batch --analyse again, nothing changed (no XML read, stored analysis reused)
  rerun-read batch again without --analyse (what a re-run costs to find that nothing changed)
  baseline   /usr/bin/python3 bench/baseline_archive.py (lxml + scikit-learn, one process)
  read-only  manicule segments over the same folder, output thrown away: reading, selection,
             tokens and counts on all cores with nothing stored and nothing analysed (how
             fast the first run could be if the store and the analysis cost nothing)
  read-only-1core  the same on one thread pinned to one core: with read-only, how much two
             cores of this machine give to work that is perfectly parallel (the ceiling of
             the first run's two-core ratio)
  xmllint    xmllint --stream --noout over the same files: libxml2 parsing alone, one core
Rounds are interleaved so that a busy moment on a shared machine hits every variant alike;
the medians and their ratios are printed as Markdown, with the load average before and after,
and the three targets' ratios round by round.
Files are in the page cache after the first round, for every variant alike.
After the rounds, the baseline's nearest segments are compared with the store's (the
same segments measured? the same neighbours?), so that the figures are known to be of
the same job.

Usage: /usr/bin/python3 bench/store_bench.py BUILD/manicule [ROUNDS [VARIANTS [CORPORA]]]
  (from the project root; VARIANTS and CORPORA are comma-separated subsets, e.g.
  first,first-1 and gerdracor)
"""
import os
import sqlite3
import statistics
import subprocess
import sys
import tempfile

from archive_copies import remove_store  # bench/, as child_usage
from child_usage import timed  # bench/, which Python puts first on the path of its scripts

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CORPORA = os.environ.get("MANICULE_CORPORA", os.path.join(ROOT, "..", "shared", "corpora"))
BASELINE = os.path.join(ROOT, "bench", "baseline_archive.py")


def agreement(store, baseline_tsv):
    """How far the baseline's nearest segments agree with those of the store's latest
    analysis: segments in both, same neighbour at the same rank, same set of neighbours,
    and the largest and median difference of the distances at the same rank."""
    db = sqlite3.connect(store)
    run = db.execute("SELECT max(run_id) FROM neighbours").fetchone()[0]
    ours = {(seg, rank): (nb, dist) for seg, rank, nb, dist in db.execute(
        "SELECT segment, rank, neighbour, distance FROM neighbours WHERE run_id = ?", (run,))}
    db.close()
    theirs = {}
    with open(baseline_tsv, encoding="utf-8") as f:
        for line in f:
            seg, rank, nb, dist = line.rstrip("\n").split("\t")
            theirs[(seg, int(rank))] = (nb, float(dist))
    our_segments = {seg for seg, _ in ours}
    their_segments = {seg for seg, _ in theirs}
    common = our_segments & their_segments
    pairs = [key for key in ours if key[0] in common and key in theirs]
    same_rank = sum(ours[k][0] == theirs[k][0] for k in pairs)
    def neighbour_sets(table):
        sets = {}
        for (seg, _), (nb, _) in table.items():
            sets.setdefault(seg, set()).add(nb)
        return sets

    our_sets, their_sets = neighbour_sets(ours), neighbour_sets(theirs)
    same_set = sum(our_sets[s] == their_sets[s] for s in common)
    diffs = sorted(abs(ours[k][1] - theirs[k][1]) for k in pairs)
    return ("agreement with the baseline: %d segments measured by both (%d by manicule only, %d by the "
            "baseline only); the same neighbour at the same rank in %d of %d pairs (%.1f %%), the same "
            "set of neighbours for %d of %d segments; distances at the same rank differ by at most %.4f "
            "(median %.1e)" % (len(common), len(our_segments - common), len(their_segments - common),
                               same_rank, len(pairs), 100.0 * same_rank / max(1, len(pairs)), same_set,
                               len(common), diffs[-1] if diffs else 0.0,
                               statistics.median(diffs) if diffs else 0.0))


def load():
    with open("/proc/loadavg") as f:
        return " ".join(f.read().split()[:3])


def main():
    if len(sys.argv) < 2:
        sys.exit("usage: /usr/bin/python3 bench/store_bench.py BUILD/manicule [ROUNDS [VARIANTS [CORPORA]]]")
    if sys.argv[1] == "--agreement":
        print(agreement(sys.argv[2], sys.argv[3]))
        return
    binary = os.path.abspath(sys.argv[1])
    rounds = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    wanted = sys.argv[3].split(",") if len(sys.argv) > 3 else None
    corpora = [("gerdracor", "speaker"), ("eltec-eng", "chapter")]
    if len(sys.argv) > 4:
        corpora = [c for c in corpora if c[0] in sys.argv[4].split(",")]
    print("load average before: %s; %d rounds; %d cores" % (load(), rounds, os.cpu_count()))
    for name, unit in corpora:
        folder = os.path.join(CORPORA, name)
        results = {}
        xml_files = sorted(os.path.join(d, f) for d, _, fs in os.walk(folder) for f in fs if f.endswith(".xml"))
        with tempfile.TemporaryDirectory() as tmp:
            store = os.path.join(tmp, "store.sqlite")
            batch = [binary, "batch", folder, "--store", store, "--unit", unit, "--quiet"]
            for _ in range(rounds):
                for variant, args, fresh in [
                    ("first", batch + ["--analyse"], True),
                    ("first-1", batch + ["--analyse", "--threads", "1"], True),
                    ("first-1core", ["taskset", "-c", "0"] + batch + ["--analyse", "--threads", "1"], True),
                    ("rerun", batch + ["--analyse"], False),
                    ("rerun-read", batch, False),
                    ("baseline", ["/usr/bin/python3", BASELINE, folder, unit, os.path.join(tmp, "base.tsv")], False),
                    ("read-only", [binary, "segments", folder, "--unit", unit], False),
                    ("read-only-1core", ["taskset", "-c", "0", binary, "segments", folder, "--unit", unit,
                                         "--threads", "1"], False),
                    ("xmllint", ["xmllint", "--stream", "--noout"] + xml_files, False),
                ]:
                    if wanted and variant not in wanted:
                        continue
                    if fresh:
                        remove_store(store)
                    results.setdefault(variant, []).append(timed(args, (0, 1)))
            base_tsv = os.path.join(tmp, "base.tsv")
            agreed = None
            if os.path.exists(base_tsv) and os.path.exists(store):
                # In a process of its own: the script's memory would otherwise grow by the
                # tables compared, and a child's peak (below) starts from the script's size.
                agreed = subprocess.run([sys.executable, os.path.abspath(__file__), "--agreement", store, base_tsv],
                                        check=True, capture_output=True, text=True).stdout.strip()
        med = {v: tuple(statistics.median(r[i] for r in runs) for i in range(3)) for v, runs in results.items()}
        print("\n### %s (%s)\n" % (name, unit))
        print("| variant | wall s (median) | CPU s | peak MiB | wall s, each round |")
        print("| --- | ---: | ---: | ---: | --- |")
        for v, (wall, cpu, rss) in med.items():
            print("| %s | %.3f | %.2f | %.0f | %s |" % (v, wall, cpu, rss, " ".join("%.3f" % r[0] for r in results[v])))
        ratios = [("baseline", "first"), ("first", "rerun"), ("first", "rerun-read"), ("first-1", "first"),
                  ("first-1core", "first"), ("baseline", "read-only"), ("first", "read-only"), ("read-only-1core", "read-only"),
                  ("read-only", "xmllint")]
        print("\n" + "; ".join("%s / %s: %.2fx (CPU %.2fx)" % (a, b, med[a][0] / med[b][0], med[a][1] / med[b][1])
                                for a, b in ratios if a in med and b in med))
        # The same three targets round by round: a busy spell on a shared host lengthens the
        # 10 s baseline more surely than a 1 s first run, which the ratio of medians hides.
        per_round = []
        for a, b in [("baseline", "first"), ("first", "rerun"), ("first-1core", "first")]:
            if a in results and b in results:
                each = [x[0] / y[0] for x, y in zip(results[a], results[b])]
                per_round.append("%s / %s %s" % (a, b, " ".join("%.2fx" % r for r in each)))
        if per_round:
            print("\nround by round: " + "; ".join(per_round))
        if agreed:
            print("\n" + agreed)
    print("\nload average after: %s" % load())


if __name__ == "__main__":
    main()
