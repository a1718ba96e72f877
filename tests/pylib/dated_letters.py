"""Invented letter editions for the tests of letters dated one by one
(tests/cli/test_store_letter_dates.py), and for the store fixture an earlier version made
of them (tests/fixtures/stores/dated-letters-format2.sqlite.gz, see tests/fixtures/README.md):
both must see the same bytes, so they are written here once.

Each edition is valid TEI (tei_all) and says, by construction, the year of each of its
letters. The scenario is invented: Tamsin Corbel, a ferry keeper of Quillmouth, writes to
Ned Quill.
"""
import os

WORDS = " ".join(["the ferry crossed at the turn of the tide and the keeper wrote it down"] * 3)
HEADER = ('<titleStmt><title>%s</title><author>Tamsin Corbel</author></titleStmt>'
          '<publicationStmt><p>Invented test data of the manicule project; CC0.</p></publicationStmt>'
          '<sourceDesc><p>No source: invented.</p></sourceDesc>')


def corresp(cd_id, sent_date="", received_date="", default=False):
    """A correspDesc with a sent action (Tamsin Corbel) holding `sent_date` (a date element)."""
    received = ('<correspAction type="received"><persName>Ned Quill</persName>%s</correspAction>' % received_date
                if received_date else "")
    return ('<correspDesc xml:id="%s"%s><correspAction type="sent"><persName ref="#tc">Tamsin Corbel</persName>%s'
            '</correspAction>%s</correspDesc>' % (cd_id, ' default="true"' if default else "", sent_date, received))


def letter(lid, dateline="", decls=True, after=""):
    opener = '<opener><dateline>Quillmouth%s</dateline></opener>' % (", " + dateline if dateline else "")
    pointer = ' decls="%s"' % (decls if isinstance(decls, str) else "#cd-" + lid) if decls else ""
    return '<div type="letter" xml:id="%s"%s>%s<p>%s</p>%s</div>' % (lid, pointer, opener, WORDS, after)


def tei(title, correspondence, body, lang=' xml:lang="en"'):
    return ('<TEI xmlns="http://www.tei-c.org/ns/1.0"%s><teiHeader><fileDesc>%s</fileDesc>'
            '<profileDesc>%s<particDesc><listPerson><person xml:id="tc"><persName>Tamsin Corbel</persName>'
            '</person></listPerson></particDesc></profileDesc></teiHeader><text><body>%s</body></text></TEI>'
            % (lang, HEADER % title, correspondence, body))


XML = '<?xml version="1.0" encoding="UTF-8"?>\n'

# (file name, text, {segment id: year by construction, None for none})
EDITIONS = [
    # Eight letters in one file over seven years; the file is dated by its earliest sending (1848).
    ("harbour-letters", XML + tei(
        "Letters from the harbour office",
        corresp("cd-H1", '<date when="1848-04-02"/>', '<date when="1849-01-20"/>')  # received: not the sending
        + corresp("cd-H2", '<date notBefore="1850-01-01" notAfter="1850-06-30">early 1850</date>')
        + corresp("cd-H3", "<date>Michaelmas 1851</date>")
        + corresp("cd-H4")  # no date in its sent action: its dateline dates it
        + corresp("cd-H5", "<date>Tuesday</date>")  # no year: the dateline's year wins
        + corresp("cd-H6")  # no date anywhere: the file's
        + corresp("cd-H7") + corresp("cd-H8"),
        letter("H1") + letter("H2") + letter("H3")
        + letter("H4", '<date when="1853-02-11">11 February 1853</date>')
        + letter("H5", "<date>the 3rd of May, 1855</date>") + letter("H6")
        # The editor's correction dates it, not the error it corrects (3.5.1).
        + letter("H7", '<choice><sic><date when="1805-06-01">1 June 1805</date></sic>'
                       '<corr><date when="1852-06-01">1 June 1852</date></corr></choice>')
        # A letter it encloses (floatingText, 4.3.2) has its own date; this one's is in its closer.
        + letter("H8", after='<floatingText><body><opener><dateline><date when="1790-01-01">New Year 1790</date>'
                             '</dateline></opener><p>%s</p></body></floatingText>'
                             '<closer><dateline><date when="1852-10-10">10 October 1852</date></dateline></closer>'
                             % WORDS)),
     {"H1": 1848, "H2": 1850, "H3": 1851, "H4": 1853, "H5": 1855, "H6": 1848, "H7": 1852, "H8": 1852}),
    # Letters without @decls take the default correspDesc (2.4.6).
    ("default-letters", XML + tei(
        "Letters under one default correspDesc",
        corresp("cd-X", '<date when="1854-03-01"/>', default=True) + corresp("cd-Y", '<date when="1849-01-01"/>'),
        letter("X1", decls=False) + letter("X2", decls=False)),
     {"X1": 1854, "X2": 1854}),
    # Neither @decls nor a default: letters pair with the correspDescs in document order.
    ("order-letters", XML + tei(
        "Letters paired by their order",
        corresp("cd-O1", '<date when="1847-02-02"/>') + corresp("cd-O2", '<date when="1856-07-07"/>'),
        letter("O1", decls=False) + letter("O2", decls=False)),
     {"O1": 1847, "O2": 1856}),
    # @decls pointing at two declarations, the langUsage first: the correspDesc pairs.
    ("two-declarations", XML + tei(
        "A letter declaring its language and its correspondence",
        '<langUsage xml:id="lu-M"><language ident="en">English</language></langUsage>'
        + corresp("cd-M0", '<date when="1845-01-01"/>') + corresp("cd-M1", '<date when="1853-05-05"/>'),
        letter("M1", decls="#lu-M #cd-M1")),
     {"M1": 1853}),
    # Neither @decls nor a default, and one correspDesc: both letters pair with it.
    ("only-correspondence", XML + tei(
        "Letters under their header's only correspDesc",
        corresp("cd-N", '<date when="1851-11-11"/>'),
        letter("N1", decls=False) + letter("N2", decls=False)),
     {"N1": 1851, "N2": 1851}),
    # Letters dated only in their datelines; the file has no year, so the undated one has none.
    ("dateline-letters", XML + tei(
        "Letters dated in their openers",
        corresp("cd-D1") + corresp("cd-D2"),
        letter("D1", '<date when="1852-08-30">30 August 1852</date>') + letter("D2")),
     {"D1": 1852, "D2": None}),
    # One letter, one file: the body is the letter, dated by the file's only correspDesc.
    ("single-letter", XML + tei(
        "A single letter", corresp("cd-S", '<date when="1860-12-24"/>'), "<p>%s</p>" % WORDS,
        ' xml:id="S1" xml:lang="en"'),
     {"S1": 1860}),
    # A packet of letters as a teiCorpus (its title says two; it holds four texts), each TEI
    # with its own header.
    ("packet", XML + '<teiCorpus xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en"><teiHeader><fileDesc>'
     + HEADER % "A packet of two letters" + '</fileDesc></teiHeader>'
     + tei("First of the packet", corresp("cd-P1", '<date when="1846-05-01"/>'), "<p>%s</p>" % WORDS,
           ' xml:id="P1"').replace(' xmlns="http://www.tei-c.org/ns/1.0"', "")
     + tei("Second of the packet", corresp("cd-P2", '<date when="1857-09-09"/>'), "<p>%s</p>" % WORDS,
           ' xml:id="P2"').replace(' xmlns="http://www.tei-c.org/ns/1.0"', "")
     .replace('"tc"', '"tc2"').replace('"#tc"', '"#tc2"')  # ids are unique in the whole file
     # A third text, without a correspDesc of its own, whose letter points at the second's.
     + tei("Third of the packet", "", letter("P3a", decls="#cd-P2"), ' xml:id="P3"')
     .replace(' xmlns="http://www.tei-c.org/ns/1.0"', "").replace('"tc"', '"tc3"')
     # A fourth, its sent action undated: its own header's creation date dates it.
     + tei("Fourth of the packet", '<creation><date when="1851-03-03"/></creation>' + corresp("cd-P4"),
           "<p>%s</p>" % WORDS, ' xml:id="P4"').replace(' xmlns="http://www.tei-c.org/ns/1.0"', "")
     .replace('"tc"', '"tc4"').replace('"#tc"', '"#tc4"')
     + "</teiCorpus>\n",
     {"P1": 1846, "P2": 1857, "P3a": 1857, "P4": 1851}),
    # No date anywhere: the file is left out by any --years.
    ("undated-letters", XML + tei("Undated letters", corresp("cd-U1") + corresp("cd-U2"), letter("U1") + letter("U2")),
     {"U1": None, "U2": None}),
]


def write_editions(folder):
    """Writes every edition to `folder` as NAME.xml (UTF-8); returns their paths in order."""
    paths = []
    for name, text, _ in EDITIONS:
        paths.append(os.path.join(folder, name + ".xml"))
        with open(paths[-1], "w", encoding="utf-8") as f:
            f.write(text)
    return paths
