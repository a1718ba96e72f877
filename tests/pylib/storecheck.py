"""Helpers for the archive-store tests: pick and copy plays, read a store with Python's
sqlite3 module (the SQLite library itself, not our code) and turn its tables into plain
values that can be compared: surrogate ids (run ids, settings ids, feature ids) are
replaced by what they stand for, so two stores built in different orders compare equal
exactly when they hold the same data.

The counts blob format (docs/store.md): unsigned LEB128 varints, per feature in ascending
id order the gap to the previous id (the first: the id itself), then the count.
"""
import array
import fcntl
import hashlib
import os
import shutil
import sqlite3
import subprocess
import termios
import time

import mtest

GERDRACOR = os.path.join(mtest.CORPORA, "gerdracor")


def pick_plays(count, min_size=30000, max_size=160000):
    """`count` plays of moderate size, spread evenly over the corpus in name order."""
    if not os.path.isdir(GERDRACOR):
        print("SKIP: no corpus at " + GERDRACOR)
        raise SystemExit(77)
    names = sorted(n for n in os.listdir(GERDRACOR) if n.endswith(".xml")
                   and min_size <= os.path.getsize(os.path.join(GERDRACOR, n)) <= max_size)
    step = len(names) / count
    return [names[int(i * step)] for i in range(count)]


def copy_plays(names, folder, subfolder_every=0):
    """Copies the plays into `folder` (every n-th into folder/more/); returns the paths."""
    paths = []
    for i, name in enumerate(names):
        target = folder
        if subfolder_every and i % subfolder_every == subfolder_every - 1:
            target = os.path.join(folder, "more")
        os.makedirs(target, exist_ok=True)
        shutil.copy2(os.path.join(GERDRACOR, name), os.path.join(target, name))
        paths.append(os.path.join(target, name))
    return paths


def share_of(relative_path, n):
    """The share (1..n) a file belongs to by docs/store.md's rule for --shard K/N: 1 + the first
    8 bytes of the SHA-256 of its path relative to its input folder, big-endian, mod N."""
    return 1 + int(hashlib.sha256(relative_path.encode()).hexdigest()[:16], 16) % n


def sha256_of(path):
    with open(path, "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


def decode_counts(blob):
    out, pos, fid = [], 0, 0

    def varint():
        nonlocal pos
        value, shift = 0, 0
        while True:
            byte = blob[pos]
            pos += 1
            value |= (byte & 0x7F) << shift
            if not byte & 0x80:
                return value
            shift += 7

    while pos < len(blob):
        fid += varint()
        out.append((fid, varint()))
    return out


def reports_a_file(line):
    """Whether a line of `batch --verbose` reports a file finished (read, failed or only
    hashed): the runs table counts these, and the store holds each once it is reported."""
    return line.startswith(("read:", "failed:", "hashed"))


def run_stopped(command, after, sig, env=None, group=False, delay=0.0):
    """Runs `command` (a `batch --verbose`, or a script around one) and sends it `sig`
    `delay` seconds after it has reported `after` finished files (reports_a_file), to its
    whole process group with `group` (as a workload manager does); with `after` None, no
    signal. Reads its messages to the end and waits. Returns (exit code, files reported in
    all, the messages from the signal on)."""
    proc = subprocess.Popen(command, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True,
                            start_new_session=group)
    reported, signalled, after_signal = 0, False, []
    for line in proc.stderr:
        if signalled:
            after_signal.append(line)
        if reports_a_file(line):
            reported += 1
            if reported == after:
                time.sleep(delay)
                if group:
                    os.killpg(proc.pid, sig)
                else:
                    proc.send_signal(sig)
                signalled = True
    proc.wait()
    proc.stderr.close()
    return proc.returncode, reported, "".join(after_signal)


def run_stopped_when_blocked(command, sig, pipe_bytes=4096):
    """Runs `command` (a `batch --verbose` with more to report than `pipe_bytes`) with its
    messages going into a pipe of `pipe_bytes` (F_SETPIPE_SZ, Linux fcntl(2)) that nobody
    reads, waits until the pipe is full (FIONREAD: within 512 bytes of it, less than one
    message, as a write up to PIPE_BUF waits whole), so that the command is held in the
    middle of its work, and sends it `sig`. Unlike run_stopped, which races a command that
    may finish its few remaining files before the signal arrives, the stop then always
    comes part way. Returns (exit code, whether the pipe filled, all the messages)."""
    # The pipe is sized before the command starts, so that none of its writes come first.
    read_end, write_end = os.pipe()
    fcntl.fcntl(write_end, 1031, pipe_bytes)  # F_SETPIPE_SZ
    proc = subprocess.Popen(command, stdout=subprocess.DEVNULL, stderr=write_end)
    os.close(write_end)
    reader = os.fdopen(read_end, "rb")
    filled = False
    last, steady_since = -1, time.monotonic()
    while proc.poll() is None:
        waiting = array.array("i", [0])
        fcntl.ioctl(read_end, termios.FIONREAD, waiting)
        if waiting[0] != last:
            last, steady_since = waiting[0], time.monotonic()
        # Full: what is left is less than a message; or, for a message longer than that
        # margin, nothing more has come for a second while the command still runs.
        if waiting[0] > pipe_bytes - 512 or (waiting[0] > 0 and time.monotonic() - steady_since > 1.0):
            filled = True
            proc.send_signal(sig)
            break
        time.sleep(0.01)
    messages = reader.read().decode("utf-8", "replace")
    proc.wait()
    reader.close()
    return proc.returncode, filled, messages


def connect(path):
    db = sqlite3.connect(path)
    return db


def rows(path, sql, params=()):
    """The rows a query gives on the store at `path` (Python's sqlite3)."""
    db = connect(path)
    try:
        return db.execute(sql, params).fetchall()
    finally:
        db.close()


def integrity(path):
    db = connect(path)
    try:
        return db.execute("PRAGMA integrity_check").fetchone()[0]
    finally:
        db.close()


def logical_tables(path):
    """The stored archive as plain, comparable values (no run or surrogate ids)."""
    db = connect(path)
    try:
        key_of = dict(db.execute("SELECT settings_id, key FROM settings"))
        forms = {}
        for sid, fid, form in db.execute("SELECT settings_id, feature_id, form FROM vocabulary"):
            forms[(sid, fid)] = form
        tables = {
            "settings": sorted(db.execute(
                "SELECT key, unit, selection, tokenizer, features, request FROM settings")),
            # mtime_ns is left out like the run ids: a file modified within two seconds of a
            # run is stored without its time (racily clean), so it depends on when a run began.
            "files": sorted(db.execute(
                "SELECT path, relative_path, stem, size, sha256, read_error FROM files")),
            "readings": sorted((key_of[r[0]],) + tuple(r[1:]) for r in db.execute(
                "SELECT settings_id, sha256, bytes, status, error, error_kind, title, author, date, year, "
                "language, segments, tokens, first_segment_year, last_segment_year, texts_apart FROM readings")),
        }
        segments = []
        for row in db.execute(
                "SELECT settings_id, sha256, ordinal, local_id, unit, label, language, author, authorship, "
                "pointers, warnings, tokens, types, feature_total, counts, date, year, text_title, text_author, "
                "collection_titles, text_number "
                "FROM segments"):
            sid = row[0]
            counts = tuple(sorted((forms[(sid, fid)], n) for fid, n in decode_counts(row[14])))
            segments.append((key_of[sid],) + tuple(row[1:14]) + (counts,) + tuple(row[15:]))
        tables["segments"] = sorted(segments)
        tables["vocabulary"] = sorted((key_of[s], form) for (s, _), form in forms.items())
        return tables
    finally:
        db.close()


def latest_analysis(path):
    """The newest analysis run's tables, without run ids."""
    db = connect(path)
    try:
        run = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
        return run, {
            "segments": sorted(db.execute(
                "SELECT segment, path, sha256, ordinal, label, author, tokens, measured, excluded_reason "
                "FROM analysis_segments WHERE run_id = ?", (run,))),
            "features": sorted(db.execute(
                "SELECT rank, form, total, mean, sd FROM features WHERE run_id = ?", (run,))),
            "neighbours": sorted(db.execute(
                "SELECT segment, rank, neighbour, distance FROM neighbours WHERE run_id = ?", (run,))),
        }
    finally:
        db.close()


def last_run(path, kind="batch"):
    db = connect(path)
    db.row_factory = sqlite3.Row
    try:
        return dict(db.execute("SELECT * FROM runs WHERE kind = ? ORDER BY run_id DESC LIMIT 1", (kind,)).fetchone())
    finally:
        db.close()


def diff_summary(a, b):
    """The first difference between two logical_tables results, for a failure message."""
    for name in sorted(set(a) | set(b)):
        ra, rb = a.get(name, []), b.get(name, [])
        if ra != rb:
            only_a = [r for r in ra if r not in rb][:2]
            only_b = [r for r in rb if r not in ra][:2]
            return "%s differs (%d vs %d rows); only in first: %r; only in second: %r" % (
                name, len(ra), len(rb), [str(r)[:300] for r in only_a], [str(r)[:300] for r in only_b])
    return "no difference"
