"""batch: options that only the analysis reads need --analyse.

`batch --help` gives --pca, --attribute and --recompute "with --analyse", and the analysis
and sub-corpus options (--ranks, --min-tokens, --author, --years ...) choose what an
analysis takes in (docs/store.md, "Sub-corpora": the header filters "only choose what
--analyse takes in"). Without --analyse they were taken and did nothing, exit 0. Each is
now a usage error (exit 2) that leaves no store behind (os.path), and the same option
with --analyse is taken (exit 0 and an analysis run in the runs table, Python's sqlite3).
"""
import os
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

tmp = mtest.scratch_folder("manicule-batch-options-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), archive)
common = ["--unit", "letter", "--quiet", "--min-tokens", "100"]
for option in (["--pca"], ["--attribute"], ["--recompute"], ["--ranks", "1-200"], ["--culling", "10"],
               ["--measure", "burrows-delta"], ["--neighbours", "3"], ["--author", "Pellow"],
               ["--years", "1850-1900"], ["--language", "en"], ["--title", "*Ferry*"]):
    store = os.path.join(tmp, "s.sqlite")
    p = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"] + option, check=False)
    mtest.check(p.returncode == 2 and option[0] in p.stderr and "--analyse" in p.stderr and not os.path.exists(store),
                "%r without --analyse: exit %d, store left %s, %s" % (option, p.returncode, os.path.exists(store),
                                                                      p.stderr))
    p = mtest.run(["batch", archive, "--store", store] + common + option + ["--analyse"], check=False)
    db = storecheck.connect(store)
    analyses = db.execute("SELECT count(*) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    db.close()
    mtest.check(p.returncode == 0 and analyses == 1, "%r with --analyse: exit %d, %d analyses, %s"
                % (option, p.returncode, analyses, p.stderr))
    for suffix in ("", "-wal", "-shm"):
        if os.path.exists(store + suffix):
            os.remove(store + suffix)
# --min-tokens alone, and --stop-words, the same way.
words = os.path.join(tmp, "stop.txt")
with open(words, "w", encoding="utf-8") as f:
    f.write("the\n")
for option in (["--min-tokens", "100"], ["--stop-words", words]):
    p = mtest.run(["batch", archive, "--store", os.path.join(tmp, "t.sqlite"), "--unit", "letter"] + option,
                  check=False)
    mtest.check(p.returncode == 2 and option[0] in p.stderr, "%r without --analyse: exit %d, %s"
                % (option, p.returncode, p.stderr))
mtest.done()
