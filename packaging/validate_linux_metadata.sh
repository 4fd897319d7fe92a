#!/usr/bin/env bash
# Validate the freedesktop desktop entry and the AppStream metainfo in packaging/linux/.
#
# Uses Debian's desktop-file-utils (desktop-file-validate) and appstream (appstreamcli).
# When a validator is missing it tries to install it with apt-get (as root, or through sudo
# without a password); if that is not possible it says so and exits with status 2, so a
# CI job can tell "could not check" from "checked and found wrong" (status 1).
#
# Usage: packaging/validate_linux_metadata.sh
set -u

here=$(cd "$(dirname "$0")" && pwd)
icons="$here/../resources/icons"
app_id=io.github.ditchwright.Ditchwright
desktop="$here/linux/io.github.ditchwright.Ditchwright.desktop"
metainfo="$here/linux/io.github.ditchwright.Ditchwright.metainfo.xml"

install_pkg() {  # install_pkg COMMAND DEBIAN-PACKAGE
    command -v "$1" >/dev/null 2>&1 && return 0
    if ! command -v apt-get >/dev/null 2>&1; then
        echo "missing $1 and no apt-get here: install the package '$2'" >&2
        return 1
    fi
    local run=()
    if [ "$(id -u)" -ne 0 ]; then
        if command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then
            run=(sudo -n)
        else
            echo "missing $1: install the Debian package '$2' (needs root)" >&2
            return 1
        fi
    fi
    echo "installing $2 for $1 ..."
    export DEBIAN_FRONTEND=noninteractive
    "${run[@]}" apt-get install -y --no-install-recommends "$2" >/dev/null 2>&1 \
        || { "${run[@]}" apt-get update >/dev/null 2>&1 \
             && "${run[@]}" apt-get install -y --no-install-recommends "$2" >/dev/null 2>&1; }
    command -v "$1" >/dev/null 2>&1 || { echo "could not install $2" >&2; return 1; }
}

install_pkg desktop-file-validate desktop-file-utils || exit 2
install_pkg appstreamcli appstream || exit 2

status=0
echo "== desktop-file-validate $(basename "$desktop")"
# desktop-file-validate exits 0 on hints; it prints errors and warnings and exits 1 on errors.
out=$(desktop-file-validate "$desktop" 2>&1) || status=1
[ -n "$out" ] && echo "$out"
# Treat warnings as failures too: a warning here means a key a desktop will ignore.
if printf '%s\n' "$out" | grep -q ": warning: "; then status=1; fi

echo "== appstreamcli validate --no-net $(basename "$metainfo")"
appstreamcli validate --no-net "$metainfo" || status=1

# The same files staged as a system install would place them (see README.md, "Desktop entry, metadata and icon on Linux"), so
# the launchable and the icon are checked against each other, not each file on its own.
echo "== appstreamcli validate-tree --no-net (staged install tree)"
tree=$(mktemp -d)
trap 'rm -rf "$tree"' EXIT
install -Dm644 "$desktop" "$tree/usr/share/applications/$app_id.desktop"
install -Dm644 "$metainfo" "$tree/usr/share/metainfo/$app_id.metainfo.xml"
install -Dm644 "$icons/ditchwright.svg" "$tree/usr/share/icons/hicolor/scalable/apps/$app_id.svg"
for png in "$icons"/ditchwright-[0-9]*.png; do
    size=${png##*-}; size=${size%.png}
    install -Dm644 "$png" "$tree/usr/share/icons/hicolor/${size}x${size}/apps/$app_id.png" || status=1
done
appstreamcli validate-tree --no-net "$tree" || status=1

if [ "$status" -eq 0 ]; then
    echo "Linux metadata valid."
else
    echo "Linux metadata INVALID (see above)." >&2
fi
exit "$status"
