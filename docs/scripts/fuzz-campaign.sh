#!/usr/bin/env bash
# Long fuzz campaign: runs every fuzz target of the repository for a fixed
# number of executions (default 1000000, or $EXECS) and prints one line
# per target with the executions done, the new corpus entries and the
# result. A finding writes its reproducer under the package's
# testdata/fuzz/ (commit it with the fix). This is a campaign, not a test:
# at a million executions per target it takes hours on two cores.
#
#   docs/scripts/fuzz-campaign.sh              # all targets, 1e6 each
#   EXECS=100000 docs/scripts/fuzz-campaign.sh FuzzReader FuzzParse
#   PARALLEL=1 nice docs/scripts/fuzz-campaign.sh   # one fuzz worker, beside other work
set -uo pipefail
cd "$(dirname "$0")/../.."
execs=${EXECS:-1000000}
targets=("$@")
if [ ${#targets[@]} -eq 0 ]; then
  mapfile -t targets < <(grep -rhoE --include='*_test.go' '^func Fuzz[A-Za-z0-9_]+' . | sort -u | sed 's/^func //')
fi
printf '%-32s %-22s %12s %10s %s\n' target package execs new result
status=0
for target in "${targets[@]}"; do
  pkg=$(grep -rlE --include='*_test.go' "^func $target\(" . | head -1 | xargs dirname)
  log=$(mktemp)
  start=$(date +%s)
  if go test -run '^$' -fuzz "^$target\$" -fuzztime "${execs}x" -fuzzminimizetime 10s ${PARALLEL:+-parallel "$PARALLEL"} "$pkg" >"$log" 2>&1; then
    result=ok
  elif grep -q 'Failing input written to' "$log"; then
    result="FINDING: $(grep -m1 'Failing input written to' "$log" | sed 's/.*written to //')"
    status=1
  else
    result="error (see below)"
    status=1
  fi
  # The coordinator's last progress line: "fuzz: elapsed: 1m0s, execs: 123 (2/sec), new interesting: 4 (total: 9)".
  last=$(grep -E '^fuzz: elapsed' "$log" | tail -1)
  done_execs=$(sed -nE 's/.*execs: ([0-9]+).*/\1/p' <<<"$last")
  new=$(sed -nE 's/.*new interesting: ([0-9]+).*/\1/p' <<<"$last")
  printf '%-32s %-22s %12s %10s %s (%ds)\n' "$target" "${pkg#./}" "${done_execs:-?}" "${new:-?}" "$result" $(( $(date +%s) - start ))
  if [ "$result" = "error (see below)" ]; then
    tail -n 20 "$log"
  fi
  rm -f "$log"
done
exit $status
