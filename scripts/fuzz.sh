#!/usr/bin/env bash
# Runs every fuzz target in fuzzing mode, one after another, each for SECONDS (default 180).
# Usage: scripts/fuzz.sh [SECONDS] [TARGET...]   e.g. scripts/fuzz.sh 60 NiftiFuzzTest#read
# Findings (inputs that make a reader throw anything but InputException, or hang) are written by
# Jazzer into src/test/resources/<package>/<Class>Inputs/<method>/ and then replay in mvn verify;
# the growing corpus of interesting inputs is kept in .cifuzz-corpus/ (not committed).
set -u
seconds="${1:-180}"
shift || true
targets=("$@")
if [ ${#targets[@]} -eq 0 ]; then
  targets=(NiftiFuzzTest#read NrrdFuzzTest#attached NrrdFuzzTest#detached MetaImageFuzzTest#local
           MetaImageFuzzTest#detached TiffFuzzTest#read ManifestFuzzTest#load ProtocolFuzzTest#load)
fi
mkdir -p target/fuzz-logs
for t in "${targets[@]}"; do
  log="target/fuzz-logs/${t/\#/-}.log"
  instrument="${JAZZER_INSTRUMENT:-}"
  # the TIFF target exercises ImageJ's decoder as much as our own code: instrument both by default
  if [ -z "$instrument" ] && [ "${t%%#*}" = TiffFuzzTest ]; then
    instrument='org.accordia.**,ij.io.**'
  fi
  echo "== $t for ${seconds}s -> $log"
  JAZZER_FUZZ=1 mvn -o -B test -Dtest="$t" -Dsurefire.failIfNoSpecifiedTests=false \
    -Djazzer.hooks=true -Djazzer.internal.arg.0=fuzz -Djazzer.internal.arg.1=-max_total_time="$seconds" \
    ${instrument:+-Djazzer.instrument="$instrument"} >"$log" 2>&1
  echo "   exit $?; $(grep -E '^#[0-9]+[[:space:]]+DONE' "$log" | tail -1)"
done
