#!/usr/bin/env bash
# Integration test of sharded runs on a real Slurm: a one-node cluster on localhost (munged,
# slurmctld, slurmd with a configuration in a temporary folder), the array job and the dependent
# merge of examples/slurm/ over a generated 40-frame sweep, and the merged tables compared byte
# for byte with a single-process run (run.json without its times). Installs Debian's slurm-wlm
# and munge when missing; if that is impossible it says so and fails. Every wait is bounded, every
# daemon it started is stopped by its PID, and the temporary folder is removed on exit.
# Needs the built dist/ (npm run build). Prints "slurm: P passed, F failed" last.
set -uo pipefail
ROOT=$(cd "$(dirname "$0")/../.." && pwd)
DOMTOPO="node $ROOT/bin/domtopo.js"
SHARDS=4
FRAMES=40
START=$(date +%s)
LIMIT=${SLURM_TEST_LIMIT:-240}   # seconds for the whole test, installation included

passed=0 failed=0
ok() { echo "slurm: ok - $*"; passed=$((passed + 1)); }
not_ok() { echo "slurm: FAILED - $*" >&2; failed=$((failed + 1)); }
finish() { echo "slurm: $passed passed, $failed failed"; [ "$failed" -eq 0 ] && [ "$passed" -gt 0 ]; exit $?; }
now() { date +%s.%N; }
left() { echo $((LIMIT - ($(date +%s) - START))); }

TMP=$(mktemp -d /tmp/domtopo-slurm.XXXXXX)
chmod 711 "$TMP"   # munged (user munge) keeps its pid and log in TMP/munge
STARTED_PIDS=()      # daemons this script started, stopped in reverse order
cleanup() {
  set +e
  if [ -n "${SLURM_CONF:-}" ] && [ ${#STARTED_PIDS[@]} -gt 0 ] && command -v scancel >/dev/null; then
    timeout 10 scancel --quiet --full --name=domtopo-shard --name=domtopo-merge 2>/dev/null
  fi
  for ((i = ${#STARTED_PIDS[@]} - 1; i >= 0; i--)); do
    pid=${STARTED_PIDS[$i]}
    kill "$pid" 2>/dev/null || continue
    for _ in $(seq 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    kill -0 "$pid" 2>/dev/null && kill -9 "$pid" 2>/dev/null
    wait "$pid" 2>/dev/null
  done
  rm -rf "$TMP"
}
trap cleanup EXIT
trap 'exit 1' INT TERM

# --- Slurm and munge, installed when missing ------------------------------------------------
need_install=0
for cmd in slurmctld slurmd sbatch squeue sinfo munged munge unmunge; do
  command -v "$cmd" >/dev/null || need_install=1
done
if [ "$need_install" -eq 1 ]; then
  if [ "$(id -u)" -ne 0 ] || ! command -v apt-get >/dev/null; then
    not_ok "slurm-wlm and munge are not installed and cannot be installed here (needs root and apt-get)"
    finish
  fi
  echo "slurm: installing slurm-wlm and munge (apt-get)"
  if ! { timeout 120 apt-get update -qq && DEBIAN_FRONTEND=noninteractive timeout 180 apt-get install -y -qq slurm-wlm munge; } >"$TMP/apt.log" 2>&1; then
    tail -20 "$TMP/apt.log" >&2
    not_ok "could not install slurm-wlm and munge with apt-get (log above); this test needs them"
    finish
  fi
fi

fail_with_logs() {
  not_ok "$1"
  for f in "$TMP"/log/*.log "$TMP"/jobs/*.out; do [ -f "$f" ] && { echo "--- $f" >&2; tail -15 "$f" >&2; }; done
  finish
}

# --- munge ------------------------------------------------------------------------------------
if timeout 5 munge -n 2>/dev/null | timeout 5 unmunge >/dev/null 2>&1; then
  echo "slurm: munged already running; using it"
else
  [ -f /etc/munge/munge.key ] || fail_with_logs "no /etc/munge/munge.key (the munge package creates it)"
  mkdir -p /run/munge "$TMP/munge" && chown munge: /run/munge "$TMP/munge" && chmod 755 /run/munge
  runuser -u munge -- /usr/sbin/munged --pid-file="$TMP/munge/munged.pid" --log-file="$TMP/munge/munged.log" \
    || fail_with_logs "munged did not start"
  for _ in $(seq 50); do [ -s "$TMP/munge/munged.pid" ] && break; sleep 0.1; done
  [ -s "$TMP/munge/munged.pid" ] && STARTED_PIDS+=("$(cat "$TMP/munge/munged.pid")")
  timeout 5 munge -n | timeout 5 unmunge >/dev/null || fail_with_logs "munge -n | unmunge does not report success"
fi

# --- a one-node cluster -----------------------------------------------------------------------
HOST=$(hostname -s)
MEM_MB=$(awk '/MemTotal/ { printf "%d", $2 / 1024 * 0.8 }' /proc/meminfo)
mkdir -p "$TMP/state" "$TMP/spool" "$TMP/log" "$TMP/jobs"
export SLURM_CONF="$TMP/slurm.conf"
cat >"$SLURM_CONF" <<EOF
ClusterName=domtopo-test
SlurmctldHost=$HOST
SlurmUser=root
AuthType=auth/munge
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core_Memory
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
MailProg=/bin/true
ReturnToService=2
DependencyParameters=kill_invalid_depend
SlurmctldPort=${SLURM_TEST_CTLD_PORT:-6817}
SlurmdPort=${SLURM_TEST_SLURMD_PORT:-6818}
StateSaveLocation=$TMP/state
SlurmdSpoolDir=$TMP/spool
SlurmctldPidFile=$TMP/slurmctld.pid
SlurmdPidFile=$TMP/slurmd.pid
SlurmctldLogFile=$TMP/log/slurmctld.log
SlurmdLogFile=$TMP/log/slurmd.log
NodeName=$HOST CPUs=2 RealMemory=$MEM_MB State=UNKNOWN
PartitionName=test Nodes=$HOST Default=YES MaxTime=INFINITE State=UP
EOF
slurmctld -D -f "$SLURM_CONF" >"$TMP/log/slurmctld.out" 2>&1 &
STARTED_PIDS+=($!)
slurmd -D -f "$SLURM_CONF" >"$TMP/log/slurmd.out" 2>&1 &
STARTED_PIDS+=($!)
state=""
for _ in $(seq 300); do   # at most 30 s
  state=$(timeout 5 sinfo -h -o %T 2>/dev/null | head -1)
  [ "$state" = "idle" ] && break
  sleep 0.1
done
[ "$state" = "idle" ] || fail_with_logs "the node is not idle after 30 s (sinfo says '${state:-nothing}')"
ok "one-node Slurm up on $HOST (2 CPUs)"

# --- the sweep ----------------------------------------------------------------------------------
[ -f "$ROOT/dist/index.js" ] || fail_with_logs "no dist/ (run npm run build first)"
node --input-type=module -e '
  const { demoSweep, encodeNpy } = await import(process.argv[1]);
  const { writeFileSync } = await import("node:fs");
  const n = Number(process.argv[3]);
  const sweep = demoSweep({ size: 128, frames: n, seed: 9 });
  writeFileSync(process.argv[2], encodeNpy(Array.from({ length: n }, (_, k) => sweep.frame(k))));
' "$ROOT/dist/index.js" "$TMP/sweep.npy" "$FRAMES" || fail_with_logs "could not generate the sweep"
ARGS="--threshold 127.5 --min-area 2 --sweep=-39:39:2 --field-unit mT --track --max-displacement 4 --domains"

# --- the array job and the dependent merge (examples/slurm/submit.sh) --------------------------
RUN="$TMP/run"
t0=$(now)
ids=$(cd "$TMP/jobs" && RUN_DIR="$RUN" INPUTS="$TMP/sweep.npy" DOMTOPO="$DOMTOPO" ANALYZE_ARGS="$ARGS" \
  timeout 30 "$ROOT/examples/slurm/submit.sh" --array=0-$((SHARDS - 1)) --chdir="$TMP/jobs" --mem=1G) \
  || fail_with_logs "submit.sh failed"
read -r array_id merge_id <<<"$ids"
echo "slurm: array job $array_id ($SHARDS tasks), merge job $merge_id (afterok:$array_id)"
t_array="" t_merge=""
deadline=$(( $(date +%s) + $(left) - 20 ))
while [ "$(date +%s)" -lt "$deadline" ]; do
  if [ -z "$t_array" ]; then
    done_shards=0
    for k in $(seq 0 $((SHARDS - 1))); do [ -f "$RUN/shard-$k-of-$SHARDS/run.json" ] && done_shards=$((done_shards + 1)); done
    [ "$done_shards" -eq "$SHARDS" ] && t_array=$(now)
  fi
  queued=$(timeout 5 squeue -h -j "$array_id,$merge_id" -o %i 2>/dev/null | wc -l)
  if [ "$queued" -eq 0 ]; then [ -f "$RUN/run.json" ] && t_merge=$(now); break; fi
  sleep 0.2
done
[ -n "$t_array" ] || fail_with_logs "the $SHARDS shard tasks did not all finish (no run.json in every shard folder)"
ok "array job: $SHARDS shards analyzed"
[ -n "$t_merge" ] || fail_with_logs "the merge job did not finish (no merged run.json, or jobs still queued at the deadline)"
ok "dependent merge job finished"

# --- a single-process run of the same sweep -----------------------------------------------------
t1=$(now)
# shellcheck disable=SC2086
$DOMTOPO analyze "$TMP/sweep.npy" $ARGS --workers 2 --out "$TMP/single" --quiet || fail_with_logs "single-process run failed"
t2=$(now)

same=1
for f in frames.csv frames.ndjson domains.csv tracks.csv; do
  if cmp -s "$RUN/$f" "$TMP/single/$f"; then :; else same=0; not_ok "$f of the merged run differs from the single-process run"; cmp "$RUN/$f" "$TMP/single/$f" | head -2 >&2; fi
done
[ "$same" -eq 1 ] && ok "frames.csv, frames.ndjson, domains.csv, tracks.csv identical to a single-process run"
if node -e '
  const fs = require("node:fs");
  const strip = (p) => { const r = JSON.parse(fs.readFileSync(p, "utf8")); delete r.finished; delete r.timings; delete r.shards; return JSON.stringify(r); };
  const a = strip(process.argv[1]), b = strip(process.argv[2]);
  if (a !== b) { console.error(a + "\n" + b); process.exit(1); }
  const shards = JSON.parse(fs.readFileSync(process.argv[1], "utf8")).shards;
  if (shards.length !== Number(process.argv[3])) process.exit(1);
' "$RUN/run.json" "$TMP/single/run.json" "$SHARDS"; then
  ok "run.json equal apart from times, and it lists the $SHARDS shards"
else
  not_ok "run.json of the merged run differs from the single-process one (apart from times)"
fi
awk -v a="$t0" -v b="$t_array" -v m="$t_merge" -v s1="$t1" -v s2="$t2" -v n="$SHARDS" -v f="$FRAMES" 'BEGIN {
  printf "slurm: wall time: %d-task array job %.1f s (submit to last shard; merge job done at %.1f s); single process (2 workers) %.1f s; %d frames of 128 x 128\n", n, b - a, m - a, s2 - s1, f }'

# --- a failing shard: the dependent merge is cancelled, not left pending -------------------------
bad=$(cd "$TMP/jobs" && RUN_DIR="$TMP/bad" INPUTS="$TMP/missing.npy" DOMTOPO="$DOMTOPO" ANALYZE_ARGS="--track" \
  timeout 30 "$ROOT/examples/slurm/submit.sh" --array=0-1 --chdir="$TMP/jobs" --mem=256M) || fail_with_logs "submit.sh failed"
read -r bad_array bad_merge <<<"$bad"
gone=0
for _ in $(seq 300); do   # at most 60 s
  if [ "$(timeout 5 squeue -h -j "$bad_array,$bad_merge" -o %i 2>/dev/null | wc -l)" -eq 0 ]; then gone=1; break; fi
  sleep 0.2
done
if [ "$gone" -eq 1 ] && [ ! -f "$TMP/bad/run.json" ]; then ok "a failed shard cancels the dependent merge"
else not_ok "after a failed shard the merge job was still queued (or ran)"; fi

finish
