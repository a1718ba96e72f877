"""The text the reading preset selects from an element, as lxml finds it: the element's text
without the elements README.md lists as editorial matter left out by default (the reading
preset: del and surplus too) and those never selected, keeping the text that follows them."""
import os
import re

from lxml import etree

TEI = "{http://www.tei-c.org/ns/1.0}"
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"
LEFT_OUT = set(
    "note noteGrp speaker stage castList head trailer figDesc label gap supplied del sic orig abbr rdg rdgGrp "
    "witDetail surplus opener closer salute signed dateline address postscript argument epigraph byline docAuthor "
    "index figure formula desc floatingText front back teiHeader fw standOff interp interpGrp span spanGrp fs fLib "
    "fvLib".split())


def text_without_left_out(element, out):
    """Appends the element's selected text pieces to `out`, in document order."""
    if element.text:
        out.append(element.text)
    for child in element:
        if isinstance(child.tag, str) and child.tag.replace(TEI, "") not in LEFT_OUT:
            text_without_left_out(child, out)
        if child.tail:
            out.append(child.tail)


# Words as UAX #29 finds them in plain prose such as the invented editions: runs of letters
# and digits, joined by an apostrophe (WB5-WB12), those with a letter in them ("20th", not
# "1870": numbers are not counted, README.md), case-folded (str.casefold) with ’ read as '.
# Not UAX #29 itself: no "." or ":" inside a word, no ExtendNumLet.
WORD = re.compile(r"[^\W_]+(?:['\u2019][^\W_]+)*")


def words(text):
    return [w.casefold().replace("\u2019", "'") for w in WORD.findall(text) if any(c.isalpha() for c in w)]


def letter_words(path):
    """{"stem#xml:id": words} of each div[@type='letter'] of a file, in document order: the
    text the reading preset selects (text_without_left_out) cut into words."""
    stem = os.path.splitext(os.path.basename(path))[0]
    out = {}
    for div in etree.parse(path).getroot().iter(TEI + "div"):
        if div.get("type") == "letter":
            parts = []
            text_without_left_out(div, parts)
            out[stem + "#" + div.get(XML_ID)] = words("".join(parts))
    return out
