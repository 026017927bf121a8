package rules_test

import (
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/check"
	"nodal/diag"
	"nodal/rules"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/rules")

// TestRuleFiles checks every testdata/rules/<rule-id>/ folder: fires.nodal
// must raise the rule and near-miss.nodal must not, each with exactly the
// findings in its .golden file.
func TestRuleFiles(t *testing.T) {
	dirs, err := filepath.Glob("../testdata/rules/*")
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no rule folders: %v", err)
	}
	for _, dir := range dirs {
		rule := filepath.Base(dir)
		for _, name := range []string{"fires", "near-miss"} {
			src, err := os.ReadFile(filepath.Join(dir, name+".nodal"))
			if err != nil {
				t.Errorf("%s: %v", rule, err)
				continue
			}
			path := filepath.ToSlash(filepath.Join("testdata/rules", rule, name+".nodal"))
			res, err := check.Source(path, src, nil)
			if err != nil {
				t.Fatalf("%s: %v", path, err)
			}
			var b strings.Builder
			fired := false
			for _, d := range res.Diags {
				b.WriteString(diag.Format(res.Fset, d) + "\n")
				fired = fired || d.Rule == rule
			}
			if name == "fires" && !fired {
				t.Errorf("%s does not raise %s:\n%s", path, rule, b.String())
			}
			if name == "near-miss" && fired {
				t.Errorf("%s raises %s:\n%s", path, rule, b.String())
			}
			golden := filepath.Join(dir, name+".golden")
			if *update {
				if err := os.WriteFile(golden, []byte(b.String()), 0o644); err != nil {
					t.Fatal(err)
				}
				continue
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Errorf("%v (go test ./rules -update writes it)", err)
				continue
			}
			if b.String() != string(want) {
				t.Errorf("%s: got\n%s\nwant\n%s", path, b.String(), want)
			}
		}
	}
}

// TestDeratingConfig: a project's derating limit replaces the default.
func TestDeratingConfig(t *testing.T) {
	src := []byte("ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1kΩ rated 36 mW\n")
	count := func(cfg *rules.Config) int {
		res, err := check.Source("d.nodal", src, &check.Options{Config: cfg})
		if err != nil {
			t.Fatal(err)
		}
		n := 0
		for _, d := range res.Diags {
			if d.Rule == "near-rating" {
				n++
			}
		}
		return n
	}
	if n := count(nil); n != 1 {
		t.Errorf("default 60 %% limit: %d near-rating findings at 69 %%, want 1", n)
	}
	var cfg rules.Config
	if !cfg.Derating.Set("resistor-power", 0.75) || cfg.Derating.Set("no-such-key", 0.5) {
		t.Fatal("Derating.Set accepts the wrong keys")
	}
	if n := count(&cfg); n != 0 {
		t.Errorf("75 %% limit: %d near-rating findings at 69 %%, want 0", n)
	}
}
