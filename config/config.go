// Package config reads nodal.toml, the per-project settings of the
// checker: rule severities, derating limits of the rating rules, paths to
// skip, and the limits on block expansion.
//
// A check of a file uses the nodal.toml in the file's folder or the
// nearest folder above it, or the file named by --config. Values not set
// there keep their defaults. Every key is checked: an unknown key, a value
// of the wrong type or range, or an unknown rule id is an error that names
// the file, the line and the key. Nothing is silently ignored.
package config

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"

	"github.com/BurntSushi/toml"
	"github.com/bmatcuk/doublestar/v4"

	"nodal/diag"
)

// RenamedRules maps rule ids that were renamed to their names now. A
// nodal.toml that sets an old id gets an error naming the new one.
var RenamedRules = map[string]string{
	"allow-reason": "accept-reason",
	"unused-allow": "stale-accept",
	"bad-allow":    "bad-accept",
}

// FileName is the name Find looks for.
const FileName = "nodal.toml"

// Limit defaults: how deep blocks may nest, how many parts a design may
// expand to, and the largest file (in MiB) a check reads.
const (
	DefaultDepth   = 64
	DefaultParts   = 10_000_000
	DefaultFileMiB = 512
)

// Config is the configuration in effect for one file.
type Config struct {
	// File is the nodal.toml these settings came from; empty when every
	// value is a default.
	File string
	// Severity overrides rule severities; Off silences a rule.
	Severity map[string]diag.Severity
	// Derating holds the [derating] table as read: a derating key to a
	// fraction of the rating, 0 < f ≤ 1, with its line in Origin. The
	// keys and their defaults are declared with the kinds' ratings, above
	// this package, which passes the keys to Parse and fills in the
	// defaults of the keys not set here.
	Derating map[string]float64
	// Skip holds globs, relative to the folder of File, of paths not to
	// check. "**" matches any number of folders.
	Skip []string
	// Depth and Parts limit block expansion.
	Depth, Parts int
	// FileMiB caps the size of each file a check reads, in MiB.
	FileMiB int
	// Roots lists folders, besides the repository (or the checked
	// file's folder outside one), that includes may read from: library
	// checkouts. Relative entries are taken relative to the folder of
	// File and returned joined onto it.
	Roots []string
	// Thermal is the [thermal] table.
	Thermal Thermal
	// Origin says where each value came from: "default", or
	// "FILE:LINE". Keys are the TOML keys ("rules.floating-net",
	// "derating.resistor-power", "skip", "limits.depth").
	Origin map[string]string
}

// Default returns the configuration used when there is no nodal.toml.
func Default() *Config {
	c := &Config{Severity: map[string]diag.Severity{}, Derating: map[string]float64{},
		Depth: DefaultDepth, Parts: DefaultParts, FileMiB: DefaultFileMiB, Origin: map[string]string{}, Thermal: defaultThermal()}
	c.Origin["limits.depth"] = "default"
	c.Origin["limits.parts"] = "default"
	c.Origin["limits.file-mib"] = "default"
	c.Origin["roots"] = "default"
	c.Origin["skip"] = "default"
	return c
}

// Error is a problem in a configuration file.
type Error struct {
	File string
	Line int    // 0 when unknown
	Key  string // the dotted key, when known
	Msg  string
}

func (e *Error) Error() string {
	pos := e.File
	if e.Line > 0 {
		pos += ":" + strconv.Itoa(e.Line)
	}
	if e.Key != "" {
		return pos + ": " + e.Key + ": " + e.Msg
	}
	return pos + ": " + e.Msg
}

// Errors is every problem found in one file.
type Errors []*Error

func (es Errors) Error() string {
	s := make([]string, len(es))
	for i, e := range es {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// libError is the form of the TOML library's decoding errors that are not
// a ParseError, such as a number where a string belongs. It is compiled
// when such an error is first worded, not at every start of the program.
var libError = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^toml: line (\d+) \(last key "([^"]*)"\): (.*)$`)
})

// raw is the shape of nodal.toml.
type raw struct {
	Rules    map[string]string  `toml:"rules"`
	Derating map[string]float64 `toml:"derating"`
	Skip     []string           `toml:"skip"`
	Roots    []string           `toml:"roots"`
	Limits   struct {
		Depth   *int64 `toml:"depth"`
		Parts   *int64 `toml:"parts"`
		FileMiB *int64 `toml:"file-mib"`
	} `toml:"limits"`
	Thermal rawThermal `toml:"thermal"`
}

// Parse reads the text of a nodal.toml named name. known reports whether a
// rule id exists; deratingKeys lists the keys [derating] takes, in the
// order an error names them.
func Parse(name string, src []byte, known func(string) bool, suggest func(string) string, deratingKeys []string) (*Config, error) {
	c := Default()
	c.File = name
	var r raw
	md, err := toml.NewDecoder(strings.NewReader(string(src))).Decode(&r)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			msg := pe.Message
			if strings.HasPrefix(msg, "incompatible types") || strings.Contains(msg, "type") {
				msg = "wrong type of value: " + msg
			}
			return nil, &Error{File: name, Line: pe.Position.Line, Key: pe.LastKey, Msg: msg}
		}
		if m := libError().FindStringSubmatch(err.Error()); m != nil {
			line, _ := strconv.Atoi(m[1])
			return nil, &Error{File: name, Line: line, Key: m[2], Msg: "wrong type of value: " + m[3]}
		}
		return nil, &Error{File: name, Msg: err.Error()}
	}
	lines := keyLines(src)
	at := func(key string) int { return lineOf(lines, key) }
	origin := func(key string) string { return name + ":" + strconv.Itoa(at(key)) }
	var errs Errors
	bad := func(key, format string, args ...any) {
		errs = append(errs, &Error{File: name, Line: at(key), Key: key, Msg: fmt.Sprintf(format, args...)})
	}
	for _, k := range md.Undecoded() {
		key := k.String()
		msg := "unknown key"
		switch {
		case len(k) == 1:
			msg += "; the keys are skip, roots and the tables [rules], [derating], [limits] and [thermal]"
		case k[0] == "limits":
			msg += "; [limits] takes depth, parts and file-mib"
		case k[0] == "thermal":
			msg += "; [thermal] takes ambient, resistor-knee and resistor-zero"
		}
		bad(key, "%s", msg)
	}
	ids := sortedKeys(r.Rules)
	for _, id := range ids {
		key := "rules." + id
		if !known(id) {
			msg := "unknown rule id"
			if now, ok := RenamedRules[id]; ok {
				msg = "rule " + id + " is now called " + now + "; write " + now + " = " + strconv.Quote(r.Rules[id])
			} else if s := suggest(id); s != "" {
				msg += "; did you mean " + s + "?"
			} else {
				msg += "; \"nodal rules\" lists them"
			}
			bad(key, "%s", msg)
			continue
		}
		s, ok := diag.ParseSeverity(r.Rules[id])
		if !ok {
			bad(key, "severity %q is not one of off, note, warning, error", r.Rules[id])
			continue
		}
		c.Severity[id] = s
		c.Origin[key] = origin(key)
	}
	valid := map[string]bool{}
	for _, k := range deratingKeys {
		valid[k] = true
	}
	for _, k := range sortedKeys(r.Derating) {
		key := "derating." + k
		v := r.Derating[k]
		if !valid[k] {
			msg := "unknown derating key; the keys are " + strings.Join(deratingKeys, ", ")
			bad(key, "%s", msg)
			continue
		}
		if !(v > 0 && v <= 100) {
			bad(key, "%v is not a percentage of the rating between 0 (exclusive) and 100", v)
			continue
		}
		c.Derating[k] = v / 100
		c.Origin[key] = origin(key)
	}
	if md.IsDefined("skip") {
		for _, g := range r.Skip {
			if err := checkGlob(g); err != nil {
				bad("skip", "glob %q: %v", g, err)
			}
		}
		c.Skip = r.Skip
		c.Origin["skip"] = origin("skip")
	}
	if md.IsDefined("roots") {
		base := filepath.Dir(name)
		for _, root := range r.Roots {
			if strings.TrimSpace(root) == "" {
				bad("roots", "an empty folder name")
				continue
			}
			p := filepath.FromSlash(root)
			if !filepath.IsAbs(p) {
				p = filepath.Join(base, p)
			}
			c.Roots = append(c.Roots, filepath.Clean(p))
		}
		c.Origin["roots"] = origin("roots")
	}
	if p := r.Limits.FileMiB; p != nil {
		if *p < 1 || *p > 1<<20 {
			bad("limits.file-mib", "%d is not a file size in MiB between 1 and %d", *p, 1<<20)
		} else {
			c.FileMiB = int(*p)
			c.Origin["limits.file-mib"] = origin("limits.file-mib")
		}
	}
	if p := r.Limits.Depth; p != nil {
		if *p < 1 || *p > 1<<20 {
			bad("limits.depth", "%d is not a nesting depth between 1 and %d", *p, 1<<20)
		} else {
			c.Depth = int(*p)
			c.Origin["limits.depth"] = origin("limits.depth")
		}
	}
	if p := r.Limits.Parts; p != nil {
		if *p < 1 || *p > 1<<40 {
			bad("limits.parts", "%d is not a part count between 1 and %d", *p, int64(1)<<40)
		} else {
			c.Parts = int(*p)
			c.Origin["limits.parts"] = origin("limits.parts")
		}
	}
	parseThermal(r.Thermal, c, origin, bad)
	if len(errs) > 0 {
		sort.SliceStable(errs, func(i, j int) bool { return errs[i].Line < errs[j].Line })
		return nil, errs
	}
	return c, nil
}

func sortedKeys[V any](m map[string]V) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

// Find looks for nodal.toml in dir and each folder above it up to top
// (inclusive; "" or a folder not above dir: up to the file-system root),
// reading with read (which reports fs.ErrNotExist for a missing file). It
// returns the path and contents of the first found, or "" when there is
// none.
func Find(dir, top string, read func(string) ([]byte, error)) (string, []byte, error) {
	for {
		p := filepath.Join(dir, FileName)
		b, err := read(p)
		if err == nil {
			return p, b, nil
		}
		if !errors.Is(err, fs.ErrNotExist) && !errors.Is(err, fs.ErrPermission) {
			return "", nil, err
		}
		up := filepath.Dir(dir)
		if up == dir || dir == top {
			return "", nil, nil
		}
		dir = up
	}
}

// Skipped reports whether file (a path as the checker names it) matches
// one of the skip globs, taken relative to the folder of c.File.
func (c *Config) Skipped(file string) bool { return c.SkippedBy(file) != "" }

// SkippedBy returns the first skip glob that file matches, or "".
func (c *Config) SkippedBy(file string) string {
	if len(c.Skip) == 0 || c.File == "" {
		return ""
	}
	base, err := filepath.Abs(filepath.Dir(c.File))
	if err != nil {
		return ""
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return ""
	}
	rel, err := filepath.Rel(base, abs)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return ""
	}
	rel = filepath.ToSlash(rel)
	for _, g := range c.Skip {
		if matchGlob(g, rel) {
			return g
		}
	}
	return ""
}

// checkGlob reports a pattern the matcher cannot use.
func checkGlob(g string) error {
	if g == "" {
		return errors.New("empty pattern")
	}
	if !doublestar.ValidatePattern(g) {
		return errors.New("not a valid pattern (an unclosed [ or {, or a trailing \\)")
	}
	return nil
}

// matchGlob matches a slash-separated path against a glob in which "**"
// stands for any number of folders, "*" and "?" for characters within one
// name, and [...] and {a,b} for sets and alternatives. Matching is done by
// doublestar, a maintained library whose time does not grow exponentially
// with the number of "**" (a home-made backtracking matcher did).
func matchGlob(glob, name string) bool {
	ok, err := doublestar.Match(glob, name)
	return err == nil && ok
}
