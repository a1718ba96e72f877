"""An empty option value is refused, not taken for no option (a review found `analyse-store
--author ""`, as a script's unset variable gives, analysed the whole store under the
sub-corpus' name with exit 0; `batch --shard ""` read every file). Each is a usage error
(exit 2) naming the option, and the store is left byte for byte as it was (SHA-256 by
Python's hashlib, storecheck.sha256_of) or not made at all.
"""
import os
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

tmp = mtest.scratch_folder("manicule-empty-values-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), archive)
store = os.path.join(tmp, "letters.sqlite")
mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"])



before = storecheck.sha256_of(store)
for option in ("--author", "--title", "--language", "--folder", "--years"):
    for value in ("", "  "):
        p = mtest.run(["analyse-store", "--store", store, "--min-tokens", "50", option, value], check=False)
        mtest.check(p.returncode == 2 and "manicule: " + option + ": an empty value" in p.stderr and storecheck.sha256_of(store) == before,
                    "analyse-store %s %r: exit %d, %s" % (option, value, p.returncode, p.stderr))
fresh = os.path.join(tmp, "fresh.sqlite")
for args in (["--store", fresh, "--shard", ""], ["--store", fresh, "--folder", ""], ["--store", ""]):
    p = mtest.run(["batch", archive, "--unit", "letter"] + args, check=False)
    mtest.check(p.returncode == 2 and "an empty value" in p.stderr and not os.path.exists(fresh),
                "batch %r: exit %d, %s" % (args, p.returncode, p.stderr))
p = mtest.run(["merge", "", store], check=False)
mtest.check(p.returncode == 2 and "manicule: output: an empty value" in p.stderr and storecheck.sha256_of(store) == before,
            "merge into '': exit %d, %s" % (p.returncode, p.stderr))
letters = os.path.join(archive, "ferry-letters.xml")
for option in ("--stop-words", "--labels"):
    p = mtest.run(["attribute", letters, "--unit", "letter", option, ""], check=False)
    mtest.check(p.returncode == 2 and "manicule: " + option + ": an empty value" in p.stderr,
                "attribute %s '': exit %d, %s" % (option, p.returncode, p.stderr))

# annotate --who " " wrote who=" " (a pointer to nothing); export --base-uri "" fell back to
# the file's URI as if not given. Both refused: no edition written, no export printed.
annotated = os.path.join(tmp, "annotated.xml")
for args in (["annotate", letters, "--unit", "letter", "--min-tokens", "50", "--output", annotated, "--who", " "],
             ["export", letters, "--base-uri", ""]):
    option = args[-2]
    p = mtest.run(args, check=False)
    mtest.check(p.returncode == 2 and "manicule: " + option + ": an empty value" in p.stderr and not os.path.exists(annotated)
                and not p.stdout,
                "%s %s %r: exit %d, %s" % (args[0], option, args[-1], p.returncode, p.stderr))

mtest.done()
