"""Profiles, distances, PCA, linkage and consensus on the speakers of a German play
(GerDraCor, Lessing's Emilia Galotti), checked against numpy, SciPy and scikit-learn
(tests/pylib/measure_battery.py). German forms (ä, ö, ü, ß) exercise the UTF-8 byte
tie-break of the feature ranking. Speeches are read crudely with lxml and a regex."""
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from measure_battery import check_segments  # noqa: E402
from measure_reference import dracor_speakers, require_driver  # noqa: E402

require_driver()
play = os.path.join(mtest.CORPORA, "gerdracor", "lessing-emilia-galotti.xml")
if not os.path.exists(play):
    print("SKIP: the GerDraCor play is not present")
    sys.exit(77)

# Eight speakers have 600 words or more; the others are left out and reported.
segments = dracor_speakers(mtest.CORPORA, "lessing-emilia-galotti")
check_segments(segments, min_tokens=600, near_last=200)
mtest.done()
