#!/usr/bin/env bash
# `make dist`: the two packages a field office installs without building
# from source, under dist/:
#   furlong-VERSION-linux-amd64.tar.xz    program, menu entry (.desktop), icon,
#                                          install.sh, INSTALL.txt, cautions, licence
#   furlong-VERSION-windows-amd64.zip      furlong.exe (icon, version resource, manifest;
#                                          a console program that lets go of its console
#                                          when it opens the window), README.txt with the
#                                          cautions and the licence, LICENSE.txt
# VERSION and the build number come from FyneApp.toml. The Windows program is
# cross-built with mingw-w64 (cgo for the window); its resources are compiled
# with mingw's windres into a .syso that the Go linker takes in. Installs
# mingw-w64 and xz-utils with apt-get when they are missing.
#   DIST_ONLY=linux|windows .ci/dist.sh    builds one of the two
set -euo pipefail
cd "$(dirname "$0")/.."
export LANG=${LANG:-C.UTF-8}

toml() { sed -n "s/^ *$1 *= *\"\{0,1\}\([^\"]*\)\"\{0,1\} *$/\1/p" FyneApp.toml | head -1; }
VERSION=$(toml Version); BUILD=$(toml Build); APPNAME=$(toml Name); APPID=$(toml ID)
GENERIC=$(toml GenericName); COMMENT=$(toml Comment)
if ! [[ $VERSION =~ ^[0-9]+\.[0-9]+\.[0-9]+$ ]] || ! [[ $BUILD =~ ^[0-9]+$ ]]; then
  echo "dist: FyneApp.toml must give Version = \"x.y.z\" and Build = N (found '$VERSION', '$BUILD')" >&2
  exit 1
fi
only=${DIST_ONLY:-}

need=()
command -v xz >/dev/null 2>&1 || need+=(xz-utils)
if [ "$only" != linux ]; then
  command -v x86_64-w64-mingw32-gcc >/dev/null 2>&1 || need+=(gcc-mingw-w64-x86-64)
  command -v x86_64-w64-mingw32-windres >/dev/null 2>&1 || need+=(binutils-mingw-w64-x86-64)
fi
if [ ${#need[@]} -gt 0 ]; then
  sudo=""; [ "$(id -u)" -ne 0 ] && sudo="sudo"
  if ! command -v apt-get >/dev/null 2>&1; then
    echo "dist: install ${need[*]} (or your system's equivalents: xz, the mingw-w64 cross compiler and binutils)" >&2
    exit 1
  fi
  echo "dist: installing ${need[*]}"
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq "${need[@]}" >/dev/null
fi

# Every file in both packages carries the time of the last commit, so that
# the same commit gives the same packages.
export SOURCE_DATE_EPOCH=${SOURCE_DATE_EPOCH:-$(git log -1 --format=%ct 2>/dev/null || date +%s)}
stage=$(mktemp -d)
syso=cmd/furlong/rsrc_windows_amd64.syso
trap 'rm -rf "$stage" "$syso"' EXIT
mkdir -p dist
go build -o "$stage/disttool" ./cmd/disttool
ldflags="-s -w -X main.version=$VERSION"
texts=cmd/furlong/dist
t0=$SECONDS

# CRLF line endings for Notepad on older Windows.
crlf() { sed 's/\r*$/\r/' "$@"; }

if [ "$only" != windows ]; then
  name=furlong-$VERSION-linux-amd64
  L=$stage/$name
  mkdir -p "$L/usr/local/bin" "$L/usr/local/share/applications" "$L/usr/local/share/icons/hicolor/512x512/apps"
  echo "dist: building the Linux program"
  CGO_ENABLED=1 go build -tags migrated_fynedo -trimpath -ldflags "$ldflags" -o "$L/usr/local/bin/furlong" ./cmd/furlong
  cp Icon.png "$L/usr/local/share/icons/hicolor/512x512/apps/furlong.png"
  # Desktop Entry Specification 1.4 (freedesktop.org; the newest version
  # that Debian 12's desktop-file-validate knows): the keys and the
  # semicolon-terminated lists.
  cat >"$L/usr/local/share/applications/furlong.desktop" <<DESKTOP
[Desktop Entry]
Type=Application
Version=1.4
Name=$APPNAME
GenericName=$GENERIC
Comment=$COMMENT
Exec=furlong %f
TryExec=furlong
Icon=furlong
Terminal=false
Categories=$(sed -n 's/^ *Categories *= *\[\(.*\)\]/\1/p' FyneApp.toml | tr -d '" ' | tr ',' ';');
Keywords=$(sed -n 's/^ *Keywords *= *\[\(.*\)\]/\1/p' FyneApp.toml | sed 's/" *, *"/;/g; s/"//g');
StartupWMClass=$APPNAME
DESKTOP
  cp $texts/install.sh "$L/install.sh"; chmod 755 "$L/install.sh"
  sed "s/VERSION/$VERSION/g" $texts/INSTALL-linux.txt >"$L/INSTALL.txt"
  cp $texts/cautions-and-licence.txt "$L/CAUTIONS-AND-LICENCE.txt"
  cp LICENSE "$L/LICENSE.txt"
  tar --sort=name --mtime="@$SOURCE_DATE_EPOCH" --owner=0 --group=0 --numeric-owner \
    -C "$stage" -cf - "$name" | xz -T1 -6 >"dist/$name.tar.xz"
  echo "dist: dist/$name.tar.xz ($(du -k "dist/$name.tar.xz" | cut -f1) KiB, $((SECONDS - t0)) s)"
fi

if [ "$only" != linux ]; then
  t1=$SECONDS
  name=furlong-$VERSION-windows-amd64
  W=$stage/$name
  mkdir -p "$W"
  "$stage/disttool" ico Icon.png "$stage/furlong.ico"
  IFS=. read -r v1 v2 v3 <<<"$VERSION"
  year=$(date -u -d "@$SOURCE_DATE_EPOCH" +%Y 2>/dev/null || date -u +%Y)
  # The application manifest (Microsoft, "Application manifests"): run as
  # the user who started it, Windows 10/11 behaviour (supportedOS id from
  # memory), sharp text on high-DPI screens, long paths where Windows allows them.
  cat >"$stage/furlong.manifest" <<MANIFEST
<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<assembly xmlns="urn:schemas-microsoft-com:asm.v1" manifestVersion="1.0" xmlns:asmv3="urn:schemas-microsoft-com:asm.v3">
  <assemblyIdentity version="$v1.$v2.$v3.$BUILD" processorArchitecture="amd64" name="$APPID" type="win32"/>
  <description>$APPNAME</description>
  <trustInfo xmlns="urn:schemas-microsoft-com:asm.v3">
    <security><requestedPrivileges><requestedExecutionLevel level="asInvoker" uiAccess="false"/></requestedPrivileges></security>
  </trustInfo>
  <compatibility xmlns="urn:schemas-microsoft-com:compatibility.v1">
    <application><supportedOS Id="{8e0f7a12-bfb3-4fe8-b9a5-48fd50a15a9a}"/></application>
  </compatibility>
  <asmv3:application>
    <asmv3:windowsSettings>
      <dpiAware xmlns="http://schemas.microsoft.com/SMI/2005/WindowsSettings">true/pm</dpiAware>
      <dpiAwareness xmlns="http://schemas.microsoft.com/SMI/2016/WindowsSettings">permonitorv2,permonitor</dpiAwareness>
      <longPathAware xmlns="http://schemas.microsoft.com/SMI/2016/WindowsSettings">true</longPathAware>
    </asmv3:windowsSettings>
  </asmv3:application>
</assembly>
MANIFEST
  # The version resource (Microsoft, "VERSIONINFO resource"): FILEOS
  # VOS_NT_WINDOWS32 (0x40004), FILETYPE VFT_APP (1), US English in UTF-16
  # (040904B0). GLFW_ICON is the name GLFW looks for as its windows' icon;
  # Explorer shows the first icon group, which is this one.
  cat >"$stage/furlong.rc" <<RC
GLFW_ICON ICON "furlong.ico"
1 24 "furlong.manifest"
1 VERSIONINFO
FILEVERSION $v1,$v2,$v3,$BUILD
PRODUCTVERSION $v1,$v2,$v3,$BUILD
FILEFLAGSMASK 0x3f
FILEFLAGS 0x0
FILEOS 0x40004
FILETYPE 0x1
FILESUBTYPE 0x0
BEGIN
  BLOCK "StringFileInfo"
  BEGIN
    BLOCK "040904B0"
    BEGIN
      VALUE "CompanyName", "The $APPNAME authors"
      VALUE "FileDescription", "$APPNAME: $GENERIC"
      VALUE "FileVersion", "$VERSION"
      VALUE "InternalName", "furlong"
      VALUE "LegalCopyright", "Copyright (c) $year the $APPNAME authors, MIT licence"
      VALUE "OriginalFilename", "furlong.exe"
      VALUE "ProductName", "$APPNAME"
      VALUE "ProductVersion", "$VERSION"
    END
  END
  BLOCK "VarFileInfo"
  BEGIN
    VALUE "Translation", 0x409, 1200
  END
END
RC
  (cd "$stage" && x86_64-w64-mingw32-windres -i furlong.rc -O coff -o rsrc.syso)
  cp "$stage/rsrc.syso" "$syso"
  echo "dist: cross-building furlong.exe with mingw-w64 (a cold build takes several minutes)"
  CGO_ENABLED=1 GOOS=windows GOARCH=amd64 CC=x86_64-w64-mingw32-gcc \
    go build -tags migrated_fynedo -trimpath -ldflags "$ldflags" -o "$W/furlong.exe" ./cmd/furlong
  rm -f "$syso"
  "$stage/disttool" exe "$W/furlong.exe" "$VERSION" "$BUILD"
  { sed "s/VERSION/$VERSION/g" $texts/README-windows.txt; echo; cat $texts/cautions-and-licence.txt; } | crlf >"$W/README.txt"
  crlf LICENSE >"$W/LICENSE.txt"
  "$stage/disttool" zip "dist/$name.zip" "$W"
  echo "dist: dist/$name.zip ($(du -k "dist/$name.zip" | cut -f1) KiB, $((SECONDS - t1)) s)"
fi
