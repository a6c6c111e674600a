#!/usr/bin/env bash
# Builds the library, the CLI and the whole test suite with AddressSanitizer and UndefinedBehaviorSanitizer
# (CMake option SKEIN_SANITIZE) in build-asan/, then runs every test. Any sanitizer report fails the run:
# undefined behaviour aborts (-fno-sanitize-recover), and ASan exits non-zero on the first error or leak.
#
#   tools/sanitize.sh            configure, build with -j2 and run ctest
#   JOBS=1 tools/sanitize.sh     fewer build jobs
#   BUILD_TYPE=Debug tools/sanitize.sh
set -euo pipefail
cd "$(dirname "$0")/.."
build=${BUILD_DIR:-build-asan}
jobs=${JOBS:-2}
start=$(date +%s)

generator=()
command -v ninja >/dev/null 2>&1 && generator=(-G Ninja)
# -O1 -g1 (line tables only): the sanitizers' reports keep file and line, and the build takes half the time of
# -O2 -g (measured on src/study.cpp: 55 s against 110 s), which keeps CI inside its 30 minutes.
cmake -S . -B "$build" "${generator[@]}" -DSKEIN_SANITIZE=ON -DCMAKE_BUILD_TYPE="${BUILD_TYPE:-RelWithDebInfo}" \
      -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="${SANITIZE_OPT_FLAGS:--O1 -g1 -DNDEBUG}" -DSKEIN_BUILD_TESTS=ON >/dev/null
cmake --build "$build" -j "$jobs"
built=$(date +%s)

# Leak detection stays on; halt_on_error makes the first report fatal; print_stacktrace gives UBSan reports a
# stack.
export ASAN_OPTIONS=${ASAN_OPTIONS:-detect_leaks=1:halt_on_error=1:abort_on_error=0:strict_string_checks=1:detect_stack_use_after_return=1}
export UBSAN_OPTIONS=${UBSAN_OPTIONS:-print_stacktrace=1:halt_on_error=1}
# Two threads: the OpenMP paths run in parallel under the sanitizers too, on the two cores CI has.
export OMP_NUM_THREADS=${OMP_NUM_THREADS:-2}
ctest --test-dir "$build" --output-on-failure -j "$jobs" --timeout 900
end=$(date +%s)
echo "sanitize.sh: build $((built - start)) s, tests $((end - built)) s, total $((end - start)) s"
