#!/usr/bin/env bash
# Installs what Furlong needs to build and test, only what is missing.
# Debian/Ubuntu: apt-get (with sudo when not root). Elsewhere: prints the list.
set -euo pipefail

debs=(gcc pkg-config libgl1-mesa-dev libx11-dev libxcursor-dev libxrandr-dev
      libxinerama-dev libxi-dev libxxf86vm-dev
      poppler-utils zbar-tools)  # pdftotext/pdftoppm and zbarimg: the PDF report and label tests

sudo=""
if [ "$(id -u)" -ne 0 ]; then sudo="sudo"; fi

missing=()
if command -v dpkg >/dev/null 2>&1; then
  for p in "${debs[@]}"; do
    dpkg -s "$p" >/dev/null 2>&1 || missing+=("$p")
  done
  command -v go >/dev/null 2>&1 || missing+=(golang-go)
  if [ ${#missing[@]} -gt 0 ]; then
    echo "setup: installing ${missing[*]}"
    $sudo apt-get update -qq
    DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq "${missing[@]}" >/dev/null
  fi
else
  command -v go >/dev/null 2>&1 || echo "setup: install Go 1.21 or newer from https://go.dev/dl/" >&2
  echo "setup: not a Debian/Ubuntu system; make sure these (or your system's equivalents) are installed:" >&2
  echo "  a C compiler, pkg-config, OpenGL and X11 development headers (GL, X11, Xcursor, Xrandr, Xinerama, Xi, Xxf86vm)" >&2
  echo "  for the PDF tests: poppler's pdftotext and pdftoppm, and zbar's zbarimg" >&2
fi

if ! command -v go >/dev/null 2>&1; then
  echo "setup: Go is not installed; get Go 1.21 or newer from https://go.dev/dl/" >&2
  exit 1
fi
# Go 1.21+ fetches the exact toolchain named in go.mod by itself (GOTOOLCHAIN=auto).
minor=$(go env GOVERSION | sed -E 's/^go1\.([0-9]+).*/\1/')
if [ "${minor:-0}" -lt 21 ]; then
  echo "setup: Go $(go env GOVERSION) is too old; install Go 1.21 or newer from https://go.dev/dl/" >&2
  exit 1
fi
go mod download
