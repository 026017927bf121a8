package check

// pace.go: the collector's pace while a large design is parsed and built.

import (
	"runtime/debug"
	"sync"
)

// buildGCPercent is the collector's target (GOGC) while a large design is
// parsed and built. Nearly everything those stages allocate stays live
// until the build ends (the plain-line records, the part and net tables),
// so the cycles the default target of 100 starts on the way find almost
// nothing to free: on the 1000² mesh the last of them marked some 890 MB
// to free 50. At 400 the first cycle comes at five times the heap
// instead of twice; Source's own cycle after the build then frees the
// records, and the default target is back for the rules.
const buildGCPercent = 400

// paced counts the checks between holdPace and its release, process-wide
// (files are checked concurrently), and keeps the target they replaced.
var paced struct {
	sync.Mutex
	n      int
	old    int
	raised bool
}

// holdPace raises the collector's target to buildGCPercent, unless it is
// higher already or the collector is off (GOGC=off), until the returned
// function is called (once; later calls do nothing). The target is put
// back when the last check holding it lets go.
func holdPace() (release func()) {
	paced.Lock()
	defer paced.Unlock()
	if paced.n == 0 {
		paced.old = debug.SetGCPercent(buildGCPercent)
		paced.raised = paced.old >= 0 && paced.old < buildGCPercent
		if !paced.raised {
			debug.SetGCPercent(paced.old)
		}
	}
	paced.n++
	return sync.OnceFunc(func() {
		paced.Lock()
		defer paced.Unlock()
		paced.n--
		if paced.n == 0 && paced.raised {
			debug.SetGCPercent(paced.old)
			paced.raised = false
		}
	})
}
