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
