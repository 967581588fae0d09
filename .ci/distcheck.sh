#!/usr/bin/env bash
# Smoke tests of the packages `make dist` wrote under dist/ (run by
# `make distcheck` and by .ci/test.sh):
#   Linux: the tarball unpacks, install.sh installs and removes it, the
#     program answers --help and --version.
#   Windows: the zip unpacks into a folder with spaces and accents,
#     furlong.exe is a console program with its icon and version, and it runs
#     under wine (a private WINEPREFIX, with a stand-in bcryptprimitives.dll
#     that wine 8 lacks): --help, --version, `analyze --format json` on an
#     open dataset and on the demo trial give byte for byte the Linux
#     program's output, and the report workbook it writes opens and holds the
#     same cells as the Linux program's.
#   The window: furlong.exe --demo under wine on a virtual screen (Xvfb),
#     screenshot checked for a drawn window (dist/wine-window.png).
# Installs wine, Xvfb, xdotool, ImageMagick and unzip with apt-get when missing.
# Every wine call has a time limit; wineserver is stopped at the end.
set -euo pipefail
cd "$(dirname "$0")/.."
export LANG=${LANG:-C.UTF-8}
[ "$LANG" = "C" ] && export LANG=C.UTF-8
t0=$SECONDS

toml() { sed -n "s/^ *$1 *= *\"\{0,1\}\([^\"]*\)\"\{0,1\} *$/\1/p" FyneApp.toml | head -1; }
VERSION=$(toml Version); BUILD=$(toml Build)
tarball=dist/furlong-$VERSION-linux-amd64.tar.xz
zipfile=dist/furlong-$VERSION-windows-amd64.zip
for f in "$tarball" "$zipfile"; do
  [ -f "$f" ] || { echo "distcheck: $f is missing; run 'make dist' first" >&2; exit 1; }
done

fail() { echo "distcheck: FAILED: $*" >&2; exit 1; }
step() { printf 'distcheck: %s\n' "$*"; }

need=()
command -v wine >/dev/null 2>&1 || need+=(wine)
dpkg -s wine64 >/dev/null 2>&1 || need+=(wine64)
command -v unzip >/dev/null 2>&1 || need+=(unzip)
command -v desktop-file-validate >/dev/null 2>&1 || need+=(desktop-file-utils)
command -v xz >/dev/null 2>&1 || need+=(xz-utils)
command -v Xvfb >/dev/null 2>&1 || need+=(xvfb)
command -v xdotool >/dev/null 2>&1 || need+=(xdotool)
{ command -v import >/dev/null 2>&1 && import -version >/dev/null 2>&1; } || need+=(imagemagick)
command -v x86_64-w64-mingw32-gcc >/dev/null 2>&1 || need+=(gcc-mingw-w64-x86-64)
if [ ${#need[@]} -gt 0 ]; then
  command -v apt-get >/dev/null 2>&1 || fail "install ${need[*]} (the Windows smoke test runs furlong.exe under wine)"
  sudo=""; [ "$(id -u)" -ne 0 ] && sudo="sudo"
  step "installing ${need[*]}"
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq "${need[@]}" >/dev/null ||
    fail "apt-get could not install ${need[*]}"
fi

work=$(mktemp -d)
xpid=""; wpid=""
export WINEPREFIX=$work/wineprefix WINEARCH=win64 WINEDEBUG=-all
# No Mono or Gecko installer dialogs on a new prefix (Furlong needs neither).
export WINEDLLOVERRIDES="mscoree=;mshtml="
cleanup() {
  set +e
  if [ -n "$wpid" ]; then kill "$wpid" 2>/dev/null; wait "$wpid" 2>/dev/null; fi
  [ -d "$WINEPREFIX" ] && timeout 30 wineserver -k >/dev/null 2>&1
  if [ -n "$xpid" ]; then kill "$xpid" 2>/dev/null; wait "$xpid" 2>/dev/null; fi
  rm -rf "$work"
}
trap cleanup EXIT
# Private settings and caches for the Linux program too.
export XDG_CONFIG_HOME=$work/config XDG_CACHE_HOME=$work/cache
dt=$work/disttool
go build -o "$dt" ./cmd/disttool

# ---- Linux
step "Linux: unpacking $tarball"
mkdir -p "$work/linux"
tar -xJf "$tarball" -C "$work/linux"
L=$work/linux/furlong-$VERSION-linux-amd64
for f in usr/local/bin/furlong usr/local/share/applications/furlong.desktop \
         usr/local/share/icons/hicolor/512x512/apps/furlong.png install.sh INSTALL.txt \
         CAUTIONS-AND-LICENCE.txt LICENSE.txt; do
  [ -s "$L/$f" ] || fail "the tarball has no $f"
done
desktop-file-validate "$L/usr/local/share/applications/furlong.desktop" || fail "the menu entry furlong.desktop is not valid"
lin=$L/usr/local/bin/furlong
"$lin" --help >"$work/help.linux" 2>&1 || fail "the Linux program's --help failed: $(cat "$work/help.linux")"
grep -q analyze "$work/help.linux" || fail "the Linux program's --help lists no analyze command"
lver=$("$lin" --version 2>&1) || fail "the Linux program's --version failed"
[[ $lver == *"$VERSION"* ]] || fail "the Linux program says '$lver', not version $VERSION"
step "Linux: --help and --version ($lver) work"
PREFIX=$work/prefix "$L/install.sh" >/dev/null || fail "install.sh failed"
[ -x "$work/prefix/bin/furlong" ] || fail "install.sh did not install the program"
grep -q "^Exec=$work/prefix/bin/furlong %f" "$work/prefix/share/applications/furlong.desktop" ||
  fail "the installed menu entry does not start the installed program"
PREFIX=$work/prefix "$L/install.sh" --uninstall >/dev/null || fail "install.sh --uninstall failed"
[ ! -e "$work/prefix/bin/furlong" ] || fail "install.sh --uninstall left the program"
step "Linux: install.sh installs and removes the program and its menu entry"

# ---- Windows: the package
# A folder with spaces and non-ASCII letters, as on a field-office laptop.
wdir="$work/win/Feld Versuche – Ähre"
mkdir -p "$wdir"
unzip -q "$zipfile" -d "$wdir"
W=$wdir/furlong-$VERSION-windows-amd64
exe=$W/furlong.exe
for f in furlong.exe README.txt LICENSE.txt; do [ -s "$W/$f" ] || fail "the zip has no $f"; done
grep -q "the label is the law" "$W/README.txt" || fail "README.txt lacks the cautions"
grep -q "MIT" "$W/README.txt" || fail "README.txt does not name the licence"
grep -q $'\r$' "$W/README.txt" || fail "README.txt does not have Windows line endings"
"$dt" exe "$exe" "$VERSION" "$BUILD" || fail "furlong.exe is not what the package promises"

# ---- Windows: wine
step "wine: a private prefix ($(wine --version 2>/dev/null))"
Xvfb -displayfd 3 -screen 0 1366x768x24 -nolisten tcp 3>"$work/display" >/dev/null 2>&1 &
xpid=$!
for _ in $(seq 1 50); do [ -s "$work/display" ] && break; sleep 0.1; done
[ -s "$work/display" ] || fail "Xvfb did not start"
export DISPLAY=":$(cat "$work/display")"
tw=$SECONDS
timeout -k 10 180 wineboot -i >"$work/wineboot.log" 2>&1 || fail "wineboot -i failed or hung: $(tail -5 "$work/wineboot.log")"
timeout -k 10 120 wineserver -w || true
sys32=$WINEPREFIX/drive_c/windows/system32
[ -d "$sys32" ] || fail "wineboot made no $sys32"
# Go 1.24 and later take random numbers from ProcessPrng in
# bcryptprimitives.dll, which wine 8 lacks: a stand-in on RtlGenRandom
# (advapi32's SystemFunction036), in chunks of at most 4 GiB.
cat >"$work/shim.c" <<'C'
#include <windows.h>
#define SystemFunction036 NTAPI SystemFunction036
#include <ntsecapi.h>
#undef SystemFunction036
__declspec(dllexport) BOOL WINAPI ProcessPrng(PBYTE p, SIZE_T n) {
  while (n > 0) {
    ULONG chunk = n > 0x7fffffff ? 0x7fffffff : (ULONG)n;
    if (!RtlGenRandom(p, chunk)) return FALSE;
    p += chunk; n -= chunk;
  }
  return TRUE;
}
C
x86_64-w64-mingw32-gcc -shared -O2 -o "$sys32/bcryptprimitives.dll" "$work/shim.c" -ladvapi32 ||
  fail "could not compile the bcryptprimitives.dll stand-in with mingw"
export WINEDLLOVERRIDES="$WINEDLLOVERRIDES;bcryptprimitives=n"
step "wine: prefix ready in $((SECONDS - tw)) s"

# wrun runs furlong.exe under wine from the current folder, with a time
# limit, no standard input, its output in $work/out and $work/err.
wrun() {
  local rc=0
  timeout -k 10 "${WINE_TIMEOUT:-180}" wine "$exe" "$@" </dev/null >"$work/out" 2>"$work/err" || rc=$?
  if [ $rc -eq 124 ] || [ $rc -eq 137 ]; then fail "wine furlong.exe $* hung (stopped after ${WINE_TIMEOUT:-180} s)"; fi
  return $rc
}
tw=$SECONDS
wrun --help || fail "wine furlong.exe --help exited $?: $(head -c 2000 "$work/err")"
tr -d '\r' <"$work/out" >"$work/help.win"; tr -d '\r' <"$work/err" >>"$work/help.win"
grep -q analyze "$work/help.win" || fail "furlong.exe --help under wine lists no analyze command: $(head -c 2000 "$work/help.win")"
wrun --version || fail "wine furlong.exe --version exited $?"
wver=$(tr -d '\r' <"$work/out"; tr -d '\r' <"$work/err")
[ "$wver" = "$lver" ] || fail "furlong.exe says '$wver', the Linux program '$lver'"
step "wine: --help and --version ($wver) work"

# The same numbers: an open dataset (Immer et al. 1934 barley, see
# stats/refdata/README.md) and the demo trial, both programs
# run in the same folder on the same relative file names.
data=$work/data; mkdir -p "$data"
cp stats/refdata/barley-1931-rcbd.csv "$data/barley.csv"
(cd "$data" && "$lin" new --demo -o demo.furlong >/dev/null 2>&1) || fail "the Linux program could not write the demo trial"
compare() { # label, then the arguments
  local label=$1; shift
  (cd "$data" && "$lin" "$@" >"$work/linux.json" 2>"$work/linux.err") || fail "Linux: furlong $* failed: $(cat "$work/linux.err")"
  (cd "$data" && wrun "$@") || fail "wine: furlong.exe $* exited $?: $(head -c 2000 "$work/err")"
  tr -d '\r' <"$work/out" >"$work/win.json"
  if ! cmp -s "$work/linux.json" "$work/win.json"; then
    diff "$work/linux.json" "$work/win.json" | head -20 >&2
    fail "$label: furlong.exe under wine and the Linux program print different JSON"
  fi
  local n; n=$(grep -oE -- '-?[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?' "$work/linux.json" | wc -l)
  [ "$n" -gt 100 ] || fail "$label: only $n numbers in the JSON"
  step "wine: $label: the same JSON as Linux, byte for byte ($n numbers, $(wc -c <"$work/linux.json") bytes)"
}
compare "barley RCBD (open dataset)" analyze barley.csv --treatment variety --block site --format json
compare "demo trial" analyze demo.furlong --format json

# The report workbook, written into the folder with spaces and accents.
cp "$data/demo.furlong" "$W/demo.furlong"
(cd "$W" && wrun report demo.furlong -o "Season report.xlsx") || fail "wine: furlong.exe report exited $?: $(head -c 2000 "$work/err")"
[ -s "$W/Season report.xlsx" ] || fail "furlong.exe report wrote no workbook"
(cd "$data" && "$lin" report demo.furlong -o linux.xlsx >/dev/null 2>&1) || fail "Linux: furlong report failed"
"$dt" cells "$W/Season report.xlsx" >"$work/cells.win" || fail "the workbook furlong.exe wrote does not open"
"$dt" cells "$data/linux.xlsx" >"$work/cells.linux" || fail "the Linux program's workbook does not open"
if ! cmp -s "$work/cells.linux" "$work/cells.win"; then
  diff "$work/cells.linux" "$work/cells.win" | head -20 >&2
  fail "the workbooks of furlong.exe and of the Linux program hold different cells"
fi
step "wine: the report workbook opens: $(grep -c '^# sheet' "$work/cells.win") sheets, $(grep -vc '^#' "$work/cells.win") cells, the same as Linux's"
step "wine: commands checked in $((SECONDS - tw)) s"

# ---- The window under wine
tw=$SECONDS
(cd "$data" && exec timeout -k 10 120 wine "$exe" --demo </dev/null >"$work/window.log" 2>&1) &
wpid=$!
WID=""
for _ in $(seq 1 300); do
  WID=$(xdotool search --onlyvisible --name '^Furlong' 2>/dev/null | head -1) || true
  [ -n "$WID" ] && break
  kill -0 "$wpid" 2>/dev/null || break
  sleep 0.2
done
[ -n "$WID" ] || fail "furlong.exe --demo under wine showed no window within 60 s: $(tail -c 2000 "$work/window.log")"
sleep 5
import -window root dist/wine-window.png || fail "could not take a screenshot"
"$dt" shot dist/wine-window.png || fail "the window under wine drew nothing"
kill "$wpid" 2>/dev/null; wait "$wpid" 2>/dev/null || true; wpid=""
step "wine: the window came up in $((SECONDS - tw)) s (dist/wine-window.png)"

step "both packages passed in $((SECONDS - t0)) s"
