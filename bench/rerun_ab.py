"""Two or more builds of the command line against each other on a re-run (not a test):
`batch --analyse` again over an unchanged corpus, whose first run each build made into a
store of its own beforehand. The builds take turns run by run, the order turning round
every other round (bench/build_turns.py says why). A re-run takes some 10-20 ms, so many
rounds are cheap and tell apart changes of a millisecond.

Printed: per build the medians of wall time, CPU time and system time of the re-run (from
the kernel's rusage of the child), whether the re-run left its store's bytes as they were
(SHA-256 before and after each re-run, hashlib), and for each build after the first the
median of its wall time over the first build's in the same round, with the quartiles.

Usage: /usr/bin/python3 bench/rerun_ab.py ROUNDS CORPUS BUILD/manicule BUILD/manicule...
  CORPUS is gerdracor (unit speaker) or eltec-eng (unit chapter), under ../shared/corpora
"""
import hashlib
import os
import tempfile

from build_turns import ab_arguments, print_load_after, print_medians, print_paired_ratios, turns  # bench/
from child_usage import run_with_usage  # bench/, which Python puts first on the path of its scripts


def sha256_of(path):
    with open(path, "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


def main():
    rounds, folder, unit, builds = ab_arguments(__doc__)
    runs = {b: [] for b in builds}
    unchanged = {b: 0 for b in builds}
    with tempfile.TemporaryDirectory() as scratch:
        stores = {b: os.path.join(scratch, "build%d.sqlite" % k) for k, b in enumerate(builds)}
        command = {b: [b, "batch", folder, "--store", stores[b], "--unit", unit, "--analyse", "--quiet"]
                   for b in builds}
        for b in builds:  # the first runs, then one re-run each to settle the files' times
            for _ in range(2):
                run_with_usage(command[b])
        for b in turns(builds, rounds):
            before = sha256_of(stores[b])
            wall, usage = run_with_usage(command[b])
            unchanged[b] += sha256_of(stores[b]) == before
            runs[b].append({"wall ms": 1000 * wall, "CPU ms": 1000 * (usage.ru_utime + usage.ru_stime),
                            "system ms": 1000 * usage.ru_stime})
    print_load_after()
    print_medians(runs, builds, lambda key: "%.2f",
                  ("store's bytes kept", {b: "%d of %d" % (unchanged[b], rounds) for b in builds}))
    print_paired_ratios(runs, builds, "wall ms")


if __name__ == "__main__":
    main()
