#!/usr/bin/env bash
# Memory and speed of a long run: renders a synthetic sequence of N frames
# of 1000×1000 px (a slow rigid drift with uniform strain), runs the whole
# job on it with `spallscope run`, and prints the peak resident memory and
# the frame rate of tracking. Usage: scripts/bench-memory.sh [N] [STEP]
set -euo pipefail
cd "$(dirname "$0")/.."
n=${1:-300}
step=${2:-5}
work=${WORK:-out/bench-memory}
mkdir -p "$work"
go build -o bin/spallscope ./cmd/spallscope
if [ ! -f "$work/synth/truth.json" ]; then
  ./bin/spallscope synth --field strain --exx 0.002 --eyy -0.001 --size 1000x1000 \
    --frames "$n" --oversample 1 --noise 1 --out "$work/synth" >/dev/null
fi
cat > "$work/test.yaml" <<YAML
name: memory
images: synth/frames
times: {fps: 1}
correlation: {subset: 21, step: $step}
strain: {window: 7}
YAML
rm -rf "$work/run"
/usr/bin/time -v ./bin/spallscope run "$work/test.yaml" --out "$work/run" 2> "$work/time.txt" >/dev/null
grep -E "Maximum resident set size|Elapsed" "$work/time.txt"
python3 - "$work/run/run.json" <<'PY'
import json, sys
r = json.load(open(sys.argv[1]))
t = r["track"]
print(f"frames {len(t['frames'])}, grid {t['grid']['cols']}x{t['grid']['rows']}, tracking {t['seconds']:.1f} s = {len(t['frames'])/t['seconds']:.2f} frames/s")
PY
