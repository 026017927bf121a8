#!/usr/bin/env bash
# Times `nodal check` of a small design from process start to exit, the
# binary of this tree against a baseline revision built in the same run,
# alternating one run of each, and prints the medians and their ratio.
#
#   scripts/bench-start.sh              # baseline: main; 41 runs of each
#   BASE=eb68036 RUNS=61 scripts/bench-start.sh
#
# Three places are timed: inside a git repository (a fresh clone of this
# repository's HEAD, about a hundred .nodal files, with the design
# untracked at its top level, named from there), outside any repository
# (a scratch folder), and `nodal version` outside (the cost of starting the
# process at all). Each run is one process started and waited for from a
# Python timer (posix_spawn and perf_counter), output to /dev/null; its
# processor time (user + system, git processes it starts included) comes
# from wait4, steadier than wall time on a busy machine. RT=1 (as root)
# runs each timed process under the real-time FIFO policy (priority 50,
# set by posix_spawn itself, so that no chrt process is timed with it), so
# that on a shared machine it does not wait behind other people's work:
# the nearest thing to a quiet machine short of having one (each run is a
# few milliseconds; the kernel's real-time throttling still applies).
set -euo pipefail
cd "$(dirname "$0")/.."
base=${BASE:-main}
runs=${RUNS:-41}
parts=${PARTS:-200}
work=$(mktemp -d "${TMPDIR:-/tmp}/nodal-start.XXXXXX")
trap 'git worktree remove --force "$work/base-src" >/dev/null 2>&1 || true; rm -rf "$work"' EXIT

git worktree add -q --detach "$work/base-src" "$base"
(cd "$work/base-src" && go build -o "$work/nodal-base" ./cmd/nodal)
go build -o "$work/nodal-new" ./cmd/nodal
go build -o "$work/nodal-gen" ./cmd/nodal-gen
"$work/nodal-gen" random -parts "$parts" -seed 1 >"$work/design.nodal"

git clone -q "$(pwd)" "$work/repo"
cp "$work/design.nodal" "$work/repo/design.nodal"
mkdir "$work/outside"
cp "$work/design.nodal" "$work/outside/design.nodal"
if git -C "$work/outside" rev-parse 2>/dev/null; then
  echo "note: $work is inside a git repository; the 'outside' rows are not" >&2
fi

echo "base $(git rev-parse --short "$base"), new $(git rev-parse --short HEAD)$(git diff --quiet HEAD || echo ' + changes'); $runs runs each, alternating"
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg) on $(nproc) cores"
python3 - "$work" "$runs" "${RT:-0}" <<'EOF'
import os, statistics, sys, time
work, runs, rt = sys.argv[1], int(sys.argv[2]), sys.argv[3] == "1"
devnull = os.open(os.devnull, os.O_WRONLY)
cases = [
    ("200-part design, inside a repository", "repo", ["check", "design.nodal"]),
    ("200-part design, outside any repository", "outside", ["check", "design.nodal"]),
    ("nodal version", "outside", ["version"]),
]
def once(binary, where, args):
    argv = [binary] + args
    sched = {"scheduler": (os.SCHED_FIFO, os.sched_param(50))} if rt else {}
    t0 = time.perf_counter_ns()
    pid = os.posix_spawn(argv[0], argv, os.environ,
                         file_actions=[(os.POSIX_SPAWN_DUP2, devnull, 1), (os.POSIX_SPAWN_DUP2, devnull, 2)], **sched)
    _, status, ru = os.wait4(pid, 0)
    wall = (time.perf_counter_ns() - t0) / 1e6
    if os.waitstatus_to_exitcode(status) not in (0, 1):
        sys.exit(f"{argv} in {where}: exit {os.waitstatus_to_exitcode(status)}")
    return wall, (ru.ru_utime + ru.ru_stime) * 1e3
print("| what | base ms | new ms | new / base | base CPU ms | new CPU ms | new / base |")
print("|---|---|---|---|---|---|---|")
for name, where, args in cases:
    os.chdir(os.path.join(work, where))
    t = {"base": [], "new": []}
    for _ in range(runs):
        for b in ("base", "new"):
            t[b].append(once(os.path.join(work, "nodal-" + b), where, args))
    mb, mn = (statistics.median(w for w, _ in t[b]) for b in ("base", "new"))
    cb, cn = (statistics.median(c for _, c in t[b]) for b in ("base", "new"))
    print(f"| {name} | {mb:.2f} | {mn:.2f} | {mn / mb:.2f} | {cb:.2f} | {cn:.2f} | {cn / cb:.2f} |")
EOF
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
