#!/usr/bin/env bash
# Times `nodal check` end to end (process start to exit) on generated
# designs with /usr/bin/time -v: wall clock and peak resident memory, the
# median of several runs. Designs are written by nodal-gen into a scratch
# folder; nothing in the repository is touched.
#
#   scripts/bench-cli.sh            # every design, 5 runs each (3 for the large ones)
#   RUNS=9 scripts/bench-cli.sh small
#   scripts/bench-cli.sh large      # only the million-part designs
#
# Prints one Markdown table row per design and the load average before and
# after, since the machine may be shared.
set -euo pipefail
cd "$(dirname "$0")/.."
which=${1:-all}
runs=${RUNS:-5}
bigruns=${BIGRUNS:-3}
work=$(mktemp -d "${TMPDIR:-/tmp}/nodal-bench.XXXXXX")
trap 'rm -rf "$work"' EXIT

go build -o "$work/nodal" ./cmd/nodal
go build -o "$work/nodal-gen" ./cmd/nodal-gen
gen="$work/nodal-gen"

# name | runs | nodal-gen arguments
# The first row is the baseline measured in the same run: "nodal version",
# the cost of starting the process at all.
designs=(
  "baseline: nodal version|$runs|version"
  "one line: ground gnd|$runs|ground"
  "random-200|$runs|random -parts 200 -seed 1"
  "mesh-10x10|$runs|mesh -k 10"
)
if [ "$which" = large ]; then
  designs+=(
    "mesh-707x707 (1 M parts)|$bigruns|mesh -parts 1000000"
    "random (1 M parts)|$bigruns|random -parts 1000000 -seed 1"
    "blocks (250 k instances, 1 M parts)|$bigruns|blocks -n 250000"
    "mesh-1000x1000 (2 M parts)|$bigruns|mesh -k 1000 -loads 1000"
  )
fi
if [ "$which" = all ]; then
  designs+=(
    "mesh-71x71 (10 k parts)|$runs|mesh -parts 10000"
    "mesh-224x224 (100 k parts)|$runs|mesh -parts 100000"
    "mesh-707x707 (1 M parts)|$bigruns|mesh -parts 1000000"
    "random (1 M parts)|$bigruns|random -parts 1000000 -seed 1"
    "blocks (250 k instances, 1 M parts)|$bigruns|blocks -n 250000"
    "mesh-700x700|$bigruns|mesh -k 700 -loads 700"
    "mesh-1000x1000 (2 M parts)|$bigruns|mesh -k 1000 -loads 1000"
  )
fi

median() { sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }

echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg) on $(nproc) cores"
echo
echo "| design | file MB | runs | wall s (median) | user+sys s (median) | peak RSS MB (median) | findings |"
echo "|---|---|---|---|---|---|---|"
for d in "${designs[@]}"; do
  IFS='|' read -r name n args <<<"$d"
  f="$work/design.nodal"
  if [ "$args" = version ]; then
    : >"$f"; cmd=(version)
  elif [ "$args" = ground ]; then
    echo 'ground gnd' >"$f"; cmd=(check --no-color "$f")
  else
    # shellcheck disable=SC2086
    "$gen" $args >"$f"
    cmd=(check --no-color "$f")
  fi
  mb=$(awk -v b="$(stat -c %s "$f")" 'BEGIN {printf "%.1f", b/1e6}')
  : >"$work/wall"; : >"$work/cpu"; : >"$work/rss"
  summary=""
  for _ in $(seq "$n"); do
    t0=$(date +%s%N)
    /usr/bin/time -v "$work/nodal" "${cmd[@]}" >/dev/null 2>"$work/err" || true
    t1=$(date +%s%N)
    # wall from our own clock: /usr/bin/time rounds to 10 ms
    awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.3f\n", (b-a)/1e9}' >>"$work/wall"
    awk -F': ' '/User time/ {u=$2} /System time/ {s=$2} END {print u+s}' "$work/err" >>"$work/cpu"
    awk -F': ' '/Maximum resident/ {printf "%.0f\n", $2/1024}' "$work/err" >>"$work/rss"
    summary=$(grep -E '^[0-9]+ errors?,' "$work/err" || true)
  done
  echo "| $name | $mb | $n | $(median <"$work/wall") | $(median <"$work/cpu") | $(median <"$work/rss") | $summary |"
done
echo
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
