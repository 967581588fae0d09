#!/bin/sh
# Installs Furlong from this folder (the unpacked furlong-VERSION-linux-amd64).
#   ./install.sh                 for yourself: ~/.local/bin and your application menu
#   sudo ./install.sh --system   for everyone: /usr/local
#   ./install.sh --uninstall     (or sudo ./install.sh --system --uninstall) takes it out
#   PREFIX=/opt/furlong ./install.sh   somewhere else
set -eu
here=$(cd "$(dirname "$0")" && pwd)
mode=install
prefix=${PREFIX:-}
for a in "$@"; do
  case $a in
    --system) prefix=${prefix:-/usr/local} ;;
    --uninstall) mode=uninstall ;;
    -h|--help) sed -n '2,6p' "$0"; exit 0 ;;
    *) echo "install.sh: unknown option $a (try --help)" >&2; exit 2 ;;
  esac
done
if [ -z "$prefix" ]; then
  [ -n "${HOME:-}" ] || { echo "install.sh: HOME is not set; use PREFIX=... or --system" >&2; exit 2; }
  prefix=$HOME/.local
fi
bin=$prefix/bin/furlong
desktop=$prefix/share/applications/furlong.desktop
icon=$prefix/share/icons/hicolor/512x512/apps/furlong.png

refresh() { # menus and icon caches pick the change up; missing tools are fine
  command -v update-desktop-database >/dev/null 2>&1 && update-desktop-database -q "$prefix/share/applications" 2>/dev/null || true
  command -v gtk-update-icon-cache >/dev/null 2>&1 && gtk-update-icon-cache -q -t "$prefix/share/icons/hicolor" 2>/dev/null || true
}

if [ "$mode" = uninstall ]; then
  rm -f "$bin" "$desktop" "$icon"
  refresh
  echo "Furlong removed from $prefix. Your trial files and settings were left alone."
  exit 0
fi

mkdir -p "$prefix/bin" "$prefix/share/applications" "$prefix/share/icons/hicolor/512x512/apps"
cp "$here/usr/local/bin/furlong" "$bin.new" && chmod 755 "$bin.new" && mv -f "$bin.new" "$bin"
cp "$here/usr/local/share/icons/hicolor/512x512/apps/furlong.png" "$icon"
# The menu entry names the program by its full path: ~/.local/bin is not
# on every desktop session's PATH.
sed "s|^Exec=furlong|Exec=$bin|; s|^TryExec=furlong|TryExec=$bin|" \
  "$here/usr/local/share/applications/furlong.desktop" >"$desktop"
chmod 644 "$desktop" "$icon"
refresh
echo "Furlong installed: $bin (and in your application menu as Furlong)."
case ":$PATH:" in
  *":$prefix/bin:"*) ;;
  *) echo "To type 'furlong' in a terminal, add $prefix/bin to your PATH." ;;
esac
