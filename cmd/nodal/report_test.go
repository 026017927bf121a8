package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"nodal/check"
	"nodal/circuit"
	"nodal/solve"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/report")

// reportDoc is the JSON form of nodal report, read back as a script would.
type reportDoc struct {
	File   string `json:"file"`
	Design string `json:"design"`
	Title  string `json:"title"`
	Nets   []struct {
		Name    string   `json:"name"`
		Voltage *float64 `json:"voltage"`
		// The range over tolerances and temperature.
		Low  *float64 `json:"low"`
		High *float64 `json:"high"`
	} `json:"nets"`
	Parts []struct {
		Name    string             `json:"name"`
		Kind    string             `json:"kind"`
		Voltage *float64           `json:"voltage"`
		Current *float64           `json:"current"`
		Power   *float64           `json:"power"`
		Ratings map[string]float64 `json:"ratings"`
		Use     *float64           `json:"use"`
		Limit   *string            `json:"limit"`
		// The worst use over tolerances and temperature, and where.
		WorstUse *float64 `json:"worst_use"`
		WorstAt  string   `json:"worst_at"`
		// A battery's capacity (C) and runtime (s).
		Capacity float64 `json:"capacity"`
		Runtime  float64 `json:"runtime"`
		// A port's drive range, bottom first.
		DriveRange *[2]float64 `json:"drive_range"`
	} `json:"parts"`
	// The power tree.
	Rails   []*reportSupply `json:"rails"`
	OffRail int             `json:"off_rail"`
}

// reportSupply is one supply of the power tree in the JSON form.
type reportSupply struct {
	Name, Kind, Rail, Reference string
	Judged                      bool
	Voltage, Current, Power     float64
	Use                         *float64
	Limit                       *string
	Input                       *struct {
		Rail           string
		Current, Power float64
		Fed            bool
	}
	Taken, Loss  float64
	Efficiency   *float64
	Undetermined []string
	Region       string
	ListedUnder  string `json:"listed_under"`
	Repeated     bool
	InLoop       bool `json:"in_loop"`
	Feeds        []*reportSupply
	Loads        []*reportLoad
}

// reportLoad is a part under a rail, and what the tree follows on past it.
type reportLoad struct {
	Name, Kind     string
	Current, Power float64
	Towards        []string
	Use            *float64
	Limit          *string
	Undetermined   []string
	Net            string
	Feeds          []*reportSupply
	Loads          []*reportLoad
}

// checkRails checks the power tree against the parts: every supply that
// draws from no rail delivers what its part's power says (the sign
// convention of "nodal report --help"; one that does dissipates its loss,
// checked in checkUses), takes what it delivers plus what it loses
// (energy balance), and the parts and supplies its rail feeds take what it
// delivers (Kirchhoff's current law), to the ten figures JSON keeps.
func checkRails(t *testing.T, doc *reportDoc) {
	t.Helper()
	power := map[string]float64{}
	for _, p := range doc.Parts {
		if p.Power != nil {
			power[p.Name] = *p.Power
		}
	}
	onRail := map[string]float64{} // what the supplies listing each rail deliver
	judged := func(s *reportSupply) bool { return s.Judged && len(s.Undetermined) == 0 && !s.Repeated }
	eachSupply(doc.Rails, func(s *reportSupply) {
		if !judged(s) {
			return
		}
		if s.Input == nil && !relNear(s.Power, -power[s.Name], 1e-8) {
			t.Errorf("supply %s delivers %v W, its part absorbs %v W", s.Name, s.Power, power[s.Name])
		}
		if math.Abs(s.Taken-s.Power-s.Loss) > 1e-8*math.Max(math.Abs(s.Taken), 1e-12) {
			t.Errorf("supply %s takes %v W, delivers %v W, loses %v W", s.Name, s.Taken, s.Power, s.Loss)
		}
		key := s.Name
		if s.ListedUnder != "" {
			key = s.ListedUnder
		}
		onRail[key] += s.Current
	})
	eachSupply(doc.Rails, func(s *reportSupply) {
		if !judged(s) || s.ListedUnder != "" {
			return
		}
		taken, scale := 0.0, math.Abs(onRail[s.Name])
		for _, l := range s.Loads {
			taken += l.Current
			scale = math.Max(scale, math.Abs(l.Current))
		}
		for _, f := range s.Feeds {
			if f.Input != nil {
				taken += f.Input.Current
			}
		}
		if math.Abs(taken-onRail[s.Name]) > 1e-8*math.Max(scale, 1e-12) {
			t.Errorf("rail %s: its parts take %v A, its supplies deliver %v A", s.Rail, taken, onRail[s.Name])
		}
	})
}

// eachSupply calls f for every supply of the power tree rails, the ones
// fed through loads included, parents before their children.
func eachSupply(rails []*reportSupply, f func(s *reportSupply)) {
	for _, s := range rails {
		f(s)
		eachSupply(s.Feeds, f)
		var loads func(ls []*reportLoad)
		loads = func(ls []*reportLoad) {
			for _, l := range ls {
				eachSupply(l.Feeds, f)
				loads(l.Loads)
			}
		}
		loads(s.Loads)
	}
}

func parseReport(t *testing.T, out string) *reportDoc {
	t.Helper()
	var doc reportDoc
	dec := json.NewDecoder(strings.NewReader(out))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&doc); err != nil {
		t.Fatalf("report JSON: %v\n%s", err, out)
	}
	for _, n := range doc.Nets {
		if n.Voltage == nil {
			t.Errorf("net %s has no voltage", n.Name)
		}
		if (n.Low == nil) != (n.High == nil) || n.Low != nil && n.Voltage != nil && !(*n.Low <= *n.Voltage && *n.Voltage <= *n.High) {
			t.Errorf("net %s: range %v … %v does not hold its nominal %v", n.Name, n.Low, n.High, n.Voltage)
		}
	}
	for _, p := range doc.Parts {
		if p.Voltage == nil || p.Current == nil || p.Power == nil || p.Ratings == nil {
			t.Errorf("part %s lacks a field: %+v", p.Name, p)
		}
		// The runtime is capacity over discharge current (the estimate
		// "nodal report --help" states), to the ten figures JSON keeps.
		if p.Runtime != 0 && (p.Current == nil || !relNear(p.Runtime, p.Capacity/-*p.Current, 1e-8)) {
			t.Errorf("part %s: runtime %v s from %v C at %v A", p.Name, p.Runtime, p.Capacity, p.Current)
		}
		if (p.Use == nil) != (len(p.Ratings) == 0) || (p.Use == nil) != (p.Limit == nil) {
			t.Errorf("part %s: use %v, limit %v with %d ratings", p.Name, p.Use, p.Limit, len(p.Ratings))
		}
	}
	return &doc
}

func relNear(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(math.Abs(want), 1e-300)
}

// reportDesigns lists the designs under examples/ and demo/ (paths from
// the repository root): every .nodal file with a ground. A file without
// one is a library of blocks that a design includes.
func reportDesigns(t *testing.T) []string {
	t.Helper()
	var out []string
	for _, dir := range []string{"examples", "demo"} {
		err := filepath.WalkDir(dir, func(p string, e fs.DirEntry, err error) error {
			if err != nil || e.IsDir() || !strings.HasSuffix(p, ".nodal") {
				return err
			}
			r, err := check.File(p, nil)
			if err != nil {
				return err
			}
			if r.Build.Design.Ground != circuit.NoNet {
				out = append(out, p)
			}
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
	sort.Strings(out)
	return out
}

// TestReportGoldens runs "nodal report" in text and JSON form on every
// design under examples/ and demo/ and compares the output with
// testdata/report/<path>.{txt,json}; go test ./cmd/nodal -run
// TestReportGoldens -update rewrites them.
func TestReportGoldens(t *testing.T) {
	golden, err := filepath.Abs(filepath.Join("testdata", "report"))
	if err != nil {
		t.Fatal(err)
	}
	t.Chdir(filepath.Join("..", "..")) // name files as a user at the top of the repository would
	designs := reportDesigns(t)
	if len(designs) < 5 {
		t.Fatalf("only %d designs under examples/ and demo/: %v", len(designs), designs)
	}
	want := map[string]bool{}
	for _, d := range designs {
		for _, form := range []string{"text", "json"} {
			ext := map[string]string{"text": ".txt", "json": ".json"}[form]
			g := filepath.Join(golden, strings.ReplaceAll(filepath.ToSlash(d), "/", "__")+ext)
			want[filepath.Base(g)] = true
			t.Run(d+"/"+form, func(t *testing.T) {
				code, out, errOut := runNodal(t, "", "", "report", "--format", form, d)
				if code != 0 {
					t.Fatalf("exit %d\n%s%s", code, out, errOut)
				}
				if strings.Contains(out, "\x1b[") {
					t.Error("colour codes off a terminal")
				}
				if form == "json" {
					doc := parseReport(t, out)
					checkUses(t, doc)
					checkRails(t, doc)
				}
				if *update {
					if err := os.MkdirAll(golden, 0o755); err != nil {
						t.Fatal(err)
					}
					if err := os.WriteFile(g, []byte(out), 0o644); err != nil {
						t.Fatal(err)
					}
					return
				}
				b, err := os.ReadFile(g)
				if err != nil {
					t.Fatalf("%v (run go test ./cmd/nodal -run TestReportGoldens -update)", err)
				}
				if out != string(b) {
					t.Errorf("nodal report --format %s %s differs from %s:\ngot:\n%s\nwant:\n%s", form, d, g, out, b)
				}
			})
		}
	}
	// A golden whose design is gone is stale.
	files, _ := filepath.Glob(filepath.Join(golden, "*"))
	for _, f := range files {
		if !want[filepath.Base(f)] && !*update {
			t.Errorf("%s: no design under examples/ or demo/ has this golden", f)
		}
	}
}

// checkUses recomputes each part's use from the JSON alone: the largest
// fraction of a rating, the limited magnitude taken as the rating rules
// define it (forward current and reverse voltage for diodes and LEDs).
func checkUses(t *testing.T, doc *reportDoc) {
	t.Helper()
	last := math.Inf(1)
	rated := true
	converting := convertingSupplies(doc)
	for _, p := range doc.Parts {
		if p.Use == nil {
			rated = false
			continue
		}
		if !rated {
			t.Errorf("%s: a rated part after an unrated one", p.Name)
		}
		if *p.Use > last {
			t.Errorf("%s: use %g after a part at %g; want worst first", p.Name, *p.Use, last)
		}
		last = *p.Use
		junction := p.Kind == "diode" || p.Kind == "led"
		best, bestKey := -1.0, ""
		for k, rating := range p.Ratings {
			var v float64
			switch {
			case k == "power":
				v = math.Abs(*p.Power)
			case k == "current" && junction:
				v = math.Max(*p.Current, 0)
			case k == "current":
				v = math.Abs(*p.Current)
			case k == "reverse_voltage":
				v = math.Max(-*p.Voltage, 0)
			case k == "discharge_current": // out of a battery's first pin
				v = math.Max(-*p.Current, 0)
			case k == "output_current": // out of a regulator's or converter's out pin
				v = math.Max(-*p.Current, 0)
			case k == "voltage":
				v = math.Abs(*p.Voltage)
			default:
				t.Errorf("%s: unknown rating %q", p.Name, k)
			}
			if f := v / rating; f > best {
				best, bestKey = f, k
			}
		}
		if !relNear(*p.Use, best, 1e-8) && math.Abs(*p.Use-best) > 1e-12 {
			t.Errorf("%s: use %.10g, recomputed from its values and ratings %.10g", p.Name, *p.Use, best)
		}
		if *p.Limit != bestKey && !relNear(*p.Use, best, 1e-8) {
			t.Errorf("%s: limit %s, recomputed %s", p.Name, *p.Limit, bestKey)
		}
		if s, ok := converting[p.Name]; ok {
			// A part that draws from another rail dissipates what it
			// takes less what it delivers (energy balance).
			if !relNear(*p.Power, s.Loss, 1e-8) {
				t.Errorf("%s: power %g is not its loss in the power tree, %g", p.Name, *p.Power, s.Loss)
			}
			continue
		}
		if p.Voltage != nil && p.Current != nil && !relNear(*p.Power, *p.Voltage**p.Current, 1e-8) && math.Abs(*p.Power) > 1e-18 {
			t.Errorf("%s: power %g is not voltage × current %g", p.Name, *p.Power, *p.Voltage**p.Current)
		}
	}
}

// convertingSupplies returns the supplies of the power tree that draw from
// another rail, by name.
func convertingSupplies(doc *reportDoc) map[string]*reportSupply {
	out := map[string]*reportSupply{}
	eachSupply(doc.Rails, func(s *reportSupply) {
		if s.Input != nil && s.Judged && !s.Repeated {
			out[s.Name] = s
		}
	})
	return out
}

// A resistive divider, worked by Ohm's law (G. S. Ohm, Die galvanische
// Kette, mathematisch bearbeitet, 1827) and the series rule: one current
// I = V/(R1+R2) through both resistors, V(R) = I·R, P = V·I. The use of a
// power rating is P / rating.
func TestReportDividerByOhmsLaw(t *testing.T) {
	const src = `design divider "12 V to 8.25 V"
ground gnd
source   VS (vin, gnd)  12 V
resistor R1 (vin, vout) 1 kΩ   rated 250 mW
resistor R2 (vout, gnd) 2.2 kΩ rated 125 mW, 50 V
`
	code, out, errOut := runNodal(t, "", src, "report", "--format", "json", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	doc := parseReport(t, out)
	const vs, r1, r2 = 12.0, 1000.0, 2200.0
	i := vs / (r1 + r2)
	if doc.File != "<stdin>" || doc.Design != "divider" || doc.Title != "12 V to 8.25 V" {
		t.Errorf("file %q, design %q, title %q", doc.File, doc.Design, doc.Title)
	}
	nets := map[string]float64{}
	for _, n := range doc.Nets {
		nets[n.Name] = *n.Voltage
	}
	for name, want := range map[string]float64{"gnd": 0, "vin": vs, "vout": i * r2} {
		if got, ok := nets[name]; !ok || !relNear(got, want, 1e-9) && math.Abs(got-want) > 1e-12 {
			t.Errorf("net %s: %v V, Ohm's law gives %g V", name, got, want)
		}
	}
	type want struct{ v, i, p, use float64 }
	wants := map[string]want{
		"R1": {i * r1, i, i * i * r1, i * i * r1 / 0.25},
		"R2": {i * r2, i, i * i * r2, math.Max(i*i*r2/0.125, i*r2/50)},
		"VS": {vs, -i, -vs * i, 0}, // the source delivers power: negative
	}
	order := []string{}
	for _, p := range doc.Parts {
		order = append(order, p.Name)
		w, ok := wants[p.Name]
		if !ok {
			t.Errorf("unexpected part %s", p.Name)
			continue
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{{"voltage", *p.Voltage, w.v}, {"current", *p.Current, w.i}, {"power", *p.Power, w.p}} {
			if !relNear(c.got, c.want, 1e-9) {
				t.Errorf("%s %s: %.12g, Ohm's law gives %.12g", p.Name, c.what, c.got, c.want)
			}
		}
		if w.use == 0 {
			if p.Use != nil {
				t.Errorf("%s has no rating but use %g", p.Name, *p.Use)
			}
			continue
		}
		if p.Use == nil || !relNear(*p.Use, w.use, 1e-9) {
			t.Errorf("%s use %v, want power/rating %g", p.Name, p.Use, w.use)
		}
	}
	if p := doc.Parts; len(p) != 3 || p[0].Kind != "resistor" || p[2].Kind != "voltage source" {
		t.Errorf("parts %v", order)
	}
	// R2 uses 24.75 % of its power rating, R1 5.6 %: R2 first, the unrated
	// source last.
	if strings.Join(order, " ") != "R2 R1 VS" {
		t.Errorf("order %v, want worst first: R2 R1 VS", order)
	}
	if r := doc.Parts[0].Ratings; r["power"] != 0.125 || r["voltage"] != 50 || *doc.Parts[0].Limit != "power" {
		t.Errorf("R2 ratings %v limit %s", r, *doc.Parts[0].Limit)
	}

	// The text form shows the same numbers in engineering units.
	code, text, _ := runNodal(t, "", src, "report", "-")
	if code != 0 {
		t.Fatalf("text: exit %d", code)
	}
	for _, s := range []string{"vout", "8.25 V", "3.75 mA", "30.9 mW", "25 %", "R2", "125 mW", "—", "V(first pin) − V(second pin)"} {
		if !strings.Contains(text, s) {
			t.Errorf("text form lacks %q:\n%s", s, text)
		}
	}
}

func TestReportRejectedDesign(t *testing.T) {
	// Two voltage sources in parallel: the topology rules reject it.
	code, out, errOut := runNodal(t, "", badDesign, "report", "-")
	if code != 1 {
		t.Errorf("exit %d, want 1", code)
	}
	if !errorFormat.MatchString(strings.TrimSpace(out)) || !strings.Contains(out, "[source-loop]") || !strings.HasPrefix(out, "<stdin>:4:1: error:") {
		t.Errorf("want the source-loop finding in GNU form, got:\n%s", out)
	}
	if strings.Contains(out, "Parts") || strings.Contains(out, "Nets") {
		t.Errorf("a table for a rejected design:\n%s", out)
	}
	if !strings.Contains(errOut, "no operating point") {
		t.Errorf("stderr %q", errOut)
	}
	// With --format json the findings go to stderr and stdout stays empty.
	code, out, errOut = runNodal(t, "", badDesign, "report", "--format", "json", "--stdin-filename", "sub/board.nodal")
	if code != 1 || out != "" || !strings.Contains(errOut, "sub/board.nodal:4:1: error:") {
		t.Errorf("json: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	// A syntax error.
	code, out, _ = runNodal(t, "", "ground gnd\nresistor (\n", "report", "-")
	if code != 1 || !strings.Contains(out, "[syntax]") {
		t.Errorf("syntax: exit %d\n%s", code, out)
	}
}

func TestReportUsage(t *testing.T) {
	code, out, _ := runNodal(t, "", "", "report", "--help")
	if code != 0 {
		t.Errorf("--help exit %d", code)
	}
	for _, s := range []string{"Usage: nodal report", "V(first pin) − V(second pin)", "from the first pin to the second",
		"positive when the part absorbs", "design aid", "--format", "--no-color", "NO_COLOR", "\"use\""} {
		if !strings.Contains(out, s) {
			t.Errorf("report --help lacks %q", s)
		}
	}
	_, out, _ = runNodal(t, "", "", "--help")
	if !strings.Contains(out, "nodal report [flags] FILE") {
		t.Errorf("nodal --help does not list report:\n%s", out)
	}
	dir := t.TempDir()
	write(t, filepath.Join(dir, "a.nodal"), goodDesign)
	write(t, filepath.Join(dir, "b.nodal"), goodDesign)
	for _, c := range []struct {
		args []string
		msg  string
	}{
		{[]string{"report"}, "one design file"},
		{[]string{"report", "a.nodal", "b.nodal"}, "got 2"},
		{[]string{"report", "."}, "is a folder"},
		{[]string{"report", "missing.nodal"}, "missing.nodal"},
		{[]string{"report", "--format", "sarif", "a.nodal"}, "want text or json"},
		{[]string{"report", "--stdin-filename", "x.nodal", "a.nodal"}, "needs \"-\""},
		{[]string{"report", "--bogus", "a.nodal"}, "Usage: nodal report"},
	} {
		code, _, errOut := runNodal(t, dir, "", c.args...)
		if code != 2 || !strings.Contains(errOut, c.msg) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errOut, c.msg)
		}
	}
	code, out, errOut := runNodal(t, dir, "", "report", "a.nodal")
	if code != 0 || !strings.Contains(out, "R1") || errOut != "" {
		t.Errorf("a.nodal: exit %d\n%s%s", code, out, errOut)
	}
}

// A design with findings is still reported; a line on stderr counts the
// findings "nodal check" gives and points there.
func TestReportFindingsHint(t *testing.T) {
	t.Chdir(filepath.Join("..", ".."))
	code, _, errOut := runNodal(t, "", "", "report", "demo/overloaded.nodal")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	if !strings.Contains(errOut, "2 errors, 2 warnings") || !strings.Contains(errOut, "nodal check demo/overloaded.nodal") {
		t.Errorf("stderr %q", errOut)
	}
}

// ladder is a chain of n resistors from a 1 V source: n unknowns or so.
func ladder(n int) string {
	var b strings.Builder
	b.WriteString("ground gnd\nsource V (n0, gnd) 1 V\n")
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "resistor R%d (n%d, n%d) 1 kΩ rated 250 mW\n", i, i, i+1)
	}
	fmt.Fprintf(&b, "resistor RL (n%d, gnd) 1 kΩ\n", n)
	return b.String()
}

// A design too large for the solver on hand gets a plain note on stderr,
// from report and from check, rather than an empty table or silence.
func TestReportTooLarge(t *testing.T) {
	src := ladder(solve.MaxDense + 50)
	r, err := check.Source("big.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	var se *solve.Error
	if _, err := solve.Solve(r.Build.Design, nil); !errors.As(err, &se) || se.Kind != solve.TooLarge {
		// The solver handles this size now: the report is a full table.
		code, out, errOut := runNodal(t, "", src, "report", "-")
		if code != 0 || !strings.Contains(out, "R"+fmt.Sprint(solve.MaxDense+49)) {
			t.Errorf("exit %d, stderr %q", code, errOut)
		}
		return
	}
	code, out, errOut := runNodal(t, "", src, "report", "-")
	if code != 1 || strings.Contains(out, "Parts") || !strings.Contains(errOut, "too large for this version's solver") || !strings.Contains(errOut, "unknowns") {
		t.Errorf("report: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	code, out, errOut = runNodal(t, "", src, "check", "-")
	if code != 0 || out != "" || !strings.Contains(errOut, "note: the DC operating point was not solved") || !strings.Contains(errOut, "rating rules did not run") {
		t.Errorf("check: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
}

// The README shows the report of demo/overloaded.nodal exactly as the
// golden file has it.
func TestReadmeShowsReport(t *testing.T) {
	readme, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	golden, err := os.ReadFile(filepath.Join("testdata", "report", "demo__overloaded.nodal.txt"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(readme), "$ nodal report demo/overloaded.nodal\n"+string(golden)+"```") {
		t.Error("README.md does not show the report of demo/overloaded.nodal as testdata/report has it")
	}
}

// Junk is a finding or an empty design, never a panic; a panic inside the
// pipeline is an internal error (exit 2) without a stack trace.
func TestReportRobust(t *testing.T) {
	for name, src := range map[string]string{
		"empty":       "",
		"binary":      "\x00\x01\x02\xff\xfe\x7f\x1b[31m\x00",
		"non-utf8":    "ground g\xffnd\nresistor R\xc3 (a, gnd) 1 k\xce\n",
		"huge number": "ground gnd\nsource V1 (a, gnd) 1e999 V\nresistor R1 (a, gnd) 1 kΩ\n",
		"no parts":    "ground gnd\n",
		"crlf":        "ground gnd\r\nsource V1 (a, gnd) 5 V\r\nresistor R1 (a, gnd) 1 kΩ\r\n",
	} {
		for _, form := range []string{"text", "json"} {
			code, out, errOut := runNodal(t, "", src, "report", "--format", form, "-")
			if code == 2 || strings.Contains(out+errOut, "goroutine") || strings.Contains(out+errOut, "panic") {
				t.Errorf("%s (%s): exit %d\n%s%s", name, form, code, out, errOut)
			}
			if code == 1 && !strings.Contains(errOut, "no operating point") {
				t.Errorf("%s (%s): exit 1 without saying why: %q", name, form, errOut)
			}
			if code == 0 && form == "json" {
				parseReport(t, out)
			}
		}
	}
	saved := checkSource
	defer func() { checkSource = saved }()
	checkSource = func(name string, src []byte, opt *check.Options) (*check.Result, error) {
		var m map[string]int
		m["x"]++ // a nil map write: a genuine runtime panic
		return nil, nil
	}
	code, out, errOut := runNodal(t, "", goodDesign, "report", "-")
	if code != 2 || out != "" || !strings.Contains(errOut, "internal error") || strings.Contains(errOut, "goroutine") {
		t.Errorf("panic: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
}

// The README's language tour shows the power tree that nodal report
// prints for examples/valve_controller.nodal, as its golden file has it.
func TestReadmeShowsPowerTree(t *testing.T) {
	readme, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	golden, err := os.ReadFile(filepath.Join("testdata", "report", "examples__valve_controller.nodal.txt"))
	if err != nil {
		t.Fatal(err)
	}
	g := string(golden)
	i := strings.Index(g, "\nRails:")
	if i < 0 {
		t.Fatal("the golden has no rails section")
	}
	tree, _, _ := strings.Cut(g[i+1:], "\n\n")
	if !strings.Contains(string(readme), "$ nodal report examples/valve_controller.nodal\n...\n"+tree+"\n```") {
		t.Error("README.md does not show the power tree of examples/valve_controller.nodal as testdata/report has it")
	}
}
