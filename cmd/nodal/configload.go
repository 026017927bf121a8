package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path/filepath"
	"sync"

	"nodal/circuit"
	"nodal/config"
	"nodal/diag"
	"nodal/input"
	"nodal/output"
	"nodal/rules"
)

// configLoader finds and parses each folder's nodal.toml once: in the
// file's folder or the nearest above it, up to the repository's top level
// (or the file-system root outside a repository), read from git's index
// with --staged.
type configLoader struct {
	idx    revision // nil: read from disk
	forced string   // --config
	mu     sync.Mutex
	byDir  map[string]*config.Config
	byFile map[string]*config.Config
	rules  map[*config.Config]*rules.Config
}

func newConfigLoader(idx *index, forced string) *configLoader {
	var r revision
	if idx != nil {
		r = idx
	}
	return newRevisionConfigLoader(r, forced)
}

// revision reads the files of a git revision by repository path: the
// index, or a commit or the work tree in nodal diff.
type revision interface {
	reader(maxSize int64) func(string) ([]byte, error)
}

// newRevisionConfigLoader is newConfigLoader for any revision (nil: the
// disk).
func newRevisionConfigLoader(r revision, forced string) *configLoader {
	return &configLoader{idx: r, forced: forced, byDir: map[string]*config.Config{},
		byFile: map[string]*config.Config{}, rules: map[*config.Config]*rules.Config{}}
}

func knownRule(id string) bool { return rules.Lookup(id) != nil }

func suggestRule(id string) string { return diag.Suggest(id, rules.Names()) }

// deratingKeys lists the [derating] keys the kinds table declares.
func deratingKeys() []string {
	keys, _ := rules.DeratingDefaults()
	return keys
}

// forFile returns the configuration for a checked file.
func (l *configLoader) forFile(name string) (*config.Config, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	if l.forced != "" {
		// --config names a file on disk even with --staged.
		return l.parse(l.forced, nil)
	}
	dir := filepath.Dir(name)
	if c, ok := l.byDir[dir]; ok {
		return c, nil
	}
	p, src, err := l.find(dir)
	if err != nil {
		return nil, err
	}
	var c *config.Config
	if p == "" {
		c = config.Default()
	} else if c, err = l.parse(p, src); err != nil {
		return nil, err
	}
	l.byDir[dir] = c
	return c, nil
}

// find looks for the nodal.toml that applies to files in dir.
func (l *configLoader) find(dir string) (string, []byte, error) {
	if l.idx != nil {
		// Staged names are repository paths: "." is the top level.
		return config.Find(dir, ".", l.idx.reader(input.DefaultMaxSize))
	}
	loc, err := input.Locate(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return "", nil, nil // a --stdin-filename in no folder: no nodal.toml
	}
	if err != nil {
		return "", nil, err
	}
	read := func(p string) ([]byte, error) { return input.ReadRegular(p, 0) }
	if loc.Top != "" {
		// Inside a repository a nodal.toml is read only from inside it,
		// whatever links it is reached through.
		r, err := input.New([]string{loc.Top}, 0)
		if err != nil {
			return "", nil, err
		}
		read = func(p string) ([]byte, error) {
			if _, err := r.Resolve(filepath.Dir(p)); errors.Is(err, input.ErrOutside) {
				// A folder outside the repository (reached through a
				// link to a folder) has no nodal.toml for this check;
				// its files are refused anyway.
				return nil, fs.ErrNotExist
			}
			return r.ReadFile(p)
		}
	}
	p, src, err := config.Find(loc.Dir, loc.Top, read)
	if p == "" || err != nil || filepath.IsAbs(dir) {
		return p, src, err
	}
	// Named as the files were: relative to the current folder.
	if cwd, cerr := input.Locate("."); cerr == nil {
		if rel, rerr := filepath.Rel(cwd.Dir, p); rerr == nil {
			p = rel
		}
	}
	return p, src, err
}

func (l *configLoader) parse(p string, src []byte) (*config.Config, error) {
	if c, ok := l.byFile[p]; ok {
		return c, nil
	}
	if src == nil {
		b, err := input.ReadRegular(p, 0)
		if err != nil {
			return nil, err
		}
		src = b
	}
	c, err := config.Parse(p, src, knownRule, suggestRule, deratingKeys())
	if err != nil {
		return nil, err
	}
	l.byFile[p] = c
	return c, nil
}

// rulesConfig is the rules' view of a configuration.
func (l *configLoader) rulesConfig(c *config.Config) *rules.Config {
	l.mu.Lock()
	defer l.mu.Unlock()
	if rc, ok := l.rules[c]; ok {
		return rc
	}
	rc := &rules.Config{Severity: c.Severity}
	for k, f := range c.Derating {
		rc.Derating.Set(k, f)
	}
	rc.Derating.ResistorKnee, rc.Derating.ResistorZero = c.Thermal.Knee, c.Thermal.Zero
	if c.Thermal.AmbientSet {
		rc.Ambient = circuit.Ambient{Low: c.Thermal.AmbientLow, High: c.Thermal.AmbientHigh, Set: true}
	}
	l.rules[c] = rc
	return rc
}

// printConfigError prints each problem of a configuration file on a line
// of its own, in the file:line: form, or any other error after "nodal: ".
func printConfigError(w io.Writer, err error) {
	var errs config.Errors
	var one *config.Error
	switch {
	case errors.As(err, &errs):
		for _, e := range errs {
			fmt.Fprintf(w, "%s\n", output.PathSafe(e.Error()))
		}
	case errors.As(err, &one):
		fmt.Fprintf(w, "%s\n", output.PathSafe(one.Error()))
	default:
		fmt.Fprintf(w, "nodal: %s\n", output.TextSafe(err.Error()))
	}
}
