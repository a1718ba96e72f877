#!/usr/bin/python3
"""Benchmark: Cosine Delta and Burrows's Delta matrices for random z-scores (5,000 segments x
2,000 features by default, seeded), manicule's measure_driver against SciPy's pdist (cosine,
cityblock) in the same run. Each side runs in its own process under /usr/bin/time -v, so
peak memory is per process; each is run --runs times and the median reported.

Usage: /usr/bin/python3 bench/distance_speed.py [--driver PATH] [--rows N] [--cols N]
                                                [--runs K] [--threads T] [--seed S]
The driver is tests/tools/measure_driver (target measure_driver); by default it is taken
from MANICULE_MEASURE_DRIVER. Prints a Markdown table for bench/RESULTS.md.
"""
import argparse
import os
import re
import statistics
import subprocess
import sys
import tempfile

import numpy as np

PAIRS = [("cosine-delta", "cosine"), ("burrows-delta", "cityblock")]

SCIPY_RUN = """
import sys, time
import numpy as np
from scipy.spatial.distance import pdist
x = np.fromfile(sys.argv[1], dtype='<f8').reshape(int(sys.argv[2]), int(sys.argv[3]))
start = time.perf_counter()
d = pdist(x, sys.argv[4])
if sys.argv[4] == 'cityblock':
    d /= x.shape[1]  # Burrows's Delta is the mean absolute difference
print('seconds\\t%.6f' % (time.perf_counter() - start), file=sys.stderr)
"""


def timed(command):
    """Runs under /usr/bin/time -v -> (compute seconds, wall, user+sys CPU, peak MiB)."""
    proc = subprocess.run(["/usr/bin/time", "-v"] + command, capture_output=True, text=True)
    if proc.returncode != 0:
        sys.exit("failed: %s\n%s" % (" ".join(command), proc.stderr[-2000:]))
    err = proc.stderr
    compute = float(re.search(r"^seconds\t([0-9.]+)", err, re.M).group(1))
    wall = re.search(r"Elapsed \(wall clock\) time \(h:mm:ss or m:ss\): (\S+)", err).group(1)
    seconds = 0.0
    for part in wall.split(":"):
        seconds = seconds * 60 + float(part)
    cpu = float(re.search(r"User time \(seconds\): ([0-9.]+)", err).group(1)) + \
        float(re.search(r"System time \(seconds\): ([0-9.]+)", err).group(1))
    peak = int(re.search(r"Maximum resident set size \(kbytes\): (\d+)", err).group(1)) / 1024
    return compute, seconds, cpu, peak


def median_of(runs):
    return tuple(statistics.median(values) for values in zip(*runs))


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--driver", default=os.environ.get("MANICULE_MEASURE_DRIVER", ""))
    parser.add_argument("--rows", type=int, default=5000)
    parser.add_argument("--cols", type=int, default=2000)
    parser.add_argument("--runs", type=int, default=3)
    parser.add_argument("--threads", type=int, default=2)
    parser.add_argument("--seed", type=int, default=20240601)
    args = parser.parse_args()
    if not args.driver or not os.path.exists(args.driver):
        sys.exit("give --driver or set MANICULE_MEASURE_DRIVER (build target measure_driver)")

    rng = np.random.default_rng(args.seed)
    with tempfile.TemporaryDirectory(prefix="manicule-bench-") as directory:
        data = os.path.join(directory, "z.f64")
        rng.standard_normal((args.rows, args.cols)).astype("<f8").tofile(data)
        shape = [str(args.rows), str(args.cols)]
        print("%d x %d random z-scores (seed %d), median of %d runs, %d threads for manicule; load "
              "average before: %s" % (args.rows, args.cols, args.seed, args.runs, args.threads,
                                      open("/proc/loadavg").read().split()[0]))
        print()
        print("| measure | implementation | compute s | process wall s | CPU s | peak MiB | speed-up |")
        print("| --- | --- | ---: | ---: | ---: | ---: | ---: |")
        for ours_name, scipy_name in PAIRS:
            ours, theirs = [], []
            for _ in range(args.runs):  # interleaved, so that load changes hit both sides
                ours.append(timed([args.driver, "distance", "--measure", ours_name, "--binary", data,
                                   "--rows", shape[0], "--cols", shape[1], "--threads", str(args.threads),
                                   "--output", "none"]))
                theirs.append(timed(["/usr/bin/python3", "-c", SCIPY_RUN, data] + shape + [scipy_name]))
            ours_m, theirs_m = median_of(ours), median_of(theirs)
            print("| %s | manicule | %.2f | %.2f | %.2f | %.0f | %.1fx |"
                  % ((ours_name,) + ours_m + (theirs_m[0] / ours_m[0],)))
            print("| %s | scipy pdist('%s') | %.2f | %.2f | %.2f | %.0f | 1.0x |"
                  % ((ours_name, scipy_name) + theirs_m))
        print()
        print("load average after: %s" % open("/proc/loadavg").read().split()[0])


if __name__ == "__main__":
    main()
