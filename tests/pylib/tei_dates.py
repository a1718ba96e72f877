"""The year of the work an edition holds, read from its TEI header with lxml, by the order
docs/store.md gives ("Sub-corpora"): written here apart from manicule's reader, so that
tests compare the store's `year` with it."""
import re

TEI = "{http://www.tei-c.org/ns/1.0}"


def date_value(element, text=True):
    """A date as written: its attributes (att.datable), else (for a date element) its text."""
    for name in ("when", "notBefore", "from", "notAfter", "to"):
        if element.get(name):
            return element.get(name)
    return "".join(element.itertext()) if text else None


def year_of(text):
    year = re.search(r"(?<!\d)\d{4}(?!\d)", text or "")
    return int(year.group()) if year else None


def work_year(root, header):
    """The year of the work as docs/store.md orders the header's dates: profileDesc/creation,
    else the earliest date of a correspAction of type sent, else the earliest dated event (written, print, premiere) in standOff/listEvent, else the
    date of a sourceDesc bibl of type firstEdition, else the first sourceDesc date outside a
    bibl of type digitalSource (the innermost typed bibl decides), else the header's first."""
    creation = header.find("%sprofileDesc/%screation" % (TEI, TEI))
    if creation is not None and creation.find(".//" + TEI + "date") is not None:
        return year_of(date_value(creation.find(".//" + TEI + "date")))
    sent = [year_of(date_value(d)) for action in header.iter(TEI + "correspAction") if action.get("type") == "sent"
            for d in action.iter(TEI + "date")]
    if any(y is not None for y in sent):
        return min(y for y in sent if y is not None)
    events = [year_of(date_value(e, text=False)) for e in root.findall("%sstandOff//%sevent" % (TEI, TEI))
              if e.get("type") in ("written", "print", "premiere")]
    if any(y is not None for y in events):
        return min(y for y in events if y is not None)
    source = header.find("%sfileDesc/%ssourceDesc" % (TEI, TEI))
    if source is not None:
        def bibl_type(date):
            typed = [a.get("type") for a in date.iterancestors(TEI + "bibl", TEI + "biblStruct", TEI + "biblFull")
                     if a.get("type")]
            return typed[0] if typed else ""
        dates = list(source.iter(TEI + "date"))
        first_edition = [d for d in dates if bibl_type(d) == "firstEdition"]
        if first_edition:
            return year_of(date_value(first_edition[0]))
        kept = [d for d in dates if not bibl_type(d).startswith("digital")]
        if kept:
            return year_of(date_value(kept[0]))
    first = next(header.iter(TEI + "date"), None)
    return None if first is None else year_of(date_value(first))
