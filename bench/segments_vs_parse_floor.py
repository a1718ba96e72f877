#!/usr/bin/env python3
"""Benchmark: `manicule segments --unit speaker` over all plays vs the libxml2 parse floor.

Runs, in one session and alternating, `xmllint --stream --noout` over the same files (the
floor: parsing alone, libxml2's streaming reader) and manicule on one core (--threads 1),
both pinned to the same core, and on all cores. Reports median wall and CPU (user+sys) seconds, MB/s, peak memory
(/usr/bin/time -v) and the ratios. Usage (from the project root, after a Release build):

    /usr/bin/python3 bench/segments_vs_parse_floor.py [build/manicule] [repeats]
"""
import glob
import os
import statistics
import subprocess
import sys
import tempfile

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
BIN = sys.argv[1] if len(sys.argv) > 1 else os.path.join(ROOT, "build", "manicule")
REPEATS = int(sys.argv[2]) if len(sys.argv) > 2 else 5
FILES = sorted(glob.glob(os.path.join(ROOT, "..", "shared", "corpora", "gerdracor", "*.xml")))
MB = sum(os.path.getsize(f) for f in FILES) / 1e6


def timed(cmd):
    with tempfile.NamedTemporaryFile("r") as t:
        subprocess.run(["/usr/bin/time", "-v", "-o", t.name] + cmd, stdout=subprocess.DEVNULL,
                       stderr=subprocess.DEVNULL, check=False)
        stats = {}
        for line in open(t.name):
            key, _, value = line.strip().rpartition(": ")
            stats[key] = value
    wall = stats["Elapsed (wall clock) time (h:mm:ss or m:ss)"].split(":")
    seconds = float(wall[-1]) + 60 * float(wall[-2]) + (3600 * float(wall[-3]) if len(wall) > 2 else 0)
    cpu = float(stats["User time (seconds)"]) + float(stats["System time (seconds)"])
    return seconds, cpu, int(stats["Maximum resident set size (kbytes)"]) / 1024


# The floor and the one-core run are pinned to the same core (taskset; MANICULE_BENCH_CORE,
# default 0): on a shared virtual machine one virtual core can run a third slower than the
# other for minutes, and a single-threaded process lands on either; pinned, both sides of
# the ratio meet the same core.
PIN = ["taskset", "-c", os.environ.get("MANICULE_BENCH_CORE", "0")]
commands = {
    "xmllint --stream --noout": PIN + ["xmllint", "--stream", "--noout"] + FILES,
    "manicule segments, 1 core": PIN + [BIN, "segments", "--unit", "speaker", "--threads", "1"] + FILES,
    "manicule segments, 2 cores": [BIN, "segments", "--unit", "speaker", "--threads", "2"] + FILES,
}
results = {name: [] for name in commands}
for _ in range(REPEATS):
    for name, cmd in commands.items():
        results[name].append(timed(cmd))

print("%d files, %.1f MB, %d repeats, medians; load average before: %s"
      % (len(FILES), MB, REPEATS, open("/proc/loadavg").read().split()[:3]))
print("| command | wall s | CPU s | MB/s (wall) | peak MiB |")
print("|---|---|---|---|---|")
med = {}
for name, runs in results.items():
    wall = statistics.median(r[0] for r in runs)
    cpu = statistics.median(r[1] for r in runs)
    peak = max(r[2] for r in runs)
    med[name] = (wall, cpu)
    print("| %s | %.2f | %.2f | %.1f | %.0f |" % (name, wall, cpu, MB / wall, peak))
floor = med["xmllint --stream --noout"]
one = med["manicule segments, 1 core"]
two = med["manicule segments, 2 cores"]
print()
print("ratio to the parse floor, 1 core: wall %.2fx, CPU %.2fx (target: within 2x)" % (one[0] / floor[0], one[1] / floor[1]))
print("ratio to the parse floor, 2 cores: wall %.2fx" % (two[0] / floor[0]))
