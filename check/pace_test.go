package check

import (
	"runtime/debug"
	"strings"
	"testing"
)

// gcPercent reads the collector's target.
func gcPercent() int {
	p := debug.SetGCPercent(100)
	debug.SetGCPercent(p)
	return p
}

// TestHoldPace: the target is raised while any check holds it and put
// back when the last lets go; a release called twice counts once; a
// higher target and a collector switched off are left as they are.
func TestHoldPace(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	a := holdPace()
	b := holdPace()
	if got := gcPercent(); got != buildGCPercent {
		t.Fatalf("held: target %d, want %d", got, buildGCPercent)
	}
	a()
	a() // counts once
	if got := gcPercent(); got != buildGCPercent {
		t.Errorf("one of two released (twice): target %d, want %d", got, buildGCPercent)
	}
	b()
	if got := gcPercent(); got != 100 {
		t.Errorf("both released: target %d, want 100 back", got)
	}
	for _, was := range []int{-1, 800} {
		debug.SetGCPercent(was)
		release := holdPace()
		if got := gcPercent(); got != was {
			t.Errorf("held over %d: target %d, want it left alone", was, got)
		}
		release()
		if got := gcPercent(); got != was {
			t.Errorf("released over %d: target %d", was, got)
		}
	}
}

// TestSourcePutsPaceBack: a large design's check puts the collector's
// target back when it ends, and also when its build panics.
func TestSourcePutsPaceBack(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	pad := "# " + strings.Repeat("x", 1000) + "\n"
	src := []byte("include \"other.nodal\"\nground gnd\n" + strings.Repeat(pad, collectAfterBuild/len(pad)+1))
	if _, err := Source("big.nodal", src, &Options{ReadFile: func(string) ([]byte, error) { return []byte("ground gnd\n"), nil }}); err != nil {
		t.Fatal(err)
	}
	if got := gcPercent(); got != 100 {
		t.Errorf("after a check: target %d, want 100", got)
	}
	func() {
		defer func() {
			if recover() == nil {
				t.Error("the include's reader did not panic")
			}
		}()
		Source("big.nodal", src, &Options{ReadFile: func(string) ([]byte, error) { panic("reader") }})
	}()
	if got := gcPercent(); got != 100 {
		t.Errorf("after a check that panicked: target %d, want 100", got)
	}
}
