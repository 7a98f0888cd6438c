#!/usr/bin/env bash
# Renders the app icons in public/ from the SVG artwork here, with Debian's rsvg-convert
# (package librsvg2-bin). Run from the repository root: design/icons/render.sh
set -euo pipefail
cd "$(dirname "$0")"
out=../../public
command -v rsvg-convert >/dev/null || { echo "needs rsvg-convert: apt-get install librsvg2-bin" >&2; exit 1; }
rsvg-convert -w 192 -h 192 app-icon.svg -o "$out/icons/icon-192.png"
rsvg-convert -w 512 -h 512 app-icon.svg -o "$out/icons/icon-512.png"
rsvg-convert -w 512 -h 512 maskable.svg -o "$out/icons/maskable-512.png"
rsvg-convert -w 180 -h 180 maskable.svg -o "$out/icons/apple-touch-icon.png"
cp app-icon.svg "$out/icon.svg"
