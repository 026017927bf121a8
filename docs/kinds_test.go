package docs

import (
	"os"
	"strings"
	"testing"

	"nodal/circuit"
)

// TestLanguageKindsTable: the kinds table of docs/language.md has a row for
// every kind of the kind table, with its keyword, its pins in order and the
// units "rated" takes on it, so that the reference cannot fall behind the
// language.
func TestLanguageKindsTable(t *testing.T) {
	b, err := os.ReadFile("language.md")
	if err != nil {
		t.Fatal(err)
	}
	rows := map[string][]string{} // keyword → its rows
	for _, line := range strings.Split(string(b), "\n") {
		if !strings.HasPrefix(line, "| `") {
			continue
		}
		cells := strings.Split(line, "|")
		if len(cells) < 7 {
			continue
		}
		word := strings.Trim(strings.Fields(cells[1])[0], "`")
		rows[word] = append(rows[word], line)
	}
	for _, k := range circuit.Kinds() {
		info := k.Info()
		var pins []string
		for _, p := range info.Pins {
			pins = append(pins, "`"+p+"`")
		}
		want := strings.Join(pins, ", ")
		found := false
		for _, row := range rows[info.Word] {
			cells := strings.Split(row, "|")
			if strings.TrimSpace(cells[2]) != want {
				continue
			}
			found = true
			rated := cells[5]
			for _, d := range info.RatedDims() {
				if !strings.Contains(rated, d.Symbol()) {
					t.Errorf("docs/language.md, kind %s: the rated column %q does not list %s", k, strings.TrimSpace(rated), d.Symbol())
				}
			}
			for _, a := range info.Attrs {
				if !strings.Contains(cells[4], "`"+a) {
					t.Errorf("docs/language.md, kind %s: the attributes column does not list %s", k, a)
				}
			}
		}
		if !found {
			t.Errorf("docs/language.md has no row for kind %s with pins %s", k, want)
		}
	}
}
