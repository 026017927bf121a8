package main

// githead.go: the tree of the commit HEAD names, read from the
// repository's own files (git's documented layouts: HEAD, loose refs and
// packed-refs, loose objects, pack index version 2 and packs), so that a
// check can tell without starting git that the index stages no change.
// Only the plain cases are read: a branch or a detached HEAD, a commit
// stored whole. Everything else (replace refs, another ref storage,
// symbolic refs beyond HEAD, a commit stored as a delta, damage) is
// refused and git is asked. The object read is checked against its name
// (its SHA-1), so a reading mistake can only refuse, never mislead.

import (
	"bytes"
	"compress/zlib"
	"crypto/sha1"
	"encoding/binary"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
)

// headEnv lists the environment variables that change which objects git
// reads or how it resolves them; with any set, git is asked.
var headEnv = []string{"GIT_OBJECT_DIRECTORY", "GIT_ALTERNATE_OBJECT_DIRECTORIES", "GIT_REPLACE_REF_BASE", "GIT_NO_REPLACE_OBJECTS"}

// maxCommitSize bounds the commit object read.
const maxCommitSize = 1 << 20

// headTree returns the object name of the tree of HEAD's commit in the
// repository of lay; ok is false when it cannot be read for certain.
func headTree(lay gitLayout) (tree [sha1.Size]byte, ok bool) {
	for _, v := range headEnv {
		if _, set := os.LookupEnv(v); set {
			return tree, false
		}
	}
	// Replace refs make git read another object in a commit's place.
	if _, err := os.Lstat(filepath.Join(lay.common, "refs", "replace")); err == nil {
		return tree, false
	}
	commit, ok := headCommit(lay)
	if !ok {
		return tree, false
	}
	body, ok := readObject(lay.common, commit, "commit")
	if !ok {
		return tree, false
	}
	line, _, _ := bytes.Cut(body, []byte("\n"))
	hexTree, found := bytes.CutPrefix(line, []byte("tree "))
	if !found || len(hexTree) != 2*sha1.Size {
		return tree, false
	}
	if _, err := hex.Decode(tree[:], hexTree); err != nil {
		return tree, false
	}
	return tree, true
}

// headCommit resolves HEAD: a detached commit, or a branch
// (refs/heads/…) as a loose ref or in packed-refs.
func headCommit(lay gitLayout) (oid [sha1.Size]byte, ok bool) {
	head, err := readSmall(filepath.Join(lay.gitDir, "HEAD"))
	if err != nil {
		return oid, false
	}
	s := strings.TrimSuffix(string(head), "\n")
	ref, symbolic := strings.CutPrefix(s, "ref: ")
	if !symbolic {
		return parseOID(s)
	}
	if !strings.HasPrefix(ref, "refs/heads/") || strings.Contains(ref, "..") || strings.ContainsAny(ref, "\n\r\\") {
		return oid, false
	}
	// A loose ref wins over packed-refs, as git reads them.
	if b, err := readSmall(filepath.Join(lay.common, filepath.FromSlash(ref))); err == nil {
		return parseOID(strings.TrimSuffix(string(b), "\n"))
	} else if !os.IsNotExist(err) {
		return oid, false
	}
	packed, err := os.ReadFile(filepath.Join(lay.common, "packed-refs"))
	if err != nil || bytes.Contains(packed, []byte(" refs/replace/")) {
		return oid, false
	}
	for _, line := range strings.Split(string(packed), "\n") {
		if h, name, found := strings.Cut(line, " "); found && name == ref {
			return parseOID(h)
		}
	}
	return oid, false // an unborn branch: git has no HEAD commit either
}

// readSmall reads a regular file of at most 4 KiB.
func readSmall(name string) ([]byte, error) {
	info, err := os.Lstat(name)
	if err != nil {
		return nil, err
	}
	if !info.Mode().IsRegular() || info.Size() > 4096 {
		return nil, fmt.Errorf("%s: not a small regular file", name)
	}
	return os.ReadFile(name)
}

func parseOID(s string) (oid [sha1.Size]byte, ok bool) {
	if len(s) != 2*sha1.Size {
		return oid, false
	}
	_, err := hex.Decode(oid[:], []byte(s))
	return oid, err == nil
}

// readObject reads the object oid of type kind from the repository folder
// common, loose or stored whole in a pack, and returns its content once
// its SHA-1 matches oid.
func readObject(common string, oid [sha1.Size]byte, kind string) ([]byte, bool) {
	h := hex.EncodeToString(oid[:])
	if f, err := os.Open(filepath.Join(common, "objects", h[:2], h[2:])); err == nil {
		defer f.Close()
		zr, err := zlib.NewReader(f)
		if err != nil {
			return nil, false
		}
		raw, err := io.ReadAll(io.LimitReader(zr, maxCommitSize))
		if err != nil {
			return nil, false
		}
		hdr, body, found := bytes.Cut(raw, []byte{0})
		if !found || string(hdr) != fmt.Sprintf("%s %d", kind, len(body)) {
			return nil, false
		}
		return body, verifyObject(oid, kind, body)
	}
	packs, err := os.ReadDir(filepath.Join(common, "objects", "pack"))
	if err != nil {
		return nil, false
	}
	for _, e := range packs {
		name, isIdx := strings.CutSuffix(e.Name(), ".idx")
		if !isIdx || !e.Type().IsRegular() {
			continue
		}
		dir := filepath.Join(common, "objects", "pack")
		off, found, ok := packOffset(filepath.Join(dir, e.Name()), oid)
		if !ok {
			return nil, false
		}
		if found {
			body, ok := packedObject(filepath.Join(dir, name+".pack"), off, kind)
			return body, ok && verifyObject(oid, kind, body)
		}
	}
	return nil, false
}

func verifyObject(oid [sha1.Size]byte, kind string, body []byte) bool {
	h := sha1.New()
	fmt.Fprintf(h, "%s %d\x00", kind, len(body))
	h.Write(body)
	return bytes.Equal(h.Sum(nil), oid[:])
}

// packOffset looks oid up in a pack index of version 2: found and its
// offset in the pack, or not found; ok is false for an index it cannot
// read.
func packOffset(idxName string, oid [sha1.Size]byte) (off int64, found, ok bool) {
	f, err := os.Open(idxName)
	if err != nil {
		return 0, false, false
	}
	defer f.Close()
	var hdr [8 + 256*4]byte
	if _, err := f.ReadAt(hdr[:], 0); err != nil {
		return 0, false, false
	}
	if !bytes.Equal(hdr[:8], []byte{0xff, 't', 'O', 'c', 0, 0, 0, 2}) {
		return 0, false, false
	}
	fan := func(i int) int64 { return int64(binary.BigEndian.Uint32(hdr[8+4*i:])) }
	n := fan(255)
	lo, hi := int64(0), fan(int(oid[0]))
	if oid[0] > 0 {
		lo = fan(int(oid[0]) - 1)
	}
	if lo > hi || hi > n {
		return 0, false, false
	}
	// The names of the objects whose first byte is oid's, sorted.
	names := make([]byte, (hi-lo)*sha1.Size)
	if _, err := f.ReadAt(names, int64(len(hdr))+lo*sha1.Size); err != nil {
		return 0, false, false
	}
	k := int64(-1)
	for a, b := int64(0), hi-lo; a < b; {
		m := (a + b) / 2
		switch c := bytes.Compare(names[m*sha1.Size:(m+1)*sha1.Size], oid[:]); {
		case c == 0:
			k, a, b = lo+m, m, m
		case c < 0:
			a = m + 1
		default:
			b = m
		}
	}
	if k < 0 {
		return 0, false, true
	}
	offsets := int64(len(hdr)) + n*(sha1.Size+4)
	var w [8]byte
	if _, err := f.ReadAt(w[:4], offsets+4*k); err != nil {
		return 0, false, false
	}
	o := binary.BigEndian.Uint32(w[:4])
	if o&0x80000000 == 0 {
		return int64(o), true, true
	}
	if _, err := f.ReadAt(w[:], offsets+4*n+8*int64(o&0x7fffffff)); err != nil {
		return 0, false, false
	}
	big := binary.BigEndian.Uint64(w[:])
	if big > 1<<62 {
		return 0, false, false
	}
	return int64(big), true, true
}

// packedObject reads the object at off in a pack when it is stored whole
// as kind (a delta is refused).
func packedObject(packName string, off int64, kind string) ([]byte, bool) {
	types := map[string]byte{"commit": 1, "tree": 2, "blob": 3, "tag": 4}
	f, err := os.Open(packName)
	if err != nil {
		return nil, false
	}
	defer f.Close()
	var hdr [16]byte
	n, err := f.ReadAt(hdr[:], off)
	if n == 0 || (err != nil && err != io.EOF) {
		return nil, false
	}
	// Type in bits 4–6 of the first byte, size in its low four bits and
	// seven more bits a byte while the top bit is set.
	c := hdr[0]
	if (c>>4)&7 != types[kind] {
		return nil, false
	}
	size := uint64(c & 15)
	i, shift := 1, 4
	for c&0x80 != 0 {
		if i >= n || shift > 56 {
			return nil, false
		}
		c = hdr[i]
		size |= uint64(c&0x7f) << shift
		shift += 7
		i++
	}
	if size > maxCommitSize {
		return nil, false
	}
	zr, err := zlib.NewReader(io.NewSectionReader(f, off+int64(i), 1<<62))
	if err != nil {
		return nil, false
	}
	body := make([]byte, size)
	if _, err := io.ReadFull(zr, body); err != nil {
		return nil, false
	}
	return body, true
}
