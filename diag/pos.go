// Package diag holds what every stage of nodal shares to speak about its
// input: compact source positions in a file set, and diagnostics (findings)
// that point at them.
//
// # Positions
//
// A Pos is a single integer: an offset into a FileSet, in which every added
// file owns a range of bases. Zero is NoPos. Position turns a Pos into a
// file name, a line and a column. Columns are counted in bytes from 1, the
// way Go's own tools count them, so that an editor that jumps to "line 3,
// column 14" lands on the same byte whatever characters precede it on the
// line. The grammar works in byte offsets throughout; nothing is counted in
// runes.
//
// # Diagnostics
//
// A Diagnostic carries a rule id, a severity, a message that names the parts
// and nets involved, the range it covers and related locations (the other
// parts around a loop, the instance of a block), in the manner of
// golang.org/x/tools/go/analysis. Subject names the part or net a finding
// is about by its instance path, so that tools can match findings across
// revisions; Fixes carry edits an editor can offer. A List sorts by file, line
// and column and drops exact duplicates, so that output is deterministic.
package diag

import (
	"fmt"
	"sort"
)

// Pos is a compact source position: an offset into a FileSet.
type Pos int

// NoPos is the zero Pos: no position is known.
const NoPos Pos = 0

// IsValid reports whether p is a known position.
func (p Pos) IsValid() bool { return p != NoPos }

// File is one source file in a FileSet.
type File struct {
	name  string
	base  int
	size  int
	lines []int // byte offset of the start of each line
}

// Name returns the file's name as given to AddFile.
func (f *File) Name() string { return f.name }

// Size returns the length of the file's source in bytes.
func (f *File) Size() int { return f.size }

// Base returns the Pos of the file's first byte.
func (f *File) Base() int { return f.base }

// Pos returns the Pos of the byte at offset in f. It panics if offset is
// outside the file: that is a programming error, not bad input.
func (f *File) Pos(offset int) Pos {
	if offset < 0 || offset > f.size {
		panic(fmt.Sprintf("diag: offset %d outside file %s of size %d", offset, f.name, f.size))
	}
	return Pos(f.base + offset)
}

// Offset returns the byte offset of p within f.
func (f *File) Offset(p Pos) int { return int(p) - f.base }

// Position returns the file, line and byte column of p, which must be in f.
func (f *File) Position(p Pos) Position { return f.position(f.Offset(p)) }

// position returns the line and byte column of offset in f.
func (f *File) position(offset int) Position {
	i := sort.Search(len(f.lines), func(i int) bool { return f.lines[i] > offset }) - 1
	if i < 0 {
		i = 0
	}
	return Position{Filename: f.name, Offset: offset, Line: i + 1, Column: offset - f.lines[i] + 1}
}

// FileSet holds the files of one check, each with its own range of Pos
// values. It is not safe for concurrent use; each check owns one.
type FileSet struct {
	files []*File
	base  int
}

// NewFileSet returns an empty file set.
func NewFileSet() *FileSet { return &FileSet{base: 1} }

// AddFile adds a file with the given name and source and returns it. The
// line table is computed once here.
func (s *FileSet) AddFile(name string, src []byte) *File {
	f := &File{name: name, base: s.base, size: len(src)}
	lines := make([]int, 1, len(src)/32+1)
	for i, c := range src {
		if c == '\n' {
			lines = append(lines, i+1)
		}
	}
	f.lines = lines
	s.files = append(s.files, f)
	s.base += len(src) + 1 // +1 so that an end-of-file position is still inside
	return f
}

// File returns the file that holds p, or nil.
func (s *FileSet) File(p Pos) *File {
	if p == NoPos {
		return nil
	}
	i := sort.Search(len(s.files), func(i int) bool { return s.files[i].base > int(p) }) - 1
	if i < 0 {
		return nil
	}
	f := s.files[i]
	if int(p) > f.base+f.size {
		return nil
	}
	return f
}

// Position returns the human form of p, or the zero Position for NoPos.
func (s *FileSet) Position(p Pos) Position {
	f := s.File(p)
	if f == nil {
		return Position{}
	}
	return f.position(f.Offset(p))
}

// Position is a file name, a 1-based line, and a 1-based column counted in
// bytes.
type Position struct {
	Filename string
	Offset   int
	Line     int
	Column   int
}

// IsValid reports whether the position names a line.
func (p Position) IsValid() bool { return p.Line > 0 }

// String returns "file:line:col", or "file" or "-" when less is known.
func (p Position) String() string {
	name := p.Filename
	if name == "" {
		name = "-"
	}
	if !p.IsValid() {
		return name
	}
	return fmt.Sprintf("%s:%d:%d", name, p.Line, p.Column)
}
