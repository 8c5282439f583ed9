#!/usr/bin/env bash
# Installs the Debian packages Curvebench builds, tests and runs with — only those missing.
# Usage: scripts/install-deps.sh
set -euo pipefail

packages=(
  build-essential cmake ninja-build pkg-config git
  qt6-base-dev libqcustomplot-dev libeigen3-dev libsqlite3-dev
  libgtest-dev libgmock-dev libcli11-dev libhowardhinnant-date-dev nlohmann-json3-dev
  libfmt-dev libboost-math-dev libboost-dev libssl-dev clang-format libbenchmark-dev
  libnlopt-cxx-dev libxlsxwriter-dev
  python3 python3-openpyxl python3-pandas poppler-utils
  xvfb xauth imagemagick     # the workbench without a display; screenshot checks
  clang libclang-rt-14-dev   # libFuzzer harnesses (scripts/fuzz.sh)
)
# --with-display-tools: kept for older callers; the display tools are now always installed.

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if ((${#missing[@]} == 0)); then
  exit 0
fi

echo "Installing missing packages: ${missing[*]}"
if [[ $(id -u) -ne 0 ]]; then
  SUDO=sudo
else
  SUDO=
fi
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -qq
$SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
