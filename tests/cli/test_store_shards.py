"""Archive store: one batch run and three shard runs merged give the same tables.

24 plays are read once into one store and, as share 1/3, 2/3 and 3/3, into three stores
merged with `manicule merge`. The stored archive (files, readings, segments with their
counts by feature form, vocabulary) and an analysis of it must be identical, apart from
run ids and times; a merge refuses an input that is not a store before it creates its
output, and a share with no file says so (a share of an input with no TEI file at all is
refused: exit 4); a share missing from the inputs is named, and
refused by merge --exact; a malformed --shard and a store that cannot be
opened are refused with their reason, and a damaged segment is named by analyse-store and
merge, a merge into a new store then leaving nothing behind; a merged store of two
reading settings is analysed only under the --settings asked. Outside references: Python's hashlib for every stored SHA-256 and for
the documented shard rule (1 + first 8 bytes of SHA-256(relative path) mod N), SQLite's
own PRAGMA integrity_check, and lxml for each play's title.
"""
import json
import os
import re
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402

TEI = "{http://www.tei-c.org/ns/1.0}"

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    paths = storecheck.copy_plays(storecheck.pick_plays(24), archive, subfolder_every=4)
    common = ["--unit", "speaker", "--quiet"]

    one = os.path.join(tmp, "one.sqlite")
    mtest.run(["batch", archive, "--store", one] + common)

    shards = []
    for k in (1, 2, 3):
        shard = os.path.join(tmp, "shard%d.sqlite" % k)
        mtest.run(["batch", archive, "--store", shard, "--shard", "%d/3" % k] + common)
        shards.append(shard)

    # Each file lies in exactly the share the documented rule gives (hashlib, not our code).
    def share(k):
        return {p for p in paths if storecheck.share_of(os.path.relpath(p, archive), 3) == k}

    for k, shard in enumerate(shards, start=1):
        stored = {row[0] for row in storecheck.logical_tables(shard)["files"]}
        expected = share(k)
        mtest.check(stored == expected, "shard %d/3 holds %d files, the rule gives %d" % (k, len(stored), len(expected)))
        mtest.check(len(stored) > 0, "shard %d/3 is empty" % k)

    merged = os.path.join(tmp, "merged.sqlite")
    proc = mtest.run(["merge", merged] + shards)
    mtest.check("different reading settings" not in proc.stderr, "shards read alike said to differ: " + proc.stderr)

    a, b = storecheck.logical_tables(one), storecheck.logical_tables(merged)
    mtest.check(a == b, "one run and merged shards differ: " + storecheck.diff_summary(a, b))
    mtest.check(len(a["files"]) == 24 and len(a["segments"]) > 100,
                "expected 24 files and many speakers, got %d files, %d segments" % (len(a["files"]), len(a["segments"])))

    for store in (one, merged):
        mtest.check(storecheck.integrity(store) == "ok", "PRAGMA integrity_check fails on " + store)
    for path, _, _, size, sha, error in a["files"]:
        mtest.check(sha == storecheck.sha256_of(path), "stored SHA-256 of %s differs from hashlib" % path)
        mtest.check(size == os.path.getsize(path) and error is None, "size or error of %s" % path)

    # Titles: the first titleStmt/title that is not a subtitle, whitespace collapsed (lxml).
    titles = {}
    for p in paths:
        t = etree.parse(p).find(".//%steiHeader/%sfileDesc/%stitleStmt" % (TEI, TEI, TEI))
        first = [e for e in t.findall(TEI + "title") if e.get("type") != "sub"][0]
        titles[storecheck.sha256_of(p)] = " ".join("".join(first.itertext()).split())
    for row in a["readings"]:
        mtest.check(row[6] == titles[row[1]], "title %r, lxml says %r" % (row[6], titles[row[1]]))

    # The same analysis over both stores.
    for store in (one, merged):
        mtest.run(["analyse-store", "--store", store, "--min-tokens", "300", "--neighbours", "3"])
    _, x = storecheck.latest_analysis(one)
    _, y = storecheck.latest_analysis(merged)
    mtest.check(x == y, "analyses of one run and of merged shards differ")
    mtest.check(len(x["neighbours"]) > 0, "the analysis found no neighbours")

    # Merging a shard again adds nothing.
    before = storecheck.logical_tables(merged)
    mtest.run(["merge", merged, shards[0]])
    mtest.check(storecheck.logical_tables(merged) == before, "merging a shard twice changed the store")

    # A share missing from the inputs (a task of the array that saved no store): the shares
    # given are 1/3 and 2/3 by the --shard their batch runs record (the runs table, read with
    # sqlite3). merge --exact would take share 3's files out of the merged store: refused
    # (exit 4), naming the share, the store as it was; without --exact, a note names it.
    recorded = {json.loads(p)["shard"] for s in shards[:2]
                for (p,) in storecheck.rows(s, "SELECT parameters FROM runs WHERE kind = 'batch'")}
    mtest.check(recorded == {"1/3", "2/3"}, "the shards' batch runs record %r" % recorded)
    proc = mtest.run(["merge", "--exact", merged] + shards[:2], check=False)
    mtest.check(proc.returncode == 4 and "none is share 3/3" in proc.stderr,
                "merge --exact without share 3/3: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.check(storecheck.logical_tables(merged) == before, "a refused merge --exact changed the store")
    proc = mtest.run(["merge", merged] + shards[:2])
    mtest.check("none is share 3/3" in proc.stderr, "merge without share 3/3 said nothing: %r" % proc.stderr)
    mtest.check(storecheck.logical_tables(merged) == before, "merging shares already merged changed the store")

    # Share 1 read again with the archive given as a relative path (another task's spelling),
    # merged into a copy: its files are added beside the same files under their absolute
    # paths, and a note names one such pair (os.path.relpath gives the relative spelling).
    twice = os.path.join(tmp, "twice.sqlite")
    shutil.copy(merged, twice)
    relative_shard = os.path.join(tmp, "shard1-relative.sqlite")
    mtest.run(["batch", "archive", "--store", relative_shard, "--shard", "1/3"] + common, cwd=tmp)
    proc = mtest.run(["merge", twice, relative_shard])
    added = {p for (p,) in storecheck.rows(relative_shard, "SELECT path FROM files")}
    mtest.check(added == {os.path.relpath(p, tmp) for p in share(1)}, "the relative shard holds %r" % sorted(added))
    said = re.search(r"note: (\d+) file\(s\) the merge added match files of .* such as (\S+) and (\S+):", proc.stderr)
    mtest.check(said and int(said.group(1)) == len(share(1)) and said.group(2) in added
                and os.path.join(tmp, said.group(2)) == said.group(3),
                "merging a share read under another spelling: %r" % proc.stderr)

    # A share read with other options (--no-fold) is merged, and said to hold other settings:
    # an analysis takes one settings' counts, so its files would be left out silently.
    unfolded = os.path.join(tmp, "unfolded.sqlite")
    mtest.run(["batch", archive, "--store", unfolded, "--shard", "1/3", "--no-fold"] + common)
    proc = mtest.run(["merge", os.path.join(tmp, "mixed.sqlite"), shards[1], unfolded])
    mtest.check("under 2 different reading settings" in proc.stderr, "a share read with --no-fold merged silently: " + proc.stderr)
    # and each settings is named by the inputs that hold it, so the task run otherwise is found
    mtest.check(("one each: %s; %s)" % (shards[1], unfolded)) in proc.stderr
                or ("one each: %s; %s)" % (unfolded, shards[1])) in proc.stderr,
                "the note does not name the input of each settings: " + proc.stderr)
    # A store that holds both settings itself is said to (the same store twice read as "one
    # each: X; X" before): merged on, the note counts its settings as its settings table does.
    mixed_again = os.path.join(tmp, "mixed-again.sqlite")
    proc = mtest.run(["merge", mixed_again, os.path.join(tmp, "mixed.sqlite")])
    held_settings = storecheck.rows(os.path.join(tmp, "mixed.sqlite"), "SELECT count(*) FROM settings")[0][0]
    mtest.check(held_settings == 2 and ("(%s holds 2)" % os.path.join(tmp, "mixed.sqlite")) in proc.stderr,
                "merging a store of %d settings: %s" % (held_settings, proc.stderr))
    # That merged store has no batch run to say which counts an analysis takes: without
    # --settings it is refused (exit 2, naming --settings) rather than one settings taken by
    # the order of the merge's inputs; with --settings each analysis takes the files read
    # under it, as Python's sqlite3 finds them in the readings table.
    mixed = os.path.join(tmp, "mixed.sqlite")
    proc = mtest.run(["analyse-store", "--store", mixed, "--min-tokens", "100", "--quiet"], check=False)
    mtest.check(proc.returncode == 2 and "--settings" in proc.stderr and "2 reading settings" in proc.stderr,
                "a merged store of two settings analysed without --settings: exit %d, %s" % (proc.returncode, proc.stderr))
    # Which share each settings holds, by the documented shard rule (share, above): the folded
    # counts came from share 2/3, the unfolded ones (--no-fold) from share 1/3.
    db = sqlite3.connect(mixed)
    folds = dict(db.execute("SELECT settings_id, json_extract(request, '$.tokenizer.case_fold') FROM settings"))
    db.close()
    mtest.check(sorted(folds.values()) == [0, 1], "expected a folded and an unfolded settings, got %r" % folds)
    for settings_id, folded in sorted(folds.items()):
        mtest.run(["analyse-store", "--store", mixed, "--settings", str(settings_id), "--min-tokens", "100", "--quiet"])
        _, tables = storecheck.latest_analysis(mixed)
        analysed = {row[1] for row in tables["segments"]}
        run_settings = storecheck.last_run(mixed, "analysis")["settings_id"]
        expected = share(2 if folded else 1)
        mtest.check(run_settings == settings_id and analysed and analysed <= expected,
                    "analysis under --settings %d took settings %r, files outside share %d/3: %r" %
                    (settings_id, run_settings, 2 if folded else 1, sorted(analysed - expected)))

    # An input that is not a store (here a TEI file, as sqlite3 itself would refuse it) is
    # refused with exit code 3 (bad input) and its name, before the output is created, and
    # leaves an existing output as it was.
    not_a_store = paths[0]
    fresh = os.path.join(tmp, "fresh.sqlite")
    for output in (fresh, merged):
        proc = mtest.run(["merge", output, shards[0], not_a_store], check=False)
        mtest.check(proc.returncode == 3 and not_a_store in proc.stderr and "not a manicule store" in proc.stderr,
                    "merging a TEI file: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.check(not os.path.exists(fresh), "a refused merge left a new store behind")
    mtest.check(storecheck.logical_tables(merged) == before, "a refused merge changed the store")
    # Another application's SQLite file (made by Python's sqlite3 module, rollback journal)
    # is refused by every command that opens a store, and keeps every byte (hashlib): it was
    # once switched to WAL mode before the refusal.
    foreign = os.path.join(tmp, "contacts.sqlite")
    db = sqlite3.connect(foreign)
    db.execute("PRAGMA journal_mode = DELETE")
    db.execute("CREATE TABLE contacts (name TEXT)")
    db.execute("INSERT INTO contacts VALUES ('Ada')")
    db.commit()
    db.close()
    foreign_sha = storecheck.sha256_of(foreign)
    for args in (["analyse-store", "--store", foreign, "--list-settings"], ["batch", archive, "--store", foreign] + common,
                 ["merge", foreign, shards[0]], ["merge", fresh, foreign]):
        proc = mtest.run(args, check=False)
        mtest.check(proc.returncode == 3 and "not a manicule store" in proc.stderr and storecheck.sha256_of(foreign) == foreign_sha,
                    "%s on another application's SQLite file: exit %d, %s" % (args[0], proc.returncode, proc.stderr))
    mtest.check(not os.path.exists(fresh), "a merge of a foreign file left a new store behind")
    # A shard emptied by a failed copy (0 bytes) is no store either: merged, it counted as one
    # holding nothing, and --exact took its share's files out of the merged store, exit 0.
    # Refused with exit 3, naming it; the input keeps its 0 bytes and the output its tables.
    emptied = os.path.join(tmp, "emptied.sqlite")
    open(emptied, "wb").close()
    for args in (["merge", "--exact", merged, shards[0], emptied], ["merge", fresh, emptied],
                 ["analyse-store", "--store", emptied]):
        proc = mtest.run(args, check=False)
        mtest.check(proc.returncode == 3 and emptied + " holds no manicule store" in proc.stderr,
                    "%s with a 0-byte store: exit %d, %s" % (" ".join(args[:2]), proc.returncode, proc.stderr))
        mtest.check(os.path.getsize(emptied) == 0, "%s wrote into the 0-byte input" % args[0])
    mtest.check(storecheck.logical_tables(merged) == before and not os.path.exists(fresh),
                "a merge refused for a 0-byte input changed or left a store")

    # A store with one segment's counts damaged: its blob cut to the byte 0xff, a varint
    # that never ends (the format in docs/store.md). The segment is the largest, so that an
    # analysis needs it; which one it is and its file come from the store through sqlite3.
    damaged = os.path.join(tmp, "damaged.sqlite")
    shutil.copy(shards[0], damaged)
    db = sqlite3.connect(damaged)
    sha, ordinal = db.execute("SELECT sha256, ordinal FROM segments ORDER BY tokens DESC LIMIT 1").fetchone()
    damaged_file = db.execute("SELECT path FROM files WHERE sha256 = ?", (sha,)).fetchone()[0]
    db.execute("UPDATE segments SET counts = x'ff' WHERE sha256 = ? AND ordinal = ?", (sha, ordinal))
    db.commit()
    db.close()
    proc = mtest.run(["analyse-store", "--store", damaged, "--min-tokens", "300"], check=False)
    mtest.check(proc.returncode == 3 and damaged in proc.stderr and "segment %d of %s" % (ordinal, damaged_file)
                in proc.stderr, "analysing a damaged store: exit %d, %s" % (proc.returncode, proc.stderr))
    # Merged into a new store: refused naming the store and the segment, and the new store
    # is not left behind; merged into an existing one, that one keeps what it held.
    proc = mtest.run(["merge", fresh, damaged], check=False)
    mtest.check(proc.returncode == 3 and "segment %d of the content with SHA-256 %s" % (ordinal, sha) in proc.stderr,
                "merging a damaged store: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.check(not any(os.path.exists(fresh + suffix) for suffix in ("", "-wal", "-shm")),
                "a merge that failed left its new store behind")
    kept = os.path.join(tmp, "kept.sqlite")
    mtest.run(["merge", kept, shards[1]])
    kept_before = storecheck.logical_tables(kept)
    proc = mtest.run(["merge", kept, damaged], check=False)
    mtest.check(proc.returncode == 3 and storecheck.logical_tables(kept) == kept_before,
                "a failed merge changed the existing store: exit %d" % proc.returncode)
    # A good input ahead of the damaged one: the merge is one transaction, so that input is
    # not kept either (an OUT half-merged would look whole to the next analysis).
    proc = mtest.run(["merge", kept, shards[2], damaged], check=False)
    mtest.check(proc.returncode == 3 and storecheck.logical_tables(kept) == kept_before and "merged" not in proc.stdout,
                "a merge failing at its second input kept the first: exit %d, %s" % (proc.returncode, proc.stdout))
    # The same store under another spelling is still itself.
    proc = mtest.run(["merge", kept, "." + os.sep + os.path.relpath(kept)], check=False)
    mtest.check(proc.returncode == 2 and "into itself" in proc.stderr,
                "a store merged into itself by another spelling: exit %d, %s" % (proc.returncode, proc.stderr))

    # A share with no file of the archive in it (more shares than files: the first such
    # share of 1,000 by the documented rule) is not an error, but says so.
    taken = {storecheck.share_of(os.path.relpath(p, archive), 1000) for p in paths}
    empty = min(k for k in range(1, 1001) if k not in taken)
    proc = mtest.run(["batch", archive, "--store", os.path.join(tmp, "empty-share.sqlite"), "--shard",
                      "%d/1000" % empty] + common, check=False)
    mtest.check(proc.returncode == 0 and "no TEI file (*.xml, *.tei) found under the inputs in share %d/1000" % empty in proc.stderr,
                "an empty share: exit %d, %s" % (proc.returncode, proc.stderr))
    proc = mtest.run(["batch", archive, "--store", os.path.join(tmp, "full-share.sqlite"), "--shard",
                      "%d/1000" % min(taken)] + common)
    mtest.check("no TEI file" not in proc.stderr, "a share holding files says it has none: " + proc.stderr)
    # A share's task whose input holds no TEI file in any share (on a cluster, most often the
    # archive not mounted on that machine) is refused (exit 4, nothing selected) and leaves
    # no store: saved, its empty share let merge --exact drop the archive's files.
    unmounted = os.path.join(tmp, "mount-point")
    os.makedirs(unmounted)
    nothing = os.path.join(tmp, "unmounted-share.sqlite")
    proc = mtest.run(["batch", unmounted, "--store", nothing, "--shard", "2/3"] + common, check=False)
    mtest.check(proc.returncode == 4 and "no TEI file" in proc.stderr and "in any share" in proc.stderr
                and not [n for n in os.listdir(tmp) if n.startswith("unmounted-share.sqlite")],
                "a share of an empty input: exit %d, %s" % (proc.returncode, proc.stderr))

    # A --shard that is not K/N with 1 <= K <= N, as the documented rule needs, is a usage
    # error (exit 2) that creates no store: "-1" once passed as share 1 of 4,294,967,295.
    for bad, says in [("1/-1", "takes K/N"), (" 1/3", "takes K/N"), ("1/0", "N, the number of shares"),
                      ("0/3", "between 1 and N"), ("4/3", "between 1 and N")]:
        refused = os.path.join(tmp, "refused.sqlite")
        proc = mtest.run(["batch", archive, "--store", refused, "--shard", bad] + common, check=False)
        mtest.check(proc.returncode == 2 and says in proc.stderr and not os.path.exists(refused),
                    "--shard %r: exit %d, %s" % (bad, proc.returncode, proc.stderr))
    # So is --commit-every 0 (no transaction can hold no file; it was taken as 1, silently).
    proc = mtest.run(["batch", archive, "--store", refused, "--commit-every", "0"] + common, check=False)
    mtest.check(proc.returncode == 2 and "--commit-every" in proc.stderr and not os.path.exists(refused),
                "--commit-every 0: exit %d, %s" % (proc.returncode, proc.stderr))

    # A play deleted from the archive after a merge: each share's batch drops it, but a
    # second merge into the same OUT keeps it (merge never removes) and names it on stderr;
    # merged into a new store, as the job script does, the shares give what one run over
    # the archive now gives (os.walk says which files are left).
    before_delete = os.path.join(tmp, "before-delete")
    shutil.copytree(archive, before_delete)
    second = sorted(os.path.join(d, n) for d, _, names in os.walk(before_delete) for n in names)[0]
    shares = []
    for k in (1, 2, 3):
        shard = os.path.join(tmp, "bd-shard%d.sqlite" % k)
        mtest.run(["batch", before_delete, "--store", shard, "--shard", "%d/3" % k] + common)
        shares.append(shard)
    target = os.path.join(tmp, "target.sqlite")
    mtest.run(["merge", target] + shares)
    os.remove(second)
    for k in (1, 2, 3):
        mtest.run(["batch", before_delete, "--store", shares[k - 1], "--shard", "%d/3" % k] + common)
    proc = mtest.run(["merge", target] + shares)
    mtest.check("holds 1 file(s) that none of the merged stores has, such as %s" % second in proc.stderr,
                "a merge keeping a deleted file does not say so: %s" % proc.stderr)
    # With --exact the same OUT follows the shares: the deleted play goes (os.walk says
    # which are left), in place, under the store's lock (the job script's merge).
    exact_target = os.path.join(tmp, "exact-target.sqlite")
    shutil.copy(target, exact_target)
    proc = mtest.run(["merge", "--exact", exact_target] + shares)
    still_there = sorted(os.path.join(d, n) for d, _, names in os.walk(before_delete) for n in names)
    exact_files = sorted(r[0] for r in storecheck.logical_tables(exact_target)["files"])
    mtest.check(exact_files == still_there and "removed 1 file(s) that no input holds" in proc.stdout
                and "none of the merged" not in proc.stderr,
                "merge --exact after a deletion: %d files against %d, %s %s" %
                (len(exact_files), len(still_there), proc.stdout, proc.stderr))
    fresh_merge = os.path.join(tmp, "fresh-merge.sqlite")
    proc = mtest.run(["merge", fresh_merge] + shares)
    # Each merge run counts the files its input holds (read with Python's sqlite3), as docs/store.md says.
    # (The second merge into the same OUT, which adds almost nothing, is the telling one.)
    db = sqlite3.connect(target)
    counted = [r[0] for r in db.execute("SELECT files_found FROM runs WHERE kind = 'merge' ORDER BY run_id")][-3:]
    db.close()
    held = []
    for share in shares:
        db = sqlite3.connect(share)
        held.append(db.execute("SELECT count(*) FROM files").fetchone()[0])
        db.close()
    mtest.check(counted == held, "merge runs count %r files, the inputs hold %r" % (counted, held))
    single = os.path.join(tmp, "single.sqlite")
    mtest.run(["batch", before_delete, "--store", single] + common)
    a, b = storecheck.logical_tables(single), storecheck.logical_tables(fresh_merge)
    left = sorted(os.path.join(d, n) for d, _, names in os.walk(before_delete) for n in names)
    # (The contents read stay in the shares, as in any store: docs/store.md; files are compared.)
    mtest.check(sorted(r[0] for r in b["files"]) == left and a["files"] == b["files"]
                and "none of the merged" not in proc.stderr,
                "shares merged into a new store after a deletion: %r against %r" % (b["files"], left))

    # A store that cannot be opened says why (exit 5, the output could not be written).
    missing_folder = os.path.join(tmp, "no-such-folder")
    mtest.check(not os.path.exists(missing_folder), "the missing folder exists")
    proc = mtest.run(["batch", archive, "--store", os.path.join(missing_folder, "s.sqlite")] + common, check=False)
    mtest.check(proc.returncode == 5 and "the folder %s does not exist" % missing_folder in proc.stderr,
                "a store in a missing folder: exit %d, %s" % (proc.returncode, proc.stderr))
    # A store path that is a link to nothing (os.symlink to a missing file) says so, as a
    # file that cannot be opened does (core/open_failure.h).
    dangling = os.path.join(tmp, "dangling.sqlite")
    os.symlink(os.path.join(missing_folder, "gone.sqlite"), dangling)
    proc = mtest.run(["batch", archive, "--store", dangling] + common, check=False)
    mtest.check(proc.returncode == 5 and "it is a symbolic link to %s, which does not exist" % os.path.join(missing_folder, "gone.sqlite")
                in proc.stderr,
                "a store path linking to nothing: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.check(os.path.isdir(archive), "the archive is not a folder")
    proc = mtest.run(["batch", archive, "--store", archive] + common, check=False)
    mtest.check(proc.returncode == 5 and "it is a folder" in proc.stderr,
                "a folder given as the store: exit %d, %s" % (proc.returncode, proc.stderr))

mtest.done()
