package circuit

import (
	"bytes"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"nodal/diag"
	"nodal/grammar"
	"nodal/internal/gen"
)

// A design read with grammar.ParsePlain, its plain part lines lent their
// nodes one at a time, builds exactly what the whole tree builds: the
// same parts, nets, instances and findings.
func samePlainBuild(t *testing.T, path string, src []byte) {
	t.Helper()
	build := func(parse func(string, []byte) *grammar.File) *Result {
		fset := diag.NewFileSet()
		file := fset.AddFile(path, src)
		read := func(p string) ([]byte, error) { return os.ReadFile(p) }
		return BuildFile(fset, file, src, parse(path, src), &Options{ReadFile: read})
	}
	got, want := build(grammar.ParsePlain), build(grammar.ParseShared)
	if !reflect.DeepEqual(got.Design, want.Design) {
		t.Fatalf("%s: the design built from plain lines differs from the tree's (%d parts, %d nets; %d, %d)", path, len(got.Design.Parts), len(got.Design.Nets), len(want.Design.Parts), len(want.Design.Nets))
	}
	if !reflect.DeepEqual(got.Findings, want.Findings) {
		t.Fatalf("%s: %d findings from plain lines, %d from the tree", path, len(got.Findings), len(want.Findings))
	}
	if got.Incomplete != want.Incomplete || got.Invalid != want.Invalid || !reflect.DeepEqual(got.Unsure, want.Unsure) || len(got.Files) != len(want.Files) {
		t.Fatalf("%s: the build's flags or files differ between plain lines and the tree", path)
	}
}

func TestPlainBuildsAsTree(t *testing.T) {
	n := 0
	for _, root := range []string{"../testdata", "../examples", "../demo"} {
		filepath.WalkDir(root, func(p string, e fs.DirEntry, err error) error {
			if err != nil || e.IsDir() || !strings.HasSuffix(p, ".nodal") {
				return nil
			}
			src, err := os.ReadFile(p)
			if err != nil {
				t.Fatal(err)
			}
			samePlainBuild(t, p, src)
			n++
			return nil
		})
	}
	if n < 20 {
		t.Fatalf("only %d test files found", n)
	}
	var b bytes.Buffer
	(&gen.Mesh{K: 30, Supplies: 4, Loads: 30, Rated: 1, Seed: 1}).Write(&b)
	samePlainBuild(t, "mesh.nodal", b.Bytes())
	b.Reset()
	(&gen.Random{Parts: 2000, Seed: 2}).Write(&b)
	samePlainBuild(t, "random.nodal", b.Bytes())
	b.Reset()
	(&gen.Blocks{N: 300, Seed: 3}).Write(&b)
	samePlainBuild(t, "blocks.nodal", b.Bytes())
	// Duplicate names, unknown kinds and bad values among plain lines.
	samePlainBuild(t, "mixed.nodal", []byte("ground gnd\nresistor R1 (a, gnd) 1 kΩ\nresistor R1 (a, gnd) 2 kΩ rated 1 W\n"+
		"capacitor R1 (a, gnd) 1 µF\nresistr R2 (a, gnd) 1 kΩ\nresistor R3 (a, gnd) 1 V\nresistor R4 (a, gnd) -1 kΩ tol 200%\n"+
		"block cell (p, q) {\nresistor R (p, q) 1 kΩ\n}\ncell C1 (a, gnd)\ncell R1 (a, gnd)\nsource V1 (a, gnd) 5 V\nsource V2 (b, gnd) 5 Ω\n"))
}
