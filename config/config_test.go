package config

import (
	"errors"
	"strings"
	"testing"

	"nodal/diag"
)

// testDerating stands for the derating keys the kinds declare, which
// this package does not know.
var testDerating = []string{"resistor-power", "fuse-current"}

func known(id string) bool { return id == "floating-net" || id == "shorted-part" }
func suggest(id string) string {
	if strings.HasPrefix(id, "float") {
		return "floating-net"
	}
	return ""
}

func TestParseValid(t *testing.T) {
	src := `# project settings
skip = ["vendor/**", "scratch/*.nodal"]

[rules]
floating-net = "off"
"shorted-part" = "error"

[derating]
resistor-power = 50

[limits]
depth = 8
`
	c, err := Parse("nodal.toml", []byte(src), known, suggest, testDerating)
	if err != nil {
		t.Fatal(err)
	}
	if c.Severity["floating-net"] != diag.Off || c.Severity["shorted-part"] != diag.Error {
		t.Errorf("severities %v", c.Severity)
	}
	// Only what the file sets: the defaults are filled in above.
	if _, set := c.Derating["fuse-current"]; c.Derating["resistor-power"] != 0.5 || set || len(c.Derating) != 1 {
		t.Errorf("derating %v", c.Derating)
	}
	if c.Depth != 8 || c.Parts != DefaultParts {
		t.Errorf("limits %d %d", c.Depth, c.Parts)
	}
	for key, want := range map[string]string{"rules.floating-net": "nodal.toml:5", "rules.shorted-part": "nodal.toml:6",
		"derating.resistor-power": "nodal.toml:9", "limits.depth": "nodal.toml:12", "limits.parts": "default", "skip": "nodal.toml:2"} {
		if c.Origin[key] != want {
			t.Errorf("origin of %s = %q, want %q", key, c.Origin[key], want)
		}
	}
}

func TestParseErrors(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"[rules]\nfloatin-net = \"off\"\n", "f.toml:2: rules.floatin-net: unknown rule id; did you mean floating-net?"},
		{"[rules]\nunused-allow = \"off\"\n", "f.toml:2: rules.unused-allow: rule unused-allow is now called stale-accept; write stale-accept = \"off\""},
		{"[rules]\nallow-reason = \"error\"\n", "f.toml:2: rules.allow-reason: rule allow-reason is now called accept-reason"},
		{"[rules]\nbad-allow = \"note\"\n", "f.toml:2: rules.bad-allow: rule bad-allow is now called bad-accept"},
		{"[rules]\nfloating-net = \"loud\"\n", "f.toml:2: rules.floating-net: severity \"loud\" is not one of off, note, warning, error"},
		{"[rules]\nfloating-net = 3\n", "f.toml:2: rules.floating-net: wrong type of value"},
		{"colour = true\n", "f.toml:1: colour: unknown key"},
		{"[limits]\n\ndepth = 4\nwidth = 2\n", "f.toml:4: limits.width: unknown key"},
		{"[limits]\ndepth = 0\n", "f.toml:2: limits.depth: 0 is not a nesting depth"},
		{"[derating]\nfuse-current = 0\n", "f.toml:2: derating.fuse-current: 0 is not a percentage"},
		{"[derating]\nfuse = 50\n", "f.toml:2: derating.fuse: unknown derating key; the keys are resistor-power, fuse-current"},
		{"skip = [\n  \"a/[\",\n]\n", "f.toml:1: skip: glob \"a/[\""},
		{"[rules\n", "f.toml:2: "},
	} {
		_, err := Parse("f.toml", []byte(c.src), known, suggest, testDerating)
		if err == nil {
			t.Errorf("%q: no error", c.src)
			continue
		}
		var e *Error
		var es Errors
		if !errors.As(err, &e) && !errors.As(err, &es) {
			t.Errorf("%q: error of type %T", c.src, err)
		}
		if !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("%q:\n got %q\nwant %q…", c.src, err.Error(), c.want)
		}
	}
}

func TestGlobs(t *testing.T) {
	for _, c := range []struct {
		glob, name string
		want       bool
	}{
		{"vendor/**", "vendor/a/b.nodal", true},
		{"vendor/**", "src/vendor/a.nodal", false},
		{"**/scratch.nodal", "a/b/scratch.nodal", true},
		{"**/scratch.nodal", "scratch.nodal", true},
		{"*.nodal", "a/b.nodal", false},
		{"a/*.nodal", "a/b.nodal", true},
	} {
		if got := matchGlob(c.glob, c.name); got != c.want {
			t.Errorf("matchGlob(%q, %q) = %v", c.glob, c.name, got)
		}
	}
}

// A pattern of many "**" against a deep path made the old backtracking
// matcher try every way of splitting the path (past 60 s for twelve "**"
// and thirty folders). The library matches it in a number of steps that
// grows with the pattern and the path, not exponentially: the test bounds
// the work by giving it many such paths, which it could not finish
// otherwise.
func TestSkipGlobManyDoubleStars(t *testing.T) {
	glob := strings.Repeat("**/", 12) + "x"
	deep := strings.Repeat("d/", 30) + "y.nodal"
	c := &Config{File: "nodal.toml", Skip: []string{glob}}
	if err := checkGlob(glob); err != nil {
		t.Fatal(err)
	}
	for i := 0; i < 200; i++ {
		if c.Skipped(deep) {
			t.Fatalf("%s matched %s", glob, deep)
		}
	}
	if !c.Skipped(strings.Repeat("d/", 30) + "x") {
		t.Errorf("%s does not match a path ending in x", glob)
	}
}

func TestSkipGlobForms(t *testing.T) {
	c := &Config{File: "nodal.toml", Skip: []string{"vendor/**", "scratch/*.nodal", "{a,b}/c.nodal"}}
	for name, want := range map[string]string{
		"vendor/x/y.nodal":    "vendor/**",
		"vendor/y.nodal":      "vendor/**",
		"scratch/t.nodal":     "scratch/*.nodal",
		"scratch/d/t.nodal":   "",
		"b/c.nodal":           "{a,b}/c.nodal",
		"boards/main.nodal":   "",
		"../vendor/out.nodal": "",
	} {
		if got := c.SkippedBy(name); got != want {
			t.Errorf("SkippedBy(%q) = %q, want %q", name, got, want)
		}
	}
	if checkGlob("[ab") == nil {
		t.Errorf("an unclosed [ is accepted")
	}
}
