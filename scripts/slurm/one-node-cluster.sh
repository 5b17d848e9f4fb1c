#!/usr/bin/env bash
# A one-node Slurm cluster on this machine, for the job-array test (test/cluster/slurmArray.test.ts).
#
#   scripts/slurm/one-node-cluster.sh start    # as root: munge, slurm.conf, slurmctld, slurmd; waits for the node
#   scripts/slurm/one-node-cluster.sh status   # prints the node's state (exit 0 when it takes jobs)
#   scripts/slurm/one-node-cluster.sh stop     # as root: stops the daemons this script started
#
# Needs Debian's slurm-wlm and munge (.ci/run installs them). `start` is idempotent: daemons that
# already answer are left alone, a stale pid file is ignored, and a changed configuration restarts
# them. It writes /etc/slurm/slurm.conf (where every Slurm command looks for it) with a marker line
# and refuses to overwrite one it did not write, so it never touches a real cluster's configuration.
# Daemon state, pid files and logs go to $MOONSIEVE_SLURM_STATE (default /tmp/moonsieve-slurm).
#
# No cgroups are needed: processes are tracked through /proc (proctrack/linuxproc), tasks are not
# bound to cores (task/none), and CPUs are allocated one by one (select/cons_tres with CR_CPU), so a
# 2-core machine runs two single-CPU array tasks at a time. There is no accounting database, so
# `sacct` does not work on this cluster; `sbatch --wait` reports the array's highest exit code.
set -euo pipefail

STATE=${MOONSIEVE_SLURM_STATE:-/tmp/moonsieve-slurm}
CONF=/etc/slurm/slurm.conf
MARKER='# Written by moonsieve scripts/slurm/one-node-cluster.sh: a one-node test cluster.'
WAIT_S=${MOONSIEVE_SLURM_WAIT_S:-60}

say() { printf 'slurm cluster: %s\n' "$*"; }
die() { printf 'slurm cluster: %s\n' "$*" >&2; exit 1; }

need_root() { [ "$(id -u)" -eq 0 ] || die "'$1' must run as root (it starts system daemons)"; }

need_commands() {
  local missing=()
  for c in munge unmunge munged slurmctld slurmd sinfo scontrol; do
    command -v "$c" >/dev/null 2>&1 || missing+=("$c")
  done
  [ ${#missing[@]} -eq 0 ] || die "missing ${missing[*]}: install Debian's slurm-wlm and munge (apt-get install slurm-wlm munge)"
}

# A pid file names a live process of the given command (a stale file from a killed daemon does not
# count, nor a zombie: in a container whose init does not reap, a killed daemon lingers as one).
alive() {
  local pidfile=$1 comm=$2 pid stat
  [ -s "$pidfile" ] || return 1
  pid=$(tr -dc 0-9 <"$pidfile")
  [ -n "$pid" ] || return 1
  [ "$(ps -p "$pid" -o comm= 2>/dev/null || true)" = "$comm" ] || return 1
  stat=$(ps -p "$pid" -o stat= 2>/dev/null | tr -d ' ' || true)
  [ -n "$stat" ] && [[ $stat != Z* ]]
}

munge_ok() { munge -n 2>/dev/null | unmunge >/dev/null 2>&1; }

start_munge() {
  if munge_ok; then say "munged already answers"; return; fi
  if [ ! -s /etc/munge/munge.key ]; then
    say "creating /etc/munge/munge.key"
    install -d -o munge -g munge -m 0700 /etc/munge
    mungekey --create --keyfile=/etc/munge/munge.key
    chown munge:munge /etc/munge/munge.key
    chmod 0400 /etc/munge/munge.key
  fi
  install -d -o munge -g munge -m 0755 /run/munge
  install -d -o munge -g munge -m 0700 /var/lib/munge /var/log/munge
  say "starting munged"
  # --force: run even if a killed munged left its socket behind (we checked that none answers).
  runuser -u munge -- /usr/sbin/munged --force
  for _ in $(seq 1 20); do munge_ok && return; sleep 0.25; done
  die "munged did not answer (see /var/log/munge/munged.log)"
}

# The node line from slurmd -C: this host's short name, real CPU count, sockets/cores/threads, memory (MB).
node_line() { slurmd -C | head -n 1; }

write_conf() {
  local node name
  node=$(node_line)
  name=$(sed -n 's/^NodeName=\([^ ]*\).*/\1/p' <<<"$node")
  [ -n "$name" ] || die "could not read this node's name from 'slurmd -C': $node"
  cat <<CONF
$MARKER
# Regenerated on each start; edit the script, not this file.
ClusterName=moonsieve
SlurmctldHost=$name
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
MpiDefault=none
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MailProg=/bin/true
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
ReturnToService=2
StateSaveLocation=$STATE/slurmctld
SlurmdSpoolDir=$STATE/slurmd
SlurmctldPidFile=$STATE/slurmctld.pid
SlurmdPidFile=$STATE/slurmd.pid
SlurmctldLogFile=$STATE/slurmctld.log
SlurmdLogFile=$STATE/slurmd.log
$node State=UNKNOWN
PartitionName=main Nodes=$name Default=YES MaxTime=INFINITE State=UP
CONF
}

# The node's compact state (idle, mix, alloc, down*, …), or nothing while slurmctld does not answer.
node_state() { { sinfo -h -N -o '%t' 2>/dev/null || true; } | head -n 1; }

stop_daemons() {
  local f comm pid
  for f in slurmd slurmctld; do
    comm=$f
    if alive "$STATE/$f.pid" "$comm"; then
      pid=$(cat "$STATE/$f.pid")
      say "stopping $f (pid $pid)"
      kill "$pid"
      for _ in $(seq 1 40); do alive "$STATE/$f.pid" "$comm" || break; sleep 0.25; done
      if alive "$STATE/$f.pid" "$comm"; then kill -9 "$pid"; fi
    fi
    rm -f "$STATE/$f.pid"
  done
}

start() {
  need_root start
  need_commands
  install -d -m 0755 "$STATE" "$STATE/slurmctld" "$STATE/slurmd"
  start_munge

  local new
  new=$(write_conf)
  if [ -e "$CONF" ] && ! grep -qxF "$MARKER" "$CONF"; then
    die "$CONF exists and was not written by this script; not touching a real cluster's configuration"
  fi
  if [ ! -e "$CONF" ] || [ "$(cat "$CONF")" != "$new" ]; then
    if [ -e "$CONF" ]; then say "configuration changed: restarting the daemons"; stop_daemons; fi
    install -d -m 0755 /etc/slurm
    printf '%s\n' "$new" >"$CONF.tmp"
    mv "$CONF.tmp" "$CONF"
    say "wrote $CONF"
  fi

  if alive "$STATE/slurmctld.pid" slurmctld; then say "slurmctld already running"; else
    say "starting slurmctld"; slurmctld
  fi
  if alive "$STATE/slurmd.pid" slurmd; then say "slurmd already running"; else
    say "starting slurmd"; slurmd
  fi

  local state=
  for _ in $(seq 1 $((WAIT_S * 2))); do
    state=$(node_state)
    case $state in
      idle|mix|alloc|comp) say "node is $state: ready ($(sinfo -h -N -o '%N, %c CPUs, %m MB'))"; return 0 ;;
    esac
    sleep 0.5
  done
  printf '%s\n' "--- sinfo -N -l" >&2; sinfo -N -l >&2 || true
  printf '%s\n' "--- tail $STATE/slurmctld.log" >&2; tail -n 20 "$STATE/slurmctld.log" >&2 || true
  printf '%s\n' "--- tail $STATE/slurmd.log" >&2; tail -n 20 "$STATE/slurmd.log" >&2 || true
  die "the node did not become ready within ${WAIT_S} s (state: ${state:-no answer})"
}

status() {
  command -v sinfo >/dev/null 2>&1 || die "sinfo not found (Slurm is not installed)"
  local state; state=$(node_state)
  say "node state: ${state:-no answer}"
  case $state in idle|mix|alloc|comp) return 0 ;; *) return 1 ;; esac
}

stop() {
  need_root stop
  stop_daemons
  say "stopped (munged is left running; $STATE and $CONF are kept)"
}

case ${1:-} in
  start) start ;;
  status) status ;;
  stop) stop ;;
  *) echo "usage: $0 start|status|stop" >&2; exit 2 ;;
esac
