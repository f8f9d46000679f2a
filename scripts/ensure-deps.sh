#!/usr/bin/env bash
# Installs what Soundings needs and this machine lacks: Debian's packages (PostgreSQL, ffmpeg
# and DCMTK to run; with --test also Chromium, poppler-utils, the Python reference libraries
# the statistics tests compare against, and pydicom with its DICOM test files) and the npm
# packages from the lockfile.
set -euo pipefail
cd "$(dirname "$0")/.."

missing=()
want() { dpkg-query -W -f='${Status}' "$1" 2>/dev/null | grep -q "install ok installed" || missing+=("$1"); }
want postgresql
want ffmpeg
want dcmtk
if [ "${1:-}" = "--test" ]; then
  want chromium
  want poppler-utils
  want python3-statsmodels
  want python3-sklearn
  want python3-pydicom
fi
if [ ${#missing[@]} -gt 0 ]; then
  echo "Installing Debian packages: ${missing[*]}"
  sudo_cmd=""
  [ "$(id -u)" -ne 0 ] && sudo_cmd="sudo"
  $sudo_cmd apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo_cmd apt-get install -y -qq "${missing[@]}" >/dev/null
fi

# npm packages: install when absent or when the lockfile changed since the last install.
# A node_modules that is a link is an install shared with other checkouts (git worktrees):
# `npm ci` would empty the folder it points to under everyone's feet, so it is left alone.
if [ -L node_modules ]; then
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    echo "node_modules is a link to a shared install ($(readlink node_modules)): not reinstalling; run npm ci where it lives if packages are missing"
  fi
elif [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "Installing npm packages (npm ci)"
  npm ci --no-audit --no-fund --loglevel=error
fi
