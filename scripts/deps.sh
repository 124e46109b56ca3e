#!/usr/bin/env bash
# Installs what spallscope needs to build and test: OpenCV 4 development
# files (for gocv) and pkg-config. Idempotent: it does nothing when
# `pkg-config --exists opencv4` already succeeds. With WITH_BROWSER=1 it
# also installs Debian's chromium, used by the HTML report's browser test.
# It waits for another package manager that holds dpkg's lock.
set -euo pipefail

need=()
if ! command -v pkg-config >/dev/null 2>&1 || ! pkg-config --exists opencv4; then
  need+=(pkg-config libopencv-dev)
fi
if [ "${WITH_BROWSER:-0}" = 1 ] && ! command -v chromium >/dev/null 2>&1; then
  need+=(chromium)
fi
[ ${#need[@]} -eq 0 ] && exit 0

sudo=""
[ "$(id -u)" -ne 0 ] && sudo="sudo"
export DEBIAN_FRONTEND=noninteractive
echo "deps: installing ${need[*]}" >&2
# Wait up to 10 minutes for another package manager (an unattended upgrade,
# a second build) to release dpkg's lock instead of failing at once.
wait_lock=(-o DPkg::Lock::Timeout=600)
$sudo apt-get "${wait_lock[@]}" update -qq
$sudo apt-get "${wait_lock[@]}" install -y -qq --no-install-recommends "${need[@]}" >/dev/null
pkg-config --exists opencv4 || { echo "deps: opencv4 still missing after install" >&2; exit 1; }
