#!/usr/bin/env bash
# Memory and speed of a long run: renders a synthetic sequence of N frames
# of SIZE px (default 1000x1000; 5472x3648 for a 20 MP camera) under a
# uniform strain, runs the whole job on it with `spallscope run` (or,
# with STAGE=track, the tracking stage alone with `spallscope track`),
# and prints the peak resident memory and the frame rate of tracking.
# Usage: [SIZE=WxH] [SUBSET=21] [BIN=path] [STAGE=run|track] scripts/bench-memory.sh [N] [STEP]
# BIN runs another build (an older one, say) on the same frames.
set -euo pipefail
cd "$(dirname "$0")/.."
n=${1:-300}
step=${2:-5}
size=${SIZE:-1000x1000}
subset=${SUBSET:-21}
case "$size" in
  *[!0-9x]*|x*|*x|*x*x*|"") echo "SIZE=$size: want WIDTHxHEIGHT in px" >&2; exit 2 ;;
  *x*) ;;
  *) echo "SIZE=$size: want WIDTHxHEIGHT in px" >&2; exit 2 ;;
esac
case "$n" in
  *[!0-9]*|"") echo "N=$n: want a number of frames" >&2; exit 2 ;;
esac
case "$step" in
  *[!0-9]*|"") echo "STEP=$step: want a grid step in px" >&2; exit 2 ;;
esac
case "$subset" in
  *[!0-9]*|"") echo "SUBSET=$subset: want a subset size in px" >&2; exit 2 ;;
esac
stage=${STAGE:-run}
case "$stage" in
  run|track) ;;
  *) echo "STAGE=$stage: want run or track" >&2; exit 2 ;;
esac
# The frames are rendered once per size and count and kept for the next run.
work=${WORK:-out/bench-memory-$size-$n}
mkdir -p "$work"
go build -o bin/spallscope ./cmd/spallscope
bin=${BIN:-./bin/spallscope}
if [ ! -f "$work/synth/truth.json" ]; then
  ./bin/spallscope synth --field strain --exx 0.002 --eyy -0.001 --size "$size" \
    --frames "$n" --oversample 1 --noise 1 --out "$work/synth" >/dev/null
fi
cat > "$work/test.yaml" <<YAML
name: memory
images: synth/frames
times: {fps: 1}
correlation: {subset: $subset, step: $step}
strain: {window: 7}
YAML
rm -rf "$work/run"
if [ "$stage" = track ]; then
  /usr/bin/time -v "$bin" track --images "$work/synth/frames" --subset "$subset" --step "$step" \
    --out "$work/run" 2> "$work/time.txt" >/dev/null
else
  /usr/bin/time -v "$bin" run "$work/test.yaml" --out "$work/run" 2> "$work/time.txt" >/dev/null
fi
grep -E "Maximum resident set size|Elapsed" "$work/time.txt"
python3 - "$work/run/run.json" <<'PY'
import json, sys
r = json.load(open(sys.argv[1]))
t = r["track"]
print(f"frames {len(t['frames'])}, grid {t['grid']['cols']}x{t['grid']['rows']}, tracking {t['seconds']:.1f} s = {len(t['frames'])/t['seconds']:.2f} frames/s")
PY
