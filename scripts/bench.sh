#!/usr/bin/env bash
# `npm run bench`: performance checks with their bars (not a timed test). Builds the workspaces it
# needs, then runs each section in turn; a section prints PASS/FAIL per bar.
# Add a section: a function bench_<name> below and a line in SECTIONS.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$FOLDFOLIO_ROOT"

log "building the engine"
npm run build -w shared --silent >/dev/null || { npm run build -w shared; die "engine build failed"; }

# Engine I: readers, phi/psi/omega vs gemmi on the reference set and a 1,000,000-atom model,
# full report time and peak RSS (see shared/src/cli/bench-engine.ts).
bench_engine() {
  node shared/dist/cli/bench-engine.js "$@"
}

SECTIONS=(engine)
status=0
for s in "${SECTIONS[@]}"; do
  echo
  echo "== bench: $s"
  "bench_$s" || status=1
done
exit $status
