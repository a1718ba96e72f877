#!/usr/bin/env bash
# The main job on the invented example edition (examples/): installs what is missing,
# builds, lists the segments the selection finds, then measures, attributes and writes the
# results back as TEI standoff into a copy under build/demo/ (examples/ stays untouched).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/deps.sh
bash scripts/build.sh
m=build/manicule
out=build/demo
mkdir -p "$out"

echo "== Speakers of the play, as selected (stage directions, speaker labels and notes left out)"
$m segments --unit speaker examples/ferry-play.xml

echo
echo "== Letters of the correspondence, with their senders"
$m segments --unit letter examples/ferry-letters.xml

echo
echo "== The letters nearest each other (Cosine Delta on the 150 most frequent words;"
echo "   the letters are short, so the minimum size is lowered to 200 words for the demo)"
$m distances --unit letter --min-tokens 200 --ranks 1-150 --format tsv examples/ferry-letters.xml \
  | grep -v '^#' | sort -t$'\t' -k3 -g | sed -n '1,8p'  # sed reads to the end: no broken pipe under pipefail

echo
echo "== A map of the speakers (PCA on z-scores) as SVG: $out/play-speakers.svg"
$m map --unit speaker --min-tokens 200 --ranks 1-100 --format svg --output "$out/play-speakers.svg" examples/ferry-play.xml
$m tree --unit letter --min-tokens 200 --ranks 1-150 --linkage ward --format newick examples/ferry-letters.xml

echo
echo "== Who wrote the unsigned letters? Candidates ranked, with margin and stability"
$m attribute --unit letter --min-tokens 200 --format tsv examples/ferry-letters.xml | awk '/^# caution/ || !/^#/' | cut -f1-7

echo
echo "== The results written back into a copy of the edition as TEI standoff: $out/ferry-letters.xml"
echo "   (profiles, distances, PCA, the attribution and its verification, with the caution)"
$m annotate --unit letter --min-tokens 200 --attribute --verify --output "$out/ferry-letters.xml" examples/ferry-letters.xml
$m show "$out/ferry-letters.xml" | grep -E '^(# caution|kind|candidate|verification)' | sed -n '1,16p'
