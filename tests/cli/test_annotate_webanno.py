"""`manicule export --format webanno`: the stored results as W3C Web Annotation JSON-LD.

Checked against the Web Annotation Data Model (W3C Recommendation, 23 February 2017):
section 3.1 (an Annotation has "@context" http://www.w3.org/ns/anno.jsonld, an IRI "id",
"type" Annotation and at least one "target"), 3.3.5 (motivations from the oa vocabulary),
3.3.1 (creator, created as xsd:dateTime), 4 (SpecificResource with an XPathSelector),
5 (AnnotationCollection and AnnotationPage). Every target must lead to an element of an
edition: an xml:id looked up with lxml, or the XPathSelector evaluated by lxml.
"""
import json
import os
import re
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
from mtest import FIXTURES, ROOT, check, done, run  # noqa: E402
from standoff_check import NS, PARSER, id_targets  # noqa: E402
from lxml import etree  # noqa: E402

CONTEXT = "http://www.w3.org/ns/anno.jsonld"
MOTIVATIONS = {"assessing", "bookmarking", "classifying", "commenting", "describing", "editing", "highlighting",
               "identifying", "linking", "moderating", "questioning", "replying", "tagging"}
DATETIME = re.compile(r"\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?(Z|[+-]\d{2}:\d{2})$")
BASE = "https://example.org/editions/"
ENV = dict(os.environ, SOURCE_DATE_EPOCH="1767225600")
work = tempfile.mkdtemp(prefix="manicule-webanno-")
trees = {}


def local_file(iri):
    """The file under `work` an IRI of the export names."""
    check(iri.startswith(BASE), "IRI %s is not under the base URI" % iri)
    return os.path.join(work, iri[len(BASE):].split("#")[0])


def element_of(iri):
    path = local_file(iri)
    tree = trees.setdefault(path, etree.parse(path, PARSER).getroot())
    return id_targets(tree).get(iri.split("#", 1)[1]) if "#" in iri else tree


def check_target(target, where):
    if isinstance(target, list):
        check(target, "%s: empty target list" % where)
        for t in target:
            check_target(t, where)
        return
    if isinstance(target, str):
        check(element_of(target) is not None, "%s: target %s names no element" % (where, target))
        return
    check(target.get("type") == "SpecificResource", "%s: target %r is no SpecificResource" % (where, target))
    selector = target["selector"]
    check(selector.get("type") == "XPathSelector", "%s: selector %r" % (where, selector))
    path = local_file(target["source"])
    tree = trees.setdefault(path, etree.parse(path, PARSER).getroot())
    found = tree.getroottree().xpath(selector["value"])
    check(len(found) == 1 and isinstance(found[0].tag, str), "%s: XPath %s selects %d nodes"
          % (where, selector["value"], len(found)))


def check_export(name):
    doc = json.loads(run(["export", os.path.join(work, name), "--format", "webanno", "--base-uri", BASE + name],
                         env=ENV).stdout)
    check(doc["@context"] == CONTEXT and doc["type"] == "AnnotationCollection", "%s: not a collection" % name)
    page = doc["first"]
    check(page["type"] == "AnnotationPage" and doc["total"] == len(page["items"]) > 0, "%s: page" % name)
    ids = set()
    for a in page["items"]:
        where = "%s %s" % (name, a.get("id"))
        check(a.get("@context") == CONTEXT, "%s: @context" % where)
        check(re.match(r"[a-z][a-z0-9+.-]*:", a.get("id", "")) is not None, "%s: id is no IRI" % where)
        check(a["id"] not in ids, "%s: id used twice" % where)
        ids.add(a["id"])
        types = a["type"] if isinstance(a["type"], list) else [a["type"]]
        check("Annotation" in types, "%s: type" % where)
        check(a.get("motivation") in MOTIVATIONS, "%s: motivation %r" % (where, a.get("motivation")))
        check(DATETIME.match(a.get("created", "")) and DATETIME.match(a.get("generated", "")), "%s: dates" % where)
        check(a["creator"]["type"] == "Software" and a["generator"]["type"] == "Software", "%s: agents" % where)
        check(element_of(a["creator"]["id"]) is not None, "%s: creator id names no element" % where)
        for body in a.get("body", []):
            if isinstance(body, dict) and body.get("type") == "TextualBody":
                check(isinstance(body.get("value"), str) and body["value"], "%s: empty TextualBody" % where)
                if body.get("format") == "application/json":
                    check(isinstance(json.loads(body["value"]), dict), "%s: a JSON body that is no object" % where)
            else:
                check(element_of(body["id"]) is not None, "%s: body %s names no element" % (where, body))
        check("target" in a, "%s: no target" % where)
        check_target(a["target"], where)
    return page["items"]


try:
    for path in [os.path.join(ROOT, "examples", "ferry-letters.xml"), os.path.join(ROOT, "examples", "ferry-play.xml"),
                 os.path.join(FIXTURES, "standoff", "no-ids.xml")]:
        shutil.copyfile(path, os.path.join(work, os.path.basename(path)))
    run(["annotate", os.path.join(work, "ferry-letters.xml"), "--unit", "letter", "--min-tokens", "50", "--in-place"],
        env=ENV)
    run(["annotate", os.path.join(work, "ferry-play.xml"), "--unit", "speaker", "--min-tokens", "200", "--in-place",
         "--all-pairs"], env=ENV)
    run(["annotate", os.path.join(work, "no-ids.xml"), "--unit", "speaker", "--min-tokens", "1", "--in-place"], env=ENV)
    os.makedirs(os.path.join(work, "results"))
    run(["annotate", os.path.join(work, "ferry-letters.xml"), "--unit", "letter", "--min-tokens", "50",
         "--standoff-file", os.path.join(work, "results", "letters.xml")], env=ENV)

    letters = check_export("ferry-letters.xml")
    profiles = [a for a in letters if a["motivation"] == "describing" and "#mcl-ann-L" in a["id"]]
    distances = [a for a in letters if a["motivation"] == "assessing"]
    check(len(profiles) == 12, "%d profile annotations for 12 letters" % len(profiles))
    tree = etree.parse(os.path.join(work, "ferry-letters.xml"), PARSER).getroot()
    links = tree.xpath("//tei:standOff[@type='stylometry']//tei:link", namespaces=NS)
    check(len(distances) == len(links) > 0, "one assessing annotation per link expected")
    # Each distance targets the two segments its TEI link points at (lxml reads the link's
    # @target), so that a viewer shows it on both texts; its id is the link's own.
    by_id = {l.get("{http://www.w3.org/XML/1998/namespace}id"): l for l in links}
    for a in distances:
        link = by_id.get(a["id"].split("#", 1)[1])
        check(link is not None, "distance annotation %s is not named by its link" % a["id"])
        ends = [element_of(t) for t in (a["target"] if isinstance(a["target"], list) else [a["target"]])]
        wanted = [element_of(BASE + "ferry-letters.xml" + p) for p in link.get("target").split()]
        check(len(ends) == 2 and ends == wanted and all(e is not None for e in ends),
              "%s targets %r, its link points at %r" % (a["id"], a["target"], link.get("target")))
    play = check_export("ferry-play.xml")
    check(sum(1 for a in play if a["motivation"] == "assessing") == 10, "all 10 pairs of 5 speakers expected")
    joined = check_export("no-ids.xml")
    check(any(isinstance(a["target"], list) and len(a["target"]) == 2 for a in joined),
          "the speaker with two speeches does not target both")
    check_export("results/letters.xml")
    # --base-uri makes the annotations' ids, which the Web Annotation model wants as IRIs:
    # one Python's urllib.parse.urlsplit finds no scheme in, or a fragment, or that holds a
    # space, is refused (exit 2) before anything is written.
    from urllib.parse import urlsplit
    annotated = os.path.join(work, "ferry-letters.xml")
    for base in ("not a uri", "letters.xml", "https://example.org/letters.xml#top", "https://example.org/a b.xml",
                 "https://example.org/letters.xml", "urn:x-ferry:letters"):
        parts = urlsplit(base)
        acceptable = bool(parts.scheme) and not parts.fragment and " " not in base
        proc = run(["export", annotated, "--base-uri", base], check=False, env=ENV)
        check((proc.returncode == 0) == acceptable and (acceptable or proc.returncode == 2 and not proc.stdout),
              "--base-uri %r: exit %d (urllib: %s), %s" % (base, proc.returncode, acceptable, proc.stderr))
finally:
    shutil.rmtree(work, ignore_errors=True)
done()
