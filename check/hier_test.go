package check

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/diag"
	"nodal/solve"
)

// memFiles is a ReadFile over an in-memory set of files.
func memFiles(files map[string]string) func(string) ([]byte, error) {
	return func(path string) ([]byte, error) {
		if s, ok := files[filepath.ToSlash(path)]; ok {
			return []byte(s), nil
		}
		return nil, &fs.PathError{Op: "open", Path: path, Err: fs.ErrNotExist}
	}
}

func checkMem(t *testing.T, files map[string]string, top string, opt *Options) *Result {
	t.Helper()
	if opt == nil {
		opt = &Options{}
	}
	opt.ReadFile = memFiles(files)
	r, err := File(top, opt)
	if err != nil {
		t.Fatalf("check %s: %v", top, err)
	}
	return r
}

func lines(r *Result) []string {
	var out []string
	for _, d := range r.Diags {
		out = append(out, diag.Format(r.Fset, d))
	}
	return out
}

// findings returns the diagnostics of one rule.
func findings(r *Result, rule string) []diag.Diagnostic {
	var out []diag.Diagnostic
	for _, d := range r.Diags {
		if d.Rule == rule {
			out = append(out, d)
		}
	}
	return out
}

func wantOne(t *testing.T, r *Result, rule string, contains ...string) diag.Diagnostic {
	t.Helper()
	fs := findings(r, rule)
	if len(fs) != 1 {
		t.Fatalf("want one %s finding, got %d:\n%s", rule, len(fs), strings.Join(lines(r), "\n"))
	}
	for _, c := range contains {
		if !strings.Contains(fs[0].Message, c) {
			t.Errorf("%s message %q does not contain %q", rule, fs[0].Message, c)
		}
	}
	return fs[0]
}

// normal makes a hierarchical name comparable with its hand-flattened
// spelling, which writes the dots of an instance path as underscores.
func normal(s string) string { return strings.ReplaceAll(s, ".", "_") }

// TestFlatEquivalent checks each design under testdata/hier against the
// flat design written out by hand beside it: the same parts with the same
// values on the same nets, the same findings, and (for the designs that
// solve) the same DC operating point.
func TestFlatEquivalent(t *testing.T) {
	dirs, _ := filepath.Glob("../testdata/hier/*/hier.nodal")
	if len(dirs) == 0 {
		t.Fatal("no designs under testdata/hier")
	}
	solvedPairs := 0
	for _, h := range dirs {
		dir := filepath.Dir(h)
		t.Run(filepath.Base(dir), func(t *testing.T) {
			hr, err := File(h, nil)
			if err != nil {
				t.Fatal(err)
			}
			fr, err := File(filepath.Join(dir, "flat.nodal"), nil)
			if err != nil {
				t.Fatal(err)
			}
			hd, fd := hr.Build.Design, fr.Build.Design
			if len(hd.Parts) != len(fd.Parts) || len(hd.Parts) == 0 {
				t.Fatalf("hier has %d parts, flat %d", len(hd.Parts), len(fd.Parts))
			}
			for i := range hd.Parts {
				hp, fp := hd.Parts[i], fd.Parts[i]
				hs := fmt.Sprintf("%s %s (%s, %s) tol %g rated %g W %g V %g A vf %g at %g",
					normal(hd.NameOf(&hp)), hp.Kind, normal(hd.NetName(hp.Pins[0])), normal(hd.NetName(hp.Pins[1])), hp.Tol, hp.RatedPower, hp.RatedVoltage, hp.RatedCurrent, hp.VF, hp.VFAt)
				fs := fmt.Sprintf("%s %s (%s, %s) tol %g rated %g W %g V %g A vf %g at %g",
					fp.Local, fp.Kind, fd.Nets[fp.Pins[0]].Local, fd.Nets[fp.Pins[1]].Local, fp.Tol, fp.RatedPower, fp.RatedVoltage, fp.RatedCurrent, fp.VF, fp.VFAt)
				if hs != fs {
					t.Errorf("part %d:\nhier %s\nflat %s", i, hs, fs)
				}
				if math.Abs(hp.Value-fp.Value) > 1e-12*math.Abs(fp.Value) {
					t.Errorf("part %s: value %g, flat %g", hd.NameOf(&hp), hp.Value, fp.Value)
				}
			}
			key := func(r *Result) []string {
				var out []string
				for _, d := range r.Diags {
					out = append(out, d.Severity.String()+" ["+d.Rule+"] "+normal(d.Message))
				}
				sort.Strings(out)
				return out
			}
			hk, fk := key(hr), key(fr)
			if strings.Join(hk, "\n") != strings.Join(fk, "\n") {
				t.Errorf("findings differ\nhier:\n%s\nflat:\n%s", strings.Join(hk, "\n"), strings.Join(fk, "\n"))
			}
			// A finding at a statement inside a block points at the instance.
			for _, d := range hr.Diags {
				if hr.Fset.Position(d.Pos).Filename != h && len(d.Related) == 0 {
					t.Errorf("finding inside a block has no related instance: %s", diag.Format(hr.Fset, d))
				}
			}
			if sameOperatingPoint(t, hr, fr) {
				solvedPairs++
			}
		})
	}
	if solvedPairs == 0 {
		t.Error("no design under testdata/hier solves, so no operating point was compared")
	}
}

// sameOperatingPoint checks that a hierarchical design and its flat copy
// both solve or both do not, and that when they do every net has the same
// voltage and every part the same voltage and current, names mapped by
// instance path (B1.G.R in one is B1_G_R in the other). It reports whether
// an operating point was compared.
func sameOperatingPoint(t *testing.T, hr, fr *Result) bool {
	t.Helper()
	hs, fs := hr.Solved, fr.Solved
	if hs == nil || fs == nil {
		t.Fatal("the Solve pass did not run")
	}
	if (hs.OP == nil) != (fs.OP == nil) {
		t.Fatalf("hier solved: %v (%v), flat solved: %v (%v)", hs.OP != nil, hs.Err, fs.OP != nil, fs.Err)
	}
	if hs.OP == nil {
		return false
	}
	hd, fd := hr.Build.Design, fr.Build.Design
	h, f := hs.OP, fs.OP
	// The two systems order their unknowns differently, so they agree to
	// rounding, not bit for bit: compare to 1e-9 of the largest value, the
	// solver's own self-check tolerance (solve.KCLTol).
	var vs, is float64
	for _, v := range f.NetV {
		vs = math.Max(vs, math.Abs(v))
	}
	for _, i := range f.I {
		is = math.Max(is, math.Abs(i))
	}
	if vs == 0 || is == 0 {
		t.Fatalf("the flat design solves to nothing (largest voltage %g, current %g)", vs, is)
	}
	used := 0
	for i := range hd.Nets {
		if hd.Nets[i].Pins == 0 {
			continue
		}
		used++
		name := normal(hd.NetName(circuit.NetID(i)))
		j := fd.LookupNet(name)
		if j == circuit.NoNet {
			t.Errorf("net %s has no counterpart %s in the flat design", hd.NetName(circuit.NetID(i)), name)
			continue
		}
		if math.Abs(h.NetV[i]-f.NetV[j]) > solve.KCLTol*vs {
			t.Errorf("net %s: %.12g V, flat %s %.12g V", hd.NetName(circuit.NetID(i)), h.NetV[i], name, f.NetV[j])
		}
	}
	flatUsed := 0
	for j := range fd.Nets {
		if fd.Nets[j].Pins > 0 {
			flatUsed++
		}
	}
	if used != flatUsed {
		t.Errorf("hier has %d nets in use, flat %d", used, flatUsed)
	}
	flatPart := map[string]int{}
	for j := range fd.Parts {
		flatPart[fd.Parts[j].Local] = j
	}
	for i := range hd.Parts {
		name := normal(hd.PartName(circuit.PartID(i)))
		j, ok := flatPart[name]
		if !ok {
			t.Errorf("part %s has no counterpart %s in the flat design", hd.PartName(circuit.PartID(i)), name)
			continue
		}
		if math.Abs(h.V[i]-f.V[j]) > solve.KCLTol*vs {
			t.Errorf("part %s voltage: %.12g V, flat %.12g V", hd.PartName(circuit.PartID(i)), h.V[i], f.V[j])
		}
		if math.Abs(h.I[i]-f.I[j]) > solve.KCLTol*is {
			t.Errorf("part %s current: %.12g A, flat %.12g A", hd.PartName(circuit.PartID(i)), h.I[i], f.I[j])
		}
	}
	return true
}

func TestBenchFindingsInsideBlocks(t *testing.T) {
	r, err := File("../testdata/hier/bench/hier.nodal", nil)
	if err != nil {
		t.Fatal(err)
	}
	d := wantOne(t, r, "shorted-part", "BAD.RT")
	if p := r.Fset.Position(d.Pos); !strings.HasSuffix(p.Filename, "lib/parts.nodal") || p.Line != 3 {
		t.Errorf("shorted-part at %s, want lib/parts.nodal:3", p)
	}
	if len(d.Related) != 1 || r.Fset.Position(d.Related[0].Pos).Line != 6 || !strings.Contains(d.Related[0].Message, "BAD") {
		t.Errorf("related = %+v, want the BAD instance on hier.nodal line 6", d.Related)
	}
	wantOne(t, r, "source-loop", "X.W → VIN")
	wantOne(t, r, "no-dc-path", "K.mid, K.x")
}

func TestNestedPathsAndRelated(t *testing.T) {
	files := map[string]string{
		"top.nodal": `ground gnd
source V (in, gnd) 5 V
outer A (in, gnd)
`,
		"lib.nodal": ``,
	}
	files["top.nodal"] = `block inner (p, n) {
  resistor R (p, n) 1 kΩ
  resistor S (q, q) 1 kΩ
  resistor T (p, q) 1 kΩ
}
block outer (p, n) {
  inner B (p, n)
}
` + files["top.nodal"]
	r := checkMem(t, files, "top.nodal", nil)
	d := wantOne(t, r, "shorted-part", "A.B.S", "A.B.q")
	if len(d.Related) != 2 || !strings.Contains(d.Related[0].Message, "A.B (block inner)") || !strings.Contains(d.Related[1].Message, "A (block outer)") {
		t.Errorf("related = %+v, want A.B then A", d.Related)
	}
	var names []string
	for i := range r.Build.Design.Parts {
		names = append(names, r.Build.Design.PartName(circuit.PartID(i)))
	}
	if got := strings.Join(names, " "); got != "V A.B.R A.B.S A.B.T" {
		t.Errorf("parts = %s", got)
	}
}

func TestIncludeErrors(t *testing.T) {
	t.Run("missing", func(t *testing.T) {
		r := checkMem(t, map[string]string{"b/top.nodal": "include \"lib/none.nodal\"\n"}, "b/top.nodal", nil)
		d := wantOne(t, r, "bad-include", filepath.Join("b", "lib", "none.nodal"), "does not exist")
		if p := r.Fset.Position(d.Pos); p.Filename != "b/top.nodal" || p.Line != 1 {
			t.Errorf("at %s, want the include line", p)
		}
	})
	t.Run("cycle", func(t *testing.T) {
		r := checkMem(t, map[string]string{
			"top.nodal": "include \"a.nodal\"\n",
			"a.nodal":   "block x (p, n) {\n  resistor R (p, n) 1 kΩ\n}\ninclude \"b.nodal\"\n",
			"b.nodal":   "include \"a.nodal\"\n",
		}, "top.nodal", nil)
		d := wantOne(t, r, "bad-include", "include cycle: a.nodal → b.nodal → a.nodal")
		if p := r.Fset.Position(d.Pos); p.Filename != "b.nodal" || p.Line != 1 {
			t.Errorf("at %s, want b.nodal:1", p)
		}
	})
	t.Run("self", func(t *testing.T) {
		r := checkMem(t, map[string]string{"top.nodal": "include \"top.nodal\"\n"}, "top.nodal", nil)
		wantOne(t, r, "bad-include", "include cycle: top.nodal → top.nodal")
	})
	t.Run("diamond is not a cycle", func(t *testing.T) {
		r := checkMem(t, map[string]string{
			"top.nodal": "include \"a.nodal\"\ninclude \"b.nodal\"\nground gnd\nsource V (x, gnd) 1 V\nr2 U (x, gnd)\n",
			"a.nodal":   "include \"c.nodal\"\n",
			"b.nodal":   "include \"c.nodal\"\n",
			"c.nodal":   "block r2 (p, n) {\n  resistor R (p, n) 1 kΩ\n}\n",
		}, "top.nodal", nil)
		if len(r.Diags) != 0 {
			t.Errorf("want clean, got:\n%s", strings.Join(lines(r), "\n"))
		}
	})
	t.Run("reader error", func(t *testing.T) {
		opt := &Options{ReadFile: func(p string) ([]byte, error) {
			if p == "top.nodal" {
				return []byte("include \"x.nodal\"\n"), nil
			}
			return nil, errors.New("index is locked")
		}}
		r, err := File("top.nodal", opt)
		if err != nil {
			t.Fatal(err)
		}
		wantOne(t, r, "bad-include", "index is locked")
	})
	t.Run("syntax error in included file carries its name", func(t *testing.T) {
		r := checkMem(t, map[string]string{
			"top.nodal":   "include \"lib/a.nodal\"\n",
			"lib/a.nodal": "block x (p, n) {\n  resistor R (p, n) 1 kΩ\n  resistor ( \n}\n",
		}, "top.nodal", nil)
		d := wantOne(t, r, "syntax")
		if p := r.Fset.Position(d.Pos); p.Filename != filepath.Join("lib", "a.nodal") || p.Line != 3 {
			t.Errorf("at %s, want lib/a.nodal:3", p)
		}
	})
}

func TestLibraryAlone(t *testing.T) {
	r, err := File("../testdata/hier/bench/lib/parts.nodal", nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Diags) != 0 {
		t.Errorf("a library of blocks needs no ground and should be clean:\n%s", strings.Join(lines(r), "\n"))
	}
	// An error inside an unused block is still found, once.
	r = checkMem(t, map[string]string{"lib.nodal": "block a (p, n) [r = 1 kΩ] {\n  capacitor C (p, n) r\n}\n"}, "lib.nodal", nil)
	wantOne(t, r, "param-unit", "(r = 1.00 kΩ)", "capacitance")
}

func TestBlockRules(t *testing.T) {
	const lib = `block divider (top, tap, bottom) [rtop = 10 kΩ, rbot] {
  resistor RT (top, tap)    rtop
  resistor RB (tap, bottom) rbot
}
`
	cases := []struct {
		name, src, rule string
		contains        []string
		line            int
	}{
		{"unknown block", "dividr D (a, b, gnd) [rbot = 1 kΩ]\n", "unknown-block", []string{`"dividr"`, "did you mean block divider?"}, 6},
		{"too few pins", "divider D (a, gnd) [rbot = 1 kΩ]\n", "block-pin", []string{"binds 2 nets", "(top, tap, bottom)"}, 6},
		{"wrong pin name", "divider D (top=a, tapp=b, bottom=gnd) [rbot = 1 kΩ]\n", "block-pin", []string{`no pin named "tapp"`, "did you mean tap?"}, 6},
		{"mixed pins", "divider D (top=a, b, gnd) [rbot = 1 kΩ]\n", "block-pin", []string{"mixes named and positional"}, 6},
		{"unknown param", "divider D (a, b, gnd) [rbot = 1 kΩ, rtp = 1 kΩ]\n", "unknown-param", []string{"no parameter rtp", "did you mean rtop?"}, 6},
		{"missing param", "divider D (a, b, gnd)\n", "missing-param", []string{"needs parameter rbot", "no default"}, 6},
		{"param unit", "divider D (a, b, gnd) [rbot = 1 kΩ, rtop = 5 V]\n", "param-unit", []string{"rtop", "is given 5 V, a voltage"}, 6},
		{"param unit in expression", "divider D (a, b, gnd) [rbot = (1 kΩ + 1 mA)]\n", "param-unit", []string{"cannot add a resistance (1.00 kΩ) and a current (1.00 mA)"}, 6},
		{"division by zero", "divider D (a, b, gnd) [rbot = (1 V / (2 mA - 2 mA))]\n", "bad-value", []string{"division by zero"}, 6},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			src := lib + "ground gnd\n" + c.src + "source V (a, gnd) 1 V\nresistor L (b, gnd) 1 kΩ\n"
			r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
			d := wantOne(t, r, c.rule, c.contains...)
			if p := r.Fset.Position(d.Pos); p.Line != c.line {
				t.Errorf("at line %d, want %d", p.Line, c.line)
			}
			if d.Severity != diag.Error {
				t.Errorf("severity %s", d.Severity)
			}
		})
	}
	// Near miss: a correct instance is clean.
	r := checkMem(t, map[string]string{"t.nodal": lib + "ground gnd\ndivider D (a, b, gnd) [rbot = (2 * 2.2 kΩ)]\nsource V (a, gnd) 1 V\nresistor L (b, gnd) 1 kΩ\n"}, "t.nodal", nil)
	if len(r.Diags) != 0 {
		t.Errorf("want clean:\n%s", strings.Join(lines(r), "\n"))
	}
	if got := r.Build.Design.Parts[1].Value; got != 4400 {
		t.Errorf("D.RB = %g Ω, want 4400", got)
	}
}

func TestResultOfWrongUnit(t *testing.T) {
	src := `block chan (s, k) [r = 10 kΩ, i = 2 mA] {
  resistor R (s, k) (r / i)
}
ground gnd
source V (s, gnd) 1 V
chan C (s, gnd)
`
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	d := wantOne(t, r, "param-unit", "C.R", "(r / i)", "V/A²")
	if r.Fset.Position(d.Pos).Line != 2 || len(d.Related) != 1 {
		t.Errorf("at %s related %v", r.Fset.Position(d.Pos), d.Related)
	}
}

func TestRecursiveBlock(t *testing.T) {
	src := `block a (p, n) {
  b X (p, n)
}
block b (p, n) {
  resistor R (p, n) 1 kΩ
  a Y (p, n)
}
block self (p, n) {
  self Z (p, n)
}
ground gnd
a TOP (v, gnd)
source V (v, gnd) 1 V
`
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	fs := findings(r, "recursive-block")
	if len(fs) != 2 {
		t.Fatalf("want 2 recursive-block findings, got:\n%s", strings.Join(lines(r), "\n"))
	}
	if !strings.Contains(fs[0].Message, "a → b → a") || r.Fset.Position(fs[0].Pos).Line != 6 {
		t.Errorf("first: %s", diag.Format(r.Fset, fs[0]))
	}
	if !strings.Contains(fs[1].Message, "self → self") {
		t.Errorf("second: %s", diag.Format(r.Fset, fs[1]))
	}
}

// bomb writes levels of blocks, each instantiating the next fan times.
func bomb(levels, fan int) string {
	var b strings.Builder
	b.WriteString("block l0 (p, n) {\n  resistor R (p, n) 1 kΩ\n}\n")
	for l := 1; l <= levels; l++ {
		fmt.Fprintf(&b, "block l%d (p, n) {\n", l)
		for i := 0; i < fan; i++ {
			fmt.Fprintf(&b, "  l%d I%d (p, n)\n", l-1, i)
		}
		b.WriteString("}\n")
	}
	fmt.Fprintf(&b, "ground gnd\nsource V (v, gnd) 1 V\nl%d BOOM (v, gnd)\n", levels)
	return b.String()
}

func TestExpansionBombIsRefused(t *testing.T) {
	src := bomb(10, 10)
	r := checkMem(t, map[string]string{"bomb.nodal": src}, "bomb.nodal", nil)
	d := wantOne(t, r, "expansion-limit", "BOOM", "over the limit of 10 million", "--max-parts")
	if got := r.Fset.Position(d.Pos).Line; got != strings.Count(src, "\n") {
		t.Errorf("at line %d, want the BOOM instance", got)
	}
	// Refused before memory was spent: nothing of the instance was made.
	if n := len(r.Build.Design.Parts); n != 1 {
		t.Errorf("design has %d parts, want only V", n)
	}
	if n := len(r.Build.Design.Instances); n != 0 {
		t.Errorf("design has %d instances, want none", n)
	}
}

func TestLimitsFromOptions(t *testing.T) {
	// BOOM makes 8 resistors and 15 instances (itself included), and nests
	// four blocks deep (l3, l2, l1, l0); the source V comes before it.
	src := bomb(3, 2)
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", &Options{MaxParts: 24})
	if len(findings(r, "expansion-limit")) != 0 || len(r.Build.Design.Parts) != 9 || len(r.Build.Design.Instances) != 15 {
		t.Errorf("24 is enough for 1 + 23: %s, %d parts", lines(r), len(r.Build.Design.Parts))
	}
	r = checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", &Options{MaxParts: 23})
	wantOne(t, r, "expansion-limit", "expands to 23 parts and instances", "1 before it", "limit of 23")
	r = checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", &Options{MaxDepth: 4})
	if len(findings(r, "expansion-limit")) != 0 {
		t.Errorf("depth 4 fits a limit of 4: %s", lines(r))
	}
	r = checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", &Options{MaxDepth: 3})
	wantOne(t, r, "expansion-limit", "nests blocks 4 deep", "limit of 3 (--max-depth)")
}

func TestFloatingOncePerBlock(t *testing.T) {
	src := `block ch (s, k) {
  resistor R (s, a) 1 kΩ
  resistor Q (a, k) 1 kΩ
  capacitor C (a, spare) 1 nF
}
ground gnd
source V (s, gnd) 1 V
ch A (s, gnd)
ch B (s, gnd)
ch C (s, gnd)
`
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	d := wantOne(t, r, "floating-net", "net A.spare touches only one pin (pin b of A.C)", "inside block ch", "(and in 2 more instances)")
	if r.Fset.Position(d.Pos).Line != 4 || len(d.Related) != 3 || d.Related[2].Message != "also in C (block ch)" {
		t.Errorf("at %s with %d related, want line 4 and three instances", r.Fset.Position(d.Pos), len(d.Related))
	}
	// Near miss: one instance connects the net through a pin, so each of
	// the others is reported with its path.
	src2 := strings.Replace(src, "capacitor C (a, spare) 1 nF", "capacitor C (a, spare) 1 nF\n  resistor X (spare, k) 1 kΩ", 1)
	r = checkMem(t, map[string]string{"t.nodal": src2}, "t.nodal", nil)
	if n := len(findings(r, "floating-net")); n != 0 {
		t.Errorf("want no floating nets, got %s", lines(r))
	}
}

func TestUntouchedBlockPin(t *testing.T) {
	src := "block ch (s, k, unused) {\n  resistor R (s, k) 1 kΩ\n}\n"
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	d := wantOne(t, r, "floating-net", "pin unused of block ch is connected to nothing inside the block")
	if p := r.Fset.Position(d.Pos); p.Line != 1 || p.Column != 17 {
		t.Errorf("at %s, want 1:17", p)
	}
}

func TestUnusedBlock(t *testing.T) {
	src := "block spare (p, n) {\n  resistor R (p, n) 1 kΩ\n}\nground gnd\nsource V (v, gnd) 1 V\nresistor L (v, gnd) 1 kΩ\n"
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	d := wantOne(t, r, "unused-block", "block spare")
	if d.Severity != diag.Note {
		t.Errorf("severity %s, want note", d.Severity)
	}
	// A file of blocks alone is a library: no note.
	r = checkMem(t, map[string]string{"t.nodal": "block spare (p, n) {\n  resistor R (p, n) 1 kΩ\n}\n"}, "t.nodal", nil)
	if len(r.Diags) != 0 {
		t.Errorf("library: %s", lines(r))
	}
}

func TestMergedAcrossInstances(t *testing.T) {
	src := `block ch (s, k) [r = 1 kΩ] {
  resistor R (s, k) r
}
ground gnd
source V (s, gnd) 1 V
ch A (s, gnd) [r = (0 * 1 kΩ)]
ch B (s, gnd) [r = (0 * 2 kΩ)]
ch C (s, gnd) [r = (0 * 3 kΩ)]
`
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	d := wantOne(t, r, "bad-value", "A.R is 0 Ω", "and in 2 more instances")
	if len(d.Related) != 3 || d.Related[0].Message != "in A (block ch)" || d.Related[1].Message != "also in B (block ch)" {
		t.Errorf("related %v", d.Related)
	}
}

func TestTopLevelExpression(t *testing.T) {
	src := "ground gnd\nsource V (v, gnd) 1 V\nresistor R (v, gnd) (2 * 4.7 kΩ)\nresistor Q (v, gnd) x\n"
	r := checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
	if got := r.Build.Design.Parts[1].Value; got != 9400 {
		t.Errorf("R = %g, want 9400", got)
	}
	wantOne(t, r, "unknown-param", "no parameter named x", "only a block's statements")
}

func TestBlockSyntaxErrors(t *testing.T) {
	r := checkMem(t, map[string]string{"t.nodal": "}\nblock a (p) {\n  ground gnd\n"}, "t.nodal", nil)
	var msgs []string
	for _, d := range findings(r, "syntax") {
		msgs = append(msgs, d.Message)
	}
	got := strings.Join(msgs, "\n")
	for _, w := range []string{"} closes no block", "ground belongs at the top level", "block a is not closed"} {
		if !strings.Contains(got, w) {
			t.Errorf("missing %q in:\n%s", w, got)
		}
	}
}
