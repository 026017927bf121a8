package main

// gitindex.go: the paths git's index holds, read from the index file in
// its documented format (git's gitformat-index: a header, the entries
// sorted by path, optional extensions, a trailing SHA-1 of everything
// before it), so that a check can tell which files git tracks without
// starting git. Whatever the reader does not know for certain — another
// version, a split or sparse index, a sparse checkout, a damaged file — is
// an error, and the caller asks git instead.

import (
	"bytes"
	"crypto/sha1"
	"encoding/binary"
	"errors"
	"io"
	"os"
	"strconv"
	"strings"
)

// errIndexUnknown says the index file is not one this reader can vouch
// for; git must be asked.
var errIndexUnknown = errors.New("git index: a layout this reader leaves to git")

// maxIndexSize bounds the index file read: beyond it, git is asked.
const maxIndexSize = 256 << 20

// gitIndex is what a check needs of git's index.
type gitIndex struct {
	// paths of the entries, in the index's order, each once (an unmerged
	// path has up to three entries, one per stage)
	paths []string
	// tree is the object name of the tree the whole index would be
	// written as, when the index's cache of trees holds it (treeOK): equal
	// to HEAD's tree, the index stages no change against HEAD.
	tree   [sha1.Size]byte
	treeOK bool
}

// readIndex reads the index file at name. A missing file is an empty
// index, as git reads it.
func readIndex(name string) (*gitIndex, error) {
	f, err := os.Open(name)
	if errors.Is(err, os.ErrNotExist) {
		return &gitIndex{}, nil
	}
	if err != nil {
		return nil, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !info.Mode().IsRegular() || info.Size() > maxIndexSize {
		return nil, errIndexUnknown
	}
	// Into one buffer of the size the file states (and a little room to
	// see its end), not one grown by doubling: an index of a few hundred
	// paths is tens of kilobytes, read at every check in a repository.
	b := make([]byte, 0, info.Size()+512)
	for {
		n, err := f.Read(b[len(b):cap(b)])
		b = b[:len(b)+n]
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		if len(b) > maxIndexSize {
			return nil, errIndexUnknown // it grew past the bound while read
		}
		if len(b) == cap(b) {
			b = append(b, 0)[:len(b)]
		}
	}
	return parseIndex(b)
}

// parseIndex reads an index of version 2, 3 or 4 with SHA-1 object
// names: its entries, and the root of its cache of trees (the "TREE"
// extension). It refuses (errIndexUnknown) a split index (the
// "link" extension: entries live in another file), a sparse index (the
// "sdir" extension, or folder entries), entries marked skip-worktree (a
// sparse checkout, whose files git lists but does not look for on disk),
// a bad checksum and anything truncated or out of order.
func parseIndex(b []byte) (*gitIndex, error) {
	const hashLen = sha1.Size
	if len(b) < 12+hashLen || string(b[:4]) != "DIRC" {
		return nil, errIndexUnknown
	}
	body, sum := b[:len(b)-hashLen], b[len(b)-hashLen:]
	// index.skipHash writes a zero checksum; otherwise it must match.
	if !bytes.Equal(sum, make([]byte, hashLen)) {
		if h := sha1.Sum(body); !bytes.Equal(h[:], sum) {
			return nil, errIndexUnknown
		}
	}
	version := binary.BigEndian.Uint32(body[4:8])
	if version < 2 || version > 4 {
		return nil, errIndexUnknown
	}
	count := binary.BigEndian.Uint32(body[8:12])
	const fixed = 40 + hashLen + 2 // stat fields, object name, flags
	at := 12
	var paths []string
	prev := ""
	for i := uint32(0); i < count; i++ {
		if at+fixed > len(body) {
			return nil, errIndexUnknown
		}
		start := at
		mode := binary.BigEndian.Uint32(body[at+24 : at+28])
		flags := binary.BigEndian.Uint16(body[at+40+hashLen:])
		at += fixed
		if flags&0x4000 != 0 { // extended flags follow
			if version < 3 || at+2 > len(body) {
				return nil, errIndexUnknown
			}
			if binary.BigEndian.Uint16(body[at:])&0x4000 != 0 { // skip-worktree
				return nil, errIndexUnknown
			}
			at += 2
		}
		if mode&0o170000 == 0o040000 { // a sparse folder entry
			return nil, errIndexUnknown
		}
		var name string
		if version == 4 {
			// The name is the previous one less its last n bytes, then
			// the NUL-terminated rest.
			n, w := indexVarint(body[at:])
			if w == 0 || n > uint64(len(prev)) {
				return nil, errIndexUnknown
			}
			at += w
			end := bytes.IndexByte(body[at:], 0)
			if end < 0 {
				return nil, errIndexUnknown
			}
			name = prev[:len(prev)-int(n)] + string(body[at:at+end])
			at += end + 1
		} else {
			end := bytes.IndexByte(body[at:], 0)
			if end < 0 {
				return nil, errIndexUnknown
			}
			name = string(body[at : at+end])
			// Padded with 1 to 8 NULs to a multiple of 8 from the entry's start.
			at = start + (at-start+end+8)&^7
			if at > len(body) {
				return nil, errIndexUnknown
			}
		}
		if name == "" || name < prev {
			return nil, errIndexUnknown
		}
		if name != prev {
			paths = append(paths, name)
		}
		prev = name
	}
	x := &gitIndex{paths: paths}
	// Extensions: a four-byte signature and a length each.
	for at < len(body) {
		if at+8 > len(body) {
			return nil, errIndexUnknown
		}
		sig := string(body[at : at+4])
		size := binary.BigEndian.Uint32(body[at+4 : at+8])
		if sig == "link" || sig == "sdir" || uint64(size) > uint64(len(body)-at-8) {
			return nil, errIndexUnknown
		}
		if sig == "TREE" {
			x.tree, x.treeOK = cacheTreeRoot(body[at+8 : at+8+int(size)])
		}
		at += 8 + int(size)
	}
	return x, nil
}

// cacheTreeRoot reads the first entry of the cache of trees, the root's:
// an empty path and its NUL, the count of entries it covers (-1 when the
// entry is invalid), a space, the count of subtrees, a newline, then the
// tree's object name when valid.
func cacheTreeRoot(ext []byte) (oid [sha1.Size]byte, ok bool) {
	if len(ext) == 0 || ext[0] != 0 {
		return oid, false
	}
	nl := bytes.IndexByte(ext, '\n')
	if nl < 0 {
		return oid, false
	}
	counts := strings.Fields(string(ext[1:nl]))
	if len(counts) != 2 {
		return oid, false
	}
	if n, err := strconv.Atoi(counts[0]); err != nil || n < 0 {
		return oid, false
	}
	if len(ext) < nl+1+sha1.Size {
		return oid, false
	}
	copy(oid[:], ext[nl+1:])
	return oid, true
}

// indexVarint decodes the index's variable-length integer (git's
// offset encoding: seven bits a byte, most significant first, each
// continuation adding one) and returns it with the bytes it took; 0 bytes
// for a malformed or overlong one.
func indexVarint(b []byte) (uint64, int) {
	if len(b) == 0 {
		return 0, 0
	}
	c := b[0]
	v := uint64(c & 127)
	i := 1
	for c&128 != 0 {
		if i >= len(b) || i > 9 {
			return 0, 0
		}
		v++
		c = b[i]
		i++
		v = v<<7 | uint64(c&127)
	}
	return v, i
}
