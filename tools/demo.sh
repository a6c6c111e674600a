#!/usr/bin/env bash
# Sets up the machine, builds Skein (Release, build/) and solves the bundled survey-drone wing.
#
#   tools/demo.sh                      print the summary
#   tools/demo.sh --json drone.json    extra arguments go to `skein solve`
set -euo pipefail
cd "$(dirname "$0")/.."
tools/setup.sh skein_cli
build_dir=${SKEIN_BUILD_DIR:-build}
"$build_dir/skein" solve cases/survey_drone.toml "$@"
