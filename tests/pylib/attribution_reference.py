"""Attribution recomputed from the published formulas with Debian numpy, independently of
manicule, for the attribution tests:
- z-scores of relative frequencies with the sample standard deviation (ddof=1), a feature
  without variance scoring 0, limited to +-limit (docs/attribution.md);
- cosine distance (Smith & Aldridge 2011: Cosine Delta is the cosine distance of z-scores;
  an all-zero profile is at 1 from any other and at 0 from another all-zero one) and
  Burrows's Delta (Burrows 2002: mean absolute z difference);
- the candidate rules: nearest single segment, plain centroid, weighted centroid with
  weights exp(-(d/d_min - 1)/spread) (docs/attribution.md);
- SplitMix64 (Steele, Lea & Flood 2014) with Lemire's 2019 bounded draw and a partial
  Fisher-Yates shuffle, for the stability's feature subsets;
- who sent a letter, read with lxml from correspDesc (TEI P5 2.4.6; @cert below high or
  @evidence="conjecture" make the sender conjectured, P5 21.1.2), and so which letters are
  questioned.
"""
import numpy as np
from lxml import etree

TEI = "{http://www.tei-c.org/ns/1.0}"
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"

M64 = (1 << 64) - 1


class SplitMix64:
    def __init__(self, seed):
        self.state = seed & M64

    def next(self):
        self.state = (self.state + 0x9E3779B97F4A7C15) & M64
        z = self.state
        z = ((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9) & M64
        z = ((z ^ (z >> 27)) * 0x94D049BB133111EB) & M64
        return z ^ (z >> 31)

    def below(self, n):  # Lemire 2019: multiply, reject the biased low part
        m = self.next() * n
        low = m & M64
        if low < n:
            threshold = ((1 << 64) - n) % n
            while low < threshold:
                m = self.next() * n
                low = m & M64
        return m >> 64

    def choose(self, n, k):  # partial Fisher-Yates
        pool = list(range(n))
        for i in range(min(k, n)):
            j = i + self.below(n - i)
            pool[i], pool[j] = pool[j], pool[i]
        return pool[:min(k, n)]


def z_from_relative(rel, limit):
    sd = rel.std(axis=0, ddof=1)
    z = np.where(sd > 0, (rel - rel.mean(axis=0)) / np.where(sd > 0, sd, 1), 0.0)
    return np.clip(z, -limit, limit) if limit > 0 else z


def z_scores(counts, words, ids, limit):
    """`counts` segments x features, `words[id]` each segment's word count, in `ids` order."""
    return z_from_relative(counts / np.array([words[i] for i in ids], dtype=float)[:, None], limit)


def cosine(a, b):
    na, nb = np.linalg.norm(a), np.linalg.norm(b)
    if na == 0 or nb == 0:
        return 0.0 if na == nb else 1.0
    return max(0.0, 1 - float(a @ b) / (na * nb))


def burrows(a, b):
    return float(np.mean(np.abs(a - b)))


def to_candidate(q, rows, rule, dist, spread=0.2):
    d = np.array([dist(q, r) for r in rows])
    if rule == "nearest":
        return d.min()
    if rule == "centroid" or len(rows) == 1:
        w = np.ones(len(rows))
    else:
        w = np.exp(-(d / d.min() - 1) / spread)
    return dist(q, (w[:, None] * rows).sum(axis=0) / w.sum())


def letter_senders(path, stem, sure_only=True):
    """{"stem#letterid": sender @ref, or "" for a letter the edition does not attribute};
    with sure_only False, a conjectured or uncertain sender's @ref too."""
    tree = etree.parse(path)
    sender_of_desc = {}
    for desc in tree.iter(TEI + "correspDesc"):
        sent = [a for a in desc.iter(TEI + "correspAction") if a.get("type") == "sent"]
        name = sent[0].find(".//" + TEI + "persName") if sent else None
        given = name is not None and name.get("ref")
        sure = given and name.get("evidence") != "conjecture" and name.get("cert") in (None, "high", "1", "1.0")
        sender_of_desc[desc.get(XML_ID)] = name.get("ref") if (sure if sure_only else given) else ""
    return {stem + "#" + div.get(XML_ID): sender_of_desc.get((div.get("decls") or "").lstrip("#"), "")
            for div in tree.iter(TEI + "div") if div.get("type") == "letter"}
