#!/usr/bin/env bash
# Builds the Google Benchmark suite (Release, -DSKEIN_BUILD_BENCHMARKS=ON) and runs it once: every speed target
# measured as a ratio of two times taken side by side, then a table of the ratios, the peak memory of two child
# runs (the last one 10 000 panels) and the load average. About 5 to 10 minutes on 2 busy cores. Numbers are
# kept as JSON in <build dir>/bench.json. It measures and reports; it never passes or fails on time.
#
#   tools/bench.sh                                   everything
#   tools/bench.sh --benchmark_filter=Factorise      extra arguments go to the benchmark binary
#   SKEIN_BENCH_BUILD=/tmp/b tools/bench.sh          build somewhere else than build-bench/
set -euo pipefail
cd "$(dirname "$0")/.."
build="${SKEIN_BENCH_BUILD:-build-bench}"
tools/setup.sh --packages
cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=Release -DSKEIN_BUILD_BENCHMARKS=ON -DSKEIN_BUILD_TESTS=OFF
cmake --build "$build" -j "${SKEIN_JOBS:-$(nproc)}" --target skein_bench
"$build"/tools/bench/skein_bench --benchmark_counters_tabular=true --benchmark_out="$build"/bench.json \
  --benchmark_out_format=json "$@"
