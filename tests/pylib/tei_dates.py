"""The year of the work an edition holds, read from its TEI header with lxml, by the order
docs/store.md gives ("Sub-corpora"): written here apart from manicule's reader, so that
tests compare the store's `year` with it."""
import re

TEI = "{http://www.tei-c.org/ns/1.0}"


def date_value(element, text=True):
    """A date as written: its attributes (att.datable), else (for a date element) its text
    with white space collapsed; "" when it has neither."""
    for name in ("when", "notBefore", "from", "notAfter", "to"):
        if element.get(name):
            return element.get(name)
    return " ".join("".join(element.itertext()).split()) if text else ""


def year_of(text):
    year = re.search(r"(?<!\d)\d{4}(?!\d)", text or "")
    return int(year.group()) if year else None


def signed_year(value):
    """The year of a date as written, XML Schema's gYear (1.0 Part 2, 3.2.9) reading a
    leading minus as a year before the common era ("-0400" is -400); otherwise year_of."""
    match = re.match(r"-(\d{4,})", value or "")
    return -int(match.group(1)) if match else year_of(value)


def _within_year(value):
    """What an XML Schema date (gYear, gYearMonth, date, dateTime; TEI's
    teidata.temporal.w3c) gives after its year, its time zone left out ("-05-07" of
    "1876-05-07" and of "1876-05-07Z", "" of "1876"), so that the dates of one year sort as
    written (months, then days, the less precise first; docs/store.md); "~", after all of
    those, for a date written otherwise."""
    zone = r"(?:Z|[+-]\d\d:\d\d)?"
    match = re.fullmatch(r"-?\d{4}((?:-\d\d(?:-\d\d)?)?)" + zone, value) or re.fullmatch(r"-?\d{4}(-\d\d-\d\dT.*)", value, re.S)
    return match.group(1) if match else "~"


def _earliest(values):
    """The earliest of `values` (docs/store.md: the earliest date): by year, then within the
    year by _within_year, the first written among equals; "" when none has a year."""
    return min((v for v in values if year_of(v) is not None), key=lambda v: (year_of(v), _within_year(v)), default="")


def _bibl_type(date):
    """The @type of the innermost bibl (biblStruct, biblFull) around `date` that has one."""
    typed = [a.get("type") for a in date.iterancestors(TEI + "bibl", TEI + "biblStruct", TEI + "biblFull")
             if a.get("type")]
    return typed[0] if typed else ""


def work_year(root, header):
    """The year of work_date(root, header); None when no source has a year."""
    return year_of(work_date(root, header))


def work_date(root, header):
    """The date of the work as written, as docs/store.md orders the header's dates, the first
    with a year winning: the first date in a creation element, the earliest date of a correspAction of
    type sent, the earliest event (written, print, premiere) in standOff, the first date in a
    sourceDesc bibl of type firstEdition (the innermost typed bibl decides), the first
    sourceDesc date outside a bibl whose type begins "digital", the header's first date
    outside publicationStmt, editionStmt and revisionDesc (TEI P5 2.2.4, 2.2.2, 2.6: they
    date the electronic file, its edition and its changes, not the work) and correspDesc
    (a letter's sending is the second source, its other dates no work's). Dates without a
    value (an empty <date/>) are passed by. "" when no source has a year."""
    def values(elements, text=True):
        return [v for v in (date_value(e, text) for e in elements) if v]

    creation = values(d for c in header.iter(TEI + "creation") for d in c.iter(TEI + "date"))
    sent = values(d for action in header.iter(TEI + "correspAction") if action.get("type") == "sent"
                  for d in action.iter(TEI + "date"))
    events = values((e for s in root.findall(TEI + "standOff") for e in s.iter(TEI + "event")
                     if e.get("type") in ("written", "print", "premiere")), text=False)
    source_dates = [d for s in header.iter(TEI + "sourceDesc") for d in s.iter(TEI + "date")]
    first_edition = values(d for d in source_dates if _bibl_type(d) == "firstEdition")
    source = values(d for d in source_dates if not _bibl_type(d).startswith("digital"))
    file_dating = {TEI + "publicationStmt", TEI + "editionStmt", TEI + "revisionDesc", TEI + "correspDesc"}
    anywhere = values(d for d in header.iter(TEI + "date")
                      if not any(a.tag in file_dating for a in d.iterancestors()))
    for candidate in (creation[:1], [_earliest(sent)], [_earliest(events)], first_edition[:1], source[:1],
                      anywhere[:1]):
        if candidate and year_of(candidate[0]) is not None:
            return candidate[0]
    return ""
