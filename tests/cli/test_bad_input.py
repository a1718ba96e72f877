"""Bad input gets a clear message naming the file (and line), a non-zero exit, no crash or
hang, bounded memory, and no leak of external files (issue acceptance, foundation).

Hostile documents are written here into a temporary folder, so the test does not depend on
fixture files. The entity bomb is the classic "billion laughs" construction (10 levels of 10
references, 10^10 expansions; XML 1.0 section 4.2 entity declarations); the external entity
is the XML External Entity pattern (OWASP XXE), pointing at a local file with a marker.
"""
import os
import resource
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402

TEI_OPEN = '<TEI xmlns="http://www.tei-c.org/ns/1.0">'
HEADER = ('<teiHeader><fileDesc><titleStmt><title>T</title></titleStmt><publicationStmt><p>x</p>'
          '</publicationStmt><sourceDesc><p>invented</p></sourceDesc></fileDesc></teiHeader>')
MARKER = "MARKER-9c41-NEVER-SHOWN"

tmp = tempfile.mkdtemp(prefix="manicule-bad-")


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
# (file stem + "#" + id): refused with a usage error naming the id, not listed twice.
for folder in ("first", "second"):
    os.makedirs(os.path.join(tmp, folder), exist_ok=True)
    write(os.path.join(folder, "same.xml"), TEI_OPEN + HEADER + "<text><body><p>Twice named.</p></body></text></TEI>\n")
p = run_segments(os.path.join(tmp, "first", "same.xml"), os.path.join(tmp, "second", "same.xml"))
mtest.check(p.returncode == 2 and "same#" in p.stderr and "twice" in p.stderr,
            "same file name in two folders: usage error naming the id: %d %s" % (p.returncode, p.stderr))

mtest.done()
