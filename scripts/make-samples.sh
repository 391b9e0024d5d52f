#!/usr/bin/env bash
# Regenerates sample-images/ with the project's own generator; the manifest lists how each was made.
set -euo pipefail
cd "$(dirname "$0")/.."
out=sample-images
mkdir -p "$out"
t=./bin/tessellab.mjs
declare -a entries=()
make() { # name description umPerPx args...
  local name=$1 desc=$2 um=$3; shift 3
  local args=("$@")
  if [ "$um" != "null" ]; then args+=(--um-per-px "$um"); fi
  "$t" synth "${args[@]}" --out "$out/$name.png"
  entries+=("{\"file\":\"$name.png\",\"truth\":\"$name.truth.json\",\"description\":\"$desc\",\"umPerPx\":$um,\"command\":\"tessellab synth ${args[*]} --out $name.png\"}")
}
make foam-random "Foam of random cells, a window on a larger foam: Voronoi tiling of uniformly random seeds, dark films 3 px wide" null \
  --pattern walls --cells 600 --size 900x700 --order random --seed 11 --window
make tissue-regular "Tissue-like sheet, more regular than random, a window on a larger sheet: hard-core seeds, dark membranes 3 px wide" null \
  --pattern walls --cells 500 --size 900x700 --order regular --seed 12 --window
make grains-calibrated "Grains with a known pixel size (0.5 µm/px, stored in the PNG pHYs chunk): random seeds, dark boundaries" 0.5 \
  --pattern walls --cells 700 --size 1000x800 --order random --seed 13 --wall-px 2.5
make bodies-touching "Touching bodies (nuclei-like discs) on a dark background, hard-core centres" null \
  --pattern bodies --cells 150 --size 800x600 --order regular --seed 14
{
  echo '{'
  echo '  "generator": "tessellab synth (src/core/synth); regenerate with scripts/make-samples.sh",'
  echo '  "demo": "foam-random.png",'
  echo '  "images": ['
  for i in "${!entries[@]}"; do
    sep=','; [ "$i" -eq $((${#entries[@]} - 1)) ] && sep=''
    echo "    ${entries[$i]}$sep"
  done
  echo '  ]'
  echo '}'
} > "$out/manifest.json"
echo "wrote $out/manifest.json"
