#!/usr/bin/env bash
# Packs bin/spallscope with the shared libraries it links (as ldd lists
# them, glibc's loader and libc left to the node) into
# bundle/spallscope-bundle.tar.gz, with a wrapper that points the loader at
# them: for cluster nodes without OpenCV installed.
set -euo pipefail
cd "$(dirname "$0")/.."
rm -rf bundle/spallscope
mkdir -p bundle/spallscope/lib
cp bin/spallscope bundle/spallscope/spallscope.bin
ldd bin/spallscope | awk '/=> \// {print $3}' | while read -r lib; do
  case "$(basename "$lib")" in
    libc.so.*|libm.so.*|libpthread.so.*|libdl.so.*|librt.so.*|ld-linux*) ;;  # the node's own
    *) cp -L "$lib" bundle/spallscope/lib/ ;;
  esac
done
cat > bundle/spallscope/spallscope <<'SH'
#!/usr/bin/env bash
here="$(cd "$(dirname "$0")" && pwd)"
export LD_LIBRARY_PATH="$here/lib${LD_LIBRARY_PATH:+:$LD_LIBRARY_PATH}"
exec "$here/spallscope.bin" "$@"
SH
chmod +x bundle/spallscope/spallscope
tar -C bundle -czf bundle/spallscope-bundle.tar.gz spallscope
echo "bundle/spallscope-bundle.tar.gz: $(ls bundle/spallscope/lib | wc -l) libraries, $(du -sh bundle/spallscope-bundle.tar.gz | cut -f1)"
