package grammar

import (
	"bytes"
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"unsafe"

	"github.com/alecthomas/participle/v2/lexer"

	"nodal/internal/gen"
)

// The fast path must build exactly the tree the grammar builds. The
// reference is the grammar itself (ParseReference: participle over the
// structs of ast.go, one line per call); the checks compare whole files,
// statements, errors and comments, with reflect.DeepEqual.

func sameTree(t *testing.T, what string, src []byte) {
	t.Helper()
	got, want := Parse("x.nodal", src), ParseReference("x.nodal", src)
	if reflect.DeepEqual(got, want) {
		return
	}
	// Find the first differing statement for the message.
	for i := 0; i < len(got.Stmts) && i < len(want.Stmts); i++ {
		if !reflect.DeepEqual(got.Stmts[i], want.Stmts[i]) {
			line := got.Stmts[i].Pos.Line
			t.Fatalf("%s: statement %d (line %d %q) differs from the grammar's", what, i, line, lineOf(src, line))
		}
	}
	t.Fatalf("%s: fast path gives %d statements, %d errors; grammar %d statements, %d errors", what, len(got.Stmts), len(got.Errors), len(want.Stmts), len(want.Errors))
}

func lineOf(src []byte, n int) string {
	lines := strings.Split(string(src), "\n")
	if n-1 < len(lines) && n >= 1 {
		return lines[n-1]
	}
	return ""
}

// Every .nodal file in the repository's test data and examples.
func TestFastPathMatchesGrammarOnTestdata(t *testing.T) {
	if n := eachNodalFile(t, func(p string, src []byte) { sameTree(t, p, src) }); n == 0 {
		t.Fatal("no test data found")
	}
}

// eachNodalFile hands every .nodal file of the package's and the
// repository's test data and the examples to f, and returns how many.
func eachNodalFile(t *testing.T, f func(path string, src []byte)) int {
	t.Helper()
	n := 0
	for _, root := range []string{"testdata", "../testdata", "../examples"} {
		filepath.WalkDir(root, func(p string, e fs.DirEntry, err error) error {
			if err != nil || e.IsDir() || !strings.HasSuffix(p, ".nodal") {
				return nil
			}
			src, err := os.ReadFile(p)
			if err != nil {
				t.Fatal(err)
			}
			f(p, src)
			n++
			return nil
		})
	}
	return n
}

func TestFastPathMatchesGrammarOnGenerated(t *testing.T) {
	var b bytes.Buffer
	(&gen.Mesh{K: 40, Supplies: 4, Loads: 50, Seed: 2}).Write(&b)
	sameTree(t, "mesh", b.Bytes())
	for seed := uint64(1); seed <= 4; seed++ {
		b.Reset()
		(&gen.Random{Parts: 3000, Seed: seed}).Write(&b)
		sameTree(t, "random", b.Bytes())
	}
	b.Reset()
	(&gen.Ladder{N: 1000, Seed: 3}).Write(&b)
	sameTree(t, "ladder", b.Bytes())
}

// The fast path must really be taken for plain part lines, or the test
// above would pass by always falling back.
func TestFastPathIsTaken(t *testing.T) {
	src := "resistor R1 (a, b) 4.7 kΩ tol 1%\nled D1 (anode=x, cathode=y) vf 2 V at 20 mA\nswitch S1 (a, b) open\ncell X1 (a, b, gnd) [r = 10 Ω, q]\n"
	pl, err := (definition{}).Lex("x", strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	plx := pl.(*sliceLexer)
	pk, err := lexerUpgrade(plx)
	if err != nil {
		t.Fatal(err)
	}
	run := readRun(pk)
	if run == nil || len(run.sts) != 4 || !pk.Peek().EOF() {
		t.Fatalf("the fast path read %+v, not the four part lines", run)
	}
	for i, st := range run.sts {
		if st.Part == nil {
			t.Errorf("line %d is not a part", i+1)
		}
	}
}

// The design, ground and include lines are the fast path's too, so that a
// design of them and part lines needs no grammar parser built.
func TestFastPathTakesHeaders(t *testing.T) {
	src := "design rig \"bench rig\"\nground gnd\ninclude \"parts/common.nodal\"\nresistor R1 (a, gnd) 1 kΩ\ndesign d2\n"
	pl, err := (definition{}).Lex("x", strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	pk, err := lexerUpgrade(pl.(*sliceLexer))
	if err != nil {
		t.Fatal(err)
	}
	run := readRun(pk)
	if run == nil || len(run.sts) != 5 || !pk.Peek().EOF() {
		t.Fatalf("the fast path read %+v, not the five lines", run)
	}
	sts := run.sts
	if sts[0].Design == nil || sts[0].Design.Title == nil || sts[1].Ground == nil || sts[2].Include == nil || sts[3].Part == nil || sts[4].Design == nil || sts[4].Design.Title != nil {
		t.Fatalf("the fast path read the wrong statements: %+v", sts)
	}
	sameTree(t, "headers", []byte(src))
}

// vocabulary of tokens for random lines: every token type, the words the
// grammar treats specially, and punctuation in and out of place.
var vocabulary = []string{
	"resistor", "capacitor", "source", "diode", "wire", "switch", "led", "amp",
	"R1", "n1_2", "a", "b", "gnd", "Vin", "\"out+\"", "\"\"", "\"open",
	"(", ")", ",", "=", "[", "]", "{", "}", "+", "-", "*", "/",
	"12", "4.7", "1e3", "4k7", "R47", "2R2", "100nF", "1%", "-3", ".5", "10meg",
	"Ω", "kΩ", "mA", "V", "W", "%", "ohm", "µH",
	"tol", "rated", "vf", "at", "to", "ideality", "series", "dcr", "open", "closed",
	"design", "ground", "port", "include", "block", "param",
	"é", "\xff", "#", "# note", "$",
}

func randomLine(r *rand.Rand) string {
	var b strings.Builder
	if r.IntN(2) == 0 {
		// Start like a part, so the fast path is tried on most lines.
		b.WriteString(vocabulary[r.IntN(8)] + " R" + string(rune('a'+r.IntN(26))) + " (")
	}
	n := r.IntN(14)
	for i := 0; i < n; i++ {
		if i > 0 && r.IntN(4) != 0 {
			b.WriteByte(' ')
		}
		b.WriteString(vocabulary[r.IntN(len(vocabulary))])
	}
	return b.String()
}

// mutate changes a valid line by dropping, repeating or replacing a token.
func mutate(r *rand.Rand, line string) string {
	f := strings.Fields(line)
	if len(f) == 0 {
		return line
	}
	i := r.IntN(len(f))
	switch r.IntN(3) {
	case 0:
		f = append(f[:i], f[i+1:]...)
	case 1:
		f = append(f[:i+1], f[i:]...)
	default:
		f[i] = vocabulary[r.IntN(len(vocabulary))]
	}
	return strings.Join(f, " ")
}

func TestFastPathMatchesGrammarOnRandomLines(t *testing.T) {
	r := rand.New(rand.NewPCG(6, 6))
	valid := validLines()
	for round := 0; round < 300; round++ {
		sameTree(t, "random lines", randomSource(r, valid))
	}
}

// validLines returns lines the grammar takes: a generated random design's
// and the statements of testdata/statements.nodal, and then extra.
func validLines(extra ...string) []string {
	var b bytes.Buffer
	(&gen.Random{Parts: 400, Seed: 9}).Write(&b)
	valid := strings.Split(b.String(), "\n")
	td, _ := os.ReadFile("testdata/statements.nodal")
	valid = append(valid, strings.Split(string(td), "\n")...)
	return append(valid, extra...)
}

// randomSource returns up to 300 lines, each a random line, a valid one
// mutated, or a valid one as it is.
func randomSource(r *rand.Rand, valid []string) []byte {
	var src strings.Builder
	for i := 0; i < 1+r.IntN(300); i++ {
		switch r.IntN(3) {
		case 0:
			src.WriteString(randomLine(r))
		case 1:
			src.WriteString(mutate(r, valid[r.IntN(len(valid))]))
		default:
			src.WriteString(valid[r.IntN(len(valid))])
		}
		src.WriteByte('\n')
	}
	return []byte(src.String())
}

func FuzzFastPath(f *testing.F) {
	td, _ := os.ReadFile("testdata/statements.nodal")
	for _, l := range strings.Split(string(td), "\n") {
		f.Add(l + "\n" + l)
	}
	f.Fuzz(func(t *testing.T, src string) {
		sameTree(t, "fuzz", []byte(src))
	})
}

func lexerUpgrade(l *sliceLexer) (*lexer.PeekingLexer, error) { return lexer.Upgrade(l) }

// ParseShared builds the tree Parse builds, its texts inside src itself.
func TestParseSharedIsParse(t *testing.T) {
	var b bytes.Buffer
	(&gen.Mesh{K: 20, Supplies: 4, Loads: 20, Seed: 1}).Write(&b)
	src := b.Bytes()
	got, want := ParseShared("x.nodal", src), Parse("x.nodal", src)
	if !reflect.DeepEqual(got, want) {
		t.Fatal("ParseShared and Parse build different trees")
	}
	name := got.Stmts[len(got.Stmts)-1].Part.Name.Text
	lo, hi := uintptr(unsafe.Pointer(&src[0])), uintptr(unsafe.Pointer(&src[len(src)-1]))
	if p := uintptr(unsafe.Pointer(unsafe.StringData(name))); p < lo || p > hi {
		t.Errorf("part name %q is a copy, not a substring of src", name)
	}
}

// A line needsGrammar picks out is never one the fast path reads, so the
// parser it starts building early is always needed.
func TestNeedsGrammarOnlyWhereTheFastPathStops(t *testing.T) {
	picked := 0
	for _, line := range validLines("ambient 25 °C", "}", "block amp (in, out) {", "port vin, vout") {
		toks := appendLine(nil, line, 0, len(line), 1, nil, nil)
		if len(toks) == 0 || !needsGrammar(&toks[0]) {
			continue
		}
		picked++
		pl, err := (definition{}).Lex("x", strings.NewReader(line+"\n"))
		if err != nil {
			t.Fatal(err)
		}
		pk, err := lexerUpgrade(pl.(*sliceLexer))
		if err != nil {
			t.Fatal(err)
		}
		if readRun(pk) != nil {
			t.Errorf("%q: the fast path reads it, yet needsGrammar builds the grammar's parser for it", line)
		}
	}
	if picked < 4 {
		t.Fatalf("needsGrammar picked %d lines, want at least the four added", picked)
	}
}
