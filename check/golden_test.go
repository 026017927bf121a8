package check

import (
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/diag"
	"nodal/rules"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/rules")

// TestRuleGoldens checks each testdata/rules/<rule-id>/fires.nodal and
// near_miss.nodal against the .golden file beside it: the first must fire
// its rule, the second must not. The size limit is lowered to 10 000 parts
// so that the expansion-limit pair stays small.
func TestRuleGoldens(t *testing.T) {
	t.Chdir("..") // name files as a user at the top of the repository would
	files, _ := filepath.Glob("testdata/rules/*/*.nodal")
	n := 0
	for _, f := range files {
		base := strings.TrimSuffix(filepath.Base(f), ".nodal")
		if base != "fires" && base != "near_miss" {
			continue
		}
		golden := strings.TrimSuffix(f, ".nodal") + ".golden"
		rule := filepath.Base(filepath.Dir(f))
		n++
		t.Run(rule+"/"+base, func(t *testing.T) {
			r, err := File(f, &Options{MaxParts: 10000})
			if err != nil {
				t.Fatal(err)
			}
			var b strings.Builder
			for _, d := range r.Diags {
				b.WriteString(diag.Format(r.Fset, d))
				b.WriteByte('\n')
			}
			got := b.String()
			fired := strings.Contains(got, "["+rule+"]")
			if base == "fires" && !fired {
				t.Errorf("%s does not fire %s:\n%s", f, rule, got)
			}
			if base == "near_miss" && fired {
				t.Errorf("%s fires %s:\n%s", f, rule, got)
			}
			if *update {
				if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./check -update to create it)", err)
			}
			if got != string(want) {
				t.Errorf("%s differs from %s:\ngot:\n%s\nwant:\n%s", f, golden, got, want)
			}
		})
	}
	if n == 0 {
		t.Fatal("no golden pairs under testdata/rules")
	}
}

// TestEveryRuleHasGoldens fails when a registered rule has no firing file
// or no near miss under testdata/rules, or a folder names no rule.
func TestEveryRuleHasGoldens(t *testing.T) {
	// no-convergence needs a large design to defeat every solving method;
	// package solve tests it. Every other rule has its pair.
	exempt := map[string]bool{"no-convergence": true}
	for _, a := range rules.All {
		if exempt[a.Name] {
			continue
		}
		for _, base := range []string{"fires", "near_miss"} {
			for _, ext := range []string{".nodal", ".golden"} {
				f := filepath.Join("..", "testdata", "rules", a.Name, base+ext)
				if _, err := os.Stat(f); err != nil {
					t.Errorf("rule %s: %v", a.Name, err)
				}
			}
		}
	}
	dirs, _ := filepath.Glob(filepath.Join("..", "testdata", "rules", "*"))
	for _, d := range dirs {
		if rules.Lookup(filepath.Base(d)) == nil {
			t.Errorf("%s: no registered rule has this id", d)
		}
	}
}
