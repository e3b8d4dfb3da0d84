#!/usr/bin/env bash
# Brings up a one-node batch cluster on this machine (controller + compute daemon + auth daemon) for the
# CI tests that submit real jobs. Safe to run again while it is up. See README.md beside this file.
set -euo pipefail

[ "$(id -u)" -eq 0 ] || exec sudo -E "$0" "$@"

CONF=/etc/slurm/slurm.conf
MARK="# Written by .ci/slurm/start.sh; rerunning it replaces this file."
LOG_DIR=/var/log/slurm
CTLD_LOG=$LOG_DIR/slurmctld.log
SLURMD_LOG=$LOG_DIR/slurmd.log
MUNGE_LOG=/var/log/munge/munged.log
CTLD_PID=/run/slurmctld.pid
SLURMD_PID=/run/slurmd.pid
MUNGE_PID=/run/munge/munged.pid
WAIT_SECONDS=${SLURM_START_WAIT:-60}

# Client commands in this script must talk to the cluster configured here, whatever the caller exported.
if [ -n "${SLURM_CONF:-}" ] && [ "$SLURM_CONF" != "$CONF" ]; then
  echo "slurm: note: SLURM_CONF=$SLURM_CONF is set in your shell; this cluster uses $CONF" >&2
fi
export SLURM_CONF=$CONF

fail() {
  echo "slurm: FAILED: $*" >&2
  for log in "$MUNGE_LOG" "$CTLD_LOG" "$SLURMD_LOG"; do
    [ -f "$log" ] && { echo "---- last lines of $log" >&2; tail -n 15 "$log" >&2; }
  done
  exit 1
}

# True when the pid file names a live process whose command name is $2.
pid_alive() {
  local pid
  [ -f "$1" ] || return 1
  pid=$(cat "$1" 2>/dev/null) || return 1
  [ -n "$pid" ] && [ "$(cat "/proc/$pid/comm" 2>/dev/null)" = "$2" ]
}

install_packages() {
  local missing=() p
  for p in slurmctld slurmd slurm-client munge; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed' || missing+=("$p")
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  local log
  log=$(mktemp)
  # The lock timeout lets this wait for another package install running on the same machine.
  # Recommends would pull in ~20 unused plugin and -dev packages; the daemons need only the Depends.
  if ! { apt-get update -qq -o DPkg::Lock::Timeout=300 &&
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends \
      -o DPkg::Lock::Timeout=300 "${missing[@]}"; } >"$log" 2>&1; then
    tail -n 20 "$log" >&2
    rm -f "$log"
    fail "apt-get install ${missing[*]}"
  fi
  rm -f "$log"
}

start_munge() {
  if pid_alive "$MUNGE_PID" munged && munge -n 2>/dev/null | unmunge >/dev/null 2>&1; then
    return 0
  fi
  install -d -o munge -g munge -m 0700 /etc/munge /var/log/munge
  install -d -o munge -g munge -m 0711 /var/lib/munge
  install -d -o munge -g munge -m 0755 /run/munge
  # A fresh random key per machine; only this host uses it, so it is never shared or committed.
  if [ ! -s /etc/munge/munge.key ] || [ "$(stat -c %s /etc/munge/munge.key)" -lt 32 ]; then
    dd if=/dev/urandom of=/etc/munge/munge.key bs=1024 count=1 status=none
  fi
  chown munge:munge /etc/munge/munge.key
  chmod 0400 /etc/munge/munge.key
  rm -f /run/munge/munge.socket.2 /run/munge/munge.socket.2.lock "$MUNGE_PID"
  # --force: container file systems often fail the daemon's strict directory-permission checks.
  runuser -u munge -- /usr/sbin/munged --force >/dev/null 2>&1 || fail "munged did not start"
  for _ in $(seq 1 50); do
    munge -n 2>/dev/null | unmunge >/dev/null 2>&1 && return 0
    sleep 0.2
  done
  fail "munged is not answering credential requests"
}

write_config() {
  local node cpus mem_mb real_mem new
  node=$(hostname -s)
  cpus=$(nproc)
  mem_mb=$(awk '/^MemTotal:/ { print int($2 / 1024) }' /proc/meminfo)
  # Declared memory must not exceed what the node reports, or the node is drained at registration.
  real_mem=$(( mem_mb / 2 < 1024 ? mem_mb / 2 : 1024 ))
  new=$(cat <<EOF
$MARK
ClusterName=ci
SlurmctldHost=$node(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
StateSaveLocation=/var/spool/slurmctld
SlurmdSpoolDir=/var/spool/slurmd
SlurmctldPidFile=$CTLD_PID
SlurmdPidFile=$SLURMD_PID
SlurmctldLogFile=$CTLD_LOG
SlurmdLogFile=$SLURMD_LOG
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/filetxt
JobCompLoc=/var/log/slurm/jobcomp.log
MpiDefault=none
MailProg=/bin/true
PropagateResourceLimits=NONE
SchedulerType=sched/backfill
SchedulerParameters=batch_sched_delay=0
DependencyParameters=kill_invalid_depend
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
MaxArraySize=100001
MaxJobCount=200000
ReturnToService=2
SlurmctldTimeout=30
SlurmdTimeout=30
MessageTimeout=10
KillWait=5
MinJobAge=300
NodeName=$node NodeHostname=$node NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$real_mem State=UNKNOWN
PartitionName=ci Nodes=$node Default=YES MaxTime=INFINITE State=UP
EOF
)
  if [ -f "$CONF" ] && ! grep -qxF "$MARK" "$CONF"; then
    fail "$CONF exists and was not written by this script; move it away first"
  fi
  if [ -f "$CONF" ] && [ "$(cat "$CONF")" = "$new" ]; then
    return 1
  fi
  install -d -m 0755 /etc/slurm
  printf '%s\n' "$new" > "$CONF.tmp"
  mv -f "$CONF.tmp" "$CONF"
  return 0
}

start_slurm() {
  install -d -m 0755 "$LOG_DIR" /var/spool/slurmd
  install -d -m 0700 /var/spool/slurmctld
  local since=$SECONDS
  if ! pid_alive "$CTLD_PID" slurmctld; then
    # -c: jobs left in the state directory by an earlier run are stale; every start begins with an empty queue.
    slurmctld -c || fail "slurmctld did not start"
    started=true
  fi
  until scontrol ping 2>/dev/null | grep -q 'is UP'; do
    # The daemon writes its pid file a moment after forking, so only a later absence means it died.
    [ $((SECONDS - since)) -lt 5 ] || pid_alive "$CTLD_PID" slurmctld || fail "slurmctld exited"
    [ $((SECONDS - since)) -lt "$WAIT_SECONDS" ] || fail "slurmctld not answering after ${WAIT_SECONDS}s"
    sleep 0.25
  done
  if ! pid_alive "$SLURMD_PID" slurmd; then
    slurmd -N "$(hostname -s)" || fail "slurmd did not start"
    started=true
  fi
}

# Waits until the node is idle (or already running jobs), returning a down/drained node to service.
wait_for_node() {
  local node state since=$SECONDS
  node=$(hostname -s)
  while :; do
    state=$(sinfo -h -n "$node" -o %T 2>/dev/null | head -n 1)
    case "$state" in
      idle | mixed | allocated | completing) return 0 ;;
      down* | drain* | fail*) scontrol update nodename="$node" state=resume >/dev/null 2>&1 || true ;;
    esac
    [ $((SECONDS - since)) -lt 5 ] || pid_alive "$SLURMD_PID" slurmd || fail "slurmd exited (node state: ${state:-unknown})"
    [ $((SECONDS - since)) -lt "$WAIT_SECONDS" ] || fail "node $node not idle after ${WAIT_SECONDS}s (state: ${state:-unknown})"
    sleep 0.25
  done
}

# Runs one trivial job end to end, so "up" means jobs really launch (credentials, spool, scheduler all work).
# A freshly started controller also holds its first scheduling pass for a few seconds; this absorbs it.
probe_job() {
  local id info since=$SECONDS
  id=$(sbatch --parsable --chdir=/ --output=/dev/null --job-name=ci-probe --wrap true 2>&1) ||
    fail "probe job not accepted: $id"
  while [ -n "$(squeue -h -j "$id" 2>/dev/null)" ]; do
    [ $((SECONDS - since)) -lt "$WAIT_SECONDS" ] || fail "probe job $id not finished after ${WAIT_SECONDS}s"
    sleep 0.25
  done
  info=$(scontrol -o show job "$id" 2>/dev/null)
  case "$info" in
    *JobState=COMPLETED*) ;;
    *) fail "probe job $id did not complete: $(grep -o 'JobState=[^ ]* Reason=[^ ]*' <<<"$info")" ;;
  esac
}

started=false
install_packages
if write_config && { pid_alive "$CTLD_PID" slurmctld || pid_alive "$SLURMD_PID" slurmd; }; then
  # The running daemons were started with another configuration (e.g. a different CPU count).
  "$(dirname "$0")/stop.sh" --keep-munge >/dev/null
fi
start_munge
start_slurm
wait_for_node
$started && probe_job
echo "slurm: one-node cluster up ($(nproc) cpus)"
