"""What the A/B scripts (first_run_ab.py, rerun_ab.py) share: their command line (ROUNDS
CORPUS BUILD...), builds taking turns round by round, and their figures printed as medians
per build and as paired ratios to the first.

The order turns round every other round: in the order given in odd rounds, reversed in
even ones, so that neither a build's place in the round nor a drift of the host's speed
over the rounds favours one build (in fixed order, two runs of the same pair of builds,
minutes apart, gave ratios of 0.939 and 1.034; bench/RESULTS.md).
"""
import os
import statistics
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CORPORA = os.environ.get("MANICULE_CORPORA", os.path.join(ROOT, "..", "shared", "corpora"))
UNITS = {"gerdracor": "speaker", "eltec-eng": "chapter"}


def ab_arguments(usage):
    """ROUNDS CORPUS BUILD/manicule BUILD/manicule... from the command line (else exits
    with `usage`): the rounds, the corpus's folder, its unit and the builds. Prints the
    load average before the runs."""
    if len(sys.argv) < 5 or sys.argv[2] not in UNITS:
        sys.exit(usage)
    rounds, corpus, builds = int(sys.argv[1]), sys.argv[2], sys.argv[3:]
    print("load average before: %.2f %.2f %.2f; %d rounds; %s" % (*os.getloadavg(), rounds, corpus))
    return rounds, os.path.join(CORPORA, corpus), UNITS[corpus], builds


def print_load_after():
    print("load average after: %.2f %.2f %.2f\n" % os.getloadavg())


def turns(builds, rounds):
    """The builds, `rounds` times over, in the order they take their turns."""
    for round_number in range(rounds):
        yield from builds if round_number % 2 == 0 else reversed(builds)


def print_medians(runs, builds, number_format, extra_column=None):
    """A table of each build's median of each figure; runs[build] is a list of dicts of
    figures, number_format(key) the format of one. extra_column: (title, {build: text})."""
    keys = list(runs[builds[0]][0])
    titles = keys + ([extra_column[0]] if extra_column else [])
    print("| build | " + " | ".join(titles) + " |")
    print("| --- |" + " ---: |" * len(titles))
    for b in builds:
        cells = [number_format(k) % statistics.median(r[k] for r in runs[b]) for k in keys]
        if extra_column:
            cells.append(extra_column[1][b])
        print("| %s | " % b + " | ".join(cells) + " |")


def print_paired_ratios(runs, builds, key):
    """For each build after the first: the median of its `key` over the first build's in
    the same round, with the quartiles, and in how many rounds it was the faster."""
    for b in builds[1:]:
        ratios = sorted(x[key] / y[key] for x, y in zip(runs[b], runs[builds[0]]))
        q = statistics.quantiles(ratios, n=4) if len(ratios) > 1 else ratios * 3
        print("\n%s / %s, wall time round by round: median %.3f (quartiles %.3f, %.3f); faster in %d of %d rounds"
              % (b, builds[0], statistics.median(ratios), q[0], q[2], sum(r < 1 for r in ratios), len(ratios)))
