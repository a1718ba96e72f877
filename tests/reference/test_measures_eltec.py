"""Profiles, distances, PCA, linkage and consensus on real novel chapters (ELTeC English),
checked against numpy, SciPy and scikit-learn (tests/pylib/measure_battery.py says which
library stands behind each check). Chapters are read crudely with lxml and a regex: the
subject here is the measures, not text selection or tokenisation."""
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from measure_battery import check_segments  # noqa: E402
from measure_reference import eltec_chapters, require_driver  # noqa: E402

require_driver()
if not os.path.isdir(os.path.join(mtest.CORPORA, "eltec-eng")):
    print("SKIP: the ELTeC corpus is not present")
    sys.exit(77)

# Three chapters of each of three novels, plus a short chapter (about 350 words) that the
# default minimum of 1,500 words must leave out and report.
segments = eltec_chapters(mtest.CORPORA, [("ENG18400_Trollope", [1, 2, 3, 5]),
                                          ("ENG18471_Bronte", [2, 3, 4]),
                                          ("ENG18482_Gaskell", [1, 2, 3])])
check_segments(segments, min_tokens=1500, near_last=300)
mtest.done()
