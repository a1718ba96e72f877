"""Header fields as an editor reads them, and a segment's language by its words.

Invented editions, each with one thing the header reader once got wrong, read into a store
and compared (file_list and segment_list, read with Python's sqlite3) with what lxml gives
under the rules written down here, each from TEI P5 or tei-conventions.md:
  - the title: titleStmt's title of @type "main", else its first one that is not a
    subtitle (TEI P5 2.2.1: title/@type main and sub);
  - no note in a title or a name (tei-conventions.md section 2: notes are commentary);
  - lb, pb and cb part words unless @break="no" (tei-conventions.md, token boundaries), and
    so do the parts of a personal name (TEI P5 13.2.1: forename, surname ... are parts of one
    name, which the source writes with spaces between);
  - several persNames of one author (a pseudonym, the civil name): the first, then the
    others in brackets (unless the header brackets them itself); an author named twice
    over is one author; a name part is parted by a space from a letter or digit right
    before it, not from punctuation (d’Aubrac, „Ebbe“) nor within Han (潮見海風);
  - the title and author are those of teiHeader/fileDesc/titleStmt, not of a source's
    titleStmt in sourceDesc/biblFull;
  - a year written "-0400" (XML Schema's gYear, as TEI's att.datable.w3c uses it) is before
    the common era, so year -400; the date is kept as written, and a header without a date
    gives none (the header's dates in docs/store.md's order: tests/pylib/tei_dates.py);
  - a segment's language is that of most of its words (docs/store.md), words counted here
    as Python's re finds runs of letters; the layout between elements (newlines,
    indentation) takes the language around it and must not outweigh the words;
  - a file's language is that of most of its segments' words (xml:lang, inherited), else
    its TEI element's xml:lang, before langUsage (docs/store.md, "Language";
    tei-conventions.md section 4). The header is never part of the text measured: its
    <p>s (publicationStmt, sourceDesc) do not count.
"""
import os
import re
import sys
from collections import Counter

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from reading_text import LEFT_OUT  # noqa: E402
from tei_dates import signed_year, work_date  # noqa: E402
from unicode_words import spaceless  # noqa: E402
from lxml import etree  # noqa: E402

TEI = "http://www.tei-c.org/ns/1.0"
NS = {"t": TEI}
XML_LANG = "{http://www.w3.org/XML/1998/namespace}lang"


def edition(title_stmt, body, lang="de", profile="", date=""):
    return ('<TEI xmlns="%s" xml:lang="%s"><teiHeader><fileDesc><titleStmt>%s</titleStmt>'
            '<publicationStmt><p>invented</p></publicationStmt><sourceDesc><p>invented%s</p></sourceDesc>'
            '</fileDesc>%s</teiHeader><text><body>%s</body></text></TEI>'
            % (TEI, lang, title_stmt, date, profile, body))


PROSE = "<div><p>" + " ".join(["lantern harbour tide rope"] * 20) + "</p></div>"
# A speaker whose French words outnumber the German ones, with deep indentation between
# elements (German, the play's language), which outweighs the French by bytes.
indent = "\n" + " " * 120
SPEECHES = ("<div>" + indent + '<sp who="#graf">' + indent + "<speaker>Graf</speaker>" +
            "".join(indent + '<p xml:lang="fr">oui non merci</p>' for _ in range(6)) + indent + "<p>Ja gut.</p>" +
            indent + "</sp>" + indent + '<sp who="#magd">' + indent + "<p>Ja, ja, ich komme gleich herunter.</p>" +
            indent + '<p xml:lang="fr">merci</p>' + indent + "</sp>" + indent + '<sp who="#lotse">' + indent +
            '<p xml:lang="fr">— Oui — … » « —</p>' + indent +
            "<p>Ja, so ist es.</p>" + indent + "</sp>" + indent + "</div>")
FILES = {
    "alt-then-main.xml": edition('<title type="alt">Nebentitel</title><title type="main">Haupttitel</title>'
                                 "<author>Lore Brink</author>", PROSE),
    "untyped-then-main.xml": edition('<title>Reihe der Fähren</title><title type="sub">Ein Spiel</title>'
                                     '<title type="main">Die Überfahrt</title><author>Lore Brink</author>', PROSE),
    "line-break.xml": edition('<title>Die<lb/>Fähre <lb break="no"/>leute</title><author>Lore Brink</author>', PROSE),
    "note-in-title.xml": edition('<title>Kaimauer<note>Titel nach der Handschrift.</note></title>'
                                 "<author>Lore<note>Vorname unsicher</note> Brink</author>", PROSE),
    "name-parts.xml": edition("<title>T</title><author><persName><forename>Karl</forename><forename>Jens</forename>"
                              "<surname>Möwe</surname></persName></author>", PROSE),
    "pseudonym.xml": edition('<title>T</title><author><persName type="pseudo">Kapitän Tau</persName>'
                             "<persName><forename>Jonas</forename><surname>Reling</surname></persName>"
                             '<idno type="local">X1</idno></author>', PROSE),
    "inverted-name.xml": edition("<title>T</title><author><persName><surname>Reling</surname>, "
                                 "<forename>Jonas</forename></persName></author>", PROSE),
    "source-title-stmt.xml": edition('<title>Die Mole</title><author>Lore Brink</author>', PROSE,
                                     date='<biblFull><titleStmt><title type="main">Quellentitel</title>'
                                          "<author>Quellenautor</author></titleStmt><publicationStmt><p>p</p>"
                                          "</publicationStmt><sourceDesc><p>s</p></sourceDesc></biblFull>"),
    "source-file-desc.xml": edition('<title>Die Mole</title><author>Lore Brink</author>', PROSE,
                                    date='<biblFull><fileDesc><titleStmt><title type="main">Quellentitel</title>'
                                         "<author>Quellenautor</author></titleStmt></fileDesc></biblFull>"),
    "name-punctuation.xml": edition("<title>An „<persName>Ebbe</persName>“</title><author><persName>Jean d’"
                                    "<surname>Aubrac</surname></persName></author><author><persName><surname>Tide"
                                    "</surname>—<forename>Mara</forename></persName></author>", PROSE),
    "han-name.xml": edition("<title>T</title><author><persName><surname>潮見</surname><forename>海風"
                            "</forename></persName></author>", PROSE),
    "katakana-name.xml": edition("<title>T</title><author><persName><surname>\u30d6\u30eb\u30fc</surname>"
                                 "<forename>\u30bf\u30ed\u30a6</forename></persName></author>", PROSE),
    "square-bracket.xml": edition('<title>T</title><author><persName type="pseudo">Kapitän Tau</persName> '
                                  "[<persName>Jonas Reling</persName>]</author>", PROSE),
    "named-twice.xml": edition("<title>T</title><author>Brink, Lore</author><author>Brink, Lore</author>"
                               "<author>Jonas Reling</author>", PROSE),
    "before-common-era.xml": edition("<title>T</title><author>Lore Brink</author>", PROSE,
                                     date='<date when="-0400"/>'),
    "text-language.xml": edition("<title>T</title><author>Lore Brink</author>", PROSE, lang="fr",
                                 profile='<profileDesc><langUsage><language ident="deu">Deutsch</language>'
                                         "</langUsage></profileDesc>"),
    "speeches.xml": edition("<title>Hafen</title><author>Lore Brink</author>", SPEECHES),
    # The header's own prose, in English and longer than the German speech, is no text.
    "header-prose.xml": edition("<title>Mole</title><author>Lore Brink</author>",
                                '<div><sp who="#ferge"><p>Ja, ich komme gleich.</p></sp></div>',
                                profile='<encodingDesc><projectDesc><p xml:lang="en">'
                                        + " ".join(["the ferry project notes its sources here"] * 8)
                                        + "</p></projectDesc></encodingDesc>"),
}


def expected_title(root):
    titles = root.findall("t:teiHeader/t:fileDesc/t:titleStmt/t:title", NS)
    main = [t for t in titles if t.get("type") == "main"]
    chosen = main[0] if main else [t for t in titles if t.get("type") != "sub"][0]
    return whole(chosen)


def text_with_breaks(element, before=""):
    """The element's text without notes, with a space for each lb/pb/cb not marked
    break="no", and before a name part that follows a letter or digit directly (so that
    "Jonas" "Reling" are two words, and "Reling, Jonas" keeps its comma where it is)."""
    text = before + (element.text or "")
    for child in element:
        name = etree.QName(child).localname
        if name in ("lb", "pb", "cb"):
            text += "" if child.get("break") == "no" else " "
        elif name in ("note", "idno"):
            pass
        elif name in ("forename", "surname", "persName", "roleName", "addName", "genName", "nameLink"):
            text = text_with_breaks(child, text + (" " if re.search(r"[^\W_]$", text) and not spaceless(text[-1])
                                                   else ""))
        else:
            text = text_with_breaks(child, text)
        text += child.tail or ""
    return text if before else " ".join(text.split())


def whole(element):
    return " ".join(text_with_breaks(element).split())


def words_by_language(sp):
    """{language: words} of a speech's paragraphs (not its speaker label): runs of letters
    as Python's re finds them, each in the xml:lang it inherits (lxml)."""
    words = Counter()
    for p in sp.iter("{%s}p" % TEI):
        lang = p.xpath("string(ancestor-or-self::*[@xml:lang][1]/@xml:lang)")
        words[lang] += len(re.findall(r"[^\W\d_]+", "".join(p.itertext())))
    return words


def speeches(root):
    """The speeches the speaker unit measures: those of the text, outside the elements
    the reading preset leaves out (tests/pylib/reading_text.py); never the header's."""
    return [sp for sp in root.find("{%s}text" % TEI).iter("{%s}sp" % TEI)
            if not any(etree.QName(a).localname in LEFT_OUT for a in sp.iterancestors())]


def expected_language(root):
    """docs/store.md: the language of most of the segments' words, else the TEI element's
    xml:lang (langUsage only where the text says nothing, which no edition here does)."""
    words = Counter()
    for sp in speeches(root):
        words.update(words_by_language(sp))
    return words.most_common(1)[0][0] if words else root.get(XML_LANG)


def expected_author(root):
    authors = []
    for author in root.findall("t:teiHeader/t:fileDesc/t:titleStmt/t:author", NS):
        names = author.findall("t:persName", NS)
        if len(names) > 1 and "[" in (names[0].tail or ""):  # the header brackets the second name itself
            authors.append(whole(author))
        elif len(names) > 1:
            authors.append(whole(names[0]) + "".join(" (%s)" % whole(n) for n in names[1:]))
        else:
            authors.append(whole(author))
    # One author named twice (a copied <author>) is one author, as an editor counts them.
    return "; ".join(dict.fromkeys(authors))


tmp = mtest.scratch_folder("manicule-header-fields-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
for name, text in FILES.items():
    with open(os.path.join(archive, name), "w", encoding="utf-8") as f:
        f.write(text)
store = os.path.join(tmp, "fields.sqlite")
mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"])  # every file reads: exit 0
db = storecheck.connect(store)
stored = {os.path.basename(r[0]): r[1:] for r in db.execute(
    "SELECT path, status, title, author, date, year, language FROM file_list")}
segments = {r[0]: r[1:] for r in db.execute(
    "SELECT author, language, tokens FROM segment_list WHERE path LIKE '%speeches.xml'")}
db.close()
# reference: os.listdir, every edition written is stored once, and read
mtest.check(sorted(stored) == sorted(os.listdir(archive)), "stored %r, os.listdir %r"
            % (sorted(stored), sorted(os.listdir(archive))))

for name in FILES:
    root = etree.parse(os.path.join(archive, name)).getroot()
    status, title, author, date, year, language = stored[name]
    mtest.check(status == "ok", "%s: status %r" % (name, status))  # every edition is well-formed TEI (lxml parses it)
    mtest.check(title == expected_title(root), "%s: title %r, lxml by the rule %r" % (name, title, expected_title(root)))
    mtest.check(author == expected_author(root), "%s: author %r, lxml by the rule %r"
                % (name, author, expected_author(root)))
    # reference: lxml and re, by docs/store.md's rule (expected_language)
    mtest.check(language == expected_language(root), "%s: language %r, by its segments' words or its xml:lang %r"
                % (name, language, expected_language(root)))
    # reference: lxml (tei_dates.work_date), the date as written and its year; none without one
    written = work_date(root, root.find("{%s}teiHeader" % TEI))
    mtest.check((date or "") == written and year == signed_year(written),
                "%s: date %r, year %r; the header gives %r, year %r"
                % (name, date, year, written, signed_year(written)))

# Each speaker's language: the one most of its words are in, lxml and re counting them (the
# speaker label is not running text), and its words, as many as re finds.
root = etree.parse(os.path.join(archive, "speeches.xml")).getroot()
whos = [sp.get("who").lstrip("#") for sp in speeches(root)]  # reference: lxml
mtest.check(sorted(segments) == sorted(whos), "speakers stored %r, lxml's %r" % (sorted(segments), sorted(whos)))
for sp in speeches(root):
    words = words_by_language(sp)
    want = words.most_common(1)[0][0]
    who = sp.get("who").lstrip("#")
    language, tokens = segments[who]
    mtest.check(language == want, "speaker %s: language %r, most of its words (%r) are %r"
                % (who, language, dict(words), want))
    mtest.check(tokens == sum(words.values()), "speaker %s: %d words stored, re finds %d"
                % (who, tokens, sum(words.values())))
mtest.check({segments[w][0] for w in whos} == {"fr", "de"}, "the speakers' languages do not differ: %r" % segments)

mtest.done()
