#!/usr/bin/env bash
# The Record grid in a real window: the program under a private virtual X
# display (Xvfb), driven with xdotool as a user would (mouse clicks on grid
# cells, typed digits, Enter, Ctrl+S), then the saved trial file is read
# back by a Go test (ui.TestRealWindowFile) that checks every typed value.
#   .ci/realwindow.sh                      builds the program with cgo first
#   FURLONG_BIN=path .ci/realwindow.sh     uses a built program
# Installs xvfb and xdotool with apt-get when they are missing; when they
# cannot be installed it says so and exits 0 (the headless tests in
# ui/record_keys_test.go cover the same sequences).
set -euo pipefail
cd "$(dirname "$0")/.."
export LANG=${LANG:-C.UTF-8}
[ "$LANG" = "C" ] && export LANG=C.UTF-8

need=()
command -v Xvfb >/dev/null 2>&1 || need+=(xvfb)
command -v xdotool >/dev/null 2>&1 || need+=(xdotool)
if [ ${#need[@]} -gt 0 ]; then
  sudo=""; [ "$(id -u)" -ne 0 ] && sudo="sudo"
  if ! command -v apt-get >/dev/null 2>&1 ||
     ! ($sudo apt-get update -qq && DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq "${need[@]}") >/dev/null 2>&1; then
    echo "realwindow: could not install ${need[*]}; real-window test skipped"
    exit 0
  fi
fi

work=$(mktemp -d)
xpid=""; apid=""
cleanup() {
  if [ -n "$apid" ]; then kill "$apid" 2>/dev/null || true; wait "$apid" 2>/dev/null || true; fi
  if [ -n "$xpid" ]; then kill "$xpid" 2>/dev/null || true; wait "$xpid" 2>/dev/null || true; fi
  rm -rf "$work"
}
trap cleanup EXIT

# FURLONG_BIN runs an already built program instead of building one.
if [ -n "${FURLONG_BIN:-}" ]; then cp "$FURLONG_BIN" "$work/furlong"; else
  go build -tags migrated_fynedo -o "$work/furlong" ./cmd/furlong
fi
# Four treatments in three blocks, two traits without a valid range (so
# that no range warning could hint at a lost key).
"$work/furlong" new -o "$work/rw.furlong" --design rcbd --treatments 4 --reps 3 --seed 7 --traits ht:cm,yld >/dev/null

Xvfb -displayfd 3 -screen 0 1366x768x24 -nolisten tcp 3>"$work/display" >/dev/null 2>&1 &
xpid=$!
for _ in $(seq 1 50); do [ -s "$work/display" ] && break; sleep 0.1; done
export DISPLAY=":$(cat "$work/display")"
# A private settings folder: the first-run window size (1280×720 at 0,0).
XDG_CONFIG_HOME="$work/config" "$work/furlong" "$work/rw.furlong" >"$work/log" 2>&1 &
apid=$!
WID=""
for _ in $(seq 1 150); do
  WID=$(xdotool search --onlyvisible --pid "$apid" 2>/dev/null | head -1) || true
  [ -n "$WID" ] && break
  kill -0 "$apid" 2>/dev/null || break
  sleep 0.2
done
if [ -z "$WID" ]; then
  echo "realwindow: no window appeared"; cat "$work/log"; exit 1
fi
sleep 2
echo "realwindow: window $WID; typing into the Record grid"
at() { xdotool mousemove --window "$WID" "$1" "$2" click 1; sleep 0.4; }
typed() { xdotool type --delay 80 "$1"; sleep 0.3; }
key() { xdotool key "$1"; sleep 0.4; }
# Grid cells in the first-run window: column ht at x=610, yld at x=705;
# plot rows centred from y=152, one every 36.1 pixels (row r at 152+36.1r).
cell() { at "$1" $((152 + 361 * $2 / 10)); }
HT=610; YLD=705
at 100 260                 # the Record step's card
cell $HT 0; typed 55; key Return               # plot row 0: 55, Enter moves to row 1
cell $HT 0; cell $HT 2; typed 78; key Return   # a cell with a value, then an empty one: 78
typed 71; key Return                           # typing right after Enter: row 3
cell $HT 5; typed 83; key Down                 # ↓ stores and moves to row 6
typed 64; key Up; key Up                       # row 6: 64, then up to row 4
typed 9; key Return                            # row 4: 9
cell $HT 0; cell $YLD 1; typed 12.5; key Return  # another column after a value
cell $YLD 3; typed 7; cell $YLD 4; typed 8; key Return  # a click elsewhere keeps the 7
key ctrl+s
sleep 2
kill "$apid" 2>/dev/null; wait "$apid" 2>/dev/null || true; apid=""

FURLONG_REALWINDOW_FILE="$work/rw.furlong" \
FURLONG_REALWINDOW_WANT="ht:0=55,2=78,3=71,5=83,6=64,4=9,1=missing;yld:1=12.5,3=7,4=8,0=missing" \
  CGO_ENABLED=0 go test -count=1 -v -run '^TestRealWindowFile$' ./ui/ >"$work/check" 2>&1 || true
grep -E '^\s+realwindow_test.go|^(---|ok|FAIL)' "$work/check" || true
if ! grep -q '^--- PASS: TestRealWindowFile' "$work/check"; then
  echo "realwindow: typed values were not saved as typed"; echo "--- program output"; cat "$work/log"; exit 1
fi
echo "realwindow: every typed value was saved"
