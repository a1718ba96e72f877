"""Python baseline for the archive benchmark (bench/store_bench.py): the same job as
`manicule batch --analyse` written the way one would in Python, with lxml and
scikit-learn, in one process:

  selection   every TEI file under a folder; segments are speakers (<sp who>, a joint
              speech credited to each speaker) or chapters (<div type="chapter">); their
              text without the elements manicule's reading preset leaves out (speaker,
              stage, note, head, ...), keeping the text that follows them; units in
              <body> only (manicule leaves <front> and <back> out)
  counting    word tokens (runs of letters, apostrophes inside words) of the text in NFC,
              with the apostrophe look-alikes (U+2018, U+2019, U+02BC, U+FF07) made U+0027,
              full case folding and NFC again, as manicule's default tokenizer settings do;
              one collections.Counter per segment
  measure     segments of at least 1,500 words; the 1,000 most frequent words; relative
              frequencies, z-scores (sample sd), Cosine Delta (cosine distance of the
              z-scores, sklearn.metrics.pairwise.cosine_distances); the 5 nearest
              segments of each

Usage: /usr/bin/python3 bench/baseline_archive.py FOLDER speaker|chapter OUT.tsv
Writes the nearest segments as TSV and prints counts on stderr.
"""
import collections
import os
import re
import sys
import unicodedata

import numpy as np
from lxml import etree
from sklearn.metrics.pairwise import cosine_distances

TEI = "{http://www.tei-c.org/ns/1.0}"
SKIP = {TEI + name for name in (
    "abbr address argument back byline castList closer dateline del desc docAuthor epigraph figDesc figure "
    "floatingText formula front gap head index label note noteGrp opener orig postscript rdg rdgGrp salute sic "
    "signed speaker stage supplied surplus trailer witDetail teiHeader standOff").split()}
WORD = re.compile(r"[^\W\d_]+(?:'[^\W\d_]+)*")
APOSTROPHE_LOOKALIKES = ("\u2018", "\u2019", "\u02bc", "\uff07")
MIN_TOKENS, MFW, K = 1500, 1000, 5


def text_of(element, out):
    if element.text:
        out.append(element.text)
    for child in element:
        if isinstance(child.tag, str) and child.tag not in SKIP:
            text_of(child, out)
        if child.tail:
            out.append(child.tail)


def units(tree, tag):
    """The file's elements of this tag inside <body>: none in <front> or <back>, which the
    selection leaves out (a speech in a prologue printed in <front>). In these corpora no
    unit lies inside another left-out element, so that is all the checking it needs."""
    for body in tree.iter(TEI + "body"):
        if next(body.iterancestors(TEI + "body"), None) is None:  # not a body nested in another
            yield from body.iter(TEI + tag)


def segments_of(path, unit):
    stem = os.path.splitext(os.path.basename(path))[0]
    tree = etree.parse(path)
    texts = collections.defaultdict(list)
    if unit == "speaker":
        for sp in units(tree, "sp"):
            parts = []
            text_of(sp, parts)
            for who in (sp.get("who") or "#unknown").split():
                texts[stem + "#" + who.lstrip("#")].extend(parts)
    else:
        unnamed = 0
        for div in units(tree, "div"):
            if div.get("type") != "chapter":
                continue
            parts = []
            text_of(div, parts)
            name = div.get("{http://www.w3.org/XML/1998/namespace}id")
            if not name:  # named as manicule names a chapter without xml:id, so that the results compare
                unnamed += 1
                name = "chapter%d" % unnamed
            texts[stem + "#" + name].extend(parts)
    for key, parts in texts.items():
        text = unicodedata.normalize("NFC", " ".join(parts))
        for lookalike in APOSTROPHE_LOOKALIKES:
            text = text.replace(lookalike, "'")
        # NFC again after folding, which can decompose (U+1FE6 folds to U+03C5 U+0342)
        yield key, collections.Counter(WORD.findall(unicodedata.normalize("NFC", text.casefold())))


def main():
    folder, unit, out_path = sys.argv[1:4]
    files = sorted(os.path.join(d, f) for d, _, fs in os.walk(folder) for f in fs if f.endswith(".xml"))
    names, counters = [], []
    for path in files:
        for key, counter in segments_of(path, unit):
            if sum(counter.values()) >= MIN_TOKENS:
                names.append(key)
                counters.append(counter)
    totals = collections.Counter()
    for c in counters:
        totals.update(c)
    words = [w for w, _ in sorted(totals.items(), key=lambda item: (-item[1], item[0]))[:MFW]]
    sizes = np.array([sum(c.values()) for c in counters], dtype=float)
    rel = np.array([[c.get(w, 0) for w in words] for c in counters], dtype=float) / sizes[:, None]
    sd = rel.std(axis=0, ddof=1)
    sd[sd == 0] = 1
    z = (rel - rel.mean(axis=0)) / sd
    d = cosine_distances(z)
    np.fill_diagonal(d, np.inf)
    nearest = np.argsort(d, axis=1)[:, :K]
    with open(out_path, "w", encoding="utf-8") as out:
        for i, name in enumerate(names):
            for rank, j in enumerate(nearest[i], start=1):
                out.write("%s\t%d\t%s\t%.6f\n" % (name, rank, names[j], d[i, j]))
    print("%d files, %d segments of at least %d words, %d features" % (len(files), len(names), MIN_TOKENS, len(words)),
          file=sys.stderr)


if __name__ == "__main__":
    main()
