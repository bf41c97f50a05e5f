#!/usr/bin/env bash
# A real SLURM run of a sharded batch (exprmodel slurm-array), on a one-node cluster started here and stopped again.
#
# 1. Installs Debian's slurm-wlm and munge when missing (as root, with apt-get).
# 2. Starts munged, slurmctld and slurmd in the foreground from tests/cluster/slurm.conf, with state, spool, socket,
#    pid and log files under a fresh temporary directory and unusual ports, so it runs beside any cluster already
#    set up here. Every daemon is stopped by its process id when the script ends, also on failure (trap EXIT).
# 3. Round 1: the demo's per-cell batch in 4 shards plus the merge job, after the references job that writes the
#    dataset references once (each task then reads only its own cells, which its log says); the merged CSV must equal a
#    single-process batch run byte for byte. The run directory and the table's path hold spaces, quotes and a dollar sign.
# 4. Round 2: the array again with task 3 cancelled mid-run; merge must refuse, naming shard 3 and its file; then
#    task 3 alone is submitted again (submit.sh 3, reusing the references) with a new merge job; the merged CSV must
#    again equal the single run, and every shard file must equal round 1's (reruns are idempotent).
# The last line is "slurm test: PASS" or "slurm test: FAIL (reason)"; the exit status is 0 only on PASS.
set -uo pipefail
repo=$(cd "$(dirname "$0")/../.." && pwd)
limit=${EXPRMODEL_SLURM_TEST_TIMEOUT:-900}   # seconds each wait may take at most
started=$(date +%s)

fail() { echo "slurm test: FAIL ($*)"; exit 1; }
log() { echo "[slurm test $(( $(date +%s) - started ))s] $*"; }

# --- 1. packages ------------------------------------------------------------------------------------------------
if ! command -v slurmctld >/dev/null || ! command -v slurmd >/dev/null || ! command -v sbatch >/dev/null || ! command -v munged >/dev/null; then
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
    log "installing Debian slurm-wlm and munge..."
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq slurm-wlm munge >/dev/null) \
      || fail "apt-get could not install slurm-wlm and munge"
  else
    fail "slurm-wlm and munge are missing and this user cannot install them (apt-get install slurm-wlm munge, as root)"
  fi
fi
[ "$(id -u)" = "0" ] || fail "the test cluster's daemons run as root (SlurmUser=root in tests/cluster/slurm.conf); run as root"

exe="$repo/src/ExprModel.Cli/bin/Release/net10.0/exprmodel"
if [ ! -x "$exe" ]; then
  log "building the command line (Release)..."
  dotnet build "$repo/src/ExprModel.Cli" -c Release -nologo -v q >/dev/null || fail "exprmodel does not build"
fi

# --- 2. daemons -------------------------------------------------------------------------------------------------
state=$(mktemp -d /tmp/exprmodel-slurm.XXXXXX)
chmod 755 "$state"
pids=()
cleanup() {
  local rc=$?
  if [ -n "${SLURM_CONF:-}" ] && [ -f "$SLURM_CONF" ] && [ "${#pids[@]}" -gt 0 ]; then
    scancel --quiet --user=root >/dev/null 2>&1 || true   # jobs of this test's controller only (SLURM_CONF)
    sleep 1
  fi
  for ((k = ${#pids[@]} - 1; k >= 0; k--)); do kill "${pids[k]}" 2>/dev/null || true; done
  for p in "${pids[@]}"; do
    for _ in 1 2 3 4 5 6 7 8 9 10; do kill -0 "$p" 2>/dev/null || break; sleep 0.5; done
    kill -9 "$p" 2>/dev/null || true
  done
  if [ "$rc" = "0" ]; then rm -rf "$state"; else echo "slurm test: logs kept in $state"; fi
  exit "$rc"
}
trap cleanup EXIT
trap 'exit 1' INT TERM

for daemon in slurmctld slurmd munged; do
  others=$(pgrep -x "$daemon" | tr '\n' ' ')
  [ -n "$others" ] && log "note: $daemon already runs here (pid $others); this test uses its own ports, socket and state"
done
port_free() { ! (ss -ltnH 2>/dev/null | awk '{print $4}' | grep -qE "[:.]$1\$"); }
ctld_port=""
for base in 16917 17917 18917 19917 20917; do
  if port_free "$base" && port_free $((base + 1)); then ctld_port=$base; break; fi
done
[ -n "$ctld_port" ] || fail "no free pair of ports for slurmctld and slurmd"
slurmd_port=$((ctld_port + 1))

mkdir -p "$state/munge" "$state/ctld" "$state/spool"
chmod 700 "$state/munge"
head -c 1024 /dev/urandom >"$state/munge/munge.key"
chmod 400 "$state/munge/munge.key"
munged --foreground --force --socket="$state/munge/munge.socket" --key-file="$state/munge/munge.key" \
  --pid-file="$state/munge/munged.pid" --log-file="$state/munge/munged.log" --seed-file="$state/munge/munged.seed" \
  >"$state/munged.out" 2>&1 &
pids+=($!)
for _ in $(seq 1 50); do [ -S "$state/munge/munge.socket" ] && break; sleep 0.2; done
munge -n -S "$state/munge/munge.socket" | unmunge -S "$state/munge/munge.socket" >/dev/null 2>&1 \
  || { cat "$state/munged.out" "$state/munge/munged.log" 2>/dev/null; fail "munged does not answer on its socket"; }

host=$(hostname -s)
sed -e "s|@HOST@|$host|g" -e "s|@STATE@|$state|g" -e "s|@CPUS@|$(nproc)|g" \
  -e "s|@CTLD_PORT@|$ctld_port|g" -e "s|@SLURMD_PORT@|$slurmd_port|g" "$repo/tests/cluster/slurm.conf" >"$state/slurm.conf"
export SLURM_CONF="$state/slurm.conf"
slurmctld -D -i -f "$SLURM_CONF" >"$state/slurmctld.out" 2>&1 &
pids+=($!)
slurmd -D -N exprmodelnode -f "$SLURM_CONF" >"$state/slurmd.out" 2>&1 &
pids+=($!)
log "munged, slurmctld (port $ctld_port) and slurmd (port $slurmd_port) started: pids ${pids[*]}; state in $state"

node_ready=""
for _ in $(seq 1 120); do
  st=$(sinfo -h -n exprmodelnode -o %t 2>/dev/null | head -n 1)
  case "$st" in idle | mix | alloc) node_ready=1; break ;; esac
  for p in "${pids[@]}"; do kill -0 "$p" 2>/dev/null || { tail -n 20 "$state"/*.out "$state"/*.log 2>/dev/null; fail "a daemon exited (pid $p)"; }; done
  sleep 0.5
done
[ -n "$node_ready" ] || { tail -n 20 "$state"/*.log 2>/dev/null; fail "the node did not become idle within 60 s (state '$st')"; }
log "node exprmodelnode is $st"

# --- 3. the reference: one process --------------------------------------------------------------------------------
# A run directory and a table path with spaces, quotes and a dollar sign: the scripts must quote them.
work="$state/run dir's \$HOME"
mkdir -p "$work/demo data"
cp "$repo/catalog/demo/counts.csv" "$work/demo data/counts \"x\" 'y'.csv"
export EXPRMODEL_CATALOG_DB="$state/catalog.db"
export EXPRMODEL_CATALOG_DIR="$repo/catalog"
cd "$work" || fail "cannot enter $work"
batch_options=(--expression "demo data/counts \"x\" 'y'.csv" --per cell)
# Each task's runtime is told it has --cpus processors (1); the reference is run the same way (see the guide).
log "single-process batch (reference)..."
DOTNET_PROCESSOR_COUNT=1 "$exe" batch "${batch_options[@]}" --out "$work/reference.csv" 2>"$state/reference.err" \
  || { tail -n 5 "$state/reference.err"; fail "the single-process batch failed"; }

wait_gone() { # JOBID [what]: waits until the job (all its array tasks) has left the queue
  local t0; t0=$(date +%s)
  while [ -n "$(squeue -h -j "$1" -o %i 2>/dev/null)" ]; do
    [ $(( $(date +%s) - t0 )) -gt "$limit" ] && fail "${2:-job $1} still queued after $limit s"
    sleep 1
  done
}
job_state() { scontrol -o show job "$1" 2>/dev/null | grep -oE 'JobState=[A-Z_]+' | head -n 1 | cut -d= -f2; }
jobs_of() { # TEXT: sets array_job, merge_job and references_job (empty when reused) from submit.sh's lines
  array_job=$(echo "$1" | sed -nE 's/^array job ([0-9]+).*/\1/p')
  references_job=$(echo "$1" | sed -nE 's/^references job ([0-9]+).*/\1/p')
  merge_job=$(echo "$1" | sed -nE 's/.*merge job ([0-9]+).*/\1/p')
  [ -n "$array_job" ] && [ -n "$merge_job" ] || fail "the submission did not name its jobs: $1"
}
submit_array() { # DIR: exprmodel slurm-array --submit (writes the scripts and runs submit.sh)
  local out
  out=$("$exe" slurm-array --shards 4 --dir "$1" --partition exprmodeltest --account exprmodellab --time 30 --memory 400M \
    --cpus 1 --job-name "exprmodel-test" --submit -- "${batch_options[@]}" 2>"$state/slurm-array.err") \
    || { cat "$state/slurm-array.err"; fail "exprmodel slurm-array --submit failed"; }
  echo "$out"
  jobs_of "$out"
}
resubmit() { # DIR TASKS: bash submit.sh TASKS (the rerun of failed tasks the scripts offer)
  local out
  out=$(bash "$1/submit.sh" "$2") || fail "submit.sh $2 failed: $out"
  echo "$out"
  jobs_of "$out"
}

# --- 4. round 1: the whole array and its merge ---------------------------------------------------------------------
round1="$work/round 1"
submit_array "$round1"
log "round 1: array job $array_job, merge job $merge_job submitted"
wait_gone "$array_job" "round 1's array"
wait_gone "$merge_job" "round 1's merge job"
[ "$(job_state "$merge_job")" = "COMPLETED" ] \
  || { cat "$round1"/logs/* 2>/dev/null | tail -n 20; fail "round 1's merge job ended $(job_state "$merge_job")"; }
cmp "$round1/merged.csv" "$work/reference.csv" || fail "round 1: the merged CSV differs from the single-process run"
[ -n "$references_job" ] && [ "$(job_state "$references_job")" = "COMPLETED" ] && [ -s "$round1/references.json" ] \
  || fail "round 1: no completed references job wrote references.json (job '${references_job}')"
for i in 1 2 3 4; do
  grep -qs "a part of the file" "$round1"/logs/task-$i-*.out || fail "round 1: task $i did not read only its own cells"
done
leftovers=$(find "$round1" -name '*.tmp' | wc -l)
[ "$leftovers" = "0" ] || fail "round 1 left $leftovers temporary files"
log "round 1: merged.csv equals the single-process run byte for byte ($(wc -l <"$work/reference.csv") lines)"
log "round 1: references job $references_job ran first; each task read only its own cells"

# --- 5. round 2: task 3 cancelled mid-run, merge names it, task 3 alone again --------------------------------------
round2="$work/round 2"
submit_array "$round2"
log "round 2: array job $array_job, merge job $merge_job submitted; cancelling task 3 once it is computing"
t0=$(date +%s)
until grep -qs "progress:" "$round2"/logs/task-3-*.out; do
  [ $(( $(date +%s) - t0 )) -gt "$limit" ] && fail "task 3 did not start computing within $limit s"
  st=$(squeue -h -j "${array_job}_3" -o %T 2>/dev/null)
  [ -z "$st" ] && fail "task 3 ended before it could be cancelled (nothing to test)"
  sleep 0.2
done
scancel "${array_job}_3" || fail "scancel ${array_job}_3 failed"
log "task 3 cancelled mid-run: $(grep -c progress: "$round2"/logs/task-3-*.out) progress lines written"
t0=$(date +%s)
while squeue -h -j "$array_job" -o %i 2>/dev/null | grep -q .; do
  [ $(( $(date +%s) - t0 )) -gt "$limit" ] && fail "round 2's array still queued after $limit s"
  sleep 1
done
shard3="$round2/shards/shard-3-of-4.csv"
[ -e "$shard3" ] && fail "the cancelled task left a shard file"
leftovers=$(find "$round2" -name '*.tmp' | wc -l)
log "round 2: no shard 3 file; $leftovers temporary file(s) left by the killed task (never merged)"
# The merge job's own script, run here (its job waits for an afterok that can no longer come).
if bash "$round2/merge.sh" 2>"$state/merge2.err"; then
  fail "merge accepted three shards of four"
fi
expected="error: shard 3 of 4 is missing: expected $shard3 (not found)."
grep -qF "$expected" "$state/merge2.err" || { cat "$state/merge2.err"; fail "merge did not name shard 3 and its file"; }
[ -e "$round2/merged.csv" ] && fail "a refused merge wrote merged.csv"
log "merge refused: $(cat "$state/merge2.err")"
scancel "$merge_job" 2>/dev/null || true   # its dependency can no longer be met
resubmit "$round2" 3
[ -z "$references_job" ] || fail "the rerun of task 3 wrote the references again (job $references_job) instead of reusing them"
log "round 2: task 3 alone as job $array_job, merge job $merge_job"
wait_gone "$array_job" "the rerun of task 3"
wait_gone "$merge_job" "round 2's merge job"
[ "$(job_state "$merge_job")" = "COMPLETED" ] \
  || { cat "$round2"/logs/merge-* 2>/dev/null | tail -n 20; fail "round 2's merge job ended $(job_state "$merge_job")"; }
cmp "$round2/merged.csv" "$work/reference.csv" || fail "round 2: the merged CSV differs from the single-process run"
for i in 1 2 3 4; do
  cmp "$round1/shards/shard-$i-of-4.csv" "$round2/shards/shard-$i-of-4.csv" || fail "shard $i differs between the runs"
done
log "round 2: merged.csv equals the single-process run byte for byte; every shard equals round 1's"
echo "slurm test: PASS"
