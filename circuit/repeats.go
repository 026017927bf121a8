package circuit

// repeats.go: which part and instance statements of a block (or of the top
// level) repeat the name of an earlier one. A map from every name to its
// statement costs a random access into the map and into the source text
// per statement, which on a design of millions of parts is most of the
// time its statements take to prepare. Here each name is hashed in file
// order, the hashes are sorted with the statement's index below them, and
// only names whose hashes meet are compared, by their text: a hash
// collision costs a comparison, never a finding, and the result is the one
// the map gives whatever the hash function (TestRepeatsAsMap).

import (
	"hash/maphash"
	"math/bits"
	"slices"
)

var nameSeed = maphash.MakeSeed()

// nameHash hashes a statement's name; tests swap in a weak hash to make
// names collide.
var nameHash = func(s string) uint64 { return maphash.String(nameSeed, s) }

// repeats returns, for each statement of bd whose kind or block is known,
// the index in bd.body of the first such statement before it with the same
// name, or -1; and -1 for a statement of unknown kind, which prepare
// reports instead and leaves out.
func (b *builder) repeats(bd *blockDef) []int {
	n := len(bd.body)
	first := make([]int, n)
	// The index takes the low bits of each key, the hash the rest, so
	// that keys sort by hash and, within a hash, in file order.
	shift := uint(bits.Len(uint(n)))
	keys := make([]uint64, 0, n)
	for k, st := range bd.body {
		first[k] = -1
		if !b.knownWord(b.partKind(st)) {
			continue
		}
		keys = append(keys, nameHash(b.partName(st))<<shift|uint64(k))
	}
	slices.Sort(keys)
	index := func(key uint64) int { return int(key & (1<<shift - 1)) }
	var reps []int // the distinct names of one run of equal hashes, by first use
	for i := 0; i < len(keys); {
		j := i + 1
		for j < len(keys) && keys[j]>>shift == keys[i]>>shift {
			j++
		}
		if j-i > 1 {
			reps = reps[:0]
			for _, key := range keys[i:j] {
				k, name := index(key), b.partName(bd.body[index(key)])
				first[k] = -1
				for _, r := range reps {
					if b.partName(bd.body[r]) == name {
						first[k] = r
						break
					}
				}
				if first[k] < 0 {
					reps = append(reps, k)
				}
			}
		}
		i = j
	}
	return first
}

// knownWord reports whether a statement's kind word is a built-in kind or
// a block, as prepare decides it.
func (b *builder) knownWord(word string) bool {
	if _, builtin := kindOf(word); builtin {
		return true
	}
	_, isBlock := b.blocks[word]
	return isBlock
}
