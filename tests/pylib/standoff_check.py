"""Checks of annotated editions made without our own code: Python's difflib finds what was
inserted, lxml (libxml2 through Debian's python3-lxml) parses it, jing validates against
TEI P5 tei_all.rng.

inserted_chunks(before, after) -> list of (offset_in_after, bytes), or raises if anything
was deleted or replaced. check_insertions(...) says whether each chunk is one of the
elements write-back may add, standing where TEI allows it.
"""
import difflib
import os
import re
import subprocess

from lxml import etree

TEI = "http://www.tei-c.org/ns/1.0"
NS = {"tei": TEI}
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"
PARSER = etree.XMLParser(resolve_entities=False, no_network=True, huge_tree=True, load_dtd=False)

# What write-back may add, and where (TEI P5 4.12.0: standOff is a model.resource child of
# TEI; application sits in teiHeader/encodingDesc/appInfo; change in revisionDesc or its
# listChange).
ALLOWED_TOP = {"standOff", "encodingDesc", "appInfo", "application", "revisionDesc", "change"}
ALLOWED_PARENTS = {
    "standOff": {"TEI", "teiCorpus"},
    "encodingDesc": {"teiHeader"},
    "appInfo": {"encodingDesc"},
    "application": {"appInfo"},
    "revisionDesc": {"teiHeader"},
    "change": {"revisionDesc", "listChange"},
}


def inserted_chunks(before, after):
    """Byte ranges of `after` that are not in `before`, found by difflib on lines and then
    on bytes inside each differing block. Raises AssertionError on deletions."""
    a_lines = before.splitlines(keepends=True)
    b_lines = after.splitlines(keepends=True)
    a_starts = [0]
    for line in a_lines:
        a_starts.append(a_starts[-1] + len(line))
    b_starts = [0]
    for line in b_lines:
        b_starts.append(b_starts[-1] + len(line))
    chunks = []
    lines = difflib.SequenceMatcher(None, a_lines, b_lines, autojunk=False)
    for tag, i1, i2, j1, j2 in lines.get_opcodes():
        if tag == "equal":
            continue
        a_part = before[a_starts[i1]:a_starts[i2]]
        b_part = after[b_starts[j1]:b_starts[j2]]
        fine = difflib.SequenceMatcher(None, a_part, b_part, autojunk=False)
        for t, x1, x2, y1, y2 in fine.get_opcodes():
            if t == "equal":
                continue
            if t != "insert":
                raise AssertionError("bytes of the input were %s at input offset %d: %r -> %r"
                                     % (t, a_starts[i1] + x1, a_part[x1:x2][:200], b_part[y1:y2][:200]))
            chunks.append((b_starts[j1] + y1, b_part[y1:y2]))
    return merge_adjacent(chunks)


def merge_adjacent(chunks):
    out = []
    for offset, data in sorted(chunks):
        if out and out[-1][0] + len(out[-1][1]) == offset:
            out[-1] = (out[-1][0], out[-1][1] + data)
        else:
            out.append((offset, data))
    return out


def alignments(after, offset, length):
    """An insertion is ambiguous where its text repeats what stands beside it ("</x>" then
    inserted "\n<y>...</x>"); every offset it may be slid to, nearest first."""
    left = 0
    while offset - left > 0 and after[offset - left - 1] == after[offset + length - left - 1]:
        left += 1
    right = 0
    while offset + length + right < len(after) and after[offset + right] == after[offset + length + right]:
        right += 1
    candidates = range(offset - left, offset + right + 1)
    return sorted(candidates, key=lambda o: abs(o - offset))


def remove_chunks(after, chunks):
    out, at = [], 0
    for offset, data in chunks:
        out.append(after[at:offset])
        at = offset + len(data)
    out.append(after[at:])
    return b"".join(out)


def local(tag):
    return tag.split("}")[-1] if isinstance(tag, str) else ""


def chunk_elements(data):
    """The elements a chunk holds: it must be whitespace plus well-formed elements."""
    text = data.decode("utf-8").strip()
    wrapper = ('<w xmlns="%s" xmlns:tei="%s">' % (TEI, TEI)) + text + "</w>"
    root = etree.fromstring(wrapper.encode("utf-8"), PARSER)
    if (root.text or "").strip() or any((child.tail or "").strip() for child in root):
        raise AssertionError("inserted text outside elements: %r" % text[:200])
    return list(root)


def check_insertions(before, after, allow_ids=False, parse_bytes=None):
    """`before` and `after` as UTF-8 bytes; `parse_bytes`: the file as written, when it is
    in another encoding (UTF-16). Returns (chunks, problems). Every chunk must hold only elements write-back may add,
    found in the parsed output at the same line under an allowed parent; with allow_ids,
    a chunk may also be one ' xml:id="..."' inside a start tag."""
    problems = []
    chunks = inserted_chunks(before, after)
    if remove_chunks(after, chunks) != before:
        problems.append("removing the inserted ranges does not give back the input")
    tree = etree.fromstring(parse_bytes if parse_bytes is not None else after, PARSER)
    by_line = {}
    for el in tree.iter():
        if isinstance(el.tag, str):
            by_line.setdefault((el.sourceline, local(el.tag)), []).append(el)
    for offset, data in chunks:
        elements, error = None, None
        for shifted in alignments(after, offset, len(data)):
            candidate = after[shifted:shifted + len(data)]
            if allow_ids and re.fullmatch(rb'\s?xml:id="[A-Za-z_][A-Za-z0-9._-]*"\s?', candidate):
                elements = []
                break
            try:
                elements = chunk_elements(candidate)
                offset, data = shifted, candidate
                break
            except Exception as e:  # noqa: BLE001 - reported below if no alignment parses
                error = error or e
        if elements is None:
            problems.append("chunk at %d does not parse as elements: %s: %r" % (offset, error, data[:120]))
            continue
        lead = len(data) - len(data.lstrip())
        first_line = after[:offset + lead].count(b"\n") + 1
        for el in elements:
            line = first_line + el.sourceline - 1  # the chunk starts on line 1 of its wrapper
            name = local(el.tag)
            if el.tag.split("}")[0].strip("{") != TEI or name not in ALLOWED_TOP:
                problems.append("chunk at %d holds <%s>, which write-back never adds" % (offset, el.tag))
                continue
            found = by_line.get((line, name), [])
            if not found:
                problems.append("chunk at %d: <%s> not found at line %d of the output" % (offset, name, line))
                continue
            parent = found[0].getparent()
            if parent is None or local(parent.tag) not in ALLOWED_PARENTS[name]:
                problems.append("<%s> at line %d stands in <%s>"
                                % (name, line, local(parent.tag) if parent is not None else "-"))
    return chunks, problems


def jing_errors(schema, paths):
    """Error messages of jing per file, with line and column numbers removed."""
    if not paths:
        return {}
    proc = subprocess.run(["jing", schema] + list(paths), capture_output=True, text=True)
    errors = {os.path.abspath(p): set() for p in paths}
    for line in proc.stdout.splitlines():
        m = re.match(r"(.*?):(\d+):(\d+): (.*)", line)
        if m:
            errors.setdefault(os.path.abspath(m.group(1)), set()).add(m.group(4))
    # jing failing without a located error (a schema not found, a crash) is no pass.
    if proc.returncode != 0 and not any(errors.values()):
        for path in errors:
            errors[path].add("jing exited %d: %s" % (proc.returncode, (proc.stdout + proc.stderr).strip()[:200]))
    return errors


def id_targets(tree):
    return {el.get(XML_ID): el for el in tree.iter() if isinstance(el.tag, str) and el.get(XML_ID)}


def resolve_tei_xpath(tree, path):
    """A TEI xpath() pointer /a[1]/b[2] evaluated with lxml, TEI being the default namespace."""
    steps = re.findall(r"/([^/\[]+)\[(\d+)\]", path)
    expression = "".join("/tei:%s[%s]" % (name, n) for name, n in steps)
    found = tree.getroottree().xpath(expression, namespaces=NS)
    return found[0] if len(found) == 1 else None
