package circuit

// collect.go: step 1 of elaboration (see hier.go). Each file is split into
// its top-level statements and its block definitions; includes are
// followed, each file read and parsed once.

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"strconv"
	"strings"
	"unicode/utf8"

	"nodal/diag"
	"nodal/grammar"
	"nodal/input"
)

// topStmt is a top-level statement of the checked file: a statement of
// the tree, or (st nil) plain line plain of the file (grammar.ParsePlain),
// whose kind is a built-in one.
type topStmt struct {
	st    *grammar.Statement
	plain int
}

// collect splits a parsed file into its top-level statements and its
// blocks, and follows its includes. stack holds the files being included,
// outermost first, to find cycles. Plain lines (grammar.ParsePlain) of
// built-in kinds at the top level stay plain; the others are made into
// statements of their own here, as the tree would hold them.
func (b *builder) collect(ast *grammar.File, stack []string) []topStmt {
	var top []topStmt
	var open *blockDef
	lib := len(stack) > 1
	stmts, plain := ast.Stmts, ast.PlainLines()
	if plain > 0 {
		top = make([]topStmt, 0, len(stmts)+plain)
	}
	for i, j := 0, 0; i < len(stmts) || j < plain; {
		var st *grammar.Statement
		if j < plain {
			start, _ := ast.PlainSpan(j)
			if i == len(stmts) || start < stmts[i].Start() {
				if _, builtin := kindOf(ast.PlainKind(j)); open == nil && builtin {
					top = append(top, topStmt{plain: j})
					j++
					continue
				}
				st = ast.PlainStatement(j, nil)
				j++
			}
		}
		if st == nil {
			st = stmts[i]
			i++
		}
		pos, end := b.pos(st.Start()), b.pos(st.End())
		switch {
		case st.Block != nil:
			if open != nil {
				b.report(CodeSyntax, open.pos, open.end, "block %s is not closed before block %s starts (line %d); blocks do not nest: add a line with } after its last statement", open.name, st.Block.Name.Text, b.file.Position(pos).Line)
				b.r.Incomplete = true
			}
			open = b.define(st.Block, pos, end, lib)
		case st.Close != nil:
			if open == nil {
				b.report(CodeSyntax, pos, end, "} closes no block")
				b.r.Incomplete = true
				continue
			}
			open.closed = true
			open = nil
		case st.Include != nil:
			if open != nil {
				b.report(CodeSyntax, pos, end, "include belongs at the top level of a file, not inside block %s", open.name)
				continue
			}
			b.include(st.Include, pos, end, stack)
		case open != nil && st.Part != nil:
			open.body = append(open.body, treeStmt(st.Part, pos, end))
		case open != nil:
			what := "ground"
			switch {
			case st.Port != nil:
				what = "port"
			case st.Design != nil:
				what = "design"
			case st.Ambient != nil:
				what = "ambient"
			}
			msg := what + " belongs at the top level, not inside block " + open.name
			if what == "ground" {
				msg += "; inside a block the design's ground net is reached by its name"
			} else if what == "port" {
				msg += "; a block's pins are its ports"
			}
			b.report(CodeSyntax, pos, end, "%s", msg)
		default:
			top = append(top, topStmt{st: st})
		}
	}
	if open != nil {
		b.report(CodeSyntax, open.pos, open.end, "block %s is not closed; add a line with } after its last statement", open.name)
		b.r.Incomplete = true
	}
	return top
}

// define records a block header.
func (b *builder) define(h *grammar.Block, pos, end diag.Pos, lib bool) *blockDef {
	bd := &blockDef{name: h.Name.Text, file: b.file, pos: pos, end: end, nameEnd: b.nameEnd(h.Name), header: h, lib: lib}
	if _, builtin := kindOf(bd.name); builtin {
		b.report(CodeDuplicateName, pos, end, "block %s has the name of a built-in kind; choose another name", bd.name)
		return bd // defined, but never found by name
	}
	if prev, dup := b.blocks[bd.name]; dup {
		b.report(CodeDuplicateName, pos, end, "block %s is already defined at %s", bd.name, b.where(prev.pos))
		return bd
	}
	b.blocks[bd.name] = bd
	b.blockList = append(b.blockList, bd)
	return bd
}

// include reads, parses and collects an included file.
func (b *builder) include(inc *grammar.Include, pos, end diag.Pos, stack []string) {
	rel := unquote(inc.Path.Text)
	if strings.TrimSpace(rel) == "" {
		b.report(CodeBadInclude, pos, end, "include needs a file name")
		b.r.Incomplete = true
		return
	}
	path := filepath.FromSlash(rel)
	if !filepath.IsAbs(path) {
		path = filepath.Join(filepath.Dir(b.file.Name()), path)
	}
	path = filepath.Clean(path)
	if b.opt.ReadFile == nil || b.fset == nil {
		b.report(CodeBadInclude, pos, end, "cannot include %s: this check reads no files", showPath(rel))
		b.r.Incomplete = true
		b.failed = append(b.failed, fmt.Sprintf("%s (%s)", showPath(rel), b.where(pos)))
		return
	}
	id, err := b.identify(path)
	if err == nil {
		if i, open := b.active[id]; open {
			chain := append(append([]string{}, stack[i:]...), path)
			b.report(CodeBadInclude, pos, end, "include cycle: %s", strings.Join(chain, " → "))
			b.r.Incomplete = true
			return
		}
		if b.included[id] {
			return // already brought in by another include
		}
	}
	var src []byte
	if err == nil {
		src, err = b.opt.ReadFile(path)
	}
	if err != nil {
		b.report(CodeBadInclude, pos, end, "%s", includeError(rel, path, err))
		b.r.Incomplete = true
		b.failed = append(b.failed, fmt.Sprintf("%s (%s)", showPath(rel), b.where(pos)))
		return
	}
	b.included[id] = true
	file := b.fset.AddFile(path, src)
	b.srcs[file] = src
	ast := grammar.ParseShared(path, src) // src is kept unchanged in b.r.Files
	b.r.Files = append(b.r.Files, SourceFile{File: file, Src: src, Comments: ast.Comments})
	saved := b.file
	b.file = file
	b.syntaxErrors(ast)
	b.active[id] = len(stack)
	b.collect(ast, append(stack, path)) // top-level statements of a library are its own
	delete(b.active, id)
	b.file = saved
}

// identify is Options.Identify, or the cleaned path.
func (b *builder) identify(path string) (string, error) {
	if b.opt.Identify == nil {
		return filepath.Clean(path), nil
	}
	return b.opt.Identify(path)
}

// includeError says why an included file could not be read. A path that
// leads outside the folders nodal reads is named only as written, and
// nothing about its target is said.
func includeError(rel, path string, err error) string {
	switch {
	case errors.Is(err, input.ErrOutside):
		return fmt.Sprintf("include %s leads outside the folders nodal reads (the repository, or the roots set in nodal.toml or by --root); nothing of it was read", strconv.Quote(rel))
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Sprintf("included file %s does not exist (an include path is relative to the file that includes it)", showPath(path))
	}
	return fmt.Sprintf("cannot read included file %s: %v", showPath(path), unwrapPath(err))
}

func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// showPath writes a path for a message: as it is, or quoted with escapes
// when it is not valid UTF-8, so that every message stays printable.
func showPath(p string) string {
	if utf8.ValidString(p) {
		return p
	}
	return strconv.Quote(p)
}
