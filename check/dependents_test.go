package check

import (
	"path/filepath"
	"reflect"
	"testing"

	"nodal/grammar"
)

func TestIncludes(t *testing.T) {
	src := "\ufeffinclude \"lib/stages.nodal\"\n" +
		"# include \"commented.nodal\"\n" +
		"ground gnd\n" +
		"  include \"../shared/power.nodal\"   # indented, with a comment\n" +
		"resistor include_me (a, gnd) 1 kΩ\n" +
		"include \"\"\n"
	got := Includes(filepath.Join("boards", "main.nodal"), []byte(src))
	want := []string{filepath.Join("boards", "lib", "stages.nodal"), filepath.Join("shared", "power.nodal")}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("Includes = %q, want %q", got, want)
	}
}

// plainInclude takes a line only when the parser reads it as one include
// statement with that path, so Includes reads the same paths through it as
// through the parser.
func TestPlainIncludeIsTheParsers(t *testing.T) {
	lines := []string{
		`include "lib/a.nodal"`, `include "lib/a.nodal" # note`, "include\t\"x.nodal\"\t", `include ""`,
		`include "a b.nodal"#c`, `include "unterminated`, `include x.nodal`, `include "a" "b"`,
		`include "a", "b"`, `include`, `include # "a"`, `include "a" 3`, `include "a" (b)`,
		`include "é.nodal"`, "include \"a\"\r", `include "a" }`, `include "\"`,
	}
	took := 0
	for _, line := range lines {
		var want []string
		for _, st := range grammar.Parse("x.nodal", []byte(line)).Stmts {
			if st.Include != nil && st.Include.Path != nil {
				want = append(want, st.Include.Path.Text)
			}
		}
		p, ok := plainInclude(line)
		if !ok {
			continue
		}
		took++
		if len(want) != 1 || want[0] != p {
			t.Errorf("%q: plainInclude reads %q, the parser %q", line, p, want)
		}
	}
	if took < 5 {
		t.Fatalf("plainInclude took %d of the lines, want at least the five plain ones", took)
	}
}

func TestDependents(t *testing.T) {
	// a includes lib; b includes mid, which includes lib; c includes
	// nothing; d and e include each other and lib2.
	graph := map[string][]string{
		"a": {"lib"}, "b": {"mid"}, "mid": {"lib"}, "c": nil,
		"d": {"e", "lib2"}, "e": {"d"},
	}
	calls := map[string]int{}
	includes := func(f string) []string { calls[f]++; return graph[f] }
	others := []string{"a", "b", "c", "d", "e", "mid"}
	if got, want := Dependents([]string{"lib"}, others, includes), []string{"a", "b", "mid"}; !reflect.DeepEqual(got, want) {
		t.Errorf("dependents of lib = %q, want %q", got, want)
	}
	for f, n := range calls {
		if n != 1 {
			t.Errorf("includes(%s) called %d times", f, n)
		}
	}
	if got, want := Dependents([]string{"lib2"}, others, includes), []string{"d", "e"}; !reflect.DeepEqual(got, want) {
		t.Errorf("dependents of lib2 (through a cycle) = %q, want %q", got, want)
	}
	if got := Dependents([]string{"c"}, others, includes); len(got) != 0 {
		t.Errorf("a file included nowhere has dependents %q", got)
	}
	// A target that is also a dependent of another target stays a target.
	if got, want := Dependents([]string{"lib", "mid"}, others, includes), []string{"a", "b"}; !reflect.DeepEqual(got, want) {
		t.Errorf("dependents of lib and mid = %q, want %q", got, want)
	}
}
