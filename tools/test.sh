#!/usr/bin/env bash
# Sets up the machine (with the browser the HTML report's test opens), builds Skein and its tests (Release,
# build/) and runs the whole test suite.
#
#   tools/test.sh                  every test
#   tools/test.sh -R examples      extra arguments go to ctest (here: only the tests whose names match)
set -euo pipefail
cd "$(dirname "$0")/.."
tools/setup.sh --with-browser
build_dir=${SKEIN_BUILD_DIR:-build}
ctest --test-dir "$build_dir" --output-on-failure -j2 "$@"
