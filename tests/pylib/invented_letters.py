"""Invented letter editions for the command tests: plain lower-case ASCII words separated
by single spaces, so that the tokens are the same under any tokenizer (UAX #29, a regular
expression, or str.split()). Each letter has an xml:id and a sender (a correspDesc it
points to with @decls); a letter with no words is allowed (an empty segment).
"""
import os
import random
from xml.sax.saxutils import escape

# Invented words; none is a prefix-joined compound or holds an apostrophe.
VOCABULARY = ("and the of to a in that it was he for on are with as his they be at one have this from "
              "or had by word but what some we can out other were all there when up use your how said "
              "an each she which do their time if will way about many then them write would like so "
              "these her long make thing see him two has look more day could go come did number sound "
              "no most people my over know water than call first who may down side been now find").split()


def zipf_words(rng, count, bias, vocabulary=VOCABULARY):
    """`count` words drawn with Zipf-like weights; `bias` (a dict word -> factor) shifts a style."""
    weights = [(1.0 / (rank + 1)) * bias.get(w, 1.0) for rank, w in enumerate(vocabulary)]
    return rng.choices(vocabulary, weights=weights, k=count)


def letters_tei(letters):
    """letters: list of (xml_id, sender_key, sender_name, words). Returns the TEI text."""
    senders = {}
    for _, key, name, _ in letters:
        senders[key] = escape(name)
    persons = "".join('<person xml:id="%s"><persName>%s</persName></person>' % (k, n) for k, n in senders.items())
    corresp = "".join(
        '<correspDesc xml:id="cd-%s"><correspAction type="sent"><persName ref="#%s">%s</persName>'
        '</correspAction></correspDesc>' % (lid, key, escape(name)) for lid, key, name, _ in letters)
    divs = "".join('<div type="letter" xml:id="%s" decls="#cd-%s"><p>%s</p></div>\n' % (lid, lid, " ".join(words))
                   for lid, _, _, words in letters)
    return ('<?xml version="1.0" encoding="UTF-8"?>\n'
            '<TEI xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en"><teiHeader><fileDesc>'
            '<titleStmt><title>Invented letters for a test</title></titleStmt>'
            '<publicationStmt><p>Invented test data of the manicule project; CC0.</p></publicationStmt>'
            '<sourceDesc><p>No source: invented.</p></sourceDesc></fileDesc><profileDesc>'
            + corresp + '<particDesc><listPerson>' + persons + '</listPerson></particDesc></profileDesc>'
            '</teiHeader><text><body>\n' + divs + '</body></text></TEI>\n')


def write_letters(directory, name, letters):
    path = os.path.join(directory, name)
    with open(path, "w", encoding="utf-8") as f:
        f.write(letters_tei(letters))
    return path


def three_hands(seed=20260301, per_author=4, size=(400, 700)):
    """Letters by three invented senders with slightly different habits."""
    rng = random.Random(seed)
    hands = [("p-ash", "Ada Ash", {"the": 1.6, "of": 0.6, "which": 3.0}),
             ("p-birch", "Bo Birch", {"and": 1.8, "i": 1.0, "so": 3.0, "then": 2.5}),
             ("p-cedar", "Cy Cedar", {"a": 1.7, "that": 0.5, "would": 3.0, "could": 2.5})]
    letters = []
    for k in range(per_author):
        for key, name, bias in hands:
            lid = "L%02d" % (len(letters) + 1)
            letters.append((lid, key, name, zipf_words(rng, rng.randint(*size), bias)))
    return letters
