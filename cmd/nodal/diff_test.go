package main

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"
)

// An invented bench supply: R1 dissipates V²/R (Joule's law) = (10 V)² /
// 1 kΩ = 100 mW, 40 % of its 250 mW rating; at 15.4 V, 237.16 mW, 94.9 %.
const (
	psuBefore = `ground gnd
source V1 (vin, gnd) 10 V
resistor R1 (vin, gnd) 1 kΩ rated 250 mW
`
	psuAfter = `ground gnd
source V1 (vin, gnd) 15.4 V
resistor R1 (vin, gnd) 1 kΩ rated 250 mW
`
)

type diffDoc struct {
	Base      string `json:"base"`
	Head      string `json:"head"`
	Unchanged int    `json:"unchanged_designs"`
	Designs   []struct {
		Path   string `json:"path"`
		Status string `json:"status"`
		Parts  []struct {
			Name   string `json:"name"`
			Before *struct {
				Rating string  `json:"rating"`
				Use    float64 `json:"use"`
			} `json:"before"`
			After *struct {
				Rating string  `json:"rating"`
				Use    float64 `json:"use"`
			} `json:"after"`
		} `json:"parts"`
		Nets []struct {
			Name          string
			Before, After float64
		} `json:"nets"`
		Findings []struct {
			State   string `json:"state"`
			Rule    string `json:"rule"`
			Subject string `json:"subject"`
			Line    int    `json:"line"`
		} `json:"findings"`
	} `json:"designs"`
}

func diffJSON(t *testing.T, dir string, args ...string) (*diffDoc, int, string) {
	t.Helper()
	code, out, errs := runNodal(t, dir, "", append([]string{"diff", "--format", "json"}, args...)...)
	if code == 2 {
		t.Fatalf("nodal diff %v: exit 2: %s", args, errs)
	}
	var doc diffDoc
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("nodal diff %v: %v\n%s", args, err, out)
	}
	return &doc, code, errs
}

// A change that raises R1 from 40 % to 95 % of its power rating is a
// stress change, between two commits, between HEAD and the work tree, and
// between HEAD and the index; an untouched design is counted, not listed.
func TestDiffStressChange(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "boards", "psu.nodal"), psuBefore)
	write(t, filepath.Join(dir, "boards", "other.nodal"), goodDesign)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "psu at 10 V")
	write(t, filepath.Join(dir, "boards", "psu.nodal"), psuAfter)

	check := func(what string, doc *diffDoc) {
		t.Helper()
		if len(doc.Designs) != 1 || doc.Designs[0].Path != "boards/psu.nodal" || doc.Designs[0].Status != "changed" || doc.Unchanged != 1 {
			t.Fatalf("%s: designs %+v, %d unchanged; want boards/psu.nodal changed, 1 unchanged", what, doc.Designs, doc.Unchanged)
		}
		d := doc.Designs[0]
		if len(d.Parts) != 1 || d.Parts[0].Name != "R1" || d.Parts[0].Before == nil || d.Parts[0].After == nil {
			t.Fatalf("%s: parts %+v; want R1", what, d.Parts)
		}
		p := d.Parts[0]
		// P = V²/R: 100 mW and 237.16 mW of 250 mW.
		if p.Before.Rating != "power" || math.Abs(p.Before.Use-0.40) > 1e-9 || math.Abs(p.After.Use-0.94864) > 1e-9 {
			t.Errorf("%s: R1 %+v → %+v; want power 0.40 → 0.94864", what, *p.Before, *p.After)
		}
		if len(d.Nets) != 1 || d.Nets[0].Name != "vin" {
			t.Errorf("%s: nets %+v; want vin", what, d.Nets)
		}
	}
	doc, _, _ := diffJSON(t, dir)
	check("HEAD against the work tree", doc)
	if doc.Head != "the work tree" || !strings.Contains(doc.Base, "HEAD") {
		t.Errorf("revisions named %q and %q", doc.Base, doc.Head)
	}
	// The index still holds the old version: nothing changed there.
	doc, _, _ = diffJSON(t, dir, "--staged")
	if len(doc.Designs) != 0 || doc.Unchanged != 2 {
		t.Errorf("--staged before staging: %+v", doc.Designs)
	}
	git(t, dir, "add", ".")
	doc, _, _ = diffJSON(t, dir, "--staged")
	check("HEAD against the index", doc)
	git(t, dir, "commit", "-qm", "psu at 15.4 V")
	doc, _, _ = diffJSON(t, dir, "HEAD~1", "HEAD")
	check("two commits", doc)

	// The text form says it for a person.
	_, out, _ := runNodal(t, dir, "", "diff", "HEAD~1", "HEAD")
	if !strings.Contains(out, "R1 (resistor) power: 40 % (100 mW of 250 mW) → 95 % (237 mW of 250 mW) (+55 points)") {
		t.Errorf("text form:\n%s", out)
	}
	// A higher threshold hides the move.
	doc, _, _ = diffJSON(t, dir, "--use-change", "60", "--voltage-change", "10 V", "HEAD~1", "HEAD")
	if len(doc.Designs) != 1 || len(doc.Designs[0].Parts) != 0 || len(doc.Designs[0].Nets) != 0 {
		t.Errorf("60 points, 10 V: %+v", doc.Designs)
	}
}

// Findings between commits: one whose statement moved down is unchanged,
// one whose cause was removed is fixed, and a new one is new.
func TestDiffFindingStates(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "board.nodal"), "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, lone) 1 kΩ\nresistor R2 (vin, gone) 1 kΩ\n")
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "first")
	write(t, filepath.Join(dir, "board.nodal"), "# moved down\n\n\nground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, lone) 1 kΩ\nresistor R2 (vin, gnd) 1 kΩ\nresistor R3 (vin, fresh) 1 kΩ\n")
	git(t, dir, "commit", "-qam", "second")
	doc, code, _ := diffJSON(t, dir, "HEAD~1", "HEAD")
	if code != 0 {
		t.Errorf("exit %d with warnings only; want 0", code)
	}
	got := map[string]string{}
	for _, f := range doc.Designs[0].Findings {
		got[f.Subject] = f.State
		if f.Subject == "lone" && f.Line != 6 {
			t.Errorf("the unchanged finding is on line %d; want its new line, 6", f.Line)
		}
	}
	want := map[string]string{"lone": "unchanged", "gone": "absent", "fresh": "new"}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("%s: %q, want %q (all %v)", k, got[k], v, got)
		}
	}
	// --fail-on warning makes the new warning fail the comparison.
	if _, code, _ := diffJSON(t, dir, "--fail-on", "warning", "HEAD~1", "HEAD"); code != 1 {
		t.Errorf("--fail-on warning: exit %d, want 1", code)
	}
}

// A library changed alone changes every design that includes it, directly
// or through another file; designs added and removed are listed.
func TestDiffFollowsIncludes(t *testing.T) {
	dir := libRepo(t)
	write(t, filepath.Join(dir, "lib", "loads.nodal"), libRenamed)
	write(t, filepath.Join(dir, "boards", "added.nodal"), goodDesign+"# a new board, not the removed one moved\n")
	git(t, dir, "rm", "-q", "boards/other.nodal")
	doc, code, _ := diffJSON(t, dir)
	status := map[string]string{}
	for _, d := range doc.Designs {
		status[d.Path] = d.Status
	}
	want := map[string]string{
		"lib/loads.nodal": "changed", "lib/middle.nodal": "changed",
		"boards/direct.nodal": "changed", "boards/deep/top.nodal": "changed",
		"boards/added.nodal": "added", "boards/other.nodal": "removed",
	}
	for k, v := range want {
		if status[k] != v {
			t.Errorf("%s: %q, want %q (all %v)", k, status[k], v, status)
		}
	}
	if len(status) != len(want) || doc.Unchanged != 1 { // lib/unused.nodal
		t.Errorf("designs %v, %d unchanged; want %d listed and 1 unchanged", status, doc.Unchanged, len(want))
	}
	if code != 1 {
		t.Errorf("exit %d; the boards now name a block that is gone, want 1", code)
	}
}

// With no BASE, the comparison starts from the merge base with the
// upstream branch.
func TestDiffDefaultsToMergeBase(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "psu.nodal"), psuBefore)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "psu")
	git(t, dir, "branch", "-M", "trunk")
	git(t, dir, "checkout", "-q", "-b", "feature", "--track", "trunk")
	write(t, filepath.Join(dir, "psu.nodal"), psuAfter)
	git(t, dir, "commit", "-qam", "raise the supply")
	write(t, filepath.Join(dir, "notes.nodal"), goodDesign)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "notes")
	doc, _, _ := diffJSON(t, dir)
	if !strings.Contains(doc.Base, "merge base with trunk") {
		t.Errorf("base named %q", doc.Base)
	}
	if len(doc.Designs) != 2 {
		t.Errorf("designs %+v; want psu.nodal changed and notes.nodal added since the merge base", doc.Designs)
	}
}

// Usage mistakes and a path outside a repository are exit 2.
func TestDiffUsage(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "a.nodal"), goodDesign)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "a")
	for _, args := range [][]string{
		{"diff", "--format", "html"},
		{"diff", "--voltage-change", "5 A"},
		{"diff", "nosuchrev"},
		{"diff", "HEAD", "HEAD", "HEAD"},
		{"diff", "--staged", "HEAD", "HEAD"},
		{"diff", "--", "--output=x"},
	} {
		if code, _, errs := runNodal(t, dir, "", args...); code != 2 || errs == "" {
			t.Errorf("%v: exit %d, stderr %q; want 2 and a message", args, code, errs)
		}
	}
	if code, out, _ := runNodal(t, dir, "", "diff"); code != 0 || !strings.Contains(out, "0 unchanged") && !strings.Contains(out, "1 unchanged") {
		t.Errorf("nothing changed: exit %d\n%s", code, out)
	}
	if code, _, _ := runNodal(t, t.TempDir(), "", "diff"); code != 2 {
		t.Errorf("outside a repository: exit %d, want 2", code)
	}
}

// A nodal.toml that BASE cannot read is said on the design, and HEAD is
// compared with nothing; one that HEAD cannot read is trouble (exit 2).
func TestDiffBrokenConfig(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "nodal.toml"), "[rules]\nno-such-rule = \"error\"\n")
	write(t, filepath.Join(dir, "psu.nodal"), psuBefore)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "broken settings")
	write(t, filepath.Join(dir, "nodal.toml"), "[rules]\nfloating-net = \"error\"\n")
	doc, code, errs := diffJSON(t, dir)
	if code != 0 || len(doc.Designs) != 1 || !strings.Contains(errs, "not checked") {
		t.Errorf("broken BASE settings: exit %d, %+v\n%s", code, doc.Designs, errs)
	}
	git(t, dir, "commit", "-qam", "fixed settings")
	write(t, filepath.Join(dir, "nodal.toml"), "[rules]\nfloating-net = \"loud\"\n")
	if code, _, errs := runNodal(t, dir, "", "diff"); code != 2 || !strings.Contains(errs, "nodal.toml") {
		t.Errorf("broken HEAD settings: exit %d, %s", code, errs)
	}
}

// --ambient judges both revisions at that temperature: R1's 250 mW rating
// derated linearly from its 70 °C knee to zero at 155 °C (the IEC 60115-1
// shape with the defaults nodal documents, common practice for
// thick-film chips) is 250 mW · (155 − 125) / (155 − 70) = 88.2 mW at
// 125 °C, so 100 mW is 113 % of it.
func TestDiffAmbient(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "psu.nodal"), psuBefore)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "psu")
	write(t, filepath.Join(dir, "psu.nodal"), psuAfter)
	doc, _, errs := diffJSON(t, dir, "--ambient", "125 °C")
	if len(doc.Designs) != 1 || len(doc.Designs[0].Parts) != 1 {
		t.Fatalf("%+v\n%s", doc.Designs, errs)
	}
	want := 0.1 / (0.25 * 30 / 85)
	if got := doc.Designs[0].Parts[0].Before.Use; math.Abs(got-want) > 1e-6 {
		t.Errorf("R1 at 125 °C uses %v of its derated rating before the change; want %v", got, want)
	}
}

// Where the worst-case analysis judges a design, the comparison carries
// it. An invented divider: V1 10 V ± 5 %, R1 and R2 1 kΩ ± 5 %. R1's
// power V²·R1/(R1 + R2)² is largest with V1 high and R2 low, and, over
// R1's own band, where R1 = R2 = 950 Ω (the maximum power transfer
// theorem): 10.5² · 950 / 1900² = 29.01 mW, 11.6 % of 250 mW. vin spans
// V1's band, 9.5 V to 10.5 V.
func TestDiffWorstCase(t *testing.T) {
	dir := gitRepo(t)
	const divider = "ground gnd\nsource V1 (vin, gnd) 10 V tol 5%\nresistor R1 (vin, mid) 1 kΩ tol 5% rated 250 mW\nresistor R2 (mid, gnd) 1 kΩ tol 5% rated 250 mW\n"
	write(t, filepath.Join(dir, "div.nodal"), divider)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "divider")
	write(t, filepath.Join(dir, "div.nodal"), strings.Replace(divider, "10 V", "15 V", 1))
	_, out, errs := runNodal(t, dir, "", "diff", "--format", "json")
	var doc struct {
		Designs []struct {
			Parts []struct {
				Name        string   `json:"name"`
				WorstBefore *float64 `json:"worst_before"`
				WorstAfter  *float64 `json:"worst_after"`
			} `json:"parts"`
			Nets []struct {
				Name        string      `json:"name"`
				BeforeRange *[2]float64 `json:"before_range"`
			} `json:"nets"`
		} `json:"designs"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil || len(doc.Designs) != 1 {
		t.Fatalf("%v\n%s%s", err, out, errs)
	}
	want := 10.5 * 10.5 * 950 / (1900 * 1900) / 0.25
	found := false
	for _, p := range doc.Designs[0].Parts {
		if p.Name == "R1" {
			found = true
			if p.WorstBefore == nil || math.Abs(*p.WorstBefore-want) > 1e-3*want || p.WorstAfter == nil || *p.WorstAfter <= *p.WorstBefore {
				t.Errorf("R1's worst case %v → %v; want %v before, and more after", p.WorstBefore, p.WorstAfter, want)
			}
		}
	}
	if !found {
		t.Errorf("R1 is not listed:\n%s", out)
	}
	for _, n := range doc.Designs[0].Nets {
		if n.Name == "vin" && (n.BeforeRange == nil || math.Abs(n.BeforeRange[0]-9.5) > 1e-9 || math.Abs(n.BeforeRange[1]-10.5) > 1e-9) {
			t.Errorf("vin's range before: %v; want 9.5 V to 10.5 V", n.BeforeRange)
		}
	}
}

// A design moved to another path with its content unchanged is renamed,
// and its findings are unchanged, not new.
func TestDiffRename(t *testing.T) {
	dir := gitRepo(t)
	const board = "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, lone) 1 kΩ\n"
	write(t, filepath.Join(dir, "old", "board.nodal"), board)
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "board")
	git(t, dir, "mv", "old", "new")
	_, out, errs := runNodal(t, dir, "", "diff", "--staged", "--format", "json")
	var doc struct {
		Designs []struct {
			Path, Status, From string
			Findings           []struct{ State string }
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v\n%s%s", err, out, errs)
	}
	if len(doc.Designs) != 1 || doc.Designs[0].Status != "renamed" || doc.Designs[0].Path != "new/board.nodal" || doc.Designs[0].From != "old/board.nodal" {
		t.Fatalf("designs %+v; want new/board.nodal renamed from old/board.nodal", doc.Designs)
	}
	if f := doc.Designs[0].Findings; len(f) != 1 || f[0].State != "unchanged" {
		t.Errorf("findings %+v; want the floating net unchanged", f)
	}
}

// The design of deep long names, changed between two commits: nodal diff
// says its tables are not compared, naming the limit, instead of listing
// 3.7 GiB of part and net names for each side.
func TestDiffDeepNames(t *testing.T) {
	dir := gitRepo(t)
	write(t, filepath.Join(dir, "deep.nodal"), deepNames(60, 4000, 100, 100))
	git(t, dir, "add", ".")
	git(t, dir, "commit", "-qm", "deep")
	write(t, filepath.Join(dir, "deep.nodal"), deepNames(60, 4000, 100, 100)+"resistor RB (a, gnd) 2 kΩ\n")
	code, out, errs := runNodal(t, dir, "", "diff")
	if code == 2 || len(out) > 20000 || strings.Count(out, "over the limit of 256 MiB") != 2 {
		t.Errorf("exit %d, %d bytes:\n%.3000s\n%s", code, len(out), out, errs)
	}
}
