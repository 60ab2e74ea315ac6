#!/usr/bin/env bash
# A real test of the README's Slurm recipe on this machine: starts munge + slurmctld + slurmd on
# localhost with a minimal config, submits a 4-task job array of a small suite (one part per
# task), a combine job with --dependency=afterok, and compares the combined results with one run.
# Exit 0: same bits; 1: mismatch or a failed job; 77: skipped (says why on a SKIPPED line).
set -u
ROOT=$(cd "$(dirname "$0")/.." && pwd)
CLI="$ROOT/dist/cli.js"

skip() { echo "SKIPPED: slurm array check: $*"; exit 77; }
for b in slurmctld slurmd sbatch squeue scontrol sinfo munged mungekey; do
  command -v "$b" >/dev/null 2>&1 || skip "$b not installed (Debian packages slurm-wlm and munge; .ci/run installs them as root)"
done
[ "$(id -u)" = "0" ] || skip "needs root to run slurmd and munged here"
[ -f "$CLI" ] || skip "dist/cli.js missing (run npm run build)"

T=$(mktemp -d /tmp/walkhull-slurm.XXXXXX)
chmod 755 "$T"
MUNGE_PID=""
cleanup() {
  scontrol -f "$T/slurm.conf" shutdown >/dev/null 2>&1 || true
  sleep 0.5
  [ -n "$MUNGE_PID" ] && kill "$MUNGE_PID" >/dev/null 2>&1
  pkill -f "$T/slurm.conf" >/dev/null 2>&1 || true
}
trap cleanup EXIT

# munge with its own key and socket
mkdir -p "$T/munge" "$T/spool" "$T/state" "$T/log" "$T/work"
chmod 755 "$T/munge"
mungekey -c -k "$T/munge/munge.key" >/dev/null 2>&1 || skip "mungekey failed"
chmod 600 "$T/munge/munge.key"
munged -F -S "$T/munge/sock" --key-file="$T/munge/munge.key" --pid-file="$T/munge/munged.pid" \
  --log-file="$T/log/munged.log" --seed-file="$T/munge/seed" --force >/dev/null 2>&1 &
MUNGE_PID=$!
for _ in $(seq 1 50); do [ -S "$T/munge/sock" ] && break; sleep 0.1; done
[ -S "$T/munge/sock" ] || skip "munged did not start (see $T/log/munged.log)"

CPUS=$(nproc)
MEM=$(awk '/MemTotal/ {printf "%d", $2 / 1024 * 0.9}' /proc/meminfo)
cat > "$T/slurm.conf" <<EOF
ClusterName=walkhull-check
SlurmctldHost=localhost(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
AuthInfo=socket=$T/munge/sock
CredType=cred/munge
MailProg=/bin/true
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
SchedulerParameters=batch_sched_delay=0
DependencyParameters=kill_invalid_depend
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
StateSaveLocation=$T/state
SlurmdSpoolDir=$T/spool
SlurmctldPidFile=$T/slurmctld.pid
SlurmdPidFile=$T/slurmd.pid
SlurmctldLogFile=$T/log/slurmctld.log
SlurmdLogFile=$T/log/slurmd.log
SlurmctldPort=16817
SlurmdPort=16818
ReturnToService=2
NodeName=localhost NodeAddr=127.0.0.1 CPUs=$CPUS RealMemory=$MEM State=UNKNOWN
PartitionName=debug Nodes=localhost Default=YES MaxTime=INFINITE State=UP
EOF
export SLURM_CONF="$T/slurm.conf"
slurmctld -D -f "$T/slurm.conf" >"$T/log/slurmctld.out" 2>&1 &
slurmd -D -N localhost -f "$T/slurm.conf" >"$T/log/slurmd.out" 2>&1 &
state=""
for _ in $(seq 1 100); do
  state=$(sinfo -h -n localhost -o %T 2>/dev/null | head -1)
  [ "$state" = "idle" ] && break
  sleep 0.2
done
[ "$state" = "idle" ] || skip "slurm node did not become idle (state '$state'; logs in $T/log)"

# The recipe from the README: an array of N parts, then a combine job after all of them succeed.
cat > "$T/work/suite.json" <<'EOF'
{ "title": "slurm recipe check: two drifting walks", "seed": 8086,
  "walks": [ { "law": "gaussian", "mean": [1, 0], "cov": [[1, 0], [0, 1]] },
             { "law": "gaussian", "mean": [0, 1], "cov": [[1, 0.3], [0.3, 0.5]] } ],
  "measure": ["perimeter", "diameter", "area", "vertices"], "n": [10, 50, 250], "paths": 4000 }
EOF
N=4
cd "$T/work"
cat > parts.sbatch <<EOF
#!/bin/bash
#SBATCH --job-name=walkhull-parts
#SBATCH --array=0-$((N - 1))
#SBATCH --cpus-per-task=1
#SBATCH --output=$T/work/part-%a.log
node "$CLI" run "$T/work/suite.json" --part \$SLURM_ARRAY_TASK_ID --parts $N --workers 1 --quiet --out "$T/work/part-\$SLURM_ARRAY_TASK_ID.json"
EOF
ARRAY=$(sbatch --parsable parts.sbatch) || { echo "sbatch of the array failed"; exit 1; }
ARRAY=${ARRAY%%;*}
PARTS=$(for i in $(seq 0 $((N - 1))); do printf '%s ' "$T/work/part-$i.json"; done)
COMBINE=$(sbatch --parsable --dependency=afterok:"$ARRAY" --job-name=walkhull-combine --output="$T/work/combine.log" \
  --wrap="node '$CLI' combine $PARTS --no-checks --out '$T/work/combined.json'") || { echo "sbatch of the combine job failed"; exit 1; }
COMBINE=${COMBINE%%;*}
echo "submitted array $ARRAY ($N tasks) and combine $COMBINE (afterok)"
for _ in $(seq 1 600); do
  [ -z "$(squeue -h -j "$ARRAY,$COMBINE" 2>/dev/null)" ] && break
  sleep 0.5
done
for id in "$COMBINE"; do
  st=$(scontrol -o show job "$id" 2>/dev/null | grep -o 'JobState=[A-Z_]*' | head -1)
  echo "combine job $id: ${st:-gone from the controller}"
done
[ -f "$T/work/combined.json" ] || { echo "no combined report; logs:"; cat "$T"/work/*.log 2>/dev/null | tail -20; exit 1; }

node "$CLI" run "$T/work/suite.json" --workers 2 --quiet --no-checks --out "$T/work/single.json" >/dev/null || exit 1
node -e '
const fs = require("fs");
const a = JSON.parse(fs.readFileSync(process.argv[1])), b = JSON.parse(fs.readFileSync(process.argv[2]));
const same = JSON.stringify(a.results) === JSON.stringify(b.results) && JSON.stringify(a.blocks) === JSON.stringify(b.blocks);
console.log(same ? "slurm array of 4 parts + combine: same bits as one run (" + a.results.length + " results, " + a.blocks.length + " blocks)" : "MISMATCH between the combined array and one run");
process.exit(same ? 0 : 1);
' "$T/work/combined.json" "$T/work/single.json"
