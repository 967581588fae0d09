#!/usr/bin/env bash
# Takes one screenshot per step of the window on the demo trial, one of
# the start screen and two of the series view on the demo series, at
# 1366×768 (a common field-office laptop):
#   .ci/screenshots.sh BINARY OUTDIR
# Uses ../shared/tools/screenshot.sh when present (it installs Xvfb, xdotool
# and ImageMagick with apt-get when missing).
set -euo pipefail
bin=$(realpath "$1"); out=$2
mkdir -p "$out"; out=$(realpath "$out")
tool=$(dirname "$0")/../../shared/tools/screenshot.sh
[ -x "$tool" ] || tool=$(dirname "$0")/../../../shared/tools/screenshot.sh
if [ ! -f "$tool" ]; then
  echo "screenshots: needs shared/tools/screenshot.sh beside the repository" >&2
  exit 1
fi
actions=$(mktemp)
# A private settings folder: no recent files, no recovery copies left by an
# earlier run, the first-run window size.
export XDG_CONFIG_HOME=$(mktemp -d)
trap 'rm -rf "$actions" "$XDG_CONFIG_HOME"' EXIT
# The step navigator's cards sit at x=100, one every 105 pixels from y=50.
cat >"$actions" <<ACT
for s in 1:setup 2:field 3:record 4:compare 5:report; do
  n=\${s%%:*}; name=\${s#*:}
  xdotool mousemove --window \$WID 100 \$((50 + (n - 1) * 105)) click 1
  sleep 2
  shot \$name.png
done
ACT
bash "$tool" -w 3 -a "$actions" "$out/last.png" "$bin" --demo >/dev/null
rm -f "$out/last.png"
bash "$tool" -w 2 "$out/start.png" "$bin" >/dev/null
# The series view's tabs sit in a row at y=158: Entries × sites, Charts.
cat >"$actions" <<ACT
xdotool mousemove --window \$WID 116 158 click 1; sleep 2; shot series.png
xdotool mousemove --window \$WID 536 158 click 1; sleep 2; shot series-charts.png
ACT
bash "$tool" -w 3 -a "$actions" "$out/last.png" "$bin" --demo-series >/dev/null
rm -f "$out/last.png"
ls "$out"
