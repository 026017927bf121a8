#!/usr/bin/env bash
# Runs the stage benchmarks (internal/bench) COUNT times each and prints,
# per stage and design, the median time per operation at 10 k, 100 k and
# 1 M parts, the median throughput at the largest size, and the growth
# exponent: the least-squares slope of log(time) against log(parts).
#
#   scripts/bench-stages.sh                  # COUNT=5, every benchmark
#   COUNT=3 BENCH='Parse|Topology' scripts/bench-stages.sh
#   CPU=1 BENCH='^BenchmarkParse$' scripts/bench-stages.sh   # one core (GOMAXPROCS=1)
#
# The raw `go test -bench` output is kept in bench-stages.txt (in the
# current folder) for benchstat.
set -euo pipefail
cd "$(dirname "$0")/.."
count=${COUNT:-5}
bench=${BENCH:-.}
out=${OUT:-bench-stages.txt}
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg) on $(nproc) cores" >&2
go test ./internal/bench -run '^$' -bench "$bench" -benchmem -count "$count" ${CPU:+-cpu "$CPU"} -timeout 120m >"$out"
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)" >&2
awk '
/^Benchmark/ {
  name = $1; sub(/-[0-9]+$/, "", name)
  n = split(name, p, "/"); stage = p[1]; sub(/^Benchmark/, "", stage); kind = p[2]
  parts = p[3]; sub(/parts=/, "", parts)
  key = stage "|" kind "|" parts
  keys[key] = 1; sk[stage "|" kind] = 1; sizes[stage "|" kind, parts] = 1
  for (i = 3; i <= NF; i++) {
    if ($i == "ns/op") ns[key] = ns[key] " " $(i-1)
    if ($i == "MB/s") mbs[key] = mbs[key] " " $(i-1)
    if ($i == "parts/s" || $i == "findings/s") { ps[key] = ps[key] " " $(i-1); unit[stage "|" kind] = $i }
    if ($i == "B/op") bop[key] = bop[key] " " $(i-1)
    if ($i == "allocs/op") aop[key] = aop[key] " " $(i-1)
  }
}
function median(list,   a, n, i, j, t) {
  n = split(list, a, " ")
  if (n == 0) return ""
  for (i = 1; i <= n; i++) for (j = i + 1; j <= n; j++) if (a[j] + 0 < a[i] + 0) { t = a[i]; a[i] = a[j]; a[j] = t }
  return a[int((n + 1) / 2)]
}
END {
  print "| stage | design | 10 k parts | 100 k parts | 1 M parts | throughput at largest | B/op, allocs/op at largest | growth exponent |"
  print "|---|---|---|---|---|---|---|---|"
  split("10000 100000 1000000", S, " ")
  for (sk1 in sk) order[++m] = sk1
  for (i = 1; i <= m; i++) for (j = i + 1; j <= m; j++) if (order[j] < order[i]) { t = order[i]; order[i] = order[j]; order[j] = t }
  for (o = 1; o <= m; o++) {
    k = order[o]; split(k, q, "|")
    row = "| " q[1] " | " q[2]
    sx = sy = sxx = sxy = c = 0; last = ""
    for (s = 1; s <= 3; s++) {
      key = k "|" S[s]
      med = median(ns[key])
      if (med == "") { row = row " | –"; continue }
      row = row sprintf(" | %.3g ms", med / 1e6)
      x = log(S[s]); y = log(med); sx += x; sy += y; sxx += x * x; sxy += x * y; c++
      last = key
    }
    thr = ""
    if (mbs[last] != "") thr = median(mbs[last]) " MB/s, "
    if (ps[last] != "") thr = thr sprintf("%.3g %s", median(ps[last]), unit[k])
    row = row " | " thr " | " median(bop[last]) ", " median(aop[last])
    if (c >= 2) row = row sprintf(" | %.2f |", (c * sxy - sx * sy) / (c * sxx - sx * sx))
    else row = row " | – |"
    print row
  }
}' "$out"
