package main

import (
	"os"
	"runtime/debug"
)

// tuneGC trades memory the command would hand back anyway for fewer
// collections. A check builds one large, long-lived tree and model and
// exits, so most collections while parsing a big file find little to free:
// with the collector's default (GOGC=100) a million-part file is scanned
// five times over while it is read. Collecting at 400 % growth instead,
// with a soft limit so that the heap is still held near 2.5 GiB when a file
// is that large, cuts that work. GOGC and GOMEMLIMIT set in the
// environment win.
func tuneGC() {
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(400)
	}
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(5 << 29) // 2.5 GiB
	}
}
