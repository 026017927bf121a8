package lsp

import (
	"fmt"
	"os"
	"runtime"
	"strings"
	"testing"
	"time"
)

// ladder writes an invented design of n resistors: a chain from a 12 V
// source with a resistor to ground at every node.
func ladder(n int, last string) string {
	var b strings.Builder
	b.WriteString("# An invented resistor ladder for the benchmarks.\nground gnd\nsource V1 (n0, gnd) 12 V\n")
	for i := 0; i < n/2; i++ {
		fmt.Fprintf(&b, "resistor RS%d (n%d, n%d) 100 Ω\n", i, i, i+1)
		fmt.Fprintf(&b, "resistor RP%d (n%d, gnd) %s\n", i, i+1, last)
	}
	return b.String()
}

// BenchmarkDiagnosticsAfterEdit measures, over the protocol, the time from
// an edit of a 2,000-part design to its diagnostics: with the server's
// default pause after an edit, and without it (the check alone).
//
//	go test -run='^$' -bench=DiagnosticsAfterEdit -benchmem ./lsp
func BenchmarkDiagnosticsAfterEdit(b *testing.B) {
	for _, c := range []struct {
		name     string
		debounce time.Duration
	}{{"default-debounce", 0}, {"no-debounce", -1}} {
		b.Run(c.name, func(b *testing.B) {
			s := newSession(b, Options{Debounce: c.debounce})
			s.initialize()
			n := 2000
			if s := os.Getenv("LADDER"); s != "" {
				fmt.Sscan(s, &n)
			}
			srcs := [2]string{ladder(n, "10 kΩ"), ladder(n, "4.7 kΩ")}
			u := s.write("ladder.nodal", srcs[0])
			s.open(u, srcs[0])
			s.diagnostics(u, 1)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				v := int32(i + 2)
				s.change(u, v, srcs[i%2])
				if ds := s.diagnostics(u, v); len(ds) != 0 {
					b.Fatalf("the ladder has findings: %v", ds[0])
				}
			}
		})
	}
}

// TestMemoryFlatOverEdits makes 10,000 edits, as fast as a client sends
// them, and checks that the server's heap and goroutines after them are
// what they were after the first 1,000: nothing piles up per edit.
func TestMemoryFlatOverEdits(t *testing.T) {
	if testing.Short() {
		t.Skip("10,000 edits")
	}
	s := newSession(t, Options{Debounce: time.Millisecond})
	s.initialize()
	src := ladder(200, "10 kΩ")
	u := s.write("ladder.nodal", src)
	s.open(u, src)
	s.diagnostics(u, 1)
	measure := func(version int32) (uint64, int) {
		s.diagnostics(u, version)
		time.Sleep(20 * time.Millisecond) // let the last check's goroutines end
		runtime.GC()
		runtime.GC()
		var m runtime.MemStats
		runtime.ReadMemStats(&m)
		return m.HeapAlloc, runtime.NumGoroutine()
	}
	edit := func(from, to int) {
		for i := from; i < to; i++ {
			// Type one more character into a comment, then remove it.
			text := src
			if i%2 == 0 {
				text = src + "# x\n"
			}
			s.change(u, int32(i), text)
		}
	}
	edit(2, 1000)
	heap1, gor1 := measure(999)
	edit(1000, 10000)
	heap2, gor2 := measure(9999)
	t.Logf("heap after 1,000 edits %d kB, after 10,000 %d kB; goroutines %d, %d", heap1>>10, heap2>>10, gor1, gor2)
	if heap2 > heap1+2<<20 {
		t.Errorf("the heap grew from %d kB to %d kB over 9,000 edits", heap1>>10, heap2>>10)
	}
	if gor2 > gor1+2 {
		t.Errorf("goroutines grew from %d to %d", gor1, gor2)
	}
}
