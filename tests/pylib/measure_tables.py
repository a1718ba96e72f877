"""Readers for the TSV the measuring commands write (profile, distances): "# key: value"
parameter lines, then a header row and data rows."""


def read_parameters(text):
    params = {}
    for line in text.splitlines():
        if line.startswith("# "):
            key, _, value = line[2:].partition(": ")
            params.setdefault(key, []).append(value)
    return params


def data_rows(text):
    return [line.split("\t") for line in text.splitlines() if line and not line.startswith("#")]


def read_profile(text):
    """(parameters, features, {segment: [values]}) from `profile` TSV."""
    rows = data_rows(text)
    return read_parameters(text), rows[0][1:], {r[0]: [float(v) for v in r[1:]] for r in rows[1:]}


def read_distances(text):
    """(parameters, [(segment_a, segment_b, value)]) from `distances` TSV."""
    rows = data_rows(text)
    assert rows[0] == ["segment_a", "segment_b", "value"], rows[0]
    return read_parameters(text), [(a, b, float(v)) for a, b, v in rows[1:]]
