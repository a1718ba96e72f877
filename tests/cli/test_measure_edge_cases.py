"""Edge cases of the measuring commands (profile, distances, map, tree), through the
command line, on invented letters whose tokens are plain ASCII words:
  - more features asked than the vocabulary has: works, and says so; the feature count is
    the number of distinct words (Python's set() over the same words)
  - a single segment: distances, map and tree fail clearly (exit 4, a message naming the
    problem, nothing on standard output); profile still writes its one row (z = 0)
  - two identical letters: distance 0 under every measure
  - an empty letter: left out and reported (stderr note, TSV "# left out", JSON reason)
  - a word with the same relative frequency everywhere: z = 0, reported
  - never NaN or infinity in any output
"""
import json
import random
import os
import re
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import invented_letters  # noqa: E402
from measure_battery import MEASURES  # noqa: E402
from measure_tables import read_distances, read_profile  # noqa: E402

NOT_A_NUMBER = re.compile(r"(?<![A-Za-z])(nan|NaN|inf|Infinity)(?![A-Za-z])")


def no_nan(text, what):
    mtest.check(not NOT_A_NUMBER.search(text), "no NaN or infinity in %s" % what)


def every_output(args):
    """Runs every measuring command and format on `args`; returns {name: stdout}."""
    out = {}
    for command, formats in (("profile", ["tsv"]), ("distances", ["tsv", "json"]), ("map", ["tsv", "json", "svg"]),
                             ("tree", ["newick", "json", "svg"])):
        for fmt in formats:
            out["%s %s" % (command, fmt)] = mtest.run([command, "--format", fmt] + args).stdout
    for values in ("counts", "z"):
        out["profile " + values] = mtest.run(["profile", "--values", values] + args).stdout
    return out


with tempfile.TemporaryDirectory() as tmp:
    letters = invented_letters.three_hands(per_author=2, size=(150, 250))
    same = letters[0][3]
    letters.append(("L90", "p-ash", "Ada Ash", list(same)))  # identical to L01
    letters.append(("L91", "p-birch", "Bo Birch", []))       # empty
    path = invented_letters.write_letters(tmp, "letters.xml", letters)
    args = [path, "--unit", "letter", "--min-tokens", "50"]

    # More features than the vocabulary: all distinct words are used, and the run says so.
    vocabulary = {w for _, _, _, words in letters for w in words}  # Python set() of the invented words
    proc = mtest.run(["profile", "--ranks", "1-100000"] + args)
    params, features, rows = read_profile(proc.stdout)
    mtest.check(sorted(features) == sorted(vocabulary), "every distinct word is a feature (%d)" % len(vocabulary))
    mtest.check(any("the %d features found" % len(vocabulary) in n for n in params.get("note", [])),
                "the header notes that fewer features exist: %s" % params.get("note"))
    mtest.check("the %d features found" % len(vocabulary) in proc.stderr, "stderr notes it too")

    # The empty letter: left out and reported everywhere.
    mtest.check("letters#L91" not in rows, "the empty letter has no row")
    mtest.check(any(v.startswith("letters#L91: ") for v in params.get("left out", [])), "TSV header lists it as left out")
    mtest.check("segment(s) left out" in proc.stderr, "stderr says segments were left out")
    doc = json.loads(mtest.run(["distances", "--format", "json"] + args).stdout)
    empty = [s for s in doc["segments"] if s["segment"] == "letters#L91"]
    mtest.check(len(empty) == 1 and not empty[0]["measured"] and "0 tokens" in empty[0]["left_out_because"],
                "JSON lists the empty letter with the reason: %s" % empty)

    # Two identical letters: distance 0 under every measure.
    for measure in MEASURES:
        _, pairs = read_distances(mtest.run(["distances", "--measure", measure] + args).stdout)
        value = [v for a, b, v in pairs if (a, b) == ("letters#L01", "letters#L90")]
        mtest.check(value == [0.0], "%s of two identical letters is 0, got %s" % (measure, value))
        mtest.check(all(v > 0 for a, b, v in pairs if (a, b) != ("letters#L01", "letters#L90")),
                    "%s of different letters is positive" % measure)

    # Never NaN, in any command or format.
    for name, text in every_output(args).items():
        no_nan(text, name)

    # A word with the same relative frequency in every letter: its z-scores are 0.
    flat = [("F%d" % k, "p-f%d" % k, "F %d" % k, ["zed"] * 5 + invented_letters.zipf_words(
        random.Random(k), 95, {})) for k in range(3)]
    flat_path = invented_letters.write_letters(tmp, "flat.xml", flat)
    flat_args = [flat_path, "--unit", "letter", "--min-tokens", "50"]
    proc = mtest.run(["profile", "--values", "z"] + flat_args)
    params, features, rows = read_profile(proc.stdout)
    column = features.index("zed")
    mtest.check(all(r[column] == 0.0 for r in rows.values()), "z of a word with zero variance is 0")
    mtest.check(any("same relative frequency in every segment" in n for n in params.get("note", [])),
                "zero variance noted")
    for name, text in every_output(flat_args).items():
        no_nan(text, "zero-variance run, " + name)

    # A single segment: a clear error, no output.
    one = invented_letters.write_letters(tmp, "one.xml", letters[:1])
    for command in ("distances", "map", "tree"):
        proc = mtest.run([command, one, "--unit", "letter", "--min-tokens", "50"], check=False)
        mtest.check(proc.returncode == 4, "%s on one segment exits 4 (nothing to compare), got %d" % (command, proc.returncode))
        mtest.check("at least two segments" in proc.stderr, "%s explains: %s" % (command, proc.stderr.strip()))
        # No segment was left out for its size, so lowering the minimum cannot help: the
        # message does not advise it (it did, even at --min-tokens 1).
        mtest.check("found 1" in proc.stderr and "--min-tokens" not in proc.stderr,
                    "%s on one segment, none left out: %s" % (command, proc.stderr.strip()))
        mtest.check(proc.stdout == "", "%s writes nothing on standard output" % command)
    # Where segments were left out for their size it says how many and advises the option:
    # one letter of the two kept (the first of `letters`, of 150 words or more by
    # construction, beside one of three words).
    short = (letters[1][0], letters[1][1], letters[1][2], ["short", "and", "sweet"])
    two = invented_letters.write_letters(tmp, "two.xml", letters[:1] + [short])
    proc = mtest.run(["distances", two, "--unit", "letter", "--min-tokens", "50"], check=False)
    mtest.check(proc.returncode == 4 and "1 found, 1 shorter (lower it with --min-tokens)" in proc.stderr,
                "one of two letters too short: %d %s" % (proc.returncode, proc.stderr.strip()))
    params, features, rows = read_profile(mtest.run(["profile", "--values", "z", one, "--unit", "letter",
                                                     "--min-tokens", "50"]).stdout)
    mtest.check(len(rows) == 1 and all(v == 0.0 for v in rows["one#L01"]), "profile of one segment: z = 0")

    # No segment large enough: a clear error.
    # It says what would help (docs/measures.md: "whether lowering --min-tokens would help"),
    # with the largest segment's words, counted here as a run of letters (the letters are
    # invented in ASCII words, so re's \w+ and UAX #29 agree on them).
    proc = mtest.run(["distances", path, "--unit", "letter"], check=False)  # default minimum 1500 words
    largest = max(len(re.findall(r"[^\W\d_]+(?:'[^\W\d_]+)*", " ".join(letter[3]))) for letter in letters)
    mtest.check(proc.returncode == 4 and "fewer than 1500 words, the largest %d (lower it with --min-tokens)" % largest
                in proc.stderr, "too small for the default minimum: %s" % proc.stderr)

# A stop list leaves its words out of the features, and the run says which list it was:
# its file, its word count and its SHA-256 (hashlib), in the TSV header, the JSON
# provenance and the description annotate writes into an edition.
import hashlib  # noqa: E402
with tempfile.TemporaryDirectory() as stop_tmp:
    stop_file = os.path.join(stop_tmp, "names.txt")
    with open(stop_file, "w", encoding="utf-8") as f:
        f.write("# invented stop list\nthe\nand\n")
    with open(stop_file, "rb") as f:
        digest = hashlib.sha256(f.read()).hexdigest()
    said = "%s (2 words, SHA-256 %s)" % (stop_file, digest)
    example = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
    base = ["--unit", "letter", "--min-tokens", "200", "--stop-words", stop_file, example]
    params, features, _ = read_profile(mtest.run(["profile"] + base).stdout)
    mtest.check("the" not in features and "and" not in features, "stop words among the features")
    mtest.check(params.get("stop words") in (said, [said]), "profile header: %r" % params.get("stop words"))
    doc = json.loads(mtest.run(["distances", "--format", "json"] + base).stdout)
    mtest.check(doc["provenance"]["parameters"].get("stop words") == said,
                "distances JSON: %r" % doc["provenance"]["parameters"].get("stop words"))
    copy = os.path.join(stop_tmp, "annotated.xml")
    mtest.run(["annotate", "--output", copy] + base)
    mtest.check("Stop words left out: " + said in open(copy, encoding="utf-8").read(),
                "annotate's description lacks the stop list")

    # The listed words are compared as the tokens were normalised: with the default case
    # folding, "THE" and "And" leave out "the" and "and" (Python's str.casefold, Unicode's
    # full case folding, gives the forms); without folding (--no-fold), "The" leaves out
    # "The" alone. A review found a list's capitals matching nothing, silently.
    with open(stop_file, "w", encoding="utf-8") as f:
        f.write("THE\nAnd\n")
    folded = {w.casefold() for w in ("THE", "And")}
    _, features, _ = read_profile(mtest.run(["profile"] + base).stdout)
    mtest.check(not folded & set(features), "capitals in the stop list left in: %r" % sorted(folded & set(features)))
    with open(stop_file, "w", encoding="utf-8") as f:
        f.write("The\n")
    _, unfolded, _ = read_profile(mtest.run(["profile", "--no-fold"] + base).stdout)
    _, unfolded_all, _ = read_profile(mtest.run(["profile", "--no-fold", "--unit", "letter", "--min-tokens", "200",
                                                 example]).stdout)
    mtest.check("The" in unfolded_all and "the" in unfolded_all and "The" not in unfolded and "the" in unfolded,
                "--no-fold with 'The' listed: 'The' %s, 'the' %s" % ("The" in unfolded, "the" in unfolded))

# A letter of one word holds no word pair: with --features word-ngram --n 2 and a minimum of
# one word, it is left out for that reason, not as "shorter than the minimum of 1 word"
# (a review found the wrong reason). Its words counted here by a regular expression.
with tempfile.TemporaryDirectory() as pair_tmp:
    bodies = ["Hello.", "one two three four five six seven", "one two three four five six eight nine",
              "two three four five six seven ten"]
    words = [len(re.findall(r"[A-Za-z]+", b)) for b in bodies]
    pairs_file = os.path.join(pair_tmp, "pairs.xml")
    with open(pairs_file, "w", encoding="utf-8") as f:
        f.write('<TEI xmlns="http://www.tei-c.org/ns/1.0"><teiHeader><fileDesc><titleStmt><title>Pairs</title>'
                '</titleStmt><publicationStmt><p>invented</p></publicationStmt><sourceDesc><p>invented</p>'
                '</sourceDesc></fileDesc></teiHeader><text><body>' +
                "".join('<div type="letter" xml:id="P%d"><p>%s</p></div>' % (i, b) for i, b in enumerate(bodies)) +
                "</body></text></TEI>")
    proc = mtest.run(["distances", pairs_file, "--unit", "letter", "--features", "word-ngram", "--n", "2",
                      "--min-tokens", "1"])
    no_pair = sum(1 for w in words if w < 2)
    mtest.check(no_pair == 1 and ("%d segment(s) left out, too short to hold a feature (word 2-grams)" % no_pair)
                in proc.stderr and "shorter than the minimum" not in proc.stderr,
                "a one-word letter under word pairs: %s" % proc.stderr)

mtest.done()
