"""Two or more builds of the command line against each other (not a test): the first run
of `batch --analyse` into a new store over one corpus, the builds taking turns round by
round, so that a busy moment on a shared machine hits each alike. For deciding whether a
change to the reading, the store or the analysis pays, where the figures of two separate
benchmark runs would differ by more than the change.

Each round runs every build once, 0.3 s apart, each into a new store, the order turning
round every other round (bench/build_turns.py says why).
Printed: per build the medians of wall time, CPU time, system time, peak memory and
context switches (voluntary and involuntary, from the kernel's rusage of the child); and
for each build after the first, the median of its wall time over the first build's in the
same round (with the quartiles) and how many rounds it was the faster in. A ratio from
paired rounds holds up on a host whose speed drifts, where the medians alone may not.

Usage: /usr/bin/python3 bench/first_run_ab.py ROUNDS CORPUS BUILD/manicule BUILD/manicule...
  CORPUS is gerdracor (unit speaker) or eltec-eng (unit chapter), under ../shared/corpora
"""
import os
import tempfile
import time

from archive_copies import remove_store  # bench/, as child_usage
from build_turns import ab_arguments, print_load_after, print_medians, print_paired_ratios, turns  # bench/
from child_usage import run_with_usage  # bench/, which Python puts first on the path of its scripts


def first_run(binary, folder, unit, store):
    """Wall s, CPU s, system s, peak MiB and context switches of one first run."""
    remove_store(store)
    time.sleep(0.3)
    wall, usage = run_with_usage([binary, "batch", folder, "--store", store, "--unit", unit, "--analyse", "--quiet"])
    return {"wall s": wall, "CPU s": usage.ru_utime + usage.ru_stime, "system s": usage.ru_stime,
            "peak MiB": usage.ru_maxrss / 1024, "switches": usage.ru_nvcsw + usage.ru_nivcsw}


def main():
    rounds, folder, unit, builds = ab_arguments(__doc__)
    runs = {b: [] for b in builds}
    with tempfile.TemporaryDirectory() as scratch:
        store = os.path.join(scratch, "ab.sqlite")
        for b in turns(builds, rounds):
            runs[b].append(first_run(b, folder, unit, store))
    print_load_after()
    print_medians(runs, builds, lambda key: "%.3f" if key.endswith(" s") else "%.0f")
    print_paired_ratios(runs, builds, "wall s")


if __name__ == "__main__":
    main()
