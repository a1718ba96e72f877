#!/usr/bin/env bash
# Builds manicule with AddressSanitizer and UndefinedBehaviorSanitizer (GCC's) in
# ./build-sanitize and runs the whole test suite against that build: the unit tests, and
# every script test with the sanitized command and plugin. Any report from either
# sanitizer fails the check, whatever the test made of it. Not part of scripts/test.sh:
# 20 minutes on two cores, 16 of them building.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/deps.sh
flags="-fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined"
# Shared libraries only (MANICULE_STATIC_CLI=OFF): the sanitizers' runtime does not go with a
# statically linked C++ runtime.
cmake -S . -B build-sanitize -DCMAKE_BUILD_TYPE=RelWithDebInfo -DMANICULE_STATIC_CLI=OFF \
  -DCMAKE_C_FLAGS="$flags" -DCMAKE_CXX_FLAGS="$flags" \
  -DCMAKE_EXE_LINKER_FLAGS="-fsanitize=address,undefined" \
  -DCMAKE_SHARED_LINKER_FLAGS="-fsanitize=address,undefined" >/dev/null
cmake --build build-sanitize -j"$(nproc)"

logs="$PWD/build-sanitize/sanitizer-reports"
rm -rf "$logs"
mkdir -p "$logs"
# Reports go to files, one per process: many tests expect a non-zero exit (bad input, a
# failing file in a batch) and would take a sanitizer's abort for the failure they wanted.
# Leaks are not looked for here: the command line keeps one block per worker heap on purpose
# (cli/allocator_settings.cpp), and LeakSanitizer's own memory pushes test_bad_input's
# entity bomb past its 100 MiB limit.
export ASAN_OPTIONS="detect_leaks=0:log_path=$logs/asan"
export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1:log_path=$logs/ubsan"
status=0
(cd build-sanitize && ctest --output-on-failure -j2 --timeout 900) || status=$?
if compgen -G "$logs/*" >/dev/null; then
  echo "sanitizer reports (in $logs):"
  for report in "$logs"/*; do
    echo "== $report"
    head -n 40 "$report"
  done
  status=1
fi
exit "$status"
