#!/usr/bin/env bash
# Installs the Debian 12 packages manicule needs to build, test and demo, when missing.
# Runs apt-get only if something is missing, so a second call costs nothing.
set -euo pipefail
packages=(
  build-essential cmake pkg-config
  libxml2-dev libxml2-utils xsltproc libicu-dev libeigen3-dev libopenblas-dev zlib1g-dev liblzma-dev
  libsqlite3-dev sqlite3 nettle-dev catch2 libcli11-dev nlohmann-json3-dev
  unicode-data iso-codes jing
  python3-lxml python3-numpy python3-scipy python3-sklearn
  chromium
)
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
  echo "installing: ${missing[*]}"
  sudo_cmd=""
  [ "$(id -u)" -ne 0 ] && sudo_cmd="sudo"
  $sudo_cmd apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo_cmd apt-get install -y -qq --no-install-recommends "${missing[@]}"
fi
