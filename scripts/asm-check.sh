#!/usr/bin/env bash
# Checks that package subset's generated assembly (vector_amd64.s) and its
# Go stubs (vector_stubs_amd64.go) are what the avo generator in
# subset/_asm writes today, so that an edit to the generator cannot land
# without the code it generates (and the reverse). The files' first line,
# which names the output paths the generator was run with, is left out.
set -euo pipefail
cd "$(dirname "$0")/../subset/_asm"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
go run . -out "$tmp/vector_amd64.s" -stubs "$tmp/vector_stubs_amd64.go" -pkg subset
for f in vector_amd64.s vector_stubs_amd64.go; do
  if ! cmp -s <(tail -n +2 "$tmp/$f") <(tail -n +2 "../$f"); then
    echo "asm-check: subset/$f is not what subset/_asm generates; run 'go generate ./subset/' and commit both files" >&2
    exit 1
  fi
done
echo "asm-check: subset/vector_amd64.s and vector_stubs_amd64.go are what subset/_asm generates"
