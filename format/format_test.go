package format_test

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"nodal/format"
	"nodal/grammar"
)

var update = flag.Bool("update", false, "rewrite the .golden files")

// seeds are the repository's designs: every example and rule test file.
func seeds(t testing.TB) [][]byte {
	var out [][]byte
	for _, pattern := range []string{"../examples/*.nodal", "../examples/*/*.nodal", "../examples/*/*/*.nodal", "../testdata/rules/*/*.nodal", "../testdata/hier/*/*.nodal", "testdata/*.in"} {
		files, _ := filepath.Glob(pattern)
		for _, file := range files {
			src, err := os.ReadFile(file)
			if err != nil {
				t.Fatal(err)
			}
			out = append(out, src)
		}
	}
	if len(out) < 10 {
		t.Fatalf("only %d seed files found", len(out))
	}
	return out
}

// TestGolden compares the layout of each testdata/*.in with its .golden.
func TestGolden(t *testing.T) {
	files, _ := filepath.Glob("testdata/*.in")
	if len(files) == 0 {
		t.Fatal("no testdata/*.in")
	}
	for _, in := range files {
		src, err := os.ReadFile(in)
		if err != nil {
			t.Fatal(err)
		}
		got := format.Source(src)
		golden := strings.TrimSuffix(in, ".in") + ".golden"
		if *update {
			if err := os.WriteFile(golden, got, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		want, err := os.ReadFile(golden)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s: got\n%s\nwant\n%s", in, got, want)
		}
	}
}

// TestLayout pins the rules of the layout one by one.
func TestLayout(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"resistor  R1 ( a ,b )   4k7\n", "resistor R1 (a, b) 4k7\n"},
		{"resistor R1 (a, b) 4.7kΩ\nresistor R22 (a, gnd) 10 kΩ tol 1%\n",
			"resistor R1  (a, b)   4.7kΩ\nresistor R22 (a, gnd) 10 kΩ tol 1%\n"},
		{"led D1 (anode = a, cathode= k) vf 2 V at 10 mA\n", "led D1 (anode=a, cathode=k) vf 2 V at 10 mA\n"},
		{"led_row ROW (a, b) [i=15 mA,vs = 12 V]\n", "led_row ROW (a, b) [i = 15 mA, vs = 12 V]\n"},
		{"source V1 (a, b) - 5 V\n", "source V1 (a, b) -5 V\n"},
		{"resistor R (a, b) (2*rtop - - 1 kΩ)\n", "resistor R (a, b) (2 * rtop - -1 kΩ)\n"},
		{"resistor R (a, b) ( -(vs-vd)/ i )  rated p\n", "resistor R (a, b) (-(vs - vd) / i) rated p\n"},
		{"\n\n\nground gnd\n\n\n\nport a\n\n\n", "ground gnd\n\nport a\n"},
		{"ground gnd   # ref  \nport a,b # out\n", "ground gnd # ref\nport a, b  # out\n"},
		{"block b (x, y) {\nresistor R (x, y) 1 kΩ\n}\n", "block b (x, y) {\n  resistor R (x, y) 1 kΩ\n}\n"},
		{"   resistor R1 (a  b\n", "resistor R1 (a  b\n"},                                      // broken: kept as written
		{"resistor R1 (a, b) 1 kΩ\r\nground gnd\r\n", "resistor R1 (a, b) 1 kΩ\nground gnd\n"}, // CRLF
		{"", ""},
		{"port  vin 4.5 V   to 5.5V series 50 Ω\nport loop 4 mA to -20 mA\n", "port vin 4.5 V to 5.5V series 50 Ω\nport loop 4 mA to -20 mA\n"}, // a drive's range
		{"# only\n", "# only\n"},
		{"resistor R1 (a, b) 1 kΩ\n  # why\nresistor R222 (a, b) 1 kΩ\n",
			"resistor R1   (a, b) 1 kΩ\n# why\nresistor R222 (a, b) 1 kΩ\n"},
	} {
		got := string(format.Source([]byte(c.in)))
		if got != c.want {
			t.Errorf("format %q:\n got %q\nwant %q", c.in, got, c.want)
		}
	}
}

// TestIdempotentAndTokensKept formats every design in the repository:
// formatting twice gives what formatting once gives, and every line keeps
// its tokens.
func TestIdempotentAndTokensKept(t *testing.T) {
	for _, src := range seeds(t) {
		checkFormat(t, src)
	}
}

// FuzzFormat holds the formatter to its promises on arbitrary input.
//
//	go test -run='^$' -fuzz=FuzzFormat -fuzztime=1m ./format/
func FuzzFormat(f *testing.F) {
	for _, s := range seeds(f) {
		f.Add(s)
	}
	f.Add([]byte("resistor R1 (a, gnd) 1e999 V\n\xff\xfe\x00ground\x80 gnd\n"))
	f.Fuzz(func(t *testing.T, src []byte) {
		checkFormat(t, src)
	})
}

func checkFormat(t *testing.T, src []byte) {
	t.Helper()
	once := format.Source(src)
	twice := format.Source(once)
	if !bytes.Equal(once, twice) {
		t.Fatalf("not idempotent on %q:\nonce  %q\ntwice %q", src, once, twice)
	}
	a, b := lineTokens(src), lineTokens(once)
	if len(a) != len(b) {
		t.Fatalf("%d non-blank lines became %d on %q:\n%q", len(a), len(b), src, once)
	}
	for i := range a {
		if a[i] != b[i] {
			t.Fatalf("line %d changed its tokens on %q:\n was %s\n now %s", i+1, src, a[i], b[i])
		}
	}
}

// lineTokens returns each non-blank line's tokens (type and text), one
// string per line.
func lineTokens(src []byte) []string {
	var out []string
	for _, l := range strings.Split(string(src), "\n") {
		toks := grammar.LexLine(l)
		if len(toks) == 0 {
			continue
		}
		var b strings.Builder
		for _, tk := range toks {
			v := tk.Value
			if tk.Type == grammar.TokComment || tk.Type == grammar.TokInvalid {
				v = strings.TrimRight(v, " \t\r\f\v") // trailing blanks go
			}
			b.WriteString(string(rune('A' - int(tk.Type))))
			b.WriteString(v)
			b.WriteByte(0)
		}
		out = append(out, b.String())
	}
	return out
}
