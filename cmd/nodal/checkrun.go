package main

// checkrun.go: the files of one check run — each set up with its
// configuration, limits and reader (a unit), checked on every core as they
// come, admitted by size, and each one's result kept in its place.

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"sync"

	"nodal/check"
	"nodal/config"
	"nodal/input"
	"nodal/output"
)

// unit is one file to check.
type unit struct {
	name     string // as messages name it
	stdin    bool
	cfg      *config.Config
	limits   limits // in effect for this file
	read     func(name string) ([]byte, error)
	identify func(name string) (string, error)
}

// unitBuilder sets files up for checking.
type unitBuilder struct {
	cf      *checkFlags
	loader  *configLoader
	readers *readers
	idx     *index          // git's index with --staged, else nil
	walked  map[string]bool // files found by walking a folder, not named
}

// build sets up the files names (as collected, or as found through
// includes) in order. Files a skip glob matches are left out, saying so on
// msgs when they were named; a file whose reader cannot be made is
// reported on msgs and makes status 2. A configuration error stops the
// whole check (err).
func (b *unitBuilder) build(names []string, msgs io.Writer) (units []unit, status int, err error) {
	cf := b.cf
	for _, n := range names {
		u := unit{name: n}
		where := n
		if n == "-" {
			u.stdin = true
			u.name = "<stdin>"
			where = filepath.Join(".", "stdin")
			if cf.stdinName != "" {
				u.name = cf.stdinName
				where = cf.stdinName
			}
		}
		cfg, err := b.loader.forFile(where)
		if err != nil {
			return nil, status, err
		}
		if g := cfg.SkippedBy(where); g != "" {
			if !b.walked[n] {
				fmt.Fprintf(msgs, "nodal: %s: skipped: it matches the skip glob %q of %s\n", output.TextSafe(u.name), g, output.TextSafe(cfg.File))
			}
			continue
		}
		u.cfg = cfg
		u.limits = cf.limits.forConfig(cfg)
		if b.idx != nil {
			u.read, u.identify = b.idx.reader(u.limits.fileMiB<<20), cleanIdentity
		} else {
			r, err := b.readers.forFile(where, cfg.Roots, int(u.limits.fileMiB))
			if err != nil {
				fmt.Fprintln(msgs, fileError(u.name, err))
				status = 2
				continue
			}
			u.read, u.identify = r.ReadFile, r.Resolve
			if !u.stdin {
				if _, err := r.Resolve(n); errors.Is(err, input.ErrOutside) && b.walked[n] {
					fmt.Fprintf(msgs, "nodal: %s: note: skipped: a link that leads outside the folders nodal reads\n", output.TextSafe(n))
					continue
				}
			}
		}
		units = append(units, u)
	}
	return units, status, nil
}

// checkPool checks the units added to it on jobs workers, as they are
// added. Files are admitted by size: the bytes being checked at once stay
// within one file's cap, so several large designs do not each take a
// worker's share of memory at the same time. A design is weighed again
// once its blocks are measured, by the parts it expands to (partWeight
// bytes each), so that a small file of blocks that makes millions of
// parts waits its turn as a large flat file would.
type checkPool struct {
	wg      sync.WaitGroup
	next    chan *pending
	all     []*pending
	fromIdx bool // files are read from git's index: no size on disk
}

type pending struct {
	u unit
	r fileResult
}

// newCheckPool starts jobs workers. stdinSrc is standard input's content,
// for the unit that reads it.
func newCheckPool(jobs int, budget int64, stdinSrc []byte, loader *configLoader, fromIdx bool) *checkPool {
	p := &checkPool{next: make(chan *pending), fromIdx: fromIdx}
	adm := newAdmission(budget)
	for range jobs {
		p.wg.Add(1)
		go func() {
			defer p.wg.Done()
			for w := range p.next {
				n := int64(len(stdinSrc))
				if !w.u.stdin && !p.fromIdx {
					n = sizeOf(w.u.name)
				}
				t := adm.admit(n)
				w.r = checkOne(w.u, stdinSrc, loader, func(parts int64) { t.grow(min(parts, math.MaxInt64/partWeight) * partWeight) })
				t.done()
			}
		}()
	}
	return p
}

// add hands a unit to the workers; it waits until one takes it.
func (p *checkPool) add(u unit) {
	w := &pending{u: u}
	p.all = append(p.all, w)
	p.next <- w
}

// wait waits for every unit added and returns their results in the order
// they were added.
func (p *checkPool) wait() []fileResult {
	close(p.next)
	p.wg.Wait()
	out := make([]fileResult, len(p.all))
	for i, w := range p.all {
		out[i] = w.r
	}
	return out
}

type fileResult struct {
	checked  bool
	findings []output.Finding
	sources  map[string][]byte
	err      string
	note     string // said on standard error, without changing the exit status
}

// checkOne checks one file. A panic anywhere in the pipeline becomes an
// internal error for that file (exit 2), so that one file that trips a bug
// neither takes the others down nor prints a stack trace.
func checkOne(u unit, stdinSrc []byte, loader *configLoader, expanding func(parts int64)) (out fileResult) {
	defer func() {
		if r := recover(); r != nil {
			out = fileResult{checked: true, err: fmt.Sprintf("nodal: %s: internal error: %v (please report it with the file that caused it)", output.TextSafe(u.name), r)}
		}
	}()
	var src []byte
	var err error
	if u.stdin {
		src = stdinSrc
	} else {
		src, err = u.read(u.name)
	}
	if err != nil {
		return fileResult{err: fileError(u.name, err)}
	}
	// Includes are read the same way as the file: from disk below the
	// roots, or from git's index with --staged.
	lim := u.limits
	opts := &check.Options{Config: withAmbient(loader.rulesConfig(u.cfg), lim.ambient), ReadFile: u.read, Identify: u.identify, MaxDepth: lim.maxDepth, MaxParts: lim.maxParts, Expanding: expanding}
	res, err := checkSource(u.name, src, opts)
	out = fileResult{checked: true, sources: map[string][]byte{u.name: src}}
	if res != nil {
		for _, f := range res.Build.Files {
			out.sources[f.File.Name()] = f.Src
		}
	}
	if err != nil {
		out.err = fmt.Sprintf("nodal: %s: internal error: %v", output.TextSafe(u.name), err)
	}
	if res != nil {
		out.findings = output.FromDiags(res.Fset, res.Diags)
		for i := range out.findings {
			out.findings[i].Design = u.name
		}
		if s := res.Solved; s != nil && s.Skipped != nil {
			out.note = fmt.Sprintf("nodal: %s: note: the DC operating point was not solved, so the rating rules did not run: %v", output.TextSafe(u.name), s.Skipped)
		}
	}
	return out
}

// checkSource is check.Source; tests replace it to reach the recovery path.
var checkSource = check.Source
