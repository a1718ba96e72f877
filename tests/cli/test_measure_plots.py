"""The SVG plots of `map` and `tree`, read back with lxml (Debian's python3-lxml):
  - well-formed SVG 1.1 in the SVG namespace, no script
  - one <text class="point-label"> per measured segment, naming it (sender names holding
    & < " ' come back intact, so text is escaped)
  - axis titles carry the explained variance that sklearn.decomposition.PCA computes on
    the same z-scores ("PC1 (23.4 %)"), and beside each axis the features with the
    strongest loadings at either end (sklearn's components_)
  - a legend with one entry per sender when letters share senders
  - a letter is named by sender and letter id even when its sender wrote no other
    letter plotted, and by the whole segment id ("FILE#ID") when two editions hold a
    letter of the same sender and id (the names and ids are those written into the
    invented editions here)
  - a letter whose sender the edition only conjectures (TEI P5 att.global.responsibility:
    @cert on the sender's persName, here "low") is labelled as conjectured; lxml reads
    which letters those are from the invented example edition
  - the dendrogram: one leaf label per segment; the consensus: one support figure per
    group, equal to the Newick support labels
  - --output writes the same document to a file
"""
import json
import os
import re
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import invented_letters  # noqa: E402
from measure_tables import read_profile  # noqa: E402

import numpy as np  # noqa: E402
from lxml import etree  # noqa: E402
from sklearn.decomposition import PCA  # noqa: E402

SVG = "{http://www.w3.org/2000/svg}"
TIME = re.compile(r"\d{4}-\d\d-\d\dT[\d:]+Z")


def parse_svg(text, what):
    try:
        root = etree.fromstring(text.encode("utf-8"))
    except etree.XMLSyntaxError as e:
        mtest.fail("%s is not well-formed XML: %s" % (what, e))
    mtest.check(root.tag == SVG + "svg" and root.get("version") == "1.1", "%s: an SVG 1.1 root" % what)
    mtest.check(not list(root.iter(SVG + "script")), "%s: no script" % what)
    return root


def texts(root, css_class):
    return [t for t in root.iter(SVG + "text") if css_class in (t.get("class") or "").split()]


def texts_in_group(root, css_class):
    return [t.text for t in root.iter(SVG + "text") if t.getparent().get("class") == css_class]


with tempfile.TemporaryDirectory() as tmp:
    renamed = {"p-ash": "Ada & <Ash>", "p-birch": "Bo \"Birch\"", "p-cedar": "Cy 'Cedar'"}
    letters = [(lid, key, renamed[key], words) for lid, key, _, words in invented_letters.three_hands()]
    path = invented_letters.write_letters(tmp, "letters.xml", letters)
    args = [path, "--unit", "letter", "--min-tokens", "100", "--ranks", "1-60"]

    # --- the scatter plot ---------------------------------------------------------------
    svg_text = mtest.run(["map", "--format", "svg"] + args).stdout
    root = parse_svg(svg_text, "map SVG")
    labels = [t.text for t in texts(root, "point-label")]
    mtest.check(len(labels) == len(letters), "one point label per letter: %d" % len(labels))
    for lid, _, name, _ in letters:
        mtest.check("%s (%s)" % (name, lid) in labels, "label for %s: %s (%s)" % (lid, name, lid))

    _, features, z_rows = read_profile(mtest.run(["profile", "--values", "z"] + args).stdout)
    z = np.array(list(z_rows.values()))
    pca = PCA(n_components=2, svd_solver="full").fit(z)  # sklearn.decomposition.PCA
    titles = [t.text for t in texts(root, "axis-title")]
    for k in range(2):
        expected = "PC%d (%.1f %%)" % (k + 1, pca.explained_variance_ratio_[k] * 100)
        mtest.check(expected in titles, "axis title %r among %s" % (expected, titles))

    # Poles: the words at either end of each axis, strongest first, as sklearn weighs them.
    doc = json.loads(mtest.run(["map", "--format", "json"] + args).stdout)
    coords = np.array([c["coordinates"] for c in doc["coordinates"]])
    poles = [t.text for t in texts(root, "axis-poles")]
    mtest.check(len(poles) == 4, "four pole lists (two per axis): %s" % poles)
    for k in range(2):
        sign = 1.0 if np.dot(coords[:, k], pca.transform(z)[:, k]) >= 0 else -1.0
        weights = sign * pca.components_[k]
        low, high = features[int(np.argmin(weights))], features[int(np.argmax(weights))]
        mtest.check(any(p.startswith("\u2190 " + low + ",") or p == "\u2190 " + low for p in poles),
                    "PC%d low end starts with %r: %s" % (k + 1, low, poles))
        mtest.check(any((p.startswith(high + ", ") or p.startswith(high + " \u2192")) and p.endswith("\u2192")
                        for p in poles), "PC%d high end starts with %r: %s" % (k + 1, high, poles))

    legend = texts_in_group(root, "legend")
    mtest.check(legend[0] == "author" and sorted(legend[1:]) == sorted(renamed.values()),
                "legend: author, then each sender once: %s" % legend)
    caption = " ".join(texts_in_group(root, "caption"))
    mtest.check("PCA on z-scores" in caption and "letters" in caption and "manicule" in caption,
                "caption names method, input and tool: %s" % caption)

    out_file = os.path.join(tmp, "map.svg")
    mtest.run(["map", "--format", "svg", "--output", out_file] + args)
    with open(out_file, encoding="utf-8") as f:
        written = f.read()
    mtest.check(TIME.sub("", written) == TIME.sub("", svg_text), "--output writes the same SVG")

    # --- the dendrogram -----------------------------------------------------------------
    root = parse_svg(mtest.run(["tree", "--format", "svg"] + args).stdout, "tree SVG")
    leaf_labels = [t.text for t in texts(root, "leaf-label")]
    mtest.check(sorted(leaf_labels) == sorted(labels), "one leaf label per letter")
    mtest.check(any(t.text.startswith("ward linkage height") for t in texts(root, "axis-title")), "height scale titled")

    ranges = "1-20,1-30,1-40,1-50,1-60"
    root = parse_svg(mtest.run(["tree", "--format", "svg", "--bootstrap", ranges] + args).stdout, "consensus SVG")
    supports = sorted(int(t.text) for t in texts(root, "support"))
    newick = mtest.run(["tree", "--bootstrap", ranges] + args).stdout
    newick_supports = sorted(int(s) for s in re.findall(r"\)(\d+)", re.sub(r"\[[^\]]*\]", "", newick)))
    mtest.check(supports and supports == newick_supports, "support figures equal Newick's: %s" % supports)

    # --- letters named apart from their senders -----------------------------------------
    # The last letter given to a sender of its own: a lone sender's name alone would not
    # say which letter the point is.
    lone_id = letters[-1][0]
    lone = letters[:-1] + [(lone_id, "p-dove", "Di Dove", letters[-1][3])]
    lone_path = invented_letters.write_letters(tmp, "lone.xml", lone)
    lone_args = [lone_path, "--unit", "letter", "--min-tokens", "100", "--ranks", "1-60"]
    for command, css in (("map", "point-label"), ("tree", "leaf-label")):
        shown = [t.text for t in texts(parse_svg(mtest.run([command, "--format", "svg"] + lone_args).stdout,
                                                 command + " SVG, lone sender"), css)]
        mtest.check("Di Dove (%s)" % lone_id in shown, "%s: the lone sender's letter named with its id: %s"
                    % (command, shown))
    # The same letters in two editions: sender and letter id alike, the file tells them apart.
    twin_path = invented_letters.write_letters(tmp, "twin.xml", lone)
    shown = [t.text for t in texts(parse_svg(mtest.run(["map", "--format", "svg", lone_path, twin_path, "--unit",
                                                        "letter", "--min-tokens", "100", "--ranks", "1-60"]).stdout,
                                             "map SVG, two editions"), "point-label")]
    expected = sorted("%s (%s#%s)" % (name, stem, lid) for stem in ("lone", "twin") for lid, _, name, _ in lone)
    mtest.check(sorted(shown) == expected, "letters of two editions named by segment id: %s" % shown)

# --- chapters: the legend names authors, every label is distinct --------------------------
# Two invented novels by two invented authors (titleStmt/author, read back with lxml); the
# first in two volumes whose chapters are headed alike ("CHAPTER I." twice), the second
# with a "CHAPTER I." of its own. The legend must name the authors, never a heading, and no
# two plotted labels may read alike.
import random  # noqa: E402
chapter_rng = random.Random(7)
chapter_words = "the of and a to in was he she it that his her with had for on at by".split()


def novel(path, author, volumes):
    divs = ""
    for v, headings in enumerate(volumes, start=1):
        inner = "".join('<div type="chapter"><head>%s</head><p>%s</p></div>'
                        % (h, " ".join(chapter_rng.choice(chapter_words) for _ in range(120))) for h in headings)
        divs += '<div type="volume" n="%d">%s</div>' % (v, inner)
    with open(path, "w", encoding="utf-8") as f:
        f.write('<TEI xmlns="http://www.tei-c.org/ns/1.0"><teiHeader><fileDesc><titleStmt><title>An invented novel'
                '</title><author>%s</author></titleStmt><publicationStmt><p>Invented test data; CC0.</p>'
                '</publicationStmt><sourceDesc><p>Invented.</p></sourceDesc></fileDesc></teiHeader><text><body>%s'
                '</body></text></TEI>' % (author, divs))


with tempfile.TemporaryDirectory() as tmp:
    novels = [os.path.join(tmp, "harbour.xml"), os.path.join(tmp, "lantern.xml")]
    novel(novels[0], "Quill, Ada (1801-1860)", [["CHAPTER I.", "CHAPTER II."], ["CHAPTER I.", "CHAPTER II."]])
    novel(novels[1], "Marsh, Eben (1810-1870)", [["CHAPTER I.", "THE LANTERN."]])
    authors = sorted(etree.parse(n).findtext(".//{http://www.tei-c.org/ns/1.0}author") for n in novels)
    chapters = sum(len(etree.parse(n).xpath("//*[local-name()='div'][@type='chapter']")) for n in novels)
    for command, css in (("map", "point-label"), ("tree", "leaf-label")):
        root = parse_svg(mtest.run([command, "--format", "svg", "--unit", "chapter", "--min-tokens", "20"] + novels).stdout,
                         command + " SVG, chapters")
        shown = [t.text for t in texts(root, css)]
        mtest.check(len(shown) == chapters and len(set(shown)) == len(shown),
                    "%s: %d chapters (lxml), labels %r" % (command, chapters, shown))
        legend = texts_in_group(root, "legend")
        mtest.check(legend[:1] == ["author"] and sorted(legend[1:]) == authors,
                    "%s: legend %r, the headers name %r" % (command, legend, authors))

# --- leader lines between close points --------------------------------------------------
# Where two points lie within 24 px of each other (a rule of thumb of this project, no
# published source), a label set beside both reads as either's: each such point gets a
# leader line from its centre to its label. The distances are plain geometry on the
# circles the SVG draws (the example letters: L05 and L12, L06 and L11 lie that close).
def crowded_points_without_leaders(root):
    centres = [(float(c.get("cx")), float(c.get("cy"))) for g in root.iter(SVG + "g") if g.get("class") == "points"
               for c in g.iter(SVG + "circle")]
    starts = {(float(l.get("x1")), float(l.get("y1"))) for g in root.iter(SVG + "g") if g.get("class") == "leaders"
              for l in g.iter(SVG + "line")}
    crowded = [a for a in centres if any(a != b and ((a[0] - b[0]) ** 2 + (a[1] - b[1]) ** 2) ** 0.5 < 24 for b in centres)]
    return crowded, [a for a in crowded if a not in starts]


example_letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
map_root = parse_svg(mtest.run(["map", "--format", "svg", example_letters, "--unit", "letter", "--min-tokens",
                                "200"]).stdout, "map SVG, example letters")
crowded, without = crowded_points_without_leaders(map_root)
mtest.check(crowded and not without, "close points %r, of which without a leader line %r" % (crowded, without))

# --- a consensus over disjoint ranges says which ranks it used ---------------------------
# Three trees over 300-400, 1-50 and 100-200: the header lists the ranges (it said "1-400")
# and counts the ranks some range takes, up to the number of distinct words (the profile's
# columns; Python's set for the union).
ranges = [(300, 400), (1, 50), (100, 200)]
bootstrap = ",".join("%d-%d" % r for r in ranges)
head = json.loads(mtest.run(["tree", "--format", "json", "--unit", "letter", "--min-tokens", "200", "--bootstrap",
                             bootstrap, example_letters]).stdout)["provenance"]["parameters"]
_, all_features, _ = read_profile(mtest.run(["profile", "--unit", "letter", "--min-tokens", "200", "--ranks",
                                             "1-100000", example_letters]).stdout)
union = {r for a, b in ranges for r in range(a, b + 1) if r <= len(all_features)}
mtest.check(head.get("feature ranks", "").startswith("300-400, 1-50, 100-200")
            and head.get("features used") == str(len(union)),
            "consensus header: ranks %r, features used %r (expected %d)"
            % (head.get("feature ranks"), head.get("features used"), len(union)))

# --- a conjectured sender, from the invented example edition ------------------------------
example = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
TEI = "{http://www.tei-c.org/ns/1.0}"
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"
edition = etree.parse(example)
conjectured = set()
for desc in edition.iter(TEI + "correspDesc"):
    for sender in desc.iterfind(TEI + "correspAction[@type='sent']/" + TEI + "persName"):
        if sender.get("cert") not in (None, "high"):
            conjectured.add((desc.get(XML_ID), sender.text))
letter_ids = {div.get("decls").lstrip("#"): div.get(XML_ID) for div in edition.iter(TEI + "div")
              if div.get("type") == "letter" and div.get("decls")}
mtest.check(conjectured, "the example edition has a conjectured sender")
shown = [t.text for t in texts(parse_svg(mtest.run(["tree", "--format", "svg", example, "--unit", "letter",
                                                    "--min-tokens", "200"]).stdout, "tree SVG, example"),
                                 "leaf-label")]
for desc_id, name in conjectured:
    label = "%s (%s, conjectured)" % (name, letter_ids[desc_id])
    mtest.check(label in shown, "conjectured sender labelled %r: %s" % (label, shown))
mtest.check(sum("conjectured" in label for label in shown) == len(conjectured),
            "only the conjectured letters say so: %s" % shown)

mtest.done()
