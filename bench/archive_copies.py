"""Archives made of copies, for the store benchmarks: each copy of an edition is made
another content (a new SHA-256 for the store) by a comment after its XML declaration, and
the files are dated back past the store's racy-time window, so that a re-run trusts each
file's size and time alone."""
import os
import time


def as_copy(data, k):
    """The bytes of edition `data` as copy k: the same text, another content."""
    at = data.find(b"?>") + 2 if data.startswith(b"<?xml") else 0
    return data[:at] + b"\n<!-- copy %d -->" % k + data[at:]


def date_back(folder):
    """Gives every file below `folder` a time a minute ago."""
    past = time.time() - 60
    for dirpath, _, names in os.walk(folder):
        for name in names:
            os.utime(os.path.join(dirpath, name), (past, past))


def remove_store(store):
    """Removes a store with its log and shared-memory files."""
    for suffix in ("", "-wal", "-shm"):
        if os.path.exists(store + suffix):
            os.remove(store + suffix)
