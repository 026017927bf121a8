package check

// includes.go: which files a file includes, read without building it, so
// that a change to a library can be traced to the designs that use it.

import (
	"bytes"
	"path/filepath"
	"strings"

	"nodal/grammar"
)

// Includes returns the files that the file name includes, each resolved as
// circuit.Build resolves it: a relative path is joined onto name's folder,
// and the result is cleaned. Only include statements are read: a line
// whose first word is "include" is parsed on its own (a statement never
// spans lines), so a large design is scanned rather than parsed. An
// include the builder would refuse (inside a block, say) is listed all the
// same; callers use the list to decide what to check, and more is safe.
func Includes(name string, src []byte) []string {
	var out []string
	src = bytes.TrimPrefix(src, []byte("\ufeff"))
	for len(src) > 0 {
		line := src
		if i := bytes.IndexByte(src, '\n'); i >= 0 {
			line, src = src[:i], src[i+1:]
		} else {
			src = nil
		}
		t := bytes.TrimLeft(line, " \t")
		if !bytes.HasPrefix(t, []byte("include")) {
			continue
		}
		var paths []string
		if p, ok := plainInclude(string(t)); ok {
			paths = []string{p}
		} else {
			for _, st := range grammar.Parse(name, t).Stmts {
				if st.Include != nil && st.Include.Path != nil {
					paths = append(paths, st.Include.Path.Text)
				}
			}
		}
		for _, rel := range paths {
			if len(rel) >= 2 && rel[0] == '"' && rel[len(rel)-1] == '"' {
				rel = rel[1 : len(rel)-1]
			}
			if strings.TrimSpace(rel) == "" {
				continue
			}
			p := filepath.FromSlash(rel)
			if !filepath.IsAbs(p) {
				p = filepath.Join(filepath.Dir(name), p)
			}
			out = append(out, filepath.Clean(p))
		}
	}
	return out
}

// plainInclude returns the path of a line that is the keyword include and
// a string, and perhaps a comment: the include statement the grammar (and
// its fast path) reads with that string as its path. Any other line is
// left to the parser (ok false). A search for includers reads every file
// of a repository, and a whole parse of each include line cost it some
// 18 KB and 50 µs.
func plainInclude(line string) (path string, ok bool) {
	toks := grammar.LexLine(line)
	if len(toks) < 2 || len(toks) > 3 || toks[0].Type != grammar.TokKeyword || toks[0].Value != "include" || toks[1].Type != grammar.TokString {
		return "", false
	}
	if len(toks) == 3 && toks[2].Type != grammar.TokComment {
		return "", false
	}
	return toks[1].Value, true
}
