"""Write-back on invented editions with the hazards editors' files have: internal
entities, comments and PIs before the root, CRLF, a byte-order mark, UTF-16, ISO-8859-1,
prefixed TEI, no ids, empty header parts, entities that hold elements; and the other
outputs (--output, --standoff-file) and `show`.

Outside references: difflib (only insertions; removing them gives back the input), lxml
(the inserted ranges are standOff/application/change where TEI allows them; pointers
resolve), jing with TEI P5 4.12.0 tei_all.rng (no new errors), the UTF-16 and ISO-8859-1
codecs of Python; for `show`, the distances lxml reads in the written file, each equal to
SciPy's cosine distance of numpy z-scores from the run's counts (and to what `distances
--format json` computes on the same options).
"""
import json
import os
import re
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
from attribution_reference import z_from_relative  # noqa: E402
from mtest import FIXTURES, ROOT, SCHEMA, check, done, read_tsv, run  # noqa: E402
from standoff_check import (NS, PARSER, XML_ID, check_insertions, id_targets, inserted_chunks,  # noqa: E402
                            jing_errors, resolve_tei_xpath)
from lxml import etree  # noqa: E402
import numpy as np  # noqa: E402
from scipy.spatial.distance import cosine as cosine_distance  # noqa: E402

if shutil.which("jing") is None:
    print("SKIP: jing not available")
    sys.exit(77)

ENV = dict(os.environ, SOURCE_DATE_EPOCH="1767225600")
OWN = os.path.join(FIXTURES, "standoff")
work = tempfile.mkdtemp(prefix="manicule-fixtures-")
validated = []  # (input, output) pairs for jing


def copy(path, folder="ed"):
    os.makedirs(os.path.join(work, folder), exist_ok=True)
    target = os.path.join(work, folder, os.path.basename(path))
    shutil.copyfile(path, target)
    return target


def as_utf8(data):
    """The file's text as UTF-8 bytes: UTF-16 (BOM) decoded, other files as they are."""
    if data[:2] in (b"\xff\xfe", b"\xfe\xff"):
        return data.decode("utf-16").encode("utf-8")
    return data


def annotated(path, args, allow_ids=False, original=None):
    """Annotates a copy in place twice; checks insertions and idempotence."""
    before = open(original or path, "rb").read()
    run(["annotate", path, "--in-place"] + args, env=ENV)
    after = open(path, "rb").read()
    _, problems = check_insertions(as_utf8(before), as_utf8(after), allow_ids=allow_ids, parse_bytes=after)
    check(not problems, "%s: %s" % (os.path.basename(path), "; ".join(problems[:4])))
    run(["annotate", path, "--in-place"] + args, env=ENV)
    check(open(path, "rb").read() == after, "%s: a second run changed the bytes" % os.path.basename(path))
    validated.append((original or path, path))
    return before, after


def no_temporary_files(folder):
    left = [f for f in os.listdir(folder) if "manicule-tmp" in f]
    check(not left, "temporary files left in %s: %s" % (folder, left))


try:
    # 1. The shared hazard fixtures in one run: each gets its own segment's results, and
    #    links to the others as relative URIs.
    names = ["internal-entities.xml", "comments-pi.xml", "crlf.xml", "bom.xml", "utf16.xml"]
    copies = [copy(os.path.join(FIXTURES, n), "shared") for n in names]
    befores = {c: open(c, "rb").read() for c in copies}
    run(["annotate"] + copies + ["--unit", "whole", "--min-tokens", "1", "--in-place"], env=ENV)
    for c in copies:
        before, after = befores[c], open(c, "rb").read()
        _, problems = check_insertions(as_utf8(before), as_utf8(after), parse_bytes=after)
        check(not problems, "%s: %s" % (os.path.basename(c), "; ".join(problems[:4])))
        validated.append((os.path.join(FIXTURES, os.path.basename(c)), c))
        tree = etree.fromstring(after, PARSER)
        links = tree.xpath("//tei:standOff[@type='stylometry']//tei:link", namespaces=NS)
        check(len(links) == 4, "%s: %d links, expected one to each other file" % (c, len(links)))
        for link in links:
            ends = sorted(link.get("target").split())  # "#..." (here) sorts before "name.xml#..."
            check(ends[0] == "#xpath(/TEI[1]/text[1])" and
                  re.match(r"[a-z0-9-]+\.xml#xpath\(/TEI\[1\]/text\[1\]\)$", ends[1]), "link target %s" % ends)
    check(open(copies[3], "rb").read()[:3] == b"\xef\xbb\xbf", "bom.xml lost its byte-order mark")
    utf16 = open(copies[4], "rb").read()
    check(utf16[:2] == b"\xff\xfe" and utf16.decode("utf-16").count("<standOff") == 1, "utf16.xml is not UTF-16 LE")
    crlf = open(copies[2], "rb").read()
    check(crlf.count(b"\n") == crlf.count(b"\r\n"), "crlf.xml has line ends without CR after write-back")
    # The same file with CR alone ending its lines (an old Mac's; XML 1.0 2.11 reads CR as a
    # line end): the lines added end so too, with no LF anywhere, and only insertions.
    cr_only = os.path.join(work, "cr", "cr-only.xml")
    os.makedirs(os.path.dirname(cr_only), exist_ok=True)
    source = open(os.path.join(FIXTURES, "crlf.xml"), "rb").read().replace(b"\r\n", b"\r")
    open(cr_only, "wb").write(source)
    check(b"\n" not in source and source.count(b"\r") > 5, "the CR-only copy has %d CRs" % source.count(b"\r"))
    run(["annotate", cr_only, "--unit", "whole", "--min-tokens", "1", "--in-place"], env=ENV)
    after = open(cr_only, "rb").read()
    _, problems = check_insertions(as_utf8(source), as_utf8(after), parse_bytes=after)
    check(not problems and b"\n" not in after and after.count(b"\r") > source.count(b"\r"),
          "a file of CR line ends after write-back: %d LF, %s" % (after.count(b"\n"), "; ".join(problems[:3])))
    again = {c: open(c, "rb").read() for c in copies}
    run(["annotate"] + copies + ["--unit", "whole", "--min-tokens", "1", "--in-place"], env=ENV)
    for c in copies:
        check(open(c, "rb").read() == again[c], "%s changed on a second run" % os.path.basename(c))
    no_temporary_files(os.path.join(work, "shared"))

    # 2. Units without ids: xpath() pointers (speeches joined per speaker), then --add-ids.
    speeches = copy(os.path.join(OWN, "no-ids.xml"), "speeches")
    annotated(speeches, ["--unit", "speaker", "--min-tokens", "1"])
    tree = etree.parse(speeches, PARSER).getroot()
    joins = tree.xpath("//tei:standOff[@type='stylometry']//tei:join", namespaces=NS)
    check(len(joins) == 1 and len(joins[0].get("target").split()) == 2, "one join of Wirt's two speeches expected")
    for pointer in joins[0].get("target").split():
        element = resolve_tei_xpath(tree, pointer[len("#xpath("):-1])
        check(element is not None and element.tag == "{%s}sp" % NS["tei"], "join part %s is no sp" % pointer)
    chapters = copy(os.path.join(OWN, "no-ids.xml"), "chapters")
    original = os.path.join(OWN, "no-ids.xml")
    annotated(chapters, ["--unit", "chapter", "--min-tokens", "1", "--add-ids"], allow_ids=True, original=original)
    tree = etree.parse(chapters, PARSER).getroot()
    divs = tree.xpath("//tei:div[@type='chapter']", namespaces=NS)
    check(all(d.get(XML_ID) for d in divs), "a chapter has no xml:id")
    targets = tree.xpath("//tei:standOff[@type='stylometry']//tei:annotation/@target", namespaces=NS)
    check(not [t for t in targets if "xpath(" in t], "xpath() pointers left after --add-ids: %s" % targets)
    ids = id_targets(tree)
    for t in targets:
        check(t.lstrip("#") in ids, "annotation target %s does not resolve" % t)
    # A joint speech (who="#wirt #toller") is a speech of each speaker: --add-ids must give
    # it one xml:id, not one per speaker (two would be the same attribute twice, not
    # well-formed XML: XML 1.0, well-formedness constraint "Unique Att Spec"), and both
    # speakers' joins must point at it. lxml reads the written file.
    joint_original = os.path.join(OWN, "joint-speech-no-ids.xml")
    joint = copy(joint_original, "joint")
    annotated(joint, ["--unit", "speaker", "--min-tokens", "1", "--add-ids"], allow_ids=True, original=joint_original)
    tree = etree.parse(joint, PARSER).getroot()
    both = tree.xpath("//tei:sp[@who='#wirt #toller']", namespaces=NS)
    joint_id = both[0].get(XML_ID) if len(both) == 1 else None
    check(joint_id is not None, "the joint speech got no xml:id")
    joins = tree.xpath("//tei:standOff[@type='stylometry']//tei:join", namespaces=NS)
    check(len(joins) == 2, "%d joins, expected one for each speaker's two speeches" % len(joins))
    ids = id_targets(tree)
    for join in joins:
        parts = join.get("target").split()
        check(len(parts) == 2 and "#" + joint_id in parts, "join %s leaves out the joint speech #%s" % (parts, joint_id))
        for part in parts:
            check(part.startswith("#") and part[1:] in ids and ids[part[1:]].tag == "{%s}sp" % NS["tei"],
                  "join part %s does not resolve to a speech" % part)

    # A letter that is its text's whole body is known by its TEI's xml:id (lxml), before
    # and after --add-ids gives the body an id of its own: the ids a store or a labels
    # file knows the letters by stay the same.
    corpus_original = os.path.join(OWN, "letters-corpus-no-ids.xml")
    corpus_letters = copy(corpus_original, "corpus-letters")
    expected = sorted("letters-corpus-no-ids#" + t.get(XML_ID)
                      for t in etree.parse(corpus_original).getroot().iter("{%s}TEI" % NS["tei"]))
    listed = lambda: sorted(r["segment"] for r in read_tsv(  # noqa: E731
        run(["segments", "--unit", "letter", corpus_letters]).stdout))
    check(listed() == expected, "the body letters are not known by their TEI's ids: %r" % listed())
    annotated(corpus_letters, ["--unit", "letter", "--min-tokens", "1", "--add-ids"], allow_ids=True,
              original=corpus_original)
    bodies = list(etree.parse(corpus_letters).getroot().iter("{%s}body" % NS["tei"]))
    check(len(expected) >= 2 and len(bodies) == len(expected) and all(b.get(XML_ID) for b in bodies),
          "--add-ids gave a body letter no xml:id (%d bodies, %d letters)" % (len(bodies), len(expected)))
    check(listed() == expected, "--add-ids changed the letters' ids: %r, expected %r" % (listed(), expected))

    # 3. Encodings and namespaces.
    latin1 = copy(os.path.join(OWN, "latin1.xml"), "enc")
    before, after = annotated(latin1, ["--unit", "speaker", "--min-tokens", "1"])
    check(all(max(data) < 0x80 for _, data in inserted_chunks(before, after)),
          "non-ASCII bytes written into an ISO-8859-1 file")
    check(b"Z&#xF6;llner" in after and "Zöllner".encode("latin-1") in after, "latin1.xml names not as expected")
    prefixed = copy(os.path.join(OWN, "prefixed.xml"), "enc")
    before, after = annotated(prefixed, ["--unit", "chapter", "--min-tokens", "1"])
    check(b"<tei:standOff " in after and b"<standOff" not in after, "prefixed.xml: our elements lack the prefix")
    empty = copy(os.path.join(OWN, "empty-revision.xml"), "enc")
    proc = run(["annotate", empty, "--in-place", "--unit", "chapter", "--min-tokens", "1"], env=ENV)
    check("revisionDesc/> is empty" in proc.stderr, "the missing change is not reported: %s" % proc.stderr)
    _, problems = check_insertions(open(os.path.join(OWN, "empty-revision.xml"), "rb").read(), open(empty, "rb").read())
    check(not problems, "empty-revision.xml: %s" % problems)
    validated.append((os.path.join(OWN, "empty-revision.xml"), empty))

    # 4. Entities that hold elements: refused where they could hide our insertion point.
    header = copy(os.path.join(OWN, "markup-entity-header.xml"), "entities")
    proc = run(["annotate", header, "--in-place", "--unit", "whole", "--min-tokens", "1"], check=False, env=ENV)
    check(proc.returncode == 3 and "entity" in proc.stderr and "markup-entity-header.xml" in proc.stderr,
          "entity in the header not refused clearly: %d %s" % (proc.returncode, proc.stderr))
    check(open(header, "rb").read() == open(os.path.join(OWN, "markup-entity-header.xml"), "rb").read(),
          "markup-entity-header.xml changed although refused")
    in_text = copy(os.path.join(OWN, "markup-entity-text.xml"), "entities")
    proc = run(["annotate", in_text, "--in-place", "--unit", "chapter", "--min-tokens", "1", "--add-ids"],
               check=False, env=ENV)
    check(proc.returncode == 3 and "--add-ids" in proc.stderr, "--add-ids over an entity not refused: %s" % proc.stderr)
    annotated(in_text, ["--unit", "chapter", "--min-tokens", "1"], original=os.path.join(OWN, "markup-entity-text.xml"))
    no_temporary_files(os.path.join(work, "entities"))

    # 5. --output leaves the input alone; --standoff-file writes a TEI document of its own.
    letters_source = os.path.join(ROOT, "examples", "ferry-letters.xml")
    letters = copy(letters_source, "letters")
    args = ["--unit", "letter", "--min-tokens", "50"]
    out = os.path.join(work, "letters", "annotated.xml")
    run(["annotate", letters, "--output", out] + args, env=ENV)
    check(open(letters, "rb").read() == open(letters_source, "rb").read(), "--output changed its input")
    _, problems = check_insertions(open(letters_source, "rb").read(), open(out, "rb").read())
    check(not problems, "--output: %s" % problems)
    validated.append((letters_source, out))
    results = os.path.join(work, "results", "letters-results.xml")
    os.makedirs(os.path.dirname(results))
    run(["annotate", letters, "--standoff-file", results] + args, env=ENV)
    check(open(letters, "rb").read() == open(letters_source, "rb").read(), "--standoff-file changed the edition")
    validated.append((None, results))
    edition = etree.parse(letters, PARSER).getroot()
    ids = id_targets(edition)
    pointers = etree.parse(results, PARSER).getroot().xpath(
        "//tei:standOff//@target | //tei:standOff//@corresp", namespaces=NS)
    external = [p for value in pointers for p in value.split() if not p.startswith("#")]
    check(external, "the results file has no pointer into the edition")
    for p in external:
        path, fragment = p.split("#", 1)
        check(os.path.normpath(os.path.join(os.path.dirname(results), path)) == os.path.normpath(letters),
              "pointer %s does not lead to the edition" % p)
        check(fragment in ids, "pointer %s names no element of the edition" % p)
    proc = run(["annotate", letters, "--standoff-file", letters] + args, check=False, env=ENV)
    check(proc.returncode == 2 and open(letters, "rb").read() == open(letters_source, "rb").read(),
          "--standoff-file naming an edition was not refused: %d %s" % (proc.returncode, proc.stderr))

    # 6. show gives back the numbers the run computed (distances on the same options).
    shown = json.loads(run(["show", out, "--format", "json"]).stdout)
    computed = json.loads(run(["distances", letters] + args + ["--format", "json"]).stdout)
    pairs = {tuple(sorted((p["segment_a"], p["segment_b"]))): p["value"] for p in computed["pairs"]}
    check(len(shown["distances"]) > 10, "too few distances stored")
    for d in shown["distances"]:
        key = tuple(sorted((d["segment_a"], d["segment_b"])))
        check(pairs.get(key) == d["value"], "distance %s: stored %r, computed %r" % (key, d["value"], pairs.get(key)))
        check(d["measure"] == computed["measure"]["name"], "measure differs")
    nearest = {n["segment"]: [(m["segment"], m["distance"]) for m in n["nearest"]] for n in computed["nearest_neighbours"]}
    for s in shown["segments"]:
        check([(m["segment"], m["distance"]) for m in s["nearest"]] == nearest[s["segment"]],
              "nearest of %s differ" % s["segment"])
    # What lxml reads in the written file: each link's fs, its two segments and its value;
    # show must list exactly these, and each value must be SciPy's cosine distance of the
    # z-scores numpy computes from the run's counts (Smith & Aldridge 2011).
    tree = etree.parse(out, PARSER)
    targets = id_targets(tree)
    by_lxml = {}
    for link in tree.iterfind(".//tei:linkGrp[@type='styleDistance']/tei:link", NS):
        fs = targets[link.get("ana").lstrip("#")]
        segments = tuple(sorted(s.text for s in fs.iterfind("tei:f[@name='segments']/tei:vColl/tei:string", NS)))
        by_lxml[segments] = float(fs.find("tei:f[@name='value']/tei:numeric", NS).get("value"))
    check(by_lxml == {tuple(sorted((d["segment_a"], d["segment_b"]))): d["value"] for d in shown["distances"]},
          "show lists other distances than lxml reads in the file")
    rows = read_tsv(run(["profile", letters] + args + ["--values", "counts"]).stdout)
    ids = [r["segment"] for r in rows]
    words = {s["segment"]: s["tokens"] for s in computed["segments"]}
    counts = np.array([[float(r[f]) for f in rows[0] if f != "segment"] for r in rows])
    z = z_from_relative(counts / np.array([words[i] for i in ids], dtype=float)[:, None], 0)
    for (a, b), value in by_lxml.items():
        expected = cosine_distance(z[ids.index(a)], z[ids.index(b)])
        check(abs(value - expected) <= 1e-9 * max(1.0, abs(expected)), "%s-%s: %r, SciPy %r" % (a, b, value, expected))
    tsv = run(["show", out]).stdout
    check(tsv.count("\ndistance\t") == len(by_lxml), "show --format tsv lists other distances than the file holds")

    # Validity of everything written: no jing error the input did not already have.
    before_errors = jing_errors(SCHEMA, sorted({i for i, _ in validated if i}))
    after_errors = jing_errors(SCHEMA, [o for _, o in validated])
    for i, o in validated:
        new = after_errors[os.path.abspath(o)] - (before_errors.get(os.path.abspath(i), set()) if i else set())
        check(not new, "%s: new jing errors: %s" % (os.path.basename(o), sorted(new)[:3]))
finally:
    shutil.rmtree(work, ignore_errors=True)
done()
