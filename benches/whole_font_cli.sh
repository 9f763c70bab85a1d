#!/usr/bin/env bash
# Whole-font conversions through the command line, as a shop runs them: every character DejaVu
# Sans maps (set with fontTools, the tests' font reader) at 1 em = 100 mm and 0.01 mm, to lines,
# cubics and arcs, each writing SVG, G-code and the report. Prints wall time and peak resident
# memory (GNU time, `/usr/bin/time -v`) per target.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
python3 - "$work/all.txt" <<'PY'
import sys
from fontTools.ttLib import TTFont
cmap = TTFont("tests/fonts/DejaVuSans.ttf").getBestCmap()
chars = [chr(c) for c in sorted(cmap) if c > 32 and not 0xD800 <= c < 0xE000 and chr(c).isprintable()]
text = "".join(chars)
open(sys.argv[1], "w", encoding="utf-8").write("\n".join(text[i:i + 100] for i in range(0, len(text), 100)))
print(f"{len(chars)} characters")
PY
for to in lines cubic arcs; do
    status=0
    /usr/bin/time -v -o "$work/time" target/release/ratline convert \
        --font tests/fonts/DejaVuSans.ttf --text-file "$work/all.txt" --em 100mm \
        --tolerance 0.01mm --to "$to" -q \
        -o "$work/$to.svg" --gcode "$work/$to.nc" --report "$work/$to.json" || status=$?
    # (Exit status 2: written, with contours skipped and listed, here the glyphs without outline.)
    [ "$status" -le 2 ] || { cat "$work/time"; exit "$status"; }
    wall=$(sed -n 's/.*Elapsed (wall clock) time (h:mm:ss or m:ss): //p' "$work/time")
    rss=$(sed -n 's/.*Maximum resident set size (kbytes): //p' "$work/time")
    summary=$(python3 -c "import json,sys; r=json.load(open(sys.argv[1])); print(r['contours_out'], 'contours,', sum(r['segments_out'].values()), 'segments, max', round(r['max_deviation_mm'], 6), 'mm, within tolerance:', r['within_tolerance'])" "$work/$to.json")
    echo "$to: $summary; wall $wall, peak resident $rss kB"
done
