#!/usr/bin/env bash
# Runs every test of the solution on a fresh machine with the .NET SDK: installs what the tests need
# (Debian's chromium for the browser tests; slurm-wlm and munge for tests/cluster), builds, runs each test project and
# the SLURM test (tests/cluster/run-slurm-test.sh, counted as one test) and prints a final summary line
# "tests: N passed, N failed[, N skipped]". A failed formatting check (dotnet format --verify-no-changes) counts as one failed test.
# Exit status is non-zero when any test fails, a project cannot run or the formatting check fails.
set -uo pipefail
cd "$(dirname "$0")/.."

if ! command -v chromium >/dev/null 2>&1 && [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
    echo "installing Debian chromium for the browser tests..."
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null) || echo "warning: chromium could not be installed; browser tests will fail"
  else
    echo "warning: /usr/bin/chromium is missing and this user cannot install it (apt-get install chromium)"
  fi
fi

dotnet build ExprModel.sln -c Release -nologo -v q || { echo "tests: 0 passed, 1 failed"; exit 1; }

passed=0; failed=0; skipped=0; status=0

# Formatting as .editorconfig configures it: any file dotnet format would change counts as one failed test.
format_log=$(mktemp)
if dotnet format ExprModel.sln --verify-no-changes -v q >"$format_log" 2>&1; then
  echo "format: clean"
else
  echo "format: dotnet format would change these files (run 'dotnet format ExprModel.sln'):"
  grep -E ": error " "$format_log" | grep -oE "^[^(]+\(" | sed -E 's/\($//' | sed "s|^$PWD/||" | sort | uniq -c \
    | awk '{ print "  " $2 " (" $1 " places)" }' || true
  grep -qE ": error " "$format_log" || cat "$format_log"
  failed=$((failed + 1)); status=1
fi
rm -f "$format_log"

for proj in tests/*/*.csproj; do
  name=$(basename "$proj" .csproj)
  [ "$name" = "ExprModel.Benchmarks" ] && continue
  log=$(mktemp)
  dotnet test "$proj" -c Release --no-build -nologo 2>&1 | tee "$log" | grep -E "^\s*(Failed|Passed!|Failed!|Skipped!)|error" || true
  line=$(grep -E "(Passed|Failed)!\s+-\s+Failed:" "$log" | tail -n 1)
  if [ -z "$line" ]; then
    echo "$name: no test summary (build or host failure)"; failed=$((failed + 1)); status=1
  else
    p=$(echo "$line" | sed -E 's/.*Passed:\s*([0-9]+).*/\1/')
    f=$(echo "$line" | sed -E 's/.*Failed:\s*([0-9]+),.*/\1/')
    s=$(echo "$line" | sed -E 's/.*Skipped:\s*([0-9]+).*/\1/')
    passed=$((passed + p)); failed=$((failed + f)); skipped=$((skipped + s))
    [ "$f" != "0" ] && status=1
  fi
  rm -f "$log"
done

# The SLURM test: a one-node cluster started and stopped by the script, a sharded batch run as a job array; one test.
slurm_log=$(mktemp)
bash tests/cluster/run-slurm-test.sh >"$slurm_log" 2>&1
if tail -n 1 "$slurm_log" | grep -q "^slurm test: PASS"; then
  grep -E "round [12]: merged|merge refused" "$slurm_log" | sed 's/^/  /'
  echo "slurm: PASS"; passed=$((passed + 1))
else
  tail -n 40 "$slurm_log"
  echo "slurm: FAIL"; failed=$((failed + 1)); status=1
fi
rm -f "$slurm_log"

if [ "$skipped" != "0" ]; then
  echo "tests: $passed passed, $failed failed, $skipped skipped"
else
  echo "tests: $passed passed, $failed failed"
fi
exit $status
