#!/usr/bin/env bash
# How `nodal check` grows with the size of a design: rated supply meshes
# (nodal-gen mesh -parts N, every segment `rated 1 W`) from 10 k to 4 M
# parts, each checked from process start to exit under /usr/bin/time -v,
# and the growth exponent fitted on each interval between neighbouring
# sizes: log(t2 / t1) / log(n2 / n1), for wall time and for user + system
# time (the steadier figure on a shared machine), with peak memory.
#
#   scripts/growth.sh                       # 10k … 4M; 3 runs up to 640 k, 1 above
#   SIZES="10000 40000 160000" RUNS=5 scripts/growth.sh
#   BIGRUNS=3 scripts/growth.sh
#
# Prints a Markdown table; keeps the raw /usr/bin/time output in
# $KEEP (a folder) when set. The 4 M-part mesh is a 220 MB file and needs
# several GB of memory.
set -euo pipefail
cd "$(dirname "$0")/.."
sizes=${SIZES:-"10000 40000 160000 640000 1000000 2000000 4000000"}
runs=${RUNS:-3}
bigruns=${BIGRUNS:-1}
work=$(mktemp -d "${TMPDIR:-/tmp}/nodal-growth.XXXXXX")
trap 'rm -rf "$work"' EXIT
go build -o "$work/nodal" ./cmd/nodal
go build -o "$work/nodal-gen" ./cmd/nodal-gen

median() { sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg) on $(nproc) cores; nodal $(git rev-parse --short HEAD)"
echo
echo "| parts | file MB | runs | wall s | user+sys s | peak RSS MB | exponent (wall) | exponent (user+sys) | verdict |"
echo "|---|---|---|---|---|---|---|---|---|"
prev_n=""; prev_w=""; prev_c=""
for n in $sizes; do
  f="$work/mesh.nodal"
  "$work/nodal-gen" mesh -parts "$n" >"$f"
  parts=$(($(wc -l <"$f") - 2)) # every line but the design's name and the ground is a part
  mb=$(awk -v b="$(stat -c %s "$f")" 'BEGIN {printf "%.1f", b/1e6}')
  r=$runs
  [ "$n" -ge 1000000 ] && r=$bigruns
  : >"$work/wall"; : >"$work/cpu"; : >"$work/rss"
  for i in $(seq "$r"); do
    t0=$(date +%s%N)
    /usr/bin/time -v "$work/nodal" check --no-color "$f" >/dev/null 2>"$work/err" || true
    t1=$(date +%s%N)
    [ -n "${KEEP:-}" ] && mkdir -p "$KEEP" && cp "$work/err" "$KEEP/time-$n-$i.txt"
    awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.3f\n", (b-a)/1e9}' >>"$work/wall"
    awk -F': ' '/User time/ {u=$2} /System time/ {s=$2} END {printf "%.3f\n", u+s}' "$work/err" >>"$work/cpu"
    awk -F': ' '/Maximum resident/ {printf "%.0f\n", $2/1024}' "$work/err" >>"$work/rss"
  done
  verdict=$(grep -E '^[0-9]+ errors?,' "$work/err" || echo "no summary line")
  w=$(median <"$work/wall"); c=$(median <"$work/cpu"); rss=$(median <"$work/rss")
  ew="–"; ec="–"
  if [ -n "$prev_n" ]; then
    ew=$(awk -v a="$prev_w" -v b="$w" -v m="$prev_n" -v n="$parts" 'BEGIN {printf "%.2f", log(b/a)/log(n/m)}')
    ec=$(awk -v a="$prev_c" -v b="$c" -v m="$prev_n" -v n="$parts" 'BEGIN {printf "%.2f", log(b/a)/log(n/m)}')
  fi
  echo "| $parts | $mb | $r | $w | $c | $rss | $ew | $ec | $verdict |"
  prev_n=$parts; prev_w=$w; prev_c=$c
done
echo
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
