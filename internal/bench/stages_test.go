package bench_test

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math/rand/v2"
	"runtime"
	"runtime/metrics"
	"sync"
	"testing"
	"time"

	"nodal/check"
	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
	"nodal/internal/gen"
	"nodal/rules"
	"nodal/solve"
	"nodal/topology"
)

// Sizes in parts. The mesh of each size is the nearest square mesh.
var sizes = []int{10_000, 100_000, 1_000_000}

var (
	mu      sync.Mutex
	sources = map[string][]byte{}
)

func source(b *testing.B, kind string, parts int) []byte {
	b.Helper()
	mu.Lock()
	defer mu.Unlock()
	key := fmt.Sprint(kind, parts)
	if s, ok := sources[key]; ok {
		return s
	}
	var buf bytes.Buffer
	var err error
	switch kind {
	case "mesh":
		err = (&gen.Mesh{K: gen.MeshSide(parts), Supplies: 4, Rated: 1, Seed: 1}).Write(&buf)
	case "random":
		err = (&gen.Random{Parts: parts, Seed: 1}).Write(&buf)
	case "blocks":
		err = (&gen.Blocks{N: parts / 4, Seed: 1}).Write(&buf)
	}
	if err != nil {
		b.Fatal(err)
	}
	sources[key] = buf.Bytes()
	return buf.Bytes()
}

func each(b *testing.B, f func(b *testing.B, kind string, src []byte)) {
	for _, kind := range []string{"mesh", "random", "blocks"} {
		for _, n := range sizes {
			b.Run(fmt.Sprintf("%s/parts=%d", kind, n), func(b *testing.B) {
				f(b, kind, source(b, kind, n))
			})
		}
	}
}

func perPart(b *testing.B, parts int) {
	b.ReportMetric(float64(parts)*float64(b.N)/b.Elapsed().Seconds(), "parts/s")
}

func BenchmarkParse(b *testing.B) { benchParse(b, grammar.Parse) }

// BenchmarkParsePlain is the parse the check makes (check.Source):
// plain part lines kept as records, the file read in pieces on every core.
func BenchmarkParsePlain(b *testing.B) { benchParse(b, grammar.ParsePlain) }

// benchParse times parse on every generated design, failing on a parse
// error, and reports statements (plain lines included) a second.
func benchParse(b *testing.B, parse func(name string, src []byte) *grammar.File) {
	each(b, func(b *testing.B, kind string, src []byte) {
		b.SetBytes(int64(len(src)))
		b.ReportAllocs()
		var f *grammar.File
		for b.Loop() {
			f = parse("bench.nodal", src)
		}
		if len(f.Errors) > 0 {
			b.Fatal(f.Errors[0])
		}
		perPart(b, len(f.Stmts)+f.PlainLines())
	})
}

// BenchmarkParseReference is the baseline for BenchmarkParse in the same
// run: the grammar alone, one participle call per line, no fast path. It
// skips the million-part size, which would take minutes per iteration.
func BenchmarkParseReference(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		if len(src) > 20<<20 {
			b.Skip("too slow at this size to be worth the wait")
		}
		b.SetBytes(int64(len(src)))
		b.ReportAllocs()
		var f *grammar.File
		for b.Loop() {
			f = grammar.ParseReference("bench.nodal", src)
		}
		if len(f.Errors) > 0 {
			b.Fatal(f.Errors[0])
		}
		perPart(b, len(f.Stmts))
	})
}

// BenchmarkElaborate builds the model from what the check parses
// (grammar.ParsePlain).
func BenchmarkElaborate(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		fset := diag.NewFileSet()
		file := fset.AddFile("bench.nodal", src)
		ast := grammar.ParsePlain("bench.nodal", src)
		b.ReportAllocs()
		var r *circuit.Result
		for b.Loop() {
			r = circuit.Build(file, ast)
		}
		if len(r.Findings) > 0 {
			b.Fatal("findings in a generated design")
		}
		perPart(b, len(r.Design.Parts))
	})
}

func built(b *testing.B, src []byte) (*diag.FileSet, *circuit.Result) {
	fset := diag.NewFileSet()
	file := fset.AddFile("bench.nodal", src)
	return fset, circuit.Build(file, grammar.Parse("bench.nodal", src))
}

func BenchmarkTopology(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		_, r := built(b, src)
		b.ReportAllocs()
		var t *topology.Result
		for b.Loop() {
			t = topology.Analyze(r.Design)
		}
		if !t.WellPosed() {
			b.Fatal("generated design not well posed")
		}
		perPart(b, len(r.Design.Parts))
	})
}

// BenchmarkRules runs every rule, the topology pass they share included.
func BenchmarkRules(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		fset, r := built(b, src)
		b.ReportAllocs()
		var l diag.List
		for b.Loop() {
			var err error
			l, err = rules.Run(fset, r, rules.All, nil)
			if err != nil {
				b.Fatal(err)
			}
		}
		if len(l) > 0 {
			b.Fatal("findings in a generated design")
		}
		perPart(b, len(r.Design.Parts))
	})
}

// BenchmarkOutput sorts, de-duplicates and formats one finding per ten
// parts, at random places in the file, as the command writes them.
func BenchmarkOutput(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		fset, r := built(b, src)
		parts := r.Design.Parts
		rnd := rand.New(rand.NewPCG(1, 2))
		base := make(diag.List, len(parts)/10)
		for i := range base {
			p := &parts[rnd.IntN(len(parts))]
			base[i] = diag.Diagnostic{Pos: p.Pos, End: p.End, Rule: "floating-net", Severity: diag.Warning, Message: "net " + p.Local + " touches only one pin; connect it"}
		}
		l := make(diag.List, len(base))
		b.ReportAllocs()
		for b.Loop() {
			copy(l, base)
			l.Sort(fset)
			out := l.Dedup()
			w := bufio.NewWriter(io.Discard)
			for _, d := range out {
				w.WriteString(diag.Format(fset, d))
				w.WriteByte('\n')
			}
			w.Flush()
		}
		b.ReportMetric(float64(len(base))*float64(b.N)/b.Elapsed().Seconds(), "findings/s")
	})
}

// BenchmarkCheck is the whole pipeline as the command runs it on one file.
func BenchmarkCheck(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		b.SetBytes(int64(len(src)))
		b.ReportAllocs()
		var res *check.Result
		for b.Loop() {
			var err error
			res, err = check.Source("bench.nodal", src, nil)
			if err != nil {
				b.Fatal(err)
			}
		}
		if len(res.Diags) > 0 {
			b.Fatal("findings in a generated design")
		}
		perPart(b, len(res.Build.Design.Parts))
	})
}

// BenchmarkSolve solves the DC operating point of meshes, from one small
// enough for any solver up to the million-part mesh, and fails if the
// solution breaks Kirchhoff's current law by more than solve.KCLTol of the
// largest part current. Sizes the solver on this revision refuses as too
// large are skipped, saying so.
func BenchmarkSolve(b *testing.B) {
	for _, n := range append([]int{400}, sizes...) {
		b.Run(fmt.Sprintf("mesh/parts=%d", n), func(b *testing.B) {
			_, r := built(b, source(b, "mesh", n))
			d := r.Design
			if _, err := solve.Solve(d, nil); err != nil {
				if se, ok := err.(*solve.Error); ok && se.Kind == solve.TooLarge {
					b.Skip(se.Msg)
				}
				b.Fatal(err)
			}
			b.ReportAllocs()
			var op *solve.Result
			for b.Loop() {
				var err error
				op, err = solve.Solve(d, nil)
				if err != nil {
					b.Fatal(err)
				}
			}
			rel := op.KCL / op.KCLScale
			if !(rel <= solve.KCLTol) {
				b.Fatalf("KCL residual %g of the largest current, over %g", rel, solve.KCLTol)
			}
			b.ReportMetric(rel/1e-9, "kcl/target")
			b.ReportMetric(float64(op.Unknowns), "unknowns")
			perPart(b, len(d.Parts))
		})
	}
}

// BenchmarkMemory reports what stays live per part after each stage, with
// the collector run in between: the syntax tree (and the source string it
// points into), the circuit model, and the topology result. It times
// nothing worth reading; the figures are the B/part metrics.
func BenchmarkMemory(b *testing.B) {
	each(b, func(b *testing.B, kind string, src []byte) {
		live := func() float64 {
			runtime.GC()
			var m runtime.MemStats
			runtime.ReadMemStats(&m)
			return float64(m.HeapAlloc)
		}
		var ast, model, topo float64
		var parts int
		for b.Loop() {
			m0 := live()
			fset := diag.NewFileSet()
			file := fset.AddFile("bench.nodal", src)
			f := grammar.Parse("bench.nodal", src)
			m1 := live()
			r := circuit.Build(file, f)
			m2 := live()
			t := topology.Analyze(r.Design)
			m3 := live()
			parts = len(r.Design.Parts)
			ast, model, topo = m1-m0, m2-m1, m3-m2
			runtime.KeepAlive(f)
			runtime.KeepAlive(t)
		}
		b.ReportMetric(ast/float64(parts), "ast-B/part")
		b.ReportMetric(model/float64(parts), "model-B/part")
		b.ReportMetric(topo/float64(parts), "topology-B/part")
	})
}

// meshSource is the k×k supply mesh of gen.Mesh with four corner supplies
// and k loads; with diodes it also gets k/10 + 1 diodes to ground (vf 0.6 V
// at 1 mA, so that they conduct from the 1 V mesh and Newton has work).
func meshSource(b *testing.B, k int, diodes bool) []byte {
	b.Helper()
	key := fmt.Sprint("meshk", k, diodes)
	mu.Lock()
	defer mu.Unlock()
	if s, ok := sources[key]; ok {
		return s
	}
	var buf bytes.Buffer
	if err := (&gen.Mesh{K: k, Supplies: 4, Loads: k, Rated: 1, Seed: 1}).Write(&buf); err != nil {
		b.Fatal(err)
	}
	if diodes {
		r := rand.New(rand.NewPCG(2, 3))
		for i := 0; i <= k/10; i++ {
			fmt.Fprintf(&buf, "diode dl%d (n%d_%d, gnd) vf 0.6 V at 1 mA series 2 Ω\n", i, r.IntN(k), r.IntN(k))
		}
	}
	sources[key] = buf.Bytes()
	return buf.Bytes()
}

// BenchmarkSolveMesh is the DC solve alone (solve.Solve on the built
// design) of k×k resistor meshes, k = 100 … 1000, with and without diodes
// (Newton). It reports unknowns/s, the Newton iterations, and the KCL
// residual both as the self-check measures it (kcl-rel: of the largest
// current a part carries or would carry with one end at 0 V) and against
// the largest current any part actually carries (kcl-rel-maxI); it fails
// if the self-check tolerance is missed. Run one size at a time for peak
// memory, e.g.
//
//	/usr/bin/time -v go test ./internal/bench -run '^$' -bench 'SolveMesh/k=1000/' -benchtime 1x
func BenchmarkSolveMesh(b *testing.B) {
	for _, diodes := range []bool{false, true} {
		for _, k := range []int{100, 300, 700, 1000} {
			name := fmt.Sprintf("k=%d/resistors", k)
			if diodes {
				name = fmt.Sprintf("k=%d/diodes", k)
			}
			b.Run(name, func(b *testing.B) {
				_, r := built(b, meshSource(b, k, diodes))
				d := r.Design
				b.ReportAllocs()
				var op *solve.Result
				base := heapLive()
				stop := make(chan struct{})
				peak := make(chan float64)
				go samplePeak(stop, peak)
				for b.Loop() {
					var err error
					if op, err = solve.Solve(d, nil); err != nil {
						b.Fatal(err)
					}
				}
				close(stop)
				b.ReportMetric((<-peak-base)/1e6, "solve-peak-heap-MB")
				maxI := 0.0
				for _, i := range op.I {
					maxI = max(maxI, i, -i)
				}
				if !(op.KCL <= solve.KCLTol*op.KCLScale) {
					b.Fatalf("KCL residual %g of %g", op.KCL, op.KCLScale)
				}
				// As fractions of the tolerance 1e-9 (ReportMetric prints
				// only a few decimals).
				b.ReportMetric(op.KCL/op.KCLScale/solve.KCLTol, "kcl/1e-9")
				b.ReportMetric(op.KCL/maxI/solve.KCLTol, "kcl-of-maxI/1e-9")
				b.ReportMetric(float64(op.PCGIterations), "pcg-iters")
				b.ReportMetric(float64(op.Iterations), "newton")
				b.ReportMetric(float64(op.Unknowns)*float64(b.N)/b.Elapsed().Seconds(), "unknowns/s")
				b.ReportMetric(float64(op.Unknowns), "unknowns")
			})
		}
	}
}

// heapLive returns the bytes of live heap objects after a collection.
func heapLive() float64 {
	runtime.GC()
	return heapObjects()
}

func heapObjects() float64 {
	s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	metrics.Read(s)
	return float64(s[0].Value.Uint64())
}

// samplePeak records the largest heap-object size seen every 2 ms until
// stop closes (runtime/metrics reads without stopping the world), then
// sends it. It includes garbage not yet collected, so it bounds from above
// what the solve needs live.
func samplePeak(stop <-chan struct{}, out chan<- float64) {
	t := time.NewTicker(2 * time.Millisecond)
	defer t.Stop()
	peak := 0.0
	for {
		select {
		case <-stop:
			out <- max(peak, heapObjects())
			return
		case <-t.C:
			peak = max(peak, heapObjects())
		}
	}
}

// BenchmarkCaseClash is the case-clash rule alone (and the last pass over
// its findings, none here) on the built design, at the usual sizes and on
// the 1000×1000 rated mesh (2 M parts):
//
//	go test ./internal/bench -run '^$' -bench 'CaseClash/mesh/parts=1999008' -benchtime 5x
func BenchmarkCaseClash(b *testing.B) {
	run := func(b *testing.B, src []byte) {
		fset, r := built(b, src)
		b.ReportAllocs()
		for b.Loop() {
			l, err := rules.Run(fset, r, []*rules.Analyzer{rules.CaseClash}, nil)
			if err != nil {
				b.Fatal(err)
			}
			if len(l) > 0 {
				b.Fatal("case clash in a generated design")
			}
		}
		perPart(b, len(r.Design.Parts))
	}
	each(b, func(b *testing.B, kind string, src []byte) { run(b, src) })
	m := &gen.Mesh{K: 1000, Supplies: 4, Loads: 1000}
	b.Run(fmt.Sprintf("mesh/parts=%d", m.Parts()), func(b *testing.B) { run(b, meshSource(b, 1000, false)) })
}
