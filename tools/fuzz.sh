#!/usr/bin/env bash
# Builds the libFuzzer target (tools/fuzz/fuzz_case.cpp) with clang in build-fuzz/ and runs it on ONE core.
#
#   tools/fuzz.sh 600            fuzz for 600 seconds (default 60)
#   tools/fuzz.sh 0              build only
#   NO_BUILD=1 tools/fuzz.sh 600 run the fuzzer already built
#   FUZZ_TIMEOUT=60 tools/fuzz.sh 600   a longer per-input limit (default 10 s) on a loaded machine, where a
#                                       starved but healthy input can pass 10 s
#
# The seed corpus is tools/fuzz/corpus/ (refreshed here from cases/*.toml and tests/malformed/*.toml); new
# inputs the fuzzer finds go to build-fuzz/corpus/, so the tree is not touched. A crash, hang (-timeout), leak
# or sanitizer report stops the run and leaves its reproducer in build-fuzz/artifacts/; turn it into a test
# (tests/malformed/ or tests/data/fuzz/) before fixing it.
set -euo pipefail
cd "$(dirname "$0")/.."
seconds=${1:-60}
build=${BUILD_DIR:-build-fuzz}

generator=()
command -v ninja >/dev/null 2>&1 && generator=(-G Ninja)
if [ -z "${NO_BUILD:-}" ]; then  # NO_BUILD=1: run the fuzzer already built (another chunk of the same run)
  cmake -S . -B "$build" "${generator[@]}" -DCMAKE_CXX_COMPILER="${CXX_FUZZ:-clang++}" -DSKEIN_BUILD_FUZZ=ON \
        -DSKEIN_BUILD_TESTS=OFF -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
  cmake --build "$build" -j "${JOBS:-2}" --target fuzz_case
fi
[ "$seconds" -gt 0 ] || exit 0

seeds=tools/fuzz/corpus
mkdir -p "$seeds" "$build/corpus" "$build/artifacts"
for f in cases/*.toml tests/malformed/*.toml tests/data/fuzz/*.toml; do
  [ -f "$f" ] || continue
  cp "$f" "$seeds/$(basename "$(dirname "$f")")_$(basename "$f")"
done
export ASAN_OPTIONS=${ASAN_OPTIONS:-detect_leaks=1:halt_on_error=1}
export UBSAN_OPTIONS=${UBSAN_OPTIONS:-print_stacktrace=1:halt_on_error=1}
export OMP_NUM_THREADS=1
# libFuzzer with -jobs writes its log to fuzz-0.log in the current directory: run inside the build directory.
root=$(pwd)
cd "$build"
set +e
./fuzz_case corpus "$root/$seeds" -max_total_time="$seconds" -timeout="${FUZZ_TIMEOUT:-10}" -rss_limit_mb=2048 -max_len=8192 \
  -jobs=1 -workers=1 -print_final_stats=1 -artifact_prefix=artifacts/ -dict="$root/tools/fuzz/case.dict"
status=$?
tail -n 40 fuzz-0.log
exit $status
