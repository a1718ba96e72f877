"""The text the reading preset selects from an element, as lxml finds it: the element's text
without the elements README.md lists as editorial matter left out by default (the reading
preset: del and surplus too) and those never selected, keeping the text that follows them."""
TEI = "{http://www.tei-c.org/ns/1.0}"
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
