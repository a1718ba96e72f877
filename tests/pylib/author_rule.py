"""The tests' own reading of `--author TEXT` (docs/store.md), written from the docs, not
from the program: one of the header's authors holds each word of TEXT (words parted by
white space, commas and semicolons) as a whole word, in any order, letter case ignored.
A whole word: no letter or digit ([^\\W_], Unicode-aware, Python's re) touches it on
either side; in Han and kana, written without spaces, a name is found anywhere. The
apostrophe's typeset forms (U+2019, U+02BC, U+FF07; not U+2018, an opening quotation
mark) count as the apostrophe."""
import re

from unicode_words import spaceless

APOSTROPHES = {0x2019: "'", 0x02BC: "'", 0xFF07: "'"}


def _letter(c):
    return bool(c) and re.match(r"[^\W_]", c) is not None and not spaceless(c)


def _holds(author, word):
    author, word = author.translate(APOSTROPHES), word.translate(APOSTROPHES)
    for m in re.finditer(re.escape(word), author, re.IGNORECASE):
        before = author[m.start() - 1] if m.start() else ""
        after = author[m.end()] if m.end() < len(author) else ""
        if (not _letter(before) or not _letter(word[0])) and (not _letter(after) or not _letter(word[-1])):
            return True
    return False


def words_of(text):
    return [w for w in re.split(r"[\s,;]+", text) if w]


def author_passes(text, authors):
    """Whether one of `authors` (each one author's name, as the header gives it) holds
    every word of `text`."""
    words = words_of(text)
    return any(all(_holds(a, w) for w in words) for a in authors)
