#!/usr/bin/env bash
# The whole check suite, as CI runs it: Debian packages the tests need, typecheck, lint,
# unit and integration tests (those on PostgreSQL against a throwaway server on loopback, started
# here and removed at the end), production build, end-to-end tests in a real browser.
# Ends with one line "N passed, N failed" totalled over every vitest suite; a failed
# non-test step (typecheck, lint, build) counts as one failure.
set -u
cd "$(dirname "$0")/.."

DEBIAN_PACKAGES=(chromium python3-scipy python3-imblearn python3-periodictable python3-pandas python3-openpyxl postgresql)
missing=()
for p in "${DEBIAN_PACKAGES[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
  if [ "$(id -u)" = "0" ]; then
    echo "[test] installing Debian packages: ${missing[*]}"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -q >/dev/null && apt-get install -y -q --no-install-recommends "${missing[@]}" >/dev/null || echo "[test] apt-get failed; tests needing ${missing[*]} will fail"
  else
    echo "[test] missing Debian packages (${missing[*]}); run as root or: sudo apt-get install -y ${missing[*]}"
  fi
fi

mkdir -p test-results

# PostgreSQL for the tests that need it: a cluster of our own in a temporary folder, on a free
# loopback port, whatever else runs on the machine. Those tests fail (not skip) when it did not start.
export MELTLEDGER_TEST_PG_REQUIRED=1
unset MELTLEDGER_TEST_PG_URL MELTLEDGER_TEST_PG_DIR
echo "[test] starting PostgreSQL for the tests…"
if pg_env=$(bash scripts/test-postgres.sh start); then
  eval "$pg_env"
  echo "[postgres] running at ${MELTLEDGER_TEST_PG_URL} (data in ${MELTLEDGER_TEST_PG_DIR})"
  trap 'bash scripts/test-postgres.sh stop "${MELTLEDGER_TEST_PG_DIR}"' EXIT
else
  echo "[postgres] could not start a server; the PostgreSQL tests will fail"
fi
passed=0
failed=0
step_failed=0

run_step() {
  local name=$1; shift
  echo "[test] ${name}…"
  if "$@"; then echo "[test] ${name}: ok"; else echo "[test] ${name}: FAILED"; failed=$((failed + 1)); step_failed=1; fi
}

count_json() {
  local file=$1
  if [ -s "$file" ]; then
    local counts
    counts=$(node -e 'const r=JSON.parse(require("fs").readFileSync(process.argv[1],"utf8"));console.log(`${r.numPassedTests} ${r.numFailedTests + (r.numRuntimeErrorTestSuites ?? 0)}`)' "$file" 2>/dev/null || echo "0 1")
    passed=$((passed + ${counts% *}))
    failed=$((failed + ${counts#* }))
  else
    failed=$((failed + 1))
  fi
}

run_vitest() {
  local name=$1 out=$2; shift 2
  echo "[test] ${name}…"
  rm -f "$out"
  if npx vitest run "$@" --reporter=default --reporter=json --outputFile.json="$out"; then echo "[test] ${name}: ok"; else echo "[test] ${name}: FAILED"; step_failed=1; fi
  count_json "$out"
}

run_step "typecheck" npx tsc --noEmit -p .
run_step "lint" npx eslint .
run_vitest "unit and integration tests" test-results/unit.json
run_step "production build" npx next build
run_vitest "end-to-end tests" test-results/e2e.json --config vitest.e2e.config.ts

echo "${passed} passed, ${failed} failed"
[ "$failed" -eq 0 ] && [ "$step_failed" -eq 0 ]
