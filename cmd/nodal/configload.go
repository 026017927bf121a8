package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"sync"

	"nodal/config"
	"nodal/diag"
	"nodal/rules"
)

// configLoader finds and parses each folder's nodal.toml once.
type configLoader struct {
	read   reader
	forced string // --config
	mu     sync.Mutex
	byDir  map[string]*config.Config
	byFile map[string]*config.Config
	rules  map[*config.Config]*rules.Config
}

func newConfigLoader(read reader, forced string) *configLoader {
	return &configLoader{read: read, forced: forced, byDir: map[string]*config.Config{},
		byFile: map[string]*config.Config{}, rules: map[*config.Config]*rules.Config{}}
}

func knownRule(id string) bool { return rules.Lookup(id) != nil }

func suggestRule(id string) string { return diag.Suggest(id, rules.Names()) }

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
	p, src, err := config.Find(dir, l.read)
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

func (l *configLoader) parse(p string, src []byte) (*config.Config, error) {
	if c, ok := l.byFile[p]; ok {
		return c, nil
	}
	if src == nil {
		b, err := readDisk(p)
		if err != nil {
			return nil, err
		}
		src = b
	}
	c, err := config.Parse(p, src, knownRule, suggestRule)
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
			fmt.Fprintf(w, "%s\n", e)
		}
	case errors.As(err, &one):
		fmt.Fprintf(w, "%s\n", one)
	default:
		fmt.Fprintf(w, "nodal: %v\n", err)
	}
}
