package output

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/check"
	"nodal/diag"
)

var update = flag.Bool("update", false, "rewrite the golden files")

// report checks testdata/mixed.nodal: an error, warnings with related
// locations, a suppressed finding, a stale accept comment, and a net name with a
// multi-byte character.
func report(t *testing.T) *Report {
	t.Helper()
	name := "testdata/mixed.nodal"
	src, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	res, err := check.Source(name, src, nil)
	if err != nil {
		t.Fatal(err)
	}
	return &Report{Files: 1, Findings: FromDiags(res.Fset, res.Diags),
		Source: func(f string) []byte {
			if f == name {
				return src
			}
			return nil
		}}
}

var goldenOpts = Options{Version: "0.0.0-test", Root: "/repo", Dir: "/repo", MaxRows: 4}

func TestGolden(t *testing.T) {
	for _, format := range Formats {
		t.Run(format, func(t *testing.T) {
			var a, b bytes.Buffer
			if err := Write(&a, format, report(t), goldenOpts); err != nil {
				t.Fatal(err)
			}
			// Same input, same bytes.
			if err := Write(&b, format, report(t), goldenOpts); err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(a.Bytes(), b.Bytes()) {
				t.Fatalf("two runs wrote different bytes")
			}
			golden := filepath.Join("testdata", "mixed."+format+".golden")
			if *update {
				if err := os.WriteFile(golden, a.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./output -update to create it)", err)
			}
			if !bytes.Equal(a.Bytes(), want) {
				t.Errorf("%s output differs from %s:\n%s", format, golden, a.String())
			}
		})
	}
}

// The text form is exactly diag.Format, line for line.
func TestTextMatchesDiagFormat(t *testing.T) {
	name := "testdata/mixed.nodal"
	src, _ := os.ReadFile(name)
	res, err := check.Source(name, src, nil)
	if err != nil {
		t.Fatal(err)
	}
	var want strings.Builder
	for _, d := range res.Diags {
		want.WriteString(diag.Format(res.Fset, d) + "\n")
	}
	var got bytes.Buffer
	if err := Write(&got, "text", &Report{Files: 1, Findings: FromDiags(res.Fset, res.Diags)}, Options{}); err != nil {
		t.Fatal(err)
	}
	if got.String() != want.String() || got.Len() == 0 {
		t.Errorf("text output:\n%s\nwant:\n%s", got.String(), want.String())
	}
}

func TestJSONShape(t *testing.T) {
	var buf bytes.Buffer
	if err := Write(&buf, "json", report(t), Options{}); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Version     int              `json:"version"`
		Files       int              `json:"files"`
		Diagnostics []map[string]any `json:"diagnostics"`
	}
	dec := json.NewDecoder(&buf)
	dec.DisallowUnknownFields()
	if err := dec.Decode(&doc); err != nil {
		t.Fatal(err)
	}
	if doc.Version != 1 || doc.Files != 1 || len(doc.Diagnostics) == 0 {
		t.Fatalf("got version %d, files %d, %d diagnostics", doc.Version, doc.Files, len(doc.Diagnostics))
	}
	keys := []string{"file", "line", "column", "end_line", "end_column", "severity", "rule", "message", "related", "help_uri"}
	fixes := 0
	for _, d := range doc.Diagnostics {
		// "fixes" is there only when the finding has some.
		if fs, ok := d["fixes"].([]any); ok && len(fs) > 0 {
			fixes++
			delete(d, "fixes")
		}
		if len(d) != len(keys) {
			t.Errorf("diagnostic has keys %v, want %v", d, keys)
		}
		for _, k := range keys {
			if _, ok := d[k]; !ok {
				t.Errorf("diagnostic lacks %q: %v", k, d)
			}
		}
	}
	if fixes == 0 {
		t.Error("no finding of the sample carries its fixes")
	}
}

func TestMarkdownCap(t *testing.T) {
	r := report(t)
	var buf bytes.Buffer
	if err := Write(&buf, "markdown", r, Options{MaxRows: 2}); err != nil {
		t.Fatal(err)
	}
	want := "and " + itoa(len(r.Findings)-2) + " more."
	if !strings.Contains(buf.String(), want) {
		t.Errorf("markdown lacks %q:\n%s", want, buf.String())
	}
	// Worst first: the error row comes before every warning row.
	s := buf.String()
	if e, w := strings.Index(s, "| error | `source-loop`"), strings.Index(s, "| warning | `"); e < 0 || w < 0 || e > w {
		t.Errorf("error row not first:\n%s", s)
	}
}

func itoa(n int) string {
	b, _ := json.Marshal(n)
	return string(b)
}

func TestUnknownFormat(t *testing.T) {
	if err := Write(&bytes.Buffer{}, "xml", &Report{}, Options{}); err == nil {
		t.Error("no error for an unknown format")
	}
}
