"""The progress display of batch and analyse-store: drawn on a terminal, silent otherwise.

A real pseudo-terminal (Python's pty, POSIX openpty) stands for the user's terminal on
stderr, while stdout goes to a pipe. Over all GerDraCor plays (../shared/corpora):
- batch --analyse draws "k/N files  X MB/s  m:ss left" with N the TEI files os.walk
  finds, k rising to N; then the analysis' steps in their order (stored counts, feature
  table, nearest segments, storing results), with shares that only rise and a nearest-
  segment search that ends at 100 %; the line is cleared (ECMA-48 EL, ESC [ K, after a
  carriage return) before any other message (no message follows a drawn line without a
  clear between), and stdout holds none of it;
- analyse-store --recompute draws the same steps, with --pca also "principal components",
  and with --attribute over the invented letters (examples/) "candidate authors";
- a re-run whose analysis is stored computes nothing and draws no analysis step;
- with --quiet, or with stderr a pipe rather than a terminal (a log, a job's output), or
  on a terminal that declares no cursor control (TERM=dumb), nothing is drawn: no carriage
  return, no "files", no "analysis:";
- on a narrow terminal (40 columns, and 24 for the reading) every line drawn fits, less one
  column, by leaving out its least needed parts: the share done and the time left stay whole.
"""
import fcntl
import os
import pty
import re
import shutil
import struct
import subprocess
import sys
import tempfile
import termios

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402

PLAYS = os.path.join(mtest.CORPORA, "gerdracor")
CLEAR = "\r\x1b[K"  # carriage return, then EL (erase to the end of the line)
LEFT = r"((?:\d+:)?\d+:\d\d|--:--) left"  # m:ss, or h:mm:ss past an hour
FILES_LINE = re.compile(r"^(\d+)/(\d+) files  (\d+\.\d) MB/s  " + LEFT + "$")
STEP_LINE = re.compile(r"^analysis: ([a-z ]+?)(?:  (\d+)%  " + LEFT + ")?$")
EXAMPLES = os.path.join(mtest.ROOT, "examples")


def run_on_terminal(args, columns=0, env=None):
    """(exit code, stdout, what the terminal got on stderr) of manicule ARGS; with
    `columns`, on a terminal that says it is that wide (TIOCSWINSZ, Linux tty_ioctl(4))."""
    try:
        controller, terminal = pty.openpty()
    except OSError as e:  # a container without /dev/ptmx: no terminal to draw on
        print("SKIP: no pseudo-terminal: %s" % e)
        sys.exit(77)
    if columns:
        fcntl.ioctl(terminal, termios.TIOCSWINSZ, struct.pack("HHHH", 24, columns, 0, 0))
    # stdout to a file, not a pipe: the terminal is read to its end first, and a full pipe
    # would stop the program before that end.
    out_file = tempfile.TemporaryFile()
    proc = subprocess.Popen([mtest.BIN] + args, stdout=out_file, stderr=terminal, env=env)
    os.close(terminal)
    received = b""
    while True:
        try:
            chunk = os.read(controller, 65536)
        except OSError:  # EIO: the terminal's other end is closed
            break
        if not chunk:
            break
        received += chunk
    proc.wait(timeout=600)
    os.close(controller)
    out_file.seek(0)
    out = out_file.read()
    out_file.close()
    # The terminal's output processing turns "\n" into "\r\n" (ONLCR); undo it.
    return proc.returncode, out.decode(), received.decode().replace("\r\n", "\n")


def drawn(stderr):
    """The progress lines drawn (each after a clear), in order, and the text after the last
    clear (what the terminal shows when the program is done). A message (a piece with a
    line end) must not begin with a progress line: it would have been written over the
    line rather than after a clear."""
    pieces = stderr.split(CLEAR)
    for piece in pieces:
        first = piece.split("\n")[0]
        mtest.check("\n" not in piece or not (FILES_LINE.match(first) or
                                              first.startswith(("analysis:", "\r"))),
                    "a message printed over a progress line: %r" % piece[:200])
    return [p for p in pieces[1:] if p and "\n" not in p], pieces[-1]


def check_steps(lines, expected_steps, context):
    steps, shares = [], {}
    for line in lines:
        m = STEP_LINE.match(line)
        if not m:
            continue
        if not steps or steps[-1] != m.group(1):
            steps.append(m.group(1))
        if m.group(2) is not None:
            shares.setdefault(m.group(1), []).append(int(m.group(2)))
    mtest.check(steps == expected_steps, "%s: steps drawn %r, expected %r" % (context, steps, expected_steps))
    for step, values in shares.items():
        mtest.check(values == sorted(values) and 0 <= values[0] and values[-1] <= 100,
                    "%s: the shares of %s only rise, within 0-100: %r" % (context, step, values))
    mtest.check(shares.get("nearest segments", [None])[-1] == 100,
                "%s: the nearest-segment search ends at 100 %%: %r" % (context, shares.get("nearest segments")))


tei_files = sum(1 for _, _, names in os.walk(PLAYS) for n in names
                if n.lower().endswith((".xml", ".tei")) and not n.startswith("."))
mtest.check(tei_files > 700, "the test's own count of the plays: %d" % tei_files)

with tempfile.TemporaryDirectory() as tmp:
    store = os.path.join(tmp, "plays.sqlite")
    batch = ["batch", PLAYS, "--store", store, "--unit", "speaker", "--analyse"]

    code, out, err = run_on_terminal(batch)
    mtest.check(code == 0, "batch --analyse on a terminal exited %d: %s" % (code, err[-2000:]))
    lines, after = drawn(err)
    files = [FILES_LINE.match(line) for line in lines if FILES_LINE.match(line)]
    mtest.check(len(files) >= 2, "batch drew file counts: %r" % lines[:5])
    done = [int(m.group(1)) for m in files]
    mtest.check(all(int(m.group(2)) == tei_files for m in files),
                "each line counts of the %d files os.walk finds: %r" % (tei_files, files[-1].group(0)))
    mtest.check(done == sorted(done) and done[-1] == tei_files,
                "files done rise to all %d: %r" % (tei_files, done[-3:]))
    mtest.check(all(FILES_LINE.match(line) or STEP_LINE.match(line) for line in lines),
                "every drawn line is a file count or an analysis step: %r"
                % [line for line in lines if not (FILES_LINE.match(line) or STEP_LINE.match(line))][:3])
    check_steps(lines, ["stored counts", "feature table", "nearest segments", "storing results"], "batch --analyse")
    # The file counts come before the analysis, and the last line drawn is cleared before
    # the notes: what stays on the terminal is messages only.
    first_step = next(i for i, line in enumerate(lines) if STEP_LINE.match(line))
    mtest.check(all(FILES_LINE.match(line) for line in lines[:first_step]), "file counts first, then the analysis")
    mtest.check(not after.strip() or after.lstrip().startswith("manicule: note"),
                "the terminal is left with messages only: %r" % after[:200])
    mtest.check("\r" not in out and "files  " not in out and "analysis:" not in out,
                "stdout (a pipe) holds no progress: %r" % out[:300])
    mtest.check("batch run 1: %d file(s): %d read" % (tei_files, tei_files) in out, "the summary on stdout: %r" % out)

    code, out, err = run_on_terminal(["analyse-store", "--store", store, "--recompute"])
    mtest.check(code == 0, "analyse-store on a terminal exited %d: %s" % (code, err[-2000:]))
    lines, after = drawn(err)
    check_steps(lines, ["stored counts", "feature table", "nearest segments", "storing results"], "analyse-store")
    mtest.check(all(STEP_LINE.match(line) for line in lines), "analyse-store draws steps only: %r" % lines[:3])

    code, out, err = run_on_terminal(["analyse-store", "--store", store, "--pca"])
    mtest.check(code == 0, "analyse-store --pca on a terminal exited %d: %s" % (code, err[-2000:]))
    check_steps(drawn(err)[0], ["stored counts", "feature table", "nearest segments", "principal components",
                                "storing results"], "analyse-store --pca")

    # The invented letters have unsigned ones (docs/attribution.md): their candidates are ranked.
    letters = os.path.join(tmp, "letters.sqlite")
    code, out, err = run_on_terminal(["batch", EXAMPLES, "--store", letters, "--unit", "letter", "--analyse",
                                      "--attribute", "--min-tokens", "50"])
    mtest.check(code == 0 and "attribution row(s)" in out, "batch --attribute exited %d: %s %s" % (code, out, err))
    check_steps(drawn(err)[0], ["stored counts", "feature table", "nearest segments", "candidate authors",
                                "storing results"], "batch --analyse --attribute")

    # The analysis is stored: a re-run reads nothing and computes nothing.
    code, out, err = run_on_terminal(batch)
    mtest.check(code == 0 and "analysis:" not in err, "a re-run draws no analysis step: %r" % err[-500:])

    # A narrow terminal (40 columns, where "analysis: nearest segments  12%  0:14 left" is
    # 43): each line fits, less one column, as a line that wraps leaves its first rows on
    # the screen when the next clears the last; it sheds its least needed parts first
    # ("analysis: ", then the step's name), so the share and the time left stay whole where
    # they were cut before (a review saw "analysis: nearest segments  4" at 43 %).
    shed_step = re.compile(r"^(?:(?:analysis: )?[a-z ]+?  )?\d+%  " + LEFT + "$")
    code, out, err = run_on_terminal(["analyse-store", "--store", store, "--recompute"], columns=40)
    lines, _ = drawn(err)
    mtest.check(code == 0 and lines and all(len(line) <= 39 for line in lines),
                "on 40 columns, lines of %r characters" % sorted({len(line) for line in lines}))
    mtest.check(all(STEP_LINE.match(line) or shed_step.match(line) for line in lines),
                "on 40 columns, lines neither whole nor shed: %r" % [l for l in lines if not shed_step.match(l)][:3])
    mtest.check(any(re.match(r"^nearest segments  \d+%  " + LEFT + "$", line) for line in lines),
                "on 40 columns the search keeps its name, share and time left: %r" % lines[:6])
    # The reading of 120 plays on 24 columns: "k/120 files  m:ss left" while it fits (k under
    # 100), else the share of the bytes and the time left, never a time cut in two.
    some_plays = os.path.join(tmp, "some-plays")
    os.makedirs(some_plays)
    for name in sorted(n for n in os.listdir(PLAYS) if n.endswith(".xml"))[:120]:
        shutil.copy(os.path.join(PLAYS, name), some_plays)
    narrow_store = os.path.join(tmp, "narrow.sqlite")
    code, out, err = run_on_terminal(["batch", some_plays, "--store", narrow_store, "--unit", "speaker"], columns=24)
    lines, _ = drawn(err)
    shed_files = re.compile(r"^(?:\d+/\d+ files  |\d+%  )?" + LEFT + "$")
    mtest.check(code == 0 and lines and all(len(line) <= 23 and shed_files.match(line) for line in lines),
                "on 24 columns, reading lines %r" % [l for l in lines if not shed_files.match(l)][:3])
    mtest.check(any(" files  " in line for line in lines),
                "on 24 columns no line kept its files where they fit: %r" % lines[:5])
    # A terminal without cursor control (TERM=dumb, terminfo(5)) gets no progress line.
    code, out, err = run_on_terminal(["analyse-store", "--store", store, "--recompute"],
                                     env=dict(os.environ, TERM="dumb"))
    mtest.check(code == 0 and "\r" not in err and "analysis:" not in err, "TERM=dumb: %r" % err[:300])

    for args, how in ((batch + ["--recompute", "--quiet"], "batch --quiet on a terminal"),
                      (["analyse-store", "--store", store, "--recompute", "-q"], "analyse-store -q on a terminal")):
        code, out, err = run_on_terminal(args)
        mtest.check(code == 0, "%s exited %d" % (how, code))
        mtest.check("\r" not in err and "files  " not in err and "analysis:" not in err,
                    "%s draws nothing: %r" % (how, err[:300]))

    for args, how in ((batch + ["--recompute"], "batch"), (["analyse-store", "--store", store, "--recompute"],
                                                           "analyse-store")):
        proc = mtest.run(args)  # stderr a pipe, as in a log or a job's output
        mtest.check("\r" not in proc.stderr and "files  " not in proc.stderr and "analysis:" not in proc.stderr,
                    "%s with stderr not a terminal draws nothing: %r" % (how, proc.stderr[:300]))

mtest.done()
