#!/usr/bin/env bash
# Starts a one-node Slurm cluster on this machine for test/cluster/slurm.test.ts (run as root).
# Idempotent: a second call finds munged, slurmctld and slurmd running and only waits for the node.
# Needs Debian's packages: apt-get install -y slurmd slurmctld munge
# State, spool, pid and log files live under $CHIRPSIEVE_SLURM_DIR (default /tmp/chirpsieve-slurm);
# the configuration is written to /etc/slurm/slurm.conf, where the Slurm commands look for it.
set -euo pipefail

BASE=${CHIRPSIEVE_SLURM_DIR:-/tmp/chirpsieve-slurm}
CONF=/etc/slurm/slurm.conf
NODE=$(hostname -s)

for cmd in munged slurmctld slurmd sinfo sbatch; do
  command -v "$cmd" >/dev/null 2>&1 || PATH=$PATH:/usr/sbin
  command -v "$cmd" >/dev/null 2>&1 || { echo "slurm-up: $cmd not found; apt-get install -y slurmd slurmctld munge" >&2; exit 1; }
done
if [ "$(id -u)" != 0 ]; then echo "slurm-up: run as root" >&2; exit 1; fi

mkdir -p "$BASE/state" "$BASE/spool" "$BASE/log" /etc/slurm

running() { [ -s "$1" ] && kill -0 "$(cat "$1")" 2>/dev/null; }

# munge: a key (the package makes one; make it if missing), then the daemon.
if [ ! -s /etc/munge/munge.key ]; then
  mkdir -p /etc/munge
  if command -v mungekey >/dev/null 2>&1; then mungekey --create --keyfile=/etc/munge/munge.key
  else dd if=/dev/urandom of=/etc/munge/munge.key bs=1 count=1024 status=none; fi
fi
id munge >/dev/null 2>&1 && chown -R munge:munge /etc/munge && chmod 700 /etc/munge && chmod 400 /etc/munge/munge.key
mkdir -p /run/munge /var/lib/munge /var/log/munge
id munge >/dev/null 2>&1 && chown munge:munge /run/munge /var/lib/munge /var/log/munge
if ! munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1; then
  if id munge >/dev/null 2>&1; then
    runuser -u munge -- munged
  else
    munged --force
  fi
  for _ in $(seq 50); do munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1 && break; sleep 0.2; done
fi

# slurm.conf: this machine's CPUs and memory as slurmd sees them, one partition.
HW=$(slurmd -C | head -1 | sed "s/^NodeName=[^ ]*//")
cat >"$CONF.new" <<CONFEOF
# Written by test/cluster/slurm-up.sh (chirpsieve tests): a one-node cluster on this machine.
ClusterName=chirpsieve
SlurmctldHost=$NODE(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
ReturnToService=2
SlurmctldPort=6817
SlurmdPort=6818
StateSaveLocation=$BASE/state
SlurmdSpoolDir=$BASE/spool
SlurmctldPidFile=$BASE/slurmctld.pid
SlurmdPidFile=$BASE/slurmd.pid
SlurmctldLogFile=$BASE/log/slurmctld.log
SlurmdLogFile=$BASE/log/slurmd.log
SlurmctldTimeout=30
SlurmdTimeout=60
InactiveLimit=0
MinJobAge=300
KillWait=5
Waittime=0
NodeName=$NODE NodeAddr=127.0.0.1$HW State=UNKNOWN
PartitionName=debug Nodes=$NODE Default=YES MaxTime=INFINITE State=UP
CONFEOF
changed=0
if ! cmp -s "$CONF.new" "$CONF"; then mv "$CONF.new" "$CONF"; changed=1; else rm -f "$CONF.new"; fi

if ! running "$BASE/slurmctld.pid"; then slurmctld; elif [ "$changed" = 1 ]; then scontrol reconfigure || true; fi
if ! running "$BASE/slurmd.pid"; then slurmd; fi

# Wait (≤ 60 s) for the node to be idle (or already running jobs).
for _ in $(seq 120); do
  state=$(sinfo -h -n "$NODE" -o %T 2>/dev/null | head -1 || true)
  case "$state" in
    idle|mixed|allocated|completing) echo "slurm-up: node $NODE is $state"; exit 0 ;;
    drain*|down*) scontrol update nodename="$NODE" state=resume >/dev/null 2>&1 || true ;;
  esac
  sleep 0.5
done
echo "slurm-up: node $NODE did not become idle (state: ${state:-unknown}); see $BASE/log" >&2
exit 1
