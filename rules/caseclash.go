package rules

import (
	"slices"
	"unicode"
	"unicode/utf8"

	"nodal/circuit"
	"nodal/diag"
)

// CaseClash reports names that differ only in letter case.
//
// # Method
//
// Two names clash when strings.ToLower makes them equal, that is when
// their runes are equal after unicode.ToLower one by one. Instead of a map
// from lower-cased name to first use (two maps of every name, a lower-cased
// copy of each), the rule hashes each name's lower-cased runes without
// copying it (FNV-1a, Fowler–Noll–Vo), packs the hash's upper 32 bits
// above the index into one uint64, and sorts these keys with an LSD radix
// sort (two passes of 16 bits over the hash half; the index half is
// already in order, and the sort is stable). Names that fold alike then
// sit next to each other, in index order. Only runs with the same hash are
// looked at; a run is sorted by the folded names themselves (ties by
// index), so colliding hashes cost a comparison, never a wrong finding,
// and a run of colliding names crafted on purpose costs n log n, not n².
// Within each group of equal folded names the first by index is the first
// use, as a map filled in index order would have it.
var CaseClash = &Analyzer{
	Name:     "case-clash",
	Severity: diag.Warning,
	Doc: `two names that differ only in letter case
Names are case-sensitive, so Vin and vin are two nets (or two parts). That
is rarely meant.`,
	Run: func(p *Pass) (any, error) {
		d := p.Design
		n := max(len(d.Nets), len(d.Parts))
		keys, tmp := make([]uint64, 0, n), make([]uint64, n)
		prefix := instanceHashes(d)
		for i := range d.Nets {
			if net := &d.Nets[i]; net.Pins > 0 || net.Port {
				keys = append(keys, fullHash(prefix, net.Inst, net.Local)<<32|uint64(i))
			}
		}
		foldGroups(keys, tmp, func(i int) string { return d.NetName(i32(i)) }, func(first, i int) {
			f, net := &d.Nets[first], &d.Nets[i]
			fname := d.NetName(i32(first))
			p.Report(diag.Diagnostic{Pos: net.Pos, End: net.End, Subject: d.NetName(i32(i)), Message: "net " + netName(d, i32(i)) + " differs from net " + fname + " only in letter case; names are case-sensitive, so they are two nets",
				Related: []diag.Related{{Pos: f.Pos, Message: "net " + fname + " is first used here"}}})
		})
		keys = keys[:0]
		for i := range d.Parts {
			q := &d.Parts[i]
			keys = append(keys, fullHash(prefix, q.Inst, q.Local)<<32|uint64(i))
		}
		foldGroups(keys, tmp, func(i int) string { return d.PartName(circuit.PartID(i)) }, func(first, i int) {
			f, q := &d.Parts[first], &d.Parts[i]
			fname, qname := d.NameOf(f), d.NameOf(q)
			p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: qname, Message: "part " + qname + " differs from part " + fname + " only in letter case",
				Related: []diag.Related{{Pos: f.Pos, Message: fname + " is here"}}})
		})
		return nil, nil
	},
}

const fnvOffset, fnvPrime = 14695981039346656037, 1099511628211

// foldHash is the upper 32 bits of the 64-bit FNV-1a hash of the
// lower-cased runes of s (each rune as its UTF-8 bytes; an invalid byte as
// U+FFFD, as strings.ToLower writes it).
func foldHash(s string) uint64 { return foldFrom(fnvOffset, s) >> 32 }

// instanceHashes returns, for each instance, the FNV-1a state after the
// lower-cased runes of its path and a dot: FNV-1a reads its input in
// order, so a name inside the instance hashes on from there, and no
// dotted name is built. A dot is ASCII, so a name's runes decode the same
// alone as in the path.
func instanceHashes(d *circuit.Design) []uint64 {
	hs := make([]uint64, len(d.Instances))
	for i := range d.Instances {
		in := &d.Instances[i]
		h := uint64(fnvOffset)
		if in.Parent >= 0 && int(in.Parent) < i {
			h = hs[in.Parent] // a parent is made before its instances
		}
		hs[i] = foldFrom(foldFrom(h, in.Local), ".")
	}
	return hs
}

// fullHash is foldHash of local with instance inst's path in front.
func fullHash(prefix []uint64, inst int32, local string) uint64 {
	if inst < 0 || int(inst) >= len(prefix) {
		return foldHash(local)
	}
	return foldFrom(prefix[inst], local) >> 32
}

// foldFrom continues the FNV-1a hash h over the lower-cased runes of s.
func foldFrom(h uint64, s string) uint64 {
	const prime = fnvPrime
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if 'A' <= c && c <= 'Z' {
				c += 'a' - 'A'
			}
			h = (h ^ uint64(c)) * prime
			i++
			continue
		}
		r, w := utf8.DecodeRuneInString(s[i:])
		i += w
		var buf [utf8.UTFMax]byte
		for _, b := range utf8.AppendRune(buf[:0], unicode.ToLower(r)) {
			h = (h ^ uint64(b)) * prime
		}
	}
	return h
}

// foldCompare compares a and b as strings.ToLower(a) and strings.ToLower(b)
// would compare, rune by rune, without building either.
func foldCompare(a, b string) int {
	for a != "" && b != "" {
		ra, wa := utf8.DecodeRuneInString(a)
		rb, wb := utf8.DecodeRuneInString(b)
		if ra < utf8.RuneSelf && 'A' <= ra && ra <= 'Z' {
			ra += 'a' - 'A'
		} else if ra >= utf8.RuneSelf {
			ra = unicode.ToLower(ra)
		}
		if rb < utf8.RuneSelf && 'A' <= rb && rb <= 'Z' {
			rb += 'a' - 'A'
		} else if rb >= utf8.RuneSelf {
			rb = unicode.ToLower(rb)
		}
		if ra != rb {
			if ra < rb {
				return -1
			}
			return 1
		}
		a, b = a[wa:], b[wb:]
	}
	switch {
	case a == "" && b == "":
		return 0
	case a == "":
		return -1
	}
	return 1
}

// foldGroups sorts keys (hash<<32 | index, indexes ascending on entry) and
// calls clash(first, i) for every index i whose name folds like an earlier
// one's but is spelt differently, first being the earliest index of its
// group. tmp is scratch of at least len(keys).
func foldGroups(keys, tmp []uint64, name func(int) string, clash func(first, i int)) {
	radixSortHigh(keys, tmp[:len(keys)])
	for lo := 0; lo < len(keys); {
		hi := lo + 1
		for hi < len(keys) && keys[hi]>>32 == keys[lo]>>32 {
			hi++
		}
		if hi-lo > 1 {
			// The names of a run are built once each (inside instances
			// name builds the dotted path).
			run := keys[lo:hi]
			names := make(map[int]string, len(run))
			for _, k := range run {
				names[int(uint32(k))] = name(int(uint32(k)))
			}
			slices.SortStableFunc(run, func(x, y uint64) int {
				return foldCompare(names[int(uint32(x))], names[int(uint32(y))])
			})
			first := int(uint32(run[0]))
			for k := 1; k < len(run); k++ {
				i := int(uint32(run[k]))
				if foldCompare(names[first], names[i]) != 0 {
					first = i
					continue
				}
				if names[i] != names[first] {
					clash(first, i)
				}
			}
		}
		lo = hi
	}
}

// smallSort is the most keys radixSortHigh sorts by comparison.
const smallSort = 4096

// radixSortHigh sorts keys by their upper 32 bits, keeping the order of
// equal ones: a least-significant-digit radix sort in two 16-bit passes.
func radixSortHigh(keys, tmp []uint64) {
	if len(keys) <= smallSort {
		// The radix passes clear and sum 2¹⁶ counters each, which costs
		// more than the sort itself on a small design. The low halves are
		// the indexes, ascending on entry and distinct, so sorting whole
		// keys orders them as the stable radix sort does.
		slices.Sort(keys)
		return
	}
	// The counters are on the heap: as an array on the stack they made
	// the frame 512 KiB even on the small path above, and every check
	// grew its goroutine's stack to a megabyte to call this.
	count := make([]int, 1<<16)
	src, dst := keys, tmp
	for shift := uint(32); shift < 64; shift += 16 {
		clear(count)
		for _, k := range src {
			count[(k>>shift)&0xffff]++
		}
		sum := 0
		for i, c := range count {
			count[i] = sum
			sum += c
		}
		for _, k := range src {
			b := (k >> shift) & 0xffff
			dst[count[b]] = k
			count[b]++
		}
		src, dst = dst, src
	}
	// Two passes: the sorted keys are back in keys.
}
