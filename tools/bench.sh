#!/usr/bin/env bash
# Builds the Google Benchmark suite (Release, -DSKEIN_BUILD_BENCHMARKS=ON) in build-bench/ and runs it.
# Prints time per stage and throughput counters for 500 to 4000 panels, and keeps the numbers as JSON in
# build-bench/bench.json. Each benchmark runs three times and the mean, median and spread are shown, since the
# machine may be shared. It measures and reports; it never passes or fails on time.
#
#   tools/bench.sh                                  every benchmark
#   tools/bench.sh --benchmark_filter=Factorise     extra arguments go to the benchmark binary
set -euo pipefail
cd "$(dirname "$0")/.."
tools/setup.sh --packages
cmake -S . -B build-bench -G Ninja -DCMAKE_BUILD_TYPE=Release -DSKEIN_BUILD_BENCHMARKS=ON -DSKEIN_BUILD_TESTS=OFF
cmake --build build-bench -j "${SKEIN_JOBS:-$(nproc)}" --target skein_bench
build-bench/tools/bench/skein_bench --benchmark_counters_tabular=true --benchmark_repetitions=3 \
  --benchmark_report_aggregates_only=true --benchmark_out=build-bench/bench.json --benchmark_out_format=json "$@"
