#!/usr/bin/env bash
# `npm test`: installs what is missing, starts MariaDB and Redis on loopback, builds every
# workspace and runs every test suite (engine, service e2e, browser). Prints one closing line
# "foldfolio: N passed, N failed" and exits non-zero when anything failed.
# Run one workspace only:   scripts/test.sh shared|service|ui   (extra args go to jest)
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$FOLDFOLIO_ROOT"
only="${1:-}"; [ $# -gt 0 ] && shift

bash scripts/ensure-deps.sh
bash scripts/services.sh start
log "building workspaces"
npm run build --silent >/dev/null || { npm run build; die "build failed"; }

OUT="$FOLDFOLIO_ROOT/test-output"
mkdir -p "$OUT"
passed=0; failed=0; status=0
run_suite() {
  local ws="$1"; shift
  [ -n "$only" ] && [ "$only" != "$ws" ] && return 0
  log "running $ws tests"
  local json="$OUT/jest-$ws.json"
  rm -f "$json"
  # the service is an ES module package: jest needs Node's VM modules to load it
  local node_opts="${NODE_OPTIONS:-}"
  [ "$ws" = service ] && node_opts="--experimental-vm-modules $node_opts"
  (cd "$ws" && NODE_OPTIONS="$node_opts" npx jest --ci --forceExit --json --outputFile="$json" "$@") || status=1
  if [ -s "$json" ]; then
    read -r p f < <(node -e 'const r=require(process.argv[1]);console.log(r.numPassedTests, r.numFailedTests + r.numRuntimeErrorTestSuites)' "$json")
    passed=$((passed + p)); failed=$((failed + f))
  else
    failed=$((failed + 1)); status=1
  fi
}
# lint is part of the suite: strict TypeScript rules, no Node/DOM imports or `any` in the engine
if [ -z "$only" ]; then
  log "linting"
  if npx eslint . >"$OUT/eslint.txt" 2>&1; then passed=$((passed + 1)); else
    cat "$OUT/eslint.txt"; failed=$((failed + 1)); status=1
  fi
fi
run_suite shared "$@"
run_suite service "$@"
run_suite ui "$@"
echo
echo "foldfolio: $passed passed, $failed failed"
exit $status
