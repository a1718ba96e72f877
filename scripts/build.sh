#!/usr/bin/env bash
# Configures and builds manicule (Release) in ./build, using every core.
set -euo pipefail
cd "$(dirname "$0")/.."
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build build -j"$(nproc)"
