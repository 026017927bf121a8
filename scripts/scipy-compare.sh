#!/usr/bin/env bash
# Compares `nodal check` of a K×K supply mesh (process start to exit, parse
# to verdict) with SciPy's bare sparse direct solve of the same mesh's nodal
# equations, both measured in this one session so the ratio is fair on a
# shared machine. The equations come from our generator (nodal-gen mesh
# -matrix/-rhs): one unknown per mesh net, the supply pads eliminated.
#
#   scripts/scipy-compare.sh          # K = 700, 3 runs of each
#   K=300 RUNS=5 scripts/scipy-compare.sh
#
# Installs Debian's python3-scipy with apt-get when SciPy is missing.
set -euo pipefail
cd "$(dirname "$0")/.."
k=${K:-700}
runs=${RUNS:-3}
# Debian's python3-scipy belongs to Debian's Python, which may not be the
# first python3 on PATH.
py=${PYTHON:-/usr/bin/python3}
[ -x "$py" ] || py=python3
if ! "$py" -c 'import scipy' 2>/dev/null; then
  echo "installing python3-scipy with apt-get" >&2
  if [ "$(id -u)" = 0 ]; then sudo=""; else sudo=sudo; fi
  $sudo apt-get install -y python3-scipy >/dev/null || { $sudo apt-get update >/dev/null && $sudo apt-get install -y python3-scipy >/dev/null; }
fi
work=$(mktemp -d "${TMPDIR:-/tmp}/nodal-scipy.XXXXXX")
trap 'rm -rf "$work"' EXIT
go build -o "$work/nodal" ./cmd/nodal
go build -o "$work/nodal-gen" ./cmd/nodal-gen
"$work/nodal-gen" mesh -k "$k" -loads "$k" -matrix "$work/g.mtx" -rhs "$work/b.mtx" >"$work/mesh.nodal"

median() { sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg) on $(nproc) cores"
: >"$work/nodal.wall"; : >"$work/nodal.rss"; : >"$work/scipy.solve"; : >"$work/scipy.rss"
for i in $(seq "$runs"); do
  # alternate the two so that both see the same load
  t0=$(date +%s%N)
  /usr/bin/time -v "$work/nodal" check --no-color "$work/mesh.nodal" >/dev/null 2>"$work/err" || true
  t1=$(date +%s%N)
  awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.3f\n", (b-a)/1e9}' >>"$work/nodal.wall"
  awk -F': ' '/Maximum resident/ {printf "%.0f\n", $2/1024}' "$work/err" >>"$work/nodal.rss"
  verdict=$(grep -E '^[0-9]+ errors?,' "$work/err" || true)
  /usr/bin/time -v "$py" scripts/spsolve_mesh.py "$work/g.mtx" "$work/b.mtx" >"$work/py.out" 2>"$work/err"
  awk '{for(i=1;i<=NF;i++) if($i=="solve_s") print $(i+1)}' "$work/py.out" >>"$work/scipy.solve"
  awk -F': ' '/Maximum resident/ {printf "%.0f\n", $2/1024}' "$work/err" >>"$work/scipy.rss"
done
nw=$(median <"$work/nodal.wall"); sw=$(median <"$work/scipy.solve")
echo "mesh ${k}x${k}: $(wc -l <"$work/mesh.nodal") lines, $(stat -c %s "$work/mesh.nodal") bytes"
echo "nodal check: wall ${nw} s (median of $runs), peak RSS $(median <"$work/nodal.rss") MB; $verdict"
echo "scipy spsolve: bare solve ${sw} s (median of $runs), process peak RSS $(median <"$work/scipy.rss") MB; $(cat "$work/py.out")"
awk -v a="$nw" -v b="$sw" 'BEGIN {printf "ratio nodal / scipy = %.3f\n", a/b}'
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
