#!/usr/bin/env bash
# Stops the one-node batch cluster started by start.sh: cancels every job, then stops the compute daemon,
# the controller and the auth daemon. Never fails because something is already stopped.
# --keep-munge leaves the auth daemon running (used by start.sh when it only needs to restart the others).
set -uo pipefail

[ "$(id -u)" -eq 0 ] || exec sudo -E "$0" "$@"

export SLURM_CONF=/etc/slurm/slurm.conf
CTLD_PID=/run/slurmctld.pid
SLURMD_PID=/run/slurmd.pid
MUNGE_PID=/run/munge/munged.pid
keep_munge=false
first=TERM
[ "${1:-}" = "--keep-munge" ] && keep_munge=true

# Prints the pid from pid file $1 if that process is alive and its command name is $2.
live_pid() {
  local pid
  pid=$(cat "$1" 2>/dev/null) || return 1
  [ -n "$pid" ] && [ "$(cat "/proc/$pid/comm" 2>/dev/null)" = "$2" ] && echo "$pid"
}

# Sends each signal of $4 in turn (NONE: just wait), allowing $3 seconds after each for the daemon to exit.
stop_daemon() {
  local pidfile=$1 name=$2 grace=$3 signals=$4 pid sig
  pid=$(live_pid "$pidfile" "$name") || { rm -f "$pidfile"; return 0; }
  for sig in $signals; do
    [ "$sig" != NONE ] && kill -s "$sig" "$pid" 2>/dev/null
    for _ in $(seq 1 $((grace * 5))); do
      [ "$(cat "/proc/$pid/comm" 2>/dev/null)" = "$name" ] || { rm -f "$pidfile"; return 0; }
      sleep 0.2
    done
  done
  echo "slurm: warning: $name (pid $pid) did not exit" >&2
}

if live_pid "$CTLD_PID" slurmctld >/dev/null && command -v squeue >/dev/null; then
  jobs=$(timeout 10 squeue -h -o %F 2>/dev/null | sort -u)
  if [ -n "$jobs" ]; then
    # shellcheck disable=SC2086 # one argument per job id
    timeout 10 scancel $jobs 2>/dev/null
    for _ in $(seq 1 30); do
      [ -z "$(timeout 5 squeue -h -o %i 2>/dev/null)" ] && break
      sleep 0.5
    done
  fi
  # Asks the controller to stop itself and the compute daemon in order.
  timeout 10 scontrol shutdown >/dev/null 2>&1 && first=NONE
fi

# When the controller accepted the shutdown request, the batch daemons get time to exit before any signal.
stop_daemon "$SLURMD_PID" slurmd 10 "$first TERM KILL"
stop_daemon "$CTLD_PID" slurmctld 10 "$first TERM KILL"
$keep_munge || stop_daemon "$MUNGE_PID" munged 5 "TERM KILL"
echo "slurm: stopped"
exit 0
