"""The job-array script of the README (examples/slurm-batch.sh), run by bash as the two
tasks of an array job would run it, with Slurm's variables set by hand (no workload
manager here) and `manicule` on PATH.

Task 1 gets SIGTERM, sent to its whole process group as Slurm does at a time limit, after
its first file: the task must fail with 143 and still leave its share's store, with the run
marked interrupted and every file it reported (or, where the signal lands after the share's
last file, as it can on a loaded machine, marked done with every file); submitted again, it
must go on from there (reading only the rest) and succeed. Task 2 runs through. A task
given an option batch refuses, or no --unit, fails with exit 2 and leaves nothing behind;
saved shares get the mode the umask grants a new file. The two
shares merged must hold every play of the archive (os.walk) and the same tables as one
batch run over it. Each share's store holds just the files of its share (while stopped, some
of them: as many as it reported), by the documented rule of --shard, computed with hashlib.
Outside references: the script itself as printed in the README (compared byte for byte
with the file), the script's own #SBATCH --array line (how many shares the merge line
names), os.walk, hashlib (the shard rule, each stored SHA-256), SQLite's PRAGMA
integrity_check.
"""
import os
import re
import signal
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

SCRIPT = os.path.join(mtest.ROOT, "examples", "slurm-batch.sh")

with open(SCRIPT, encoding="utf-8") as f:
    script_text = f.read()
for doc in ("README.md", os.path.join("docs", "store.md")):
    with open(os.path.join(mtest.ROOT, doc), encoding="utf-8") as f:
        mtest.check(script_text in f.read(), doc + " does not print examples/slurm-batch.sh as it is")

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    storecheck.copy_plays(storecheck.pick_plays(16, min_size=100000, max_size=250000), archive)
    plays = {os.path.join(d, name) for d, _, names in os.walk(archive) for name in names if name.endswith(".xml")}
    # reference: hashlib, by docs/store.md's rule (storecheck.share_of)
    share_files = {k: {p for p in plays if storecheck.share_of(os.path.relpath(p, archive), 2) == k} for k in (1, 2)}
    mtest.check(all(share_files.values()), "each of the two shares holds a play: %r" % share_files)

    def stored_files(store):
        """The paths a store holds, with their SHA-256 (Python's sqlite3)."""
        return dict(storecheck.rows(store, "SELECT path, sha256 FROM files"))

    results = os.path.join(tmp, "results")
    shims = os.path.join(tmp, "bin")
    os.makedirs(shims)
    os.symlink(os.path.abspath(mtest.BIN) if os.path.sep in mtest.BIN else mtest.BIN, os.path.join(shims, "manicule"))

    def task(k, stop_after=None, alone=False, extra=()):
        """Runs array task k of 2 (MANICULE_SHARES=2, the script's way of being told the number
        of shares); alone, as the one task of an array submitted again for it (sbatch
        --array=K: Slurm then sets SLURM_ARRAY_TASK_MIN to K and SLURM_ARRAY_TASK_COUNT to 1);
        with stop_after, sends SIGTERM to the task's process group once it has reported that
        many files. Returns (exit code, files reported)."""
        # One CPU a task, so one reading thread: the stop lands while files remain.
        env = dict(os.environ, PATH=shims + os.pathsep + os.environ["PATH"], SLURM_ARRAY_TASK_ID=str(k),
                   SLURM_ARRAY_TASK_MIN=str(k) if alone else "1", SLURM_ARRAY_TASK_COUNT="1" if alone else "2",
                   SLURM_CPUS_PER_TASK="1", MANICULE_SHARES="2", TMPDIR=tmp)
        code, reported, _ = storecheck.run_stopped(["bash", SCRIPT, archive, results, "--unit", "speaker", "--verbose"]
                                                   + list(extra), stop_after, signal.SIGTERM, env=env, group=True)
        return code, reported

    # A task whose batch refuses its options (here an option no command has) fails with the
    # batch's exit code 2 and, like every task, leaves no scratch folder behind (it did).
    env = dict(os.environ, PATH=shims + os.pathsep + os.environ["PATH"], SLURM_ARRAY_TASK_ID="1",
               SLURM_ARRAY_TASK_MIN="1", SLURM_ARRAY_TASK_COUNT="2", MANICULE_SHARES="2", TMPDIR=tmp)
    refused = subprocess.run(["bash", SCRIPT, archive, results, "--unit", "speaker", "--no-such-option"],
                             capture_output=True, text=True, env=env)
    # reference: the option given, named by batch's refusal (CLI11: "not expected")
    mtest.check(refused.returncode == 2 and "--no-such-option" in refused.stderr,
                "a task with a bad option: exit %d, %s" % (refused.returncode, refused.stderr))
    mtest.check(not [n for n in os.listdir(tmp) if n.startswith("tmp")], "the refused task left its scratch folder")
    mtest.check(not os.path.exists(os.path.join(results, "shard-1-of-2.sqlite")), "the refused task saved a store")

    # Without --unit a task would read under the default unit, a settings of its own: the
    # script refuses with its usage line (exit 2) and saves nothing.
    no_unit = subprocess.run(["bash", SCRIPT, archive, results, "--verbose", "--quiet", "--folder", "a -unit"],
                             capture_output=True, text=True, env=env)
    # reference: the script's usage line, as the script itself writes it (re)
    usage = re.search(r'^usage="(.*)"$', script_text, re.M).group(1)
    mtest.check(no_unit.returncode == 2 and no_unit.stderr == usage + "\n"
                and not os.path.exists(os.path.join(results, "shard-1-of-2.sqlite")),
                "a task without --unit: exit %d, %s" % (no_unit.returncode, no_unit.stderr))

    # The unit given in CLI11's joined short form passes the script's check (batch then
    # refuses the other option, with its own message, not the script's usage line).
    for short_form in (["-uspeaker"], ["-qu", "speaker"]):
        joined = subprocess.run(["bash", SCRIPT, archive, results] + short_form + ["--no-such-option"],
                                capture_output=True, text=True, env=env)
        mtest.check(joined.returncode == 2 and "usage: slurm-batch.sh" not in joined.stderr
                    and "--no-such-option" in joined.stderr,
                    "%r: exit %d, %s" % (short_form, joined.returncode, joined.stderr))

    code, reported = task(1, stop_after=1)
    share = os.path.join(results, "shard-1-of-2.sqlite")
    mtest.check(code == 143, "task 1 stopped by SIGTERM exited %d, expected 143" % code)
    mtest.check(os.path.exists(share), "the stopped task left no store of its share")
    first = storecheck.last_run(share)
    # On a loaded machine the signal can land after the share's last file: the run is then
    # complete and recorded as done (exit 143 all the same, and the store whole).
    stopped_early = first["status"] == "interrupted" and first["files_read"] == reported
    stopped_late = first["status"] == "done" and first["files_read"] == reported == first["files_found"]
    mtest.check(stopped_early or stopped_late, "the stopped task's run: %r, %d files reported" % (first, reported))
    # reference: hashlib, what it saved is as many files as it reported, all of share 1
    # (storecheck.share_of), each with its content's SHA-256.
    saved = stored_files(share)
    mtest.check(len(saved) == reported and set(saved) <= share_files[1]
                and all(sha == storecheck.sha256_of(p) for p, sha in saved.items()),
                "the stopped task saved %r; it reported %d files, share 1 is %r"
                % (sorted(saved), reported, sorted(share_files[1])))
    code, _ = task(1)
    again = storecheck.last_run(share)
    if stopped_late:  # nothing left to do: the share's store is not written again (docs/store.md)
        mtest.check(code == 0 and again == first, "task 1 again after a complete run: exit %d, run %r" % (code, again))
    else:
        mtest.check(code == 0 and again["status"] == "done" and again["files_unchanged"] == reported,
                    "task 1 again: exit %d, run %r (%d files kept from before)" % (code, again, reported))
    # Task 2 as the one task of an array submitted again for it, given its own --threads
    # (which takes the place of the script's, rather than being refused as given twice).
    code, _ = task(2, alone=True, extra=["--threads", "2"])
    mtest.check(code == 0, "task 2 exited %d" % code)
    for k in (1, 2):  # reference: hashlib, by docs/store.md's rule (storecheck.share_of)
        saved = set(stored_files(os.path.join(results, "shard-%d-of-2.sqlite" % k)))
        mtest.check(saved == share_files[k], "share %d's store holds %r, hashlib's rule gives %r"
                    % (k, sorted(saved), sorted(share_files[k])))
    mtest.check(not [n for n in os.listdir(tmp) if n.startswith("tmp")], "a task left its scratch folder behind")

    mtest.check(sorted(os.listdir(results)) == ["shard-1-of-2.sqlite", "shard-2-of-2.sqlite"],
                "the results folder holds %r" % sorted(os.listdir(results)))
    # Saved shares are as readable as the umask allows a new file (POSIX open(2) with mode
    # 0666, less the umask, here the test's own), not mktemp's owner-only 0600, so that the
    # merge job and colleagues of the project can read them.
    mask = os.umask(0)
    os.umask(mask)
    for name in os.listdir(results):
        mode = os.stat(os.path.join(results, name)).st_mode & 0o777
        mtest.check(mode == 0o666 & ~mask, "%s has mode %o, umask %03o gives %o" % (name, mode, mask, 0o666 & ~mask))
    # The merge job as the script's usage line writes it, for an array of 2 tasks instead of 8;
    # a share left by an earlier array of 3 tasks is not taken in.
    wrapped = re.search(r'--wrap "([^"]+)"', script_text).group(1)
    # reference: the script's #SBATCH --array line (re), as many shares as tasks
    first_task, last_task = map(int, re.search(r"^#SBATCH --array=(\d+)-(\d+)$", script_text, re.M).groups())
    tasks = last_task - first_task + 1
    mtest.check(" shard-*-of-%d.sqlite" % tasks in wrapped,
                "the merge line names no share of %d: %s" % (tasks, wrapped))
    # (a store of another file, so that taking it in would show in the tables compared below)
    stale = os.path.join(results, "shard-3-of-3.sqlite")
    mtest.run(["batch", os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), "--store", stale, "--unit", "speaker",
               "--quiet"])
    merge_job = subprocess.run(["bash", "-c", wrapped.replace("RESULTS", results).replace("-of-%d" % tasks, "-of-2")],
                               capture_output=True, text=True, env=dict(os.environ, PATH=shims + os.pathsep + os.environ["PATH"]))
    mtest.check(merge_job.returncode == 0, "the merge job: exit %d, %s" % (merge_job.returncode, merge_job.stderr))
    merged = os.path.join(results, "archive.sqlite")
    one = os.path.join(tmp, "one.sqlite")
    mtest.run(["batch", archive, "--store", one, "--unit", "speaker", "--quiet"])
    a, b = storecheck.logical_tables(one), storecheck.logical_tables(merged)
    # reference: os.walk, and hashlib for each content
    merged_files = stored_files(merged)
    mtest.check(set(merged_files) == plays and all(sha == storecheck.sha256_of(p) for p, sha in merged_files.items()),
                "the merged shares hold %r, os.walk finds %r" % (sorted(merged_files), sorted(plays)))
    mtest.check(a == b, "one run and the script's merged shares differ: " + storecheck.diff_summary(a, b))
    mtest.check(storecheck.integrity(merged) == "ok", "PRAGMA integrity_check fails on the merged store")

mtest.done()
