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

# Engine II: full report with verdicts, riding hydrogens and all-atom overlaps on the reference
# set vs gemmi read + phi/psi (bar ≤ 4×), and a 1,000,000-atom model (< 20 s, peak RSS < 3 GB,
# linear growth) (see shared/src/cli/bench-verdicts.ts).
bench_verdicts() {
  node shared/dist/cli/bench-verdicts.js "$@"
}

# Figures and methods tables (issue 5): torsion-plot SVG for 10,000 residues < 1.5 s; every
# figure + the methods table for 1,000 residues < 5 s (see service/src/figures/bench.ts).
bench_figures() {
  npm run build -w service --silent >/dev/null || { npm run build -w service; return 1; }
  node service/dist/figures/bench.js "$@"
}

# Workflow (issue 6): list endpoints p95 < 200 ms while a worker analyses an invented
# 1,005,888-atom model (see service/bench/workflow-load.bench.ts; needs MariaDB and Redis).
bench_workflow() {
  bash scripts/services.sh start >/dev/null
  npm run build -w service --silent >/dev/null || { npm run build -w service; return 1; }
  local out rc=0
  out="$(mktemp)"
  (cd service && NODE_OPTIONS=--experimental-vm-modules npx jest --roots '<rootDir>/bench' \
    --testMatch '**/*.bench.ts' "$@" >"$out" 2>&1) || rc=1
  grep -E 'list latency|Expected|Received' "$out" || true
  rm -f "$out"
  if [ "$rc" = 0 ]; then echo "PASS workflow: list p95 < 200 ms during a 1M-atom analysis"
  else echo "FAIL workflow: list p95 < 200 ms during a 1M-atom analysis"; return 1; fi
}

SECTIONS=(engine verdicts figures workflow)
status=0
for s in "${SECTIONS[@]}"; do
  echo
  echo "== bench: $s"
  "bench_$s" || status=1
done
exit $status
