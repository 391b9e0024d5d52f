#!/usr/bin/env bash
# Fetches the real-photograph test corpus: sample images of Debian's python3-skimage package, taken out of the
# .deb with dpkg-deb (no Python needed) into test/fixtures/real/cache/ (git-ignored). Each file is checked
# against test/fixtures/real/SHA256SUMS, since the hand-made truth files beside it describe exactly those
# pixels. Does nothing when the cache already holds the right files.
set -euo pipefail
cd "$(dirname "$0")/.."
root=$(pwd)
dest="$root/test/fixtures/real/cache"
sums="$root/test/fixtures/real/SHA256SUMS"

if [ -d "$dest" ] && (cd "$dest" && sha256sum --quiet --strict -c "$sums" >/dev/null 2>&1); then
  exit 0
fi

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
chmod 755 "$tmp"
cd "$tmp"
# apt-get download needs the package lists; read them again only when the first try fails.
if ! apt-get download -qq python3-skimage >/dev/null 2>&1; then
  apt-get update -qq
  apt-get download -qq python3-skimage
fi
deb=$(ls python3-skimage_*.deb)
dpkg-deb -x "$deb" x
data=$(find x -type d -path '*/skimage/data' | head -n 1)
if [ -z "$data" ]; then
  echo "fetch-real-images: $deb has no skimage/data folder; the package layout changed, update this script." >&2
  exit 1
fi
mkdir -p "$dest"
# The images named in SHA256SUMS, the data folder's README.txt, and _fetchers.py, whose docstrings give each
# image's source and licence.
while read -r _ name; do
  cp "$data/$name" "$dest/$name"
done < "$sums"
cp "$data/README.txt" "$dest/README.txt"
cp "$data/_fetchers.py" "$dest/_fetchers.py"
echo "$deb" > "$dest/PACKAGE"
if ! (cd "$dest" && sha256sum --quiet --strict -c "$sums"); then
  echo "fetch-real-images: the images of $deb differ from test/fixtures/real/SHA256SUMS; the truth files describe the old ones." >&2
  exit 1
fi
echo "fetch-real-images: $(wc -l < "$sums") images from $deb in test/fixtures/real/cache/"
