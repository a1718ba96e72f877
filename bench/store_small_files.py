"""A store of many small files (a benchmark, not a test): a correspondence archive often
keeps one small file per letter or bundle, where the plays are 200 KB a file. The archive
here is 20,000 copies of the invented example edition examples/ferry-letters.xml (36 KB,
12 letters), 200 to a folder, each made another content by a comment after its XML
declaration.

Per round, interleaved:
  batch      batch --unit letter into a new store, with the default transactions
  batch-64   the same with --commit-every 64 (the default before 2026-12-03)
  rerun      batch again, nothing changed
  read-only  manicule segments over the same folder, output thrown away: reading,
             selection, tokens and counts with nothing stored (the peer)
Wall time, CPU time and peak memory from the kernel's rusage of the child (wait4);
medians. After the rounds, each of batch and batch-64 runs once more under strace, which
counts the bytes the store's writes (pwrite64) carry: the store, its log and checkpoints.

Usage: /usr/bin/python3 bench/store_small_files.py BUILD/manicule [ROUNDS [FILES]]
  (needs about 1 GB free in the temporary folder; strace for the write counts)
"""
import os
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import time

from archive_copies import as_copy, date_back, remove_store  # bench/, as child_usage
from child_usage import timed  # bench/, which Python puts first on the path of its scripts

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
LETTERS = os.path.join(ROOT, "examples", "ferry-letters.xml")


def make_archive(folder, files):
    """`files` copies of the letters, 200 to a folder (bench/archive_copies.py)."""
    with open(LETTERS, "rb") as f:
        data = f.read()
    total = 0
    for k in range(files):
        sub = os.path.join(folder, "%03d" % (k // 200))
        os.makedirs(sub, exist_ok=True)
        copy = as_copy(data, k)
        with open(os.path.join(sub, "letters-%05d.xml" % k), "wb") as f:
            f.write(copy)
        total += len(copy)
    date_back(folder)
    return total


def written_bytes(args):
    """Bytes carried by the pwrite64 calls of a command, counted by strace."""
    with tempfile.NamedTemporaryFile("r") as trace:
        subprocess.run(["strace", "-f", "-e", "trace=pwrite64", "-o", trace.name] + args,
                       stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, check=True)
        return sum(int(m.group(1)) for m in re.finditer(r"pwrite64\(.*\) = (\d+)", trace.read()))


def measure(binary, rounds, files, work):
    archive = os.path.join(work, "letters")
    size = make_archive(archive, files)
    store = os.path.join(work, "store.sqlite")
    batch = [binary, "batch", archive, "--store", store, "--unit", "letter", "--quiet"]
    variants = {
        "batch": (batch, True),
        "batch-64": (batch + ["--commit-every", "64"], True),
        "rerun": (batch, False),
        "read-only": ([binary, "segments", archive, "--unit", "letter"], False),
    }
    times = {v: [] for v in variants}
    load_before = os.getloadavg()[0]
    for r in range(rounds):
        for name, (args, new_store) in variants.items():
            if new_store:
                remove_store(store)
            times[name].append(timed(args))
        print("round %d done" % (r + 1), file=sys.stderr)
    load_after = os.getloadavg()[0]
    writes = {}
    if shutil.which("strace"):
        for name in ("batch", "batch-64"):
            remove_store(store)
            writes[name] = written_bytes(variants[name][0])
    store_size = os.path.getsize(store) if os.path.exists(store) else 0

    def median(name, what):
        return statistics.median(t[what] for t in times[name])

    print("%s, %d rounds, %d files, %.0f MB; load average %.2f before and %.2f after\n" % (
        time.strftime("%Y-%m-%d %H:%M"), rounds, files, size / 1e6, load_before, load_after))
    print("| variant | wall s (median) | CPU s | peak MiB | wall s, each round | bytes written |")
    print("| --- | ---: | ---: | ---: | --- | ---: |")
    for name in variants:
        written = "%.0f MB" % (writes[name] / 1e6) if name in writes else ""
        print("| %s | %.3f | %.2f | %.0f | %s | %s |" % (
            name, median(name, 0), median(name, 1), median(name, 2),
            " ".join("%.3f" % t[0] for t in times[name]), written))
    print("\nstore %.0f MB; batch-64 / batch %.2fx; batch / read-only %.2fx" % (
        store_size / 1e6, median("batch-64", 0) / median("batch", 0), median("batch", 0) / median("read-only", 0)))


def main():
    binary = os.path.abspath(sys.argv[1])
    rounds = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    files = int(sys.argv[3]) if len(sys.argv) > 3 else 20000
    work = tempfile.mkdtemp(prefix="manicule-small-files-")
    try:
        measure(binary, rounds, files, work)
    finally:
        shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    main()
