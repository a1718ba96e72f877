"""Bad input gets a clear message naming the file (and line), a non-zero exit, no crash or
hang, bounded memory, and no leak of external files (issue acceptance, foundation).

Hostile documents are written here into a temporary folder, so the test does not depend on
fixture files. The entity bomb is the classic "billion laughs" construction (10 levels of 10
references, 10^10 expansions; XML 1.0 section 4.2 entity declarations); the external entity
is the XML External Entity pattern (OWASP XXE), pointing at a local file with a marker.
"""
import errno
import os
import re
import resource
import sqlite3
import subprocess
import sys

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

TEI_OPEN = '<TEI xmlns="http://www.tei-c.org/ns/1.0">'
HEADER = ('<teiHeader><fileDesc><titleStmt><title>T</title></titleStmt><publicationStmt><p>x</p>'
          '</publicationStmt><sourceDesc><p>invented</p></sourceDesc></fileDesc></teiHeader>')
MARKER = "MARKER-9c41-NEVER-SHOWN"

tmp = mtest.scratch_folder("manicule-bad-")


def write(name, content, mode="w"):
    path = os.path.join(tmp, name)
    with open(path, mode) as f:
        f.write(content)
    return path


def run_segments(path, *extra, unit="whole"):
    proc = subprocess.run([mtest.BIN, "segments", "--unit", unit, "--show-text", path] + list(extra),
                          capture_output=True, text=True, timeout=120)
    return proc


# 1. Malformed XML: the unclosed <p> on line 4 is reported when </body> arrives on line 5.
malformed = write("malformed.xml", TEI_OPEN + "\n" + HEADER + "\n<text><body>\n<p>open paragraph\n</body></text></TEI>\n")
p = run_segments(malformed)
mtest.check(p.returncode == 3, "malformed XML: exit code 3 expected, got %d" % p.returncode)
mtest.check("malformed.xml:5" in p.stderr, "malformed XML: message names file and line 5: " + p.stderr)
mtest.check("mismatch" in p.stderr.lower() or "p and body" in p.stderr, "malformed XML: says what is wrong: " + p.stderr)
mtest.check(p.stdout == "", "malformed XML: nothing printed on stdout")

# 2. A root that is not TEI (well-formed HTML).
html = write("page.xml", "<html><body><p>Hello</p></body></html>\n")
p = run_segments(html)
mtest.check(p.returncode == 3, "non-TEI root: exit 3, got %d" % p.returncode)
mtest.check("page.xml:1" in p.stderr and "not a TEI document" in p.stderr and "<html>" in p.stderr,
            "non-TEI root: clear message: " + p.stderr)
# show and export, which read stored results, say the same rather than "no results of manicule".
for command in (["show"], ["export", "--format", "webanno"]):
    p = subprocess.run([mtest.BIN] + command + [html], capture_output=True, text=True)
    mtest.check(p.returncode == 3 and "page.xml:1" in p.stderr and "not a TEI document" in p.stderr,
                "%s on a non-TEI file: %d %s" % (command[0], p.returncode, p.stderr))
# TEI element name but the wrong namespace is not TEI either (TEI P5 1.2: the TEI namespace).
wrong_ns = write("wrong-ns.xml", '<TEI xmlns="http://example.org/other"><text><body><p>x</p></body></text></TEI>')
p = run_segments(wrong_ns)
mtest.check(p.returncode == 3 and "namespace" in p.stderr, "wrong namespace refused: " + p.stderr)

# 3. Entity-expansion bomb: refused, quickly, in bounded memory.
lol = ['<!ENTITY lol0 "lol">'] + ['<!ENTITY lol%d "%s">' % (i, ("&lol%d;" % (i - 1)) * 10) for i in range(1, 11)]
bomb = write("bomb.xml", "<?xml version='1.0'?>\n<!DOCTYPE TEI [\n" + "\n".join(lol) + "\n]>\n" + TEI_OPEN + HEADER +
             "<text><body><p>&lol10;</p></body></text></TEI>\n")
before = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
p = run_segments(bomb)
peak_kb = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
mtest.check(p.returncode == 3, "entity bomb: exit 3 expected, got %d (%s)" % (p.returncode, p.stderr))
mtest.check("bomb.xml" in p.stderr, "entity bomb: message names the file: " + p.stderr)
mtest.check(peak_kb < 100 * 1024, "entity bomb: peak memory %d KiB, limit 100 MiB" % peak_kb)

# 3b. One internal entity of 9.6 KB used 20,000 times: no nesting, so libxml2's own checks
# pass it, but it brings 192 MB of text out of a 100 KB file (a review took 1 GB of memory
# and 7.7 s with it). Refused, naming the file and the line of the reference that went too
# far, in bounded memory. A document using a short entity a few times still reads, and
# counts the entity's words as lxml (which expands internal entities) finds them.
phrase = "lorem ipsum " * 800
wide = write("wide-entity.xml", '<?xml version="1.0"?>\n<!DOCTYPE TEI [\n<!ENTITY s "%s">\n]>\n' % phrase + TEI_OPEN +
             HEADER + "<text><body>\n<p>" + "&s; " * 20000 + "</p></body></text></TEI>\n")
p = run_segments(wide)
peak_kb = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
mtest.check(p.returncode == 3 and "wide-entity.xml:" in p.stderr and "entities expand too far" in p.stderr,
            "a wide entity used 20,000 times: exit %d, %s" % (p.returncode, p.stderr[:300]))
mtest.check(peak_kb < 200 * 1024, "a wide entity: peak memory %d KiB, limit 200 MiB" % peak_kb)
# The same through an attribute's default value, which the DTD expands (a review saw 11 s of
# CPU for a 615 KB file of this kind).
defaulted = write("wide-default.xml", '<?xml version="1.0"?>\n<!DOCTYPE TEI [\n<!ENTITY s "%s">\n'
                  '<!ATTLIST p rend CDATA "%s">\n]>\n' % (phrase, "&s;" * 20000) + TEI_OPEN + HEADER +
                  "<text><body><p>x</p></body></text></TEI>\n")
p = run_segments(defaulted)
mtest.check(p.returncode == 3 and "wide-default.xml:4" in p.stderr and "entities expand too far" in p.stderr,
            "a wide entity in an attribute's default: exit %d, %s" % (p.returncode, p.stderr[:300]))
modest = write("modest-entity.xml", '<?xml version="1.0"?>\n<!DOCTYPE TEI [\n<!ENTITY ed "edited by the ferry clerk">\n]>\n' +
               TEI_OPEN + HEADER + "<text><body><p>" + "Notes &ed; and more. " * 5 + "</p></body></text></TEI>\n")
p = subprocess.run([mtest.BIN, "segments", "--unit", "whole", modest], capture_output=True, text=True, timeout=120)
lxml_words = len(re.findall(r"[^\W\d_]+", "".join(etree.parse(modest).getroot().find(
    "{http://www.tei-c.org/ns/1.0}text").itertext())))
rows = [l for l in p.stdout.splitlines() if l and not l.startswith("#")]
mtest.check(p.returncode == 0 and int(rows[1].split("\t")[2]) == lxml_words,
            "a short entity used 5 times: exit %d, %s against lxml's %d words" % (p.returncode, rows[1:], lxml_words))

# 4. External entity pointing at a local file: refused; the file's content never appears.
secret = write("secret.txt", MARKER + "\n")
xxe = write("xxe.xml", '<?xml version="1.0"?>\n<!DOCTYPE TEI [\n<!ENTITY secret SYSTEM "%s">\n]>\n' % secret +
            TEI_OPEN + HEADER + "<text><body><p>before &secret; after</p></body></text></TEI>\n")
for fmt in ("tsv", "json"):
    p = run_segments(xxe, "--format", fmt)
    mtest.check(MARKER not in p.stdout and MARKER not in p.stderr, "external entity content leaked (%s)" % fmt)
    mtest.check(p.returncode == 3 and "external entity" in p.stderr and "xxe.xml:" in p.stderr,
                "external entity: clear refusal expected: %d %s" % (p.returncode, p.stderr))
# A parameter entity pulling an external DTD fragment is refused too.
xxe_pe = write("xxe-pe.xml", '<?xml version="1.0"?>\n<!DOCTYPE TEI [\n<!ENTITY % ext SYSTEM "' + secret +
               '">\n%ext;\n]>\n' + TEI_OPEN + HEADER + "<text><body><p>x</p></body></text></TEI>\n")
p = run_segments(xxe_pe)
mtest.check(MARKER not in p.stdout + p.stderr, "external parameter entity content leaked")
mtest.check(p.returncode != 0, "external parameter entity: non-zero exit expected")

# 5. Empty file.
empty = write("empty.xml", "")
p = run_segments(empty)
mtest.check(p.returncode == 3 and "empty.xml" in p.stderr and "empty" in p.stderr.lower(),
            "empty file: clear message, exit 3: %d %s" % (p.returncode, p.stderr))

# 6. Unreadable / missing file.
p = run_segments(os.path.join(tmp, "does-not-exist.xml"))
mtest.check(p.returncode == 3 and "does-not-exist.xml" in p.stderr, "missing file: " + p.stderr)

# 7. A selection that finds nothing: a play-less edition asked for speakers.
prose = write("prose.xml", TEI_OPEN + HEADER + "<text><body><p>Only prose here.</p></body></text></TEI>\n")
p = run_segments(prose, unit="speaker")
mtest.check(p.returncode == 4 and "no speaker segment" in p.stderr, "nothing selected: exit 4 and message: %d %s"
            % (p.returncode, p.stderr))
p = subprocess.run([mtest.BIN, "segments", "--unit", "xpath:///tei:nothing", prose], capture_output=True, text=True)
mtest.check(p.returncode == 4, "xpath selecting nothing: exit 4, got %d" % p.returncode)
p = subprocess.run([mtest.BIN, "segments", "--unit", "xpath://tei:p[", prose], capture_output=True, text=True)
mtest.check(p.returncode == 2 and "does not compile" in p.stderr, "bad XPath: usage error: " + p.stderr)

# 8. Usage errors: unknown unit and option values.
p = subprocess.run([mtest.BIN, "segments", "--unit", "stanza", prose], capture_output=True, text=True)
mtest.check(p.returncode == 2 and "unknown unit" in p.stderr, "unknown unit: " + p.stderr)

# 9. Two files of one name in different folders would give their segments the same ids
# (file stem + "#" + id): theirs begin with the end of their path that tells them apart
# (first/same, second/same; the folder names from os.path), each file's segments listed
# once.
for folder in ("first", "second"):
    os.makedirs(os.path.join(tmp, folder), exist_ok=True)
    write(os.path.join(folder, "same.xml"), TEI_OPEN + HEADER + "<text><body><p>Twice named.</p></body></text></TEI>\n")
same_paths = [os.path.join(tmp, folder, "same.xml") for folder in ("first", "second")]
p = subprocess.run([mtest.BIN, "segments", "--unit", "whole"] + same_paths, capture_output=True, text=True)
ids = [row["segment"] for row in mtest.read_tsv(p.stdout)] if p.returncode == 0 else []
expected_ids = [os.path.basename(os.path.dirname(path)) + "/same#whole1" for path in same_paths]
mtest.check(p.returncode == 0 and ids == expected_ids,
            "same file name in two folders: ids %r, expected %r (%d %s)" % (ids, expected_ids, p.returncode, p.stderr))
# One file named twice, under one spelling or two (first/./same.xml is first/same.xml to
# os.path.normpath): a usage error naming it, rather than the file compared with itself.
respelled = os.path.join(tmp, "first", ".", "same.xml")
mtest.check(os.path.normpath(respelled) == same_paths[0], "normpath reads %s" % os.path.normpath(respelled))
for second in (same_paths[0], respelled):
    p = run_segments(same_paths[0], second)
    mtest.check(p.returncode == 2 and "named twice among the inputs" in p.stderr and second in p.stderr,
                "one file named twice (%s): usage error naming it: %d %s" % (second, p.returncode, p.stderr))

# 10. Documents that end too soon or never begin. libxml2's push parser, which reads the
# files, reports every one of them at the end of the input as "Extra content at the end of
# the document"; the message must say instead what lxml's whole-document parse of the same
# bytes finds (lxml, python3-lxml: the independent reading). A file cut short mid-paragraph,
# as an interrupted copy leaves it:
cut_text = (TEI_OPEN + "\n" + HEADER + "\n<text><body>\n<div>\n<p>The first paragraph.</p>\n"
            "<p>The second paragraph\nruns on and is cut")
cut = write("cut.xml", cut_text)


def lxml_error(path):
    """lxml's message for a document it refuses."""
    try:
        etree.parse(path)
    except etree.XMLSyntaxError as e:
        return str(e)
    mtest.fail("lxml parsed " + path)


found = re.search(r"Premature end of data in tag (\w+) line (\d+)", lxml_error(cut))
mtest.check(found is not None, "lxml's message for the cut file: %s" % lxml_error(cut))
lxml_tag, lxml_line = found.group(1), int(found.group(2))
p = run_segments(cut)
last_line = cut_text.count("\n") + 1
mtest.check(p.returncode == 3, "cut file: exit 3 expected, got %d" % p.returncode)
mtest.check("cut.xml:%d:" % last_line in p.stderr, "cut file: the message names the last line %d: %s"
            % (last_line, p.stderr))
mtest.check("<%s> (begun on line %d)" % (lxml_tag, lxml_line) in p.stderr and "cut short" in p.stderr,
            "cut file: names <%s> begun on line %d as lxml does: %s" % (lxml_tag, lxml_line, p.stderr))
mtest.check("Extra content" not in p.stderr, "cut file: libxml2's misleading message kept: " + p.stderr)
# Text that is not XML at all (lxml: "Start tag expected, '<' not found"): not "empty".
prose_only = write("letter.xml", "Dear Sir, this was saved as plain text.\n")
mtest.check("'<' not found" in lxml_error(prose_only), "lxml's message for plain text: " + lxml_error(prose_only))
p = run_segments(prose_only)
mtest.check(p.returncode == 3 and "letter.xml:1" in p.stderr and "'<' expected" in p.stderr
            and "empty" not in p.stderr, "plain text: says markup is missing, not that it is empty: " + p.stderr)
# A prolog and a comment, no root element (XML 1.0 section 2.1: a document has exactly one).
prolog_only = write("prolog.xml", '<?xml version="1.0"?>\n<!-- the edition goes here -->\n')
p = run_segments(prolog_only)
mtest.check(p.returncode == 3 and "prolog.xml:" in p.stderr and "no root element" in p.stderr,
            "prolog only: says there is no root element: " + p.stderr)
# Text after the root element's end: here libxml2's message is right, and kept (XML 1.0
# section 2.1: only Misc, comments, processing instructions and white space, may follow).
trailing = write("trailing.xml", TEI_OPEN + HEADER + "<text><body><p>x</p></body></text></TEI>\nstray words\n")
mtest.check("Extra content at the end of the document" in lxml_error(trailing), "lxml: " + lxml_error(trailing))
p = run_segments(trailing)
mtest.check(p.returncode == 3 and "trailing.xml:2" in p.stderr
            and "Extra content at the end of the document" in p.stderr,
            "text after the root: libxml2's message with the line: " + p.stderr)

# 11. A link that points at itself, named like a TEI file, in a folder walked for *.xml: it
# is taken as a file, whose reading fails with a message naming it (exit 3), not an internal
# error. What the system says
# of the link is taken from os.stat (POSIX: ELOOP) and must be what the message says.
looped = os.path.join(tmp, "linked")
os.makedirs(looped)
write(os.path.join("linked", "fine.xml"), TEI_OPEN + HEADER + "<text><body><p>Fine.</p></body></text></TEI>\n")
os.symlink("itself.xml", os.path.join(looped, "itself.xml"))
try:
    os.stat(os.path.join(looped, "itself.xml"))
    mtest.fail("os.stat followed a link to itself")
except OSError as e:
    mtest.check(e.errno == errno.ELOOP, "os.stat of the looped link: %r" % e)
    system_says = os.strerror(e.errno)
p = run_segments(looped)
mtest.check(p.returncode == 3 and "itself.xml" in p.stderr and system_says in p.stderr and "internal" not in p.stderr,
            "a link to itself: exit 3 naming it with the system's reason (%s): %d %s"
            % (system_says, p.returncode, p.stderr))

# 12. An entity that only the external DTD named in the DOCTYPE declares, as older TEI files
# have (&nbsp; with tei_all.dtd): refused, since external DTDs are never loaded, with the
# entity, the line and the DTD's name, which lxml reads from the same DOCTYPE (docinfo).
legacy = write("legacy.xml", '<?xml version="1.0"?>\n<!DOCTYPE TEI SYSTEM "tei_all.dtd">\n' + TEI_OPEN + HEADER +
               "\n<text><body><p>Before&nbsp;after.</p></body></text></TEI>\n")
legacy_tree = etree.parse(legacy, etree.XMLParser(load_dtd=False, no_network=True, resolve_entities=False))
dtd_name = legacy_tree.docinfo.system_url
entity = [e.name for e in legacy_tree.iter() if isinstance(e, etree._Entity)]
mtest.check(dtd_name == "tei_all.dtd" and entity == ["nbsp"], "lxml reads %r, %r" % (dtd_name, entity))
p = run_segments(legacy)
mtest.check(p.returncode == 3 and "legacy.xml:4:" in p.stderr and "'nbsp'" in p.stderr
            and "the DOCTYPE names %s, which manicule never loads" % dtd_name in p.stderr,
            "an entity of the external DTD: exit 3, entity, line and DTD named: %d %s" % (p.returncode, p.stderr))

# 13. Analysis options no corpus could satisfy are refused before any file is read: over a
# folder holding a malformed file, the exit is 2 (usage) naming the option, not 3 (the file,
# which reading would have met first); batch creates no store, annotate writes nothing.
refused = os.path.join(tmp, "refused")
os.makedirs(refused)
write(os.path.join("refused", "broken.xml"), TEI_OPEN + HEADER + "<text><body><p>Cut short")
for args in (["distances", "--unit", "whole", "--ranks", "10-5", refused],
             ["annotate", "--unit", "whole", "--culling", "150", "--output", os.path.join(tmp, "out"), refused],
             ["batch", refused, "--store", os.path.join(tmp, "refused.sqlite"), "--unit", "whole", "--analyse",
              "--ranks", "0-10"]):
    p = subprocess.run([mtest.BIN] + args, capture_output=True, text=True, timeout=120)
    mtest.check(p.returncode == 2 and ("feature ranks" in p.stderr or "culling" in p.stderr)
                and "broken.xml" not in p.stderr,
                "%s with an impossible option: exit 2 before reading: %d %s" % (args[0], p.returncode, p.stderr))
mtest.check(not os.path.exists(os.path.join(tmp, "refused.sqlite")) and not os.path.exists(os.path.join(tmp, "out")),
            "a refused command left a store or an output behind")

# 14. A sign before a count, anything after the digits of --ranks, or a number below an
# option's bound is a bad value (exit 2, README's table, naming the option). CLI11 read "-3" into an unsigned option as 2^64 - 3:
# `attribute --resamples -3` stopped with an internal error (exit 70), `--min-tokens -5`
# asked for more words than any text has, and `--ranks 1-150x` was taken as 1-150.
letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
for args, option in ((["attribute", "--resamples", "-3"], "--resamples"),
                     (["distances", "--min-tokens", "-5"], "--min-tokens"),
                     (["verify", "--seed", "-1"], "--seed"),
                     (["distances", "--neighbours", "+2"], "--neighbours"),
                     (["distances", "--ranks", "1-150x"], "--ranks"),
                     (["distances", "--ranks", " 1-150"], "--ranks"),
                     # The bound said plainly: CLI11's own check printed the largest double in full.
                     (["attribute", "--weight-spread", "-1"], "--weight-spread"),
                     (["attribute", "--z-limit", "-2"], "--z-limit")):
    p = subprocess.run([mtest.BIN] + args + ["--unit", "letter", letters], capture_output=True, text=True, timeout=120)
    mtest.check(p.returncode == 2 and option in p.stderr and "internal" not in p.stderr and len(p.stderr) < 300,
                "%s: exit 2 naming %s: %d %s" % (" ".join(args), option, p.returncode, p.stderr))

# 15. Options that would do nothing in the company they are given are refused (exit 2,
# naming both), not passed by in silence: --backup without --in-place (the edition is not
# overwritten, so nothing is backed up), annotate's --candidate without --verify, map
# --components 0 (two were computed all the same), evaluate --table verification without
# --verification (an empty table, exit 0), --neighbours where no nearest segments are
# listed (attribute, verify, evaluate, tree). Nothing is written.
out = os.path.join(tmp, "never-written.xml")
for args, named in ((["annotate", "--output", out, "--backup"], ("--backup", "--in-place")),
                    (["annotate", "--output", out, "--candidate", "#p-pellow"], ("--candidate", "--verify")),
                    (["map", "--components", "0"], ("--components",)),
                    (["evaluate", "--table", "verification"], ("--table", "--verification")),
                    # --neighbours where no nearest segments are listed (it was offered, and did nothing)
                    (["attribute", "--neighbours", "1"], ("--neighbours",)),
                    (["verify", "--neighbours", "1"], ("--neighbours",)),
                    (["evaluate", "--neighbours", "1"], ("--neighbours",)),
                    (["tree", "--neighbours", "1"], ("--neighbours",))):
    p = subprocess.run([mtest.BIN] + args + ["--unit", "letter", "--min-tokens", "200", letters],
                       capture_output=True, text=True, timeout=120)
    mtest.check(p.returncode == 2 and all(n in p.stderr for n in named) and p.stdout == "",
                "%s: exit 2 naming %s: %d %s" % (" ".join(args), named, p.returncode, p.stderr))
mtest.check(not os.path.exists(out), "a refused annotate wrote its output")

# 16. --keep of an element the preset reads anyway (README lists what each leaves out:
# `note` is, `notes` and, under the reading preset, `corr` are not) is said to change
# nothing, and the segments are those of the run without it; a real --keep says nothing.
plain = subprocess.run([mtest.BIN, "segments", "--unit", "letter", letters], capture_output=True, text=True)
for element in ("notes", "corr"):
    p = subprocess.run([mtest.BIN, "segments", "--unit", "letter", "--keep", element, letters],
                       capture_output=True, text=True)
    body = [l for l in p.stdout.splitlines() if not l.startswith("#")]
    mtest.check(p.returncode == 0 and "--keep %s changes nothing" % element in p.stderr
                and body == [l for l in plain.stdout.splitlines() if not l.startswith("#")],
                "--keep %s: %d %s" % (element, p.returncode, p.stderr))
p = subprocess.run([mtest.BIN, "segments", "--unit", "letter", "--keep", "note", letters], capture_output=True, text=True)
mtest.check(p.returncode == 0 and "changes nothing" not in p.stderr, "--keep note: %s" % p.stderr)
# --keep and --drop of one element ask opposite things: refused (exit 2), not the later taken.
p = subprocess.run([mtest.BIN, "segments", "--unit", "letter", "--keep", "note", "--drop", "note", letters],
                   capture_output=True, text=True)
mtest.check(p.returncode == 2 and "--keep note and --drop note" in p.stderr and not p.stdout,
            "--keep note --drop note: exit %d, %s" % (p.returncode, p.stderr))
# Both sides of an alternation (tei-conventions.md section 1: an app reads its lem or one
# reading, a choice its corr or its sic, never several): refused, where the edition's order
# used to choose without a word; one side alone shows in the selection line as preferred.
app = os.path.join(mtest.FIXTURES, "app-groups.xml")
for pair in (("lem", "rdg"), ("rdgGrp", "lem"), ("sic", "corr"), ("reg", "orig"), ("abbr", "expan")):
    p = subprocess.run([mtest.BIN, "segments", "--keep", pair[0], "--keep", pair[1], app], capture_output=True, text=True)
    mtest.check(p.returncode == 2 and "reads one of its members" in p.stderr and not p.stdout,
                "--keep %s --keep %s: exit %d, %s" % (pair + (p.returncode, p.stderr)))
p = subprocess.run([mtest.BIN, "segments", "--keep", "rdg", app], capture_output=True, text=True)
selection = [l for l in p.stdout.splitlines() if l.startswith("# selection:")]
mtest.check(p.returncode == 0 and len(selection) == 1 and selection[0].endswith(" prefer=rdg"),
            "--keep rdg: selection line %r" % selection)

# 17. A repeatable option takes one value each time: the inputs after `--keep note` or
# `--drop quote` are inputs, not more elements (they were taken as elements, so a run over
# two editions read none or one). `--unit whole` gives one segment per <text> (lxml counts
# them in the two example editions).
play = os.path.join(mtest.ROOT, "examples", "ferry-play.xml")
texts = sum(len(etree.parse(p).findall(".//{http://www.tei-c.org/ns/1.0}text")) for p in (letters, play))
for option in (["--keep", "note"], ["--drop", "quote"], ["--keep", "note", "--drop", "quote"]):
    p = subprocess.run([mtest.BIN, "segments", "--unit", "whole"] + option + [letters, play], capture_output=True, text=True)
    body = [l for l in p.stdout.splitlines() if l and not l.startswith("#")][1:]
    mtest.check(p.returncode == 0 and len(body) == texts and "changes nothing" not in p.stderr,
                "%s before two editions: exit %d, %d segments (lxml: %d texts), %s"
                % (" ".join(option), p.returncode, len(body), texts, p.stderr))

# 18. --drop and --keep take a TEI element's local name: "tei:stage", as an xpath unit
# spells it, is stage; a name with another prefix is refused (exit 2). The reading preset
# leaves the invented play's stage directions out, so --keep tei:stage adds exactly their
# words (lxml counts them, outside <front>).
plain = subprocess.run([mtest.BIN, "segments", "--unit", "whole", play], capture_output=True, text=True)
kept = subprocess.run([mtest.BIN, "segments", "--unit", "whole", "--keep", "tei:stage", play], capture_output=True,
                      text=True)
tokens = lambda p: int([l for l in p.stdout.splitlines() if l and not l.startswith("#")][1].split("\t")[2])
stage_words = sum(len(re.findall(r"[^\W\d_]+", "".join(s.itertext())))
                  for s in etree.parse(play).iter("{http://www.tei-c.org/ns/1.0}stage")
                  if not any(a.tag == "{http://www.tei-c.org/ns/1.0}front" for a in s.iterancestors()))
mtest.check(kept.returncode == 0 and stage_words > 0 and tokens(kept) - tokens(plain) == stage_words,
            "--keep tei:stage read no stage direction: %d against %d tokens (lxml: %d words in <stage>)"
            % (tokens(kept), tokens(plain), stage_words))
p = subprocess.run([mtest.BIN, "segments", "--unit", "whole", "--drop", "x:hi", play], capture_output=True, text=True)
mtest.check(p.returncode == 2 and "--drop x:hi" in p.stderr, "--drop x:hi: exit %d, %s" % (p.returncode, p.stderr))

# 19. What is not a regular file, named as an input or met again in a re-run, is refused
# with its kind and the run goes on (os.mkfifo makes a named pipe, POSIX; /dev/zero is a
# device without end): a pipe blocked the open for ever, /dev/zero was read without end.
# A folder given as the stop list was taken for an empty list.
pipe = os.path.join(tmp, "pipe.xml")
os.mkfifo(pipe)
endless = os.path.join(tmp, "endless.xml")
os.symlink("/dev/zero", endless)
store = os.path.join(tmp, "special.sqlite")
p = subprocess.run([mtest.BIN, "batch", pipe, endless, play, "--store", store, "--unit", "whole", "--quiet"],
                   capture_output=True, text=True, timeout=120)
mtest.check(p.returncode == 1 and pipe + ": cannot read the file: it is a named pipe" in p.stderr
            and endless + ": cannot read the file: it is a device" in p.stderr,
            "batch over a pipe and a device: exit %d, %s" % (p.returncode, p.stderr))
for unit in ("whole", "xpath://tei:p"):  # an xpath: unit reads the file as a tree first
    p = subprocess.run([mtest.BIN, "segments", "--unit", unit, pipe], capture_output=True, text=True, timeout=120)
    mtest.check(p.returncode == 3 and "it is a named pipe" in p.stderr,
                "segments --unit %s of a pipe: exit %d, %s" % (unit, p.returncode, p.stderr))
p = subprocess.run([mtest.BIN, "distances", "--unit", "whole", "--stop-words", tmp, play, play],
                   capture_output=True, text=True, timeout=120)
mtest.check(p.returncode == 3 and "cannot read the stop list: it is a folder" in p.stderr,
            "a folder as the stop list: exit %d, %s" % (p.returncode, p.stderr))

# 20. Two letters given one xml:id (xml:id 1.0 says an xml:id is unique in its document):
# refused with exit 3, naming the file and both lines as lxml reads them; it was refused as a
# usage error (exit 2) with no file ("segment id ... occurs twice in one profile").
letters_text = open(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), encoding="utf-8").read()
twice = write("same-id.xml", letters_text.replace('xml:id="L02"', 'xml:id="L01"', 1))
try:  # libxml2 under lxml refuses it too
    etree.parse(twice)
    lxml_refuses = False
except etree.XMLSyntaxError as e:
    lxml_refuses = "ID L01 already defined" in str(e)
mtest.check(lxml_refuses, "lxml reads two elements of one xml:id without a word")
lines = [d.sourceline for d in etree.parse(twice, etree.XMLParser(recover=True)).iter("{http://www.tei-c.org/ns/1.0}div")
         if d.get("{http://www.w3.org/XML/1998/namespace}id") == "L01"]
p = subprocess.run([mtest.BIN, "segments", "--unit", "letter", twice], capture_output=True, text=True, timeout=120)
mtest.check(len(lines) == 2 and p.returncode == 3 and "same-id.xml:%d:" % lines[1] in p.stderr
            and "lines %d and %d" % tuple(lines) in p.stderr,
            "two letters of one xml:id (lxml: lines %r): exit %d, %s" % (lines, p.returncode, p.stderr))

# An xml:id written with spaces around it is the same id (xml:id 1.0, section 4: the value
# is normalised as an ID): the segment is L03, not " L03 ".
spaced = write("spaced-id.xml", letters_text.replace('xml:id="L03"', 'xml:id=" L03 "', 1))
p = subprocess.run([mtest.BIN, "segments", "--unit", "letter", spaced], capture_output=True, text=True, timeout=120)
ids = [l.split("\t")[0] for l in p.stdout.splitlines() if l and not l.startswith("#")][1:]
mtest.check(p.returncode == 0 and "spaced-id#L03" in ids and not any(" " in i for i in ids),
            "an xml:id with spaces around it: %r" % ids)

# 21. Bytes that are not UTF-8 in a document that declares none: refused (lxml refuses them
# too) with one line naming the file, also as a batch stores it (file_list.error, read with
# Python's sqlite3): libxml2 puts the offending bytes on a line of their own.
latin = write("latin1-undeclared.xml", (TEI_OPEN + HEADER + "<text><body><p>caf\u00e9 au lait</p></body></text></TEI>\n")
              .encode("latin-1"), mode="wb")
try:
    etree.parse(latin)
    lxml_refuses = False
except etree.XMLSyntaxError:
    lxml_refuses = True
p = subprocess.run([mtest.BIN, "segments", "--unit", "whole", latin], capture_output=True, text=True, timeout=120)
mtest.check(lxml_refuses and p.returncode == 3 and p.stderr.count("\n") == 1 and "latin1-undeclared.xml:1" in p.stderr,
            "undeclared Latin-1: exit %d, %r" % (p.returncode, p.stderr))
store = os.path.join(tmp, "latin.sqlite")
p = subprocess.run([mtest.BIN, "batch", latin, "--store", store, "--unit", "whole", "--quiet"], capture_output=True, text=True)
db = sqlite3.connect(store)
errors = [r[0] for r in db.execute("SELECT error FROM file_list WHERE error IS NOT NULL")]
db.close()
mtest.check(p.returncode == 1 and len(errors) == 1 and "\n" not in errors[0], "the stored error: %r" % errors)

# 22. A store that cannot be one: a device (/dev/null opened as an empty database and failed
# at its first write, "disk I/O error", exit 5), and an input that does not exist, which
# left a new, empty store behind.
for args in (["analyse-store", "--store", "/dev/null"], ["merge", os.path.join(tmp, "m.sqlite"), "/dev/null"]):
    p = subprocess.run([mtest.BIN] + args, capture_output=True, text=True)
    mtest.check(p.returncode == 3 and "/dev/null is not a file" in p.stderr, "%r: exit %d, %s" % (args, p.returncode, p.stderr))
fresh = os.path.join(tmp, "never.sqlite")
p = subprocess.run([mtest.BIN, "batch", os.path.join(tmp, "no-such-folder"), "--store", fresh, "--unit", "letter"],
                   capture_output=True, text=True)
mtest.check(p.returncode == 3 and not any(os.path.exists(fresh + x) for x in ("", "-wal", "-shm")),
            "batch of a missing input: exit %d, store left: %s" % (p.returncode, os.path.exists(fresh)))

# 23. Elements nested 20,000 deep: libxml2's push parser sets no limit of its own (lxml's tree
# parse stops at 256), and each open element costs the reader memory (a million levels took
# 213 MB). Refused naming the file and the line, in little memory.
deep = write("deep.xml", TEI_OPEN + "<text><body>\n" + "<div>" * 20000 + "<p>x</p>" + "</div>" * 20000 +
             "</body></text></TEI>\n")
p = run_segments(deep)
mtest.check(p.returncode == 3 and "deep.xml:2" in p.stderr and "nested more than 10000 levels" in p.stderr,
            "20,000 levels deep: exit %d, %s" % (p.returncode, p.stderr))

# 24. Several inputs that cannot be read: a measuring command names the first with its
# line and the others by path (lxml refuses each), rather than one a try.
cut_files = [write("cut%d.xml" % k, TEI_OPEN + "<text><body><p>cut short\n") for k in (1, 2, 3)]
for f in cut_files:
    try:
        etree.parse(f)
        mtest.fail("lxml parsed the cut file " + f)
    except etree.XMLSyntaxError:
        pass
p = subprocess.run([mtest.BIN, "distances", "--unit", "whole"] + cut_files, capture_output=True, text=True)
mtest.check(p.returncode == 3 and "cut1.xml:" in p.stderr and "and 2 other file(s) cannot be read either" in p.stderr
            and all(f in p.stderr for f in cut_files[1:]), "three cut files: exit %d, %s" % (p.returncode, p.stderr))

# 25. A first word that names no command: said with the word and the commands, as the help
# lists them (its "Subcommands:" section), not CLI11's "A subcommand is required". The
# suggestion follows the rule in src/cli/unknown_command.h, worked out here with a
# Levenshtein distance of our own (Wagner-Fischer): the one command within one edit (a word
# of four letters or fewer) or two, else the one command the word begins; none when no
# command, or more than one, is that near.
# The commands the README documents, in the help's order.
COMMANDS = ["segments", "profile", "distances", "map", "tree", "annotate", "show", "export", "batch", "analyse-store",
            "merge", "attribute", "verify", "evaluate"]
listed = re.findall(r"^  (\S+) {2,}", subprocess.run([mtest.BIN, "--help"], capture_output=True, text=True)
                    .stdout.split("Subcommands:")[1], re.M)
mtest.check(listed == COMMANDS, "the help's commands: %r, the README's: %r" % (listed, COMMANDS))


def levenshtein(a, b):
    row = list(range(len(b) + 1))
    for i, ca in enumerate(a, 1):
        previous, row[0] = row[0], i
        for j, cb in enumerate(b, 1):
            previous, row[j] = row[j], min(row[j] + 1, row[j - 1] + 1, previous + (ca != cb))
    return row[len(b)]


def expected_suggestion(word):
    near = [c for c in COMMANDS if levenshtein(word, c) <= (1 if len(word) <= 4 else 2)]
    if not near and len(word) >= 2:
        near = [c for c in COMMANDS if c.startswith(word)]
    return near[0] if len(near) == 1 else None


for word in ("analyze-store", "frobnicate", "an", "ann", "mp", "segmnts"):
    suggested = expected_suggestion(word)
    p = subprocess.run([mtest.BIN, word, "--store", "x.sqlite"], capture_output=True, text=True)
    said = re.search(r"The commands are: (.*) \(manicule --help", p.stderr)
    mtest.check(p.returncode == 2 and ("no command '%s'" % word) in p.stderr and said is not None
                and said.group(1).split() == COMMANDS and ("did you mean" in p.stderr) == (suggested is not None)
                and (suggested is None or "did you mean %s?" % suggested in p.stderr),
                "unknown command %r (suggestion %r): exit %d, %s" % (word, suggested, p.returncode, p.stderr))
mtest.check(expected_suggestion("analyze-store") == "analyse-store" and expected_suggestion("frobnicate") is None,
            "the rule's own cases")

# 26. A file name holding control characters (ESC [ 2 K and a carriage return, which on a
# terminal wiped the "failed:" before them; ECMA-48 EL): said with each as \xNN, by its
# UTF-8 bytes (C0 controls below 0x20, DEL 0x7f, C1 controls U+0080-U+009F: ISO/IEC 6429),
# the rest of the message as it was, exit 1.
odd_folder = os.path.join(tmp, "control-names")
os.makedirs(odd_folder)
odd_name = "a\x1b[2K\rb\x7f\u009bc.xml"  # and DEL, and U+009B (CSI, a C1 control: UTF-8 C2 9B)
with open(os.path.join(odd_folder, odd_name), "w") as f:
    f.write("not xml")
p = mtest.run(["batch", odd_folder, "--store", os.path.join(tmp, "control.sqlite"), "--unit", "letter", "--quiet"],
              check=False)
shown = os.path.join(odd_folder, "".join("".join("\\x%02x" % b for b in c.encode("utf-8"))
                                          if ord(c) < 0x20 or 0x7f <= ord(c) <= 0x9f else c for c in odd_name))
mtest.check(p.returncode == 1 and ("manicule: failed: " + shown + ":1:1:") in p.stderr
            and not any((ord(c) < 0x20 and c not in "\n\t") or 0x7f <= ord(c) <= 0x9f for c in p.stderr),
            "a file name with control characters: exit %d, %r" % (p.returncode, p.stderr))

mtest.done()
