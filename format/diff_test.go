package format

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"pgregory.net/rapid"
)

var hunkHeader = regexp.MustCompile(`^@@ -(\d+),(\d+) \+(\d+),(\d+) @@$`)

// patch applies a unified diff made by Diff to a.
func patch(t *rapid.T, a []string, d string) []string {
	lines := strings.Split(strings.TrimSuffix(d, "\n"), "\n")[2:]
	var out []string
	next := 0 // next line of a not yet copied
	for k := 0; k < len(lines); {
		m := hunkHeader.FindStringSubmatch(lines[k])
		if m == nil {
			t.Fatalf("not a hunk header: %q", lines[k])
		}
		start, _ := strconv.Atoi(m[1])
		na, _ := strconv.Atoi(m[2])
		if na > 0 {
			start--
		}
		out = append(out, a[next:start]...)
		next = start
		for k++; k < len(lines) && !strings.HasPrefix(lines[k], "@@"); k++ {
			op, text := lines[k][0], lines[k][1:]
			switch op {
			case ' ':
				if a[next] != text {
					t.Fatalf("context %q does not match %q", text, a[next])
				}
				out = append(out, text)
				next++
			case '-':
				if a[next] != text {
					t.Fatalf("removed %q does not match %q", text, a[next])
				}
				next++
			case '+':
				out = append(out, text)
			}
		}
	}
	return append(out, a[next:]...)
}

// TestDiffApplies checks that applying the diff to the first text gives
// the second, on random texts over a small alphabet of lines.
func TestDiffApplies(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		gen := rapid.SliceOfN(rapid.SampledFrom([]string{"a", "b", "c", "d", ""}), 0, 40)
		a, b := gen.Draw(t, "a"), gen.Draw(t, "b")
		ja, jb := strings.Join(a, "\n")+"\n", strings.Join(b, "\n")+"\n"
		d := Diff("f", []byte(ja), []byte(jb))
		if ja == jb {
			if d != nil {
				t.Fatalf("diff of equal texts: %q", d)
			}
			return
		}
		got := patch(t, splitLines([]byte(ja)), string(d))
		if want := splitLines([]byte(jb)); fmt.Sprint(got) != fmt.Sprint(want) {
			t.Fatalf("patched %q with\n%s\ngot %q want %q", a, d, got, want)
		}
	})
}
