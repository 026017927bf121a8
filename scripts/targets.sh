#!/usr/bin/env bash
# Measures the scale targets in one run: `nodal check` of the large
# generated designs, this tree's binary ("new") against a baseline
# revision ("base") built in the same run, runs alternating (base, new,
# base, new, ...) so that a machine that speeds up or slows down moves both
# alike; then the start-up, the direct-solver anchor, the parse rate and
# the case-clash rule by the scripts and benchmarks that measure them.
#
#   BASE=f5fb1da scripts/targets.sh                 # every row, 3 rounds
#   BASE=f5fb1da ROUNDS=5 scripts/targets.sh mesh1000 random1m
#
# Rows: mesh1000 (2 M parts, 110.6 MB), mesh1414 (4 M parts, 229 MB),
# random1m (1 M parts with diodes), mesh700, start (scripts/bench-start.sh),
# cholmod (scripts/cholmod-compare.sh, new only), parse (BenchmarkParsePlain
# at 1 M parts on two cores), caseclash (BenchmarkCaseClash at 2 M parts).
# Each check row gives medians of wall time, user + system time and peak
# resident memory (/usr/bin/time), the new / base ratios of the medians,
# the load average before and after the row, and the verdict line of the
# last new run. Needs several GB of memory for the 4 M-part mesh.
set -euo pipefail
cd "$(dirname "$0")/.."
base=${BASE:-main}
rounds=${ROUNDS:-3}
rows=${*:-"mesh1000 mesh1414 random1m mesh700 start cholmod parse caseclash"}
work=$(mktemp -d "${TMPDIR:-/tmp}/nodal-targets.XXXXXX")
trap 'git worktree remove --force "$work/base-src" >/dev/null 2>&1 || true; rm -rf "$work"' EXIT

git worktree add -q --detach "$work/base-src" "$base"
(cd "$work/base-src" && go build -o "$work/nodal-base" ./cmd/nodal && go test -c -o "$work/bench-base" ./internal/bench)
go build -o "$work/nodal-new" ./cmd/nodal
go test -c -o "$work/bench-new" ./internal/bench
go build -o "$work/nodal-gen" ./cmd/nodal-gen
echo "base $(git rev-parse --short "$base"), new $(git rev-parse --short HEAD)$(git diff --quiet HEAD || echo ' + changes'); $(nproc) cores"
echo

median() { sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
load() { cut -d' ' -f1 /proc/loadavg; }

# check NAME GEN-ARGS: alternating rounds of base and new on one design.
check() {
  local name=$1 args=$2 f="$work/design.nodal"
  # shellcheck disable=SC2086
  "$work/nodal-gen" $args >"$f"
  local l0 b
  l0=$(load)
  for b in base new; do : >"$work/$b.wall"; : >"$work/$b.cpu"; : >"$work/$b.rss"; done
  for _ in $(seq "$rounds"); do
    for b in base new; do
      /usr/bin/time -f '%e %U %S %M' -o "$work/time" "$work/nodal-$b" check --no-color "$f" >/dev/null 2>"$work/$b.err" || true
      read -r wall user sys rss <"$work/time"
      echo "$wall" >>"$work/$b.wall"
      awk -v u="$user" -v s="$sys" 'BEGIN {printf "%.2f\n", u + s}' >>"$work/$b.cpu"
      awk -v k="$rss" 'BEGIN {printf "%.3f\n", k / 1e6}' >>"$work/$b.rss"
    done
  done
  local bw bc br nw nc nr
  bw=$(median <"$work/base.wall"); bc=$(median <"$work/base.cpu"); br=$(median <"$work/base.rss")
  nw=$(median <"$work/new.wall"); nc=$(median <"$work/new.cpu"); nr=$(median <"$work/new.rss")
  awk -v n="$name" -v mb="$(stat -c %s "$f")" -v bw="$bw" -v bc="$bc" -v br="$br" -v nw="$nw" -v nc="$nc" -v nr="$nr" -v l0="$l0" -v l1="$(load)" -v r="$rounds" \
    'BEGIN {printf "| %s (%.1f MB) | %d | %.2f s, %.2f s, %.2f GB | %.2f s, %.2f s, %.2f GB | %.2f× wall, %.2f× cpu, %.2f× memory | %s–%s |\n", n, mb / 1e6, r, bw, bc, br, nw, nc, nr, nw / bw, nc / bc, nr / br, l0, l1}'
  echo "  new: $(grep -E '^[0-9]+ errors?,' "$work/new.err" || echo 'no verdict line')" >&2
}

table=0
header() {
  if [ "$table" = 0 ]; then
    echo "| design | rounds | base: wall, user + sys, peak | new: wall, user + sys, peak | new / base | load |"
    echo "|---|---|---|---|---|---|"
    table=1
  fi
}
bench() { # bench PATTERN BENCHTIME: alternating base and new, one run each round
  local b
  for _ in $(seq "$rounds"); do
    for b in base new; do
      (cd "$work" && "./bench-$b" -test.run '^$' -test.bench "$1" -test.benchtime "$2" -test.benchmem -test.cpu 2 | grep -E '^Benchmark' | sed "s/^/$b /")
    done
  done
}
for row in $rows; do
  case $row in
  mesh1000) header; check "1000² rated mesh" "mesh -k 1000 -loads 1000" ;;
  mesh1414) header; check "1414² rated mesh" "mesh -k 1414 -loads 1414" ;;
  mesh700) header; check "700² rated mesh" "mesh -k 700 -loads 700" ;;
  random1m) header; check "1 M-part random network" "random -parts 1000000 -seed 1" ;;
  start) table=0; echo; BASE=$base RUNS=41 scripts/bench-start.sh ;;
  cholmod) table=0; echo; K=700 RUNS=$rounds scripts/cholmod-compare.sh ;;
  parse) table=0; echo; echo "load $(load)"; bench '^BenchmarkParsePlain$/mesh/parts=1000000' 3x ;;
  caseclash) table=0; echo; echo "load $(load)"; bench '^BenchmarkCaseClash$/mesh/parts=1999008' 5x ;;
  *) echo "unknown row $row" >&2; exit 2 ;;
  esac
done
