#!/usr/bin/env bash
# Sets up a Debian 12 machine for Skein and builds it.
#
#   tools/setup.sh              install what is missing, configure Release in build/ and build everything
#   tools/setup.sh skein_cli    the same, building only the named targets (the demo needs only the CLI)
#   tools/setup.sh --packages   install what is missing and stop (tools/bench.sh builds elsewhere)
#   tools/setup.sh --list-packages   print the Debian packages Skein needs, one a line, and stop (.ci/run
#                                     installs them itself with apt-get)
#   tools/setup.sh --with-browser ...   also install chromium and fonts-dejavu-core, for the browser test of the
#                                       HTML report (tests/output/browser_report_test.cpp, skipped without them)
#
# Packages are installed with apt-get only when dpkg-query finds one missing; as root directly, otherwise with
# sudo when it is available. Environment: SKEIN_BUILD_DIR (default build), SKEIN_JOBS (default: all cores).
set -euo pipefail
cd "$(dirname "$0")/.."

packages=(build-essential cmake ninja-build pkg-config libeigen3-dev libtomlplusplus-dev libfmt-dev libcli11-dev
          nlohmann-json3-dev libgtest-dev libbenchmark-dev libopenblas-dev liblapacke-dev zlib1g-dev)

args=()
for a in "$@"; do
  if [[ $a == --with-browser ]]; then
    packages+=(chromium fonts-dejavu-core)
  else
    args+=("$a")
  fi
done
set -- "${args[@]}"

if [[ ${1:-} == --list-packages ]]; then
  printf '%s\n' "${packages[@]}"
  exit 0
fi

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}\n' "$p" 2>/dev/null | grep -q '^install ok installed$'; then
    missing+=("$p")
  fi
done

if ((${#missing[@]} > 0)); then
  if [[ $(id -u) -eq 0 ]]; then
    as_root=()
  elif command -v sudo >/dev/null 2>&1; then
    as_root=(sudo)
  else
    echo "setup.sh: these packages are missing and installing them needs root or sudo: ${missing[*]}" >&2
    exit 1
  fi
  echo "setup.sh: installing ${missing[*]}"
  "${as_root[@]}" apt-get update
  "${as_root[@]}" env DEBIAN_FRONTEND=noninteractive apt-get install -y --no-install-recommends "${missing[@]}"
else
  echo "setup.sh: every package is installed; apt skipped"
fi

if [[ ${1:-} == --packages ]]; then
  exit 0
fi

build_dir=${SKEIN_BUILD_DIR:-build}
jobs=${SKEIN_JOBS:-$(nproc)}
cmake -S . -B "$build_dir" -G Ninja -DCMAKE_BUILD_TYPE=Release
if (($# > 0)); then
  cmake --build "$build_dir" -j "$jobs" --target "$@"
else
  cmake --build "$build_dir" -j "$jobs"
fi
