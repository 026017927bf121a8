package rules_test

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"slices"
	"testing"

	"nodal/check"
	"nodal/diag"
	"nodal/internal/gen"
	"nodal/rules"
)

// runBoth runs the analyzers on a checked design one after another and
// then concurrently (several times, on more goroutines than cores, so
// that the passes end in different orders) and fails unless every run
// gives the same findings, the same analyzers' results and the same error.
func runBoth(t *testing.T, name string, res *check.Result, cfg *rules.Config) {
	t.Helper()
	defer func(from int) { *rules.ConcurrentFrom = from }(*rules.ConcurrentFrom)
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(8))
	*rules.ConcurrentFrom = 1 << 62
	run := func() (diag.List, []string, string) {
		c := *cfg
		l, results, err := rules.RunResults(res.Fset, res.Build, rules.All, &c)
		var names []string
		for a := range results {
			names = append(names, a.Name)
		}
		slices.Sort(names)
		return l, names, fmt.Sprint(err)
	}
	wantL, wantR, wantErr := run()
	*rules.ConcurrentFrom = 0
	for k := range 4 {
		l, r, err := run()
		if !reflect.DeepEqual(l, wantL) {
			t.Errorf("%s, concurrent run %d: findings\n%v\nwant (one after another)\n%v", name, k, l, wantL)
		}
		if !reflect.DeepEqual(r, wantR) || err != wantErr {
			t.Errorf("%s, concurrent run %d: results of %v, error %s; want %v, %s", name, k, r, err, wantR, wantErr)
		}
	}
}

// TestConcurrentRunMatchesSerial: running the analyzers concurrently gives
// exactly what running them one after another gives, on every rule's test
// designs and the examples, with the default configuration, with accept
// comments ignored and with rules switched off or made errors.
func TestConcurrentRunMatchesSerial(t *testing.T) {
	var paths []string
	for _, g := range []string{"../testdata/rules/*/*.nodal", "../testdata/hier/*.nodal", "../examples/*.nodal"} {
		m, err := filepath.Glob(g)
		if err != nil {
			t.Fatal(err)
		}
		paths = append(paths, m...)
	}
	if len(paths) < 50 {
		t.Fatalf("only %d designs found", len(paths))
	}
	cfgs := []*rules.Config{
		{},
		{NoSuppress: true},
		{Severity: map[string]diag.Severity{"over-power": diag.Off, "solve": diag.Off, "floating-net": diag.Error, "near-rating": diag.Off}},
	}
	for _, path := range paths {
		res, err := check.File(path, nil)
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		for i, cfg := range cfgs {
			runBoth(t, fmt.Sprintf("%s (configuration %d)", path, i), res, cfg)
		}
	}
}

// TestConcurrentRunLargeDesigns: the same on larger generated designs
// with many findings or many instances: a rated mesh whose segments are
// rated far below what they carry (a finding on most parts, made while
// other passes run), a random network with diodes, and a chain of block
// instances (findings merged across instances).
func TestConcurrentRunLargeDesigns(t *testing.T) {
	dir := t.TempDir()
	for _, d := range []struct {
		name  string
		write func(io.Writer) error
	}{
		{"mesh.nodal", (&gen.Mesh{K: 30, Loads: 30, Rated: 1e-9, Seed: 1}).Write},
		{"random.nodal", (&gen.Random{Parts: 500, Seed: 1}).Write},
		{"chain.nodal", (&gen.Blocks{N: 200, Seed: 1}).Write},
	} {
		var buf bytes.Buffer
		if err := d.write(&buf); err != nil {
			t.Fatal(err)
		}
		// A floating net in every instance of the chain's block, merged
		// into one finding.
		src := bytes.Replace(buf.Bytes(), []byte("  resistor RS (in, mid) r\n"), []byte("  resistor RS (in, mid) r\n  resistor RX (mid, lonely) 1 kΩ\n"), 1)
		path := filepath.Join(dir, d.name)
		if err := os.WriteFile(path, src, 0o644); err != nil {
			t.Fatal(err)
		}
		res, err := check.File(path, nil)
		if err != nil {
			t.Fatalf("%s: %v", d.name, err)
		}
		if len(res.Diags) == 0 && d.name != "random.nodal" {
			t.Fatalf("%s: no findings; the test needs some", d.name)
		}
		t.Logf("%s: %d parts, %d findings", d.name, len(res.Build.Design.Parts), len(res.Diags))
		runBoth(t, d.name, res, &rules.Config{})
	}
}
