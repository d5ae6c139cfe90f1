#!/bin/bash
# Smallest -Xmx (steps of 4 MiB) with which `accordia analyze --threads 1` completes on a generated
# study of 2 cases x 4 readers (2 centres x 2), serial collector, protocol with the fewest resamples.
# Usage: scripts/min-heap.sh X,Y,Z [spacing]   (prints the smallest heap in MiB)
# Used for the per-case memory table in docs/limits.md.
set -euo pipefail
size=${1:?grid size X,Y,Z}
spacing=${2:-0.8,0.8,1.5}
jar=$(cd "$(dirname "$0")/.." && pwd)/target/accordia.jar
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
java -jar "$jar" demo --out "$work/study" --cases 2 --centres 2 --readers-per-centre 2 --size "$size" --spacing "$spacing" >/dev/null
cat > "$work/protocol.yaml" <<'YAML'
structures:
  - name: lesion
    labels: [1, 2]
consensus:
  bootstrap_resamples: 100
shift:
  permutations: 99
YAML
ok() {
  rm -rf "$work/out"
  java -XX:+UseSerialGC -Xmx"$1"m -jar "$jar" analyze "$work/study" --protocol "$work/protocol.yaml" \
    --out "$work/out" --threads 1 --quiet >/dev/null 2>&1
}
lo=8; hi=1024
ok "$hi" || { echo "fails even with ${hi} MiB" >&2; exit 1; }
while (( hi - lo > 4 )); do
  mid=$(( (lo + hi) / 2 / 4 * 4 ))
  if ok "$mid"; then hi=$mid; else lo=$mid; fi
done
echo "$hi"
