package grammar

// pieces.go: a large file is read in pieces, one per core. Lines never
// span a newline and each line is read on its own, so a file cut at line
// boundaries reads piece by piece into exactly what it reads whole: each
// piece is given the number of its first line, the pieces' statements,
// plain lines, comments and errors are joined in file order, and nothing a
// piece makes depends on where the cut fell (TestPiecesMatchWhole cuts
// files at every line of their first hundred and compares).

import (
	"runtime"
	"strings"
	"sync"
)

// minPiece is the smallest piece worth a goroutine of its own: below it,
// starting the goroutine and joining the results cost more than they save.
const minPiece = 1 << 20

func parse(name, src string, m mode) *File {
	n := 1
	if m != modeReference {
		n = min(runtime.GOMAXPROCS(0), len(src)/minPiece)
	}
	if n <= 1 {
		f := &File{Name: name, src: src}
		parseRange(f, src, 0, len(src), 1, true, m)
		f.indexPlain()
		return f
	}
	f := parsePieces(name, src, cuts(src, n), m)
	f.indexPlain()
	return f
}

// cuts returns where the n pieces of src start, each at the start of a
// line, the first at 0; fewer when the lines are too long to make n.
func cuts(src string, n int) []int {
	starts := []int{0}
	for k := 1; k < n; k++ {
		at := max(len(src)*k/n, starts[len(starts)-1])
		nl := strings.IndexByte(src[at:], '\n')
		if nl < 0 {
			break
		}
		if s := at + nl + 1; s > starts[len(starts)-1] && s < len(src) {
			starts = append(starts, s)
		}
	}
	return starts
}

// parsePieces reads the pieces of src that start at starts, each on its
// own goroutine, and joins them in order.
func parsePieces(name, src string, starts []int, m mode) *File {
	parts := make([]File, len(starts))
	lines := make([]int, len(starts))
	lines[0] = 1
	for k := 1; k < len(starts); k++ {
		lines[k] = lines[k-1] + strings.Count(src[starts[k-1]:starts[k]], "\n")
	}
	var wg sync.WaitGroup
	for k := range starts {
		to, last := len(src), k == len(starts)-1
		if !last {
			to = starts[k+1]
		}
		wg.Go(func() { parseRange(&parts[k], src, starts[k], to, lines[k], last, m) })
	}
	wg.Wait()
	f := &File{Name: name, src: src}
	var stmts, comments, errs, chunks int
	for k := range parts {
		stmts += len(parts[k].Stmts)
		comments += len(parts[k].Comments)
		errs += len(parts[k].Errors)
		chunks += len(parts[k].plain)
	}
	if stmts > 0 {
		f.Stmts = make([]*Statement, 0, stmts)
	}
	if comments > 0 {
		f.Comments = make([]Comment, 0, comments)
	}
	if errs > 0 {
		f.Errors = make([]*SyntaxError, 0, errs)
	}
	if chunks > 0 {
		f.plain = make([]plainChunk, 0, chunks)
	}
	for k := range parts {
		f.Stmts = append(f.Stmts, parts[k].Stmts...)
		f.Comments = append(f.Comments, parts[k].Comments...)
		f.Errors = append(f.Errors, parts[k].Errors...)
		f.plain = append(f.plain, parts[k].plain...)
	}
	return f
}
