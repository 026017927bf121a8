#!/usr/bin/env bash
# Compares `nodal check` of a K×K supply mesh (process start to exit: read,
# parse, build, rules, solve, ratings, verdict) with the bare analyse +
# factorise + solve of the same mesh's nodal equations by CHOLMOD's
# supernodal Cholesky (SuiteSparse), single-threaded, AMD ordering, both
# measured in this one session, runs alternating, so the ratio is fair on
# a shared machine. The equations come from our generator (nodal-gen mesh
# -matrix/-rhs): one unknown per mesh net, the supply pads eliminated.
#
#   scripts/cholmod-compare.sh          # K = 700, 3 runs of each
#   K=300 RUNS=5 scripts/cholmod-compare.sh
#
# Installs Debian's libsuitesparse-dev with apt-get when CHOLMOD's header
# is missing, and builds scripts/cholmod_mesh.c against it. CHOLMOD's
# supernodal factorisation spends its time in BLAS and LAPACK: it runs with
# the system's (Debian's reference BLAS unless another is installed) and,
# unless OPENBLAS=0, also with Debian's single-threaded OpenBLAS
# (libopenblas0-serial), fetched with apt-get download and unpacked into
# the scratch folder, not installed, and loaded by LD_LIBRARY_PATH. BLAS and
# OpenMP are held to one thread. Prints the medians of wall time (and of
# processor time, steadier on a busy machine) and their ratios.
set -euo pipefail
cd "$(dirname "$0")/.."
k=${K:-700}
runs=${RUNS:-3}
if [ ! -f /usr/include/suitesparse/cholmod.h ]; then
  echo "installing libsuitesparse-dev with apt-get" >&2
  if [ "$(id -u)" = 0 ]; then sudo=""; else sudo=sudo; fi
  $sudo apt-get install -y libsuitesparse-dev >/dev/null || { $sudo apt-get update >/dev/null && $sudo apt-get install -y libsuitesparse-dev >/dev/null; }
fi
work=$(mktemp -d "${TMPDIR:-/tmp}/nodal-cholmod.XXXXXX")
trap 'rm -rf "$work"' EXIT
${CC:-cc} -O2 -o "$work/cholmod_mesh" scripts/cholmod_mesh.c -lcholmod
go build -o "$work/nodal" ./cmd/nodal
go build -o "$work/nodal-gen" ./cmd/nodal-gen
"$work/nodal-gen" mesh -k "$k" -loads "$k" -matrix "$work/g.mtx" -rhs "$work/b.mtx" >"$work/mesh.nodal"
ob=""
if [ "${OPENBLAS:-1}" != 0 ]; then
  if (cd "$work" && apt-get download libopenblas0-serial >/dev/null 2>&1) && dpkg -x "$work"/libopenblas0-serial_*.deb "$work/openblas"; then
    ob=$(dirname "$(find "$work/openblas" -name libblas.so.3 | head -1)")
  else
    echo "could not fetch libopenblas0-serial; measuring with the system's BLAS only" >&2
  fi
fi
cores=$(nproc)
export OMP_NUM_THREADS=1 OPENBLAS_NUM_THREADS=1 MKL_NUM_THREADS=1

median() { sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
field() { awk -v k="$1" '{for (i = 1; i < NF; i++) if ($i == k) print $(i + 1)}'; }
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg) on $cores cores"
blas=$(readlink -f /usr/lib/x86_64-linux-gnu/libblas.so.3 2>/dev/null || echo unknown)
: >"$work/nodal.wall"; : >"$work/nodal.cpu"; : >"$work/nodal.rss"; : >"$work/chol.wall"; : >"$work/chol.cpu"; : >"$work/ob.wall"; : >"$work/ob.cpu"
for _ in $(seq "$runs"); do
  t0=$(date +%s%N)
  /usr/bin/time -v "$work/nodal" check --no-color "$work/mesh.nodal" >/dev/null 2>"$work/err" || true
  t1=$(date +%s%N)
  awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.3f\n", (b-a)/1e9}' >>"$work/nodal.wall"
  awk -F': ' '/User time/ {u=$2} /System time/ {s=$2} END {printf "%.3f\n", u+s}' "$work/err" >>"$work/nodal.cpu"
  awk -F': ' '/Maximum resident/ {printf "%.0f\n", $2/1024}' "$work/err" >>"$work/nodal.rss"
  verdict=$(grep -E '^[0-9]+ errors?,' "$work/err" || true)
  "$work/cholmod_mesh" "$work/g.mtx" "$work/b.mtx" >"$work/chol.out"
  field total_s <"$work/chol.out" >>"$work/chol.wall"
  field cpu_s <"$work/chol.out" >>"$work/chol.cpu"
  if [ -n "$ob" ]; then
    LD_LIBRARY_PATH="$ob" "$work/cholmod_mesh" "$work/g.mtx" "$work/b.mtx" >"$work/ob.out"
    field total_s <"$work/ob.out" >>"$work/ob.wall"
    field cpu_s <"$work/ob.out" >>"$work/ob.cpu"
  fi
done
nw=$(median <"$work/nodal.wall"); nc=$(median <"$work/nodal.cpu")
cw=$(median <"$work/chol.wall"); cc=$(median <"$work/chol.cpu")
echo "mesh ${k}x${k}: $(wc -l <"$work/mesh.nodal") lines, $(stat -c %s "$work/mesh.nodal") bytes"
echo "nodal check: wall $nw s, user+sys $nc s (medians of $runs), peak RSS $(median <"$work/nodal.rss") MB; $verdict"
echo "CHOLMOD supernodal, AMD, one thread (BLAS: $blas): analyse+factorise+solve wall $cw s, processor $cc s (medians of $runs); last run: $(cat "$work/chol.out")"
awk -v a="$nw" -v b="$cw" -v c="$nc" -v d="$cc" 'BEGIN {printf "ratio nodal check / CHOLMOD bare solve (system BLAS): wall %.3f, processor time %.3f\n", a/b, c/d}'
if [ -n "$ob" ]; then
  ow=$(median <"$work/ob.wall"); oc=$(median <"$work/ob.cpu")
  echo "CHOLMOD supernodal, AMD, one thread (BLAS: Debian's OpenBLAS, serial build): analyse+factorise+solve wall $ow s, processor $oc s (medians of $runs); last run: $(cat "$work/ob.out")"
  awk -v a="$nw" -v b="$ow" -v c="$nc" -v d="$oc" 'BEGIN {printf "ratio nodal check / CHOLMOD bare solve (OpenBLAS, serial): wall %.3f, processor time %.3f\n", a/b, c/d}'
fi
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
