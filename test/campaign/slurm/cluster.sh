#!/usr/bin/env bash
# A one-node Slurm cluster on localhost for the campaign integration test, in a private folder with
# private ports: cluster.sh start DIR | stop DIR. Daemons are stopped by the PIDs they wrote in DIR.
# Needs root (munged and slurmd run as root here) and Debian's slurm-wlm and munge packages.
set -euo pipefail
cmd=${1:?usage: cluster.sh start|stop DIR}
S=$(realpath -m "${2:?usage: cluster.sh start|stop DIR}")

stop() {
  local name pid
  for name in slurmd slurmctld munged; do
    if [[ -f "$S/run/$name.pid" ]]; then
      pid=$(cat "$S/run/$name.pid")
      kill "$pid" 2>/dev/null || true
      for _ in $(seq 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
      kill -9 "$pid" 2>/dev/null || true
      rm -f "$S/run/$name.pid"
    fi
  done
}

start() {
  mkdir -p "$S"/{munge,state,spool,run,log}
  chmod 711 "$S/munge"
  cat > "$S/slurm.conf" <<CONF
ClusterName=wellsmith
SlurmctldHost=localhost(127.0.0.1)
SlurmctldPort=16817
SlurmdPort=16818
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$S/munge/munge.socket.2
StateSaveLocation=$S/state
SlurmdSpoolDir=$S/spool
SlurmctldPidFile=$S/run/slurmctld.pid
SlurmdPidFile=$S/run/slurmd.pid
SlurmctldLogFile=$S/log/slurmctld.log
SlurmdLogFile=$S/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/filetxt
JobCompLoc=$S/log/jobcomp.txt
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
MpiDefault=none
ReturnToService=2
NodeName=localhost NodeAddr=127.0.0.1 CPUs=$(nproc) State=UNKNOWN
PartitionName=local Nodes=localhost Default=YES MaxTime=INFINITE State=UP
CONF
  export SLURM_CONF=$S/slurm.conf
  [[ -f "$S/munge/munge.key" ]] || mungekey -c -k "$S/munge/munge.key"
  chmod 600 "$S/munge/munge.key"
  munged -f --socket="$S/munge/munge.socket.2" --key-file="$S/munge/munge.key" --pid-file="$S/run/munged.pid" \
    --log-file="$S/log/munged.log" --seed-file="$S/munge/munged.seed"
  slurmctld -c
  slurmd -N localhost
  for _ in $(seq 100); do
    if sinfo -h -o %T 2>/dev/null | grep -qx idle; then echo "slurm up in $S (SLURM_CONF=$S/slurm.conf)"; return 0; fi
    sleep 0.2
  done
  echo "cluster.sh: slurm did not come up; logs in $S/log:" >&2
  tail -n 20 "$S"/log/*.log >&2 || true
  stop
  return 1
}

case "$cmd" in
  start) start ;;
  stop) stop ;;
  *) echo "usage: cluster.sh start|stop DIR" >&2; exit 2 ;;
esac
