#!/usr/bin/env bash
# Memory and speed of a long run: renders a synthetic sequence of N frames
# of SIZE px (default 1000x1000; 5472x3648 for a 20 MP camera) under a
# uniform strain, runs the whole job on it with `spallscope run` (or,
# with STAGE=track, the tracking stage alone with `spallscope track`),
# and prints the peak resident memory and the frame rate of tracking.
# Usage: [SIZE=WxH] [SUBSET=21] [BIN=path] [STAGE=run|track] scripts/bench-memory.sh [N] [STEP]
# BIN runs another build (an older one, say) on the same frames.
# DISTINCT=K renders only K frames and runs the N-frame sequence on them
# played back and forth (0…K−1, K−2…0, 1…): every frame is still read,
# decoded and tracked from its file, so memory over N frames is measured
# without rendering N photos (300 frames of 20 MP take hours to render on
# two cores); the displacement goes up and down the ramp instead of only up.
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
distinct=${DISTINCT:-$n}
case "$distinct" in
  *[!0-9]*|""|0) echo "DISTINCT=$distinct: want a number of frames to render, at least 1" >&2; exit 2 ;;
esac
if [ "$distinct" -gt "$n" ]; then distinct=$n; fi
stage=${STAGE:-run}
case "$stage" in
  run|track) ;;
  *) echo "STAGE=$stage: want run or track" >&2; exit 2 ;;
esac
# The frames are rendered once per size and count and kept for the next run.
work=${WORK:-out/bench-memory-$size-$distinct}
mkdir -p "$work"
go build -o bin/spallscope ./cmd/spallscope
bin=${BIN:-./bin/spallscope}
if [ ! -f "$work/synth/truth.json" ]; then
  ./bin/spallscope synth --field strain --exx 0.002 --eyy -0.001 --size "$size" \
    --frames "$distinct" --oversample 1 --noise 1 --out "$work/synth" >/dev/null
fi
images=synth/frames
if [ "$distinct" -lt "$n" ]; then
  # The back-and-forth sequence, as links to the rendered frames.
  images=seq-$n
  rm -rf "$work/$images"
  mkdir -p "$work/$images"
  src=("$work"/synth/frames/*.png)
  period=$(( distinct > 1 ? 2 * (distinct - 1) : 1 ))
  for ((i = 0; i < n; i++)); do
    k=$(( i % period ))
    if [ "$k" -ge "$distinct" ]; then k=$(( period - k )); fi
    ln -s "../synth/frames/$(basename "${src[$k]}")" "$work/$images/$(printf 'frame_%05d.png' "$i")"
  done
fi
cat > "$work/test.yaml" <<YAML
name: memory
images: $images
times: {fps: 1}
correlation: {subset: $subset, step: $step}
strain: {window: 7}
YAML
rm -rf "$work/run"
if [ "$stage" = track ]; then
  /usr/bin/time -v "$bin" track --images "$work/$images" --subset "$subset" --step "$step" \
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
