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
	"sync"
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
	for k := range first {
		first[k] = -1
	}
	_, workers := aheadSplit(n, n)
	keys := b.sortedKeys(bd, shift, workers > 0)
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

// sortedKeys returns the keys of bd's statements of known kind or block,
// sorted: each its name's hash above its index (shift bits). With halves
// set, two goroutines make them, each for half of the statements, and sort
// them, one the keys whose top bit is 0 and the other the rest; the keys
// are distinct, so the result is the same either way.
func (b *builder) sortedKeys(bd *blockDef, shift uint, halves bool) []uint64 {
	n := len(bd.body)
	keyOf := func(k int) (uint64, bool) {
		st := bd.body[k]
		if !b.knownWord(b.partKind(st)) {
			return 0, false
		}
		return nameHash(b.partName(st))<<shift | uint64(k), true
	}
	if !halves {
		keys := make([]uint64, 0, n)
		for k := range n {
			if key, ok := keyOf(k); ok {
				keys = append(keys, key)
			}
		}
		slices.Sort(keys)
		return keys
	}
	var part [2][2][]uint64 // by half of the statements, then by top bit
	var wg sync.WaitGroup
	for h := range 2 {
		wg.Go(func() {
			lo, hi := h*n/2, (h+1)*n/2
			for t := range part[h] {
				part[h][t] = make([]uint64, 0, (hi-lo)/2+(hi-lo)/16)
			}
			for k := lo; k < hi; k++ {
				if key, ok := keyOf(k); ok {
					part[h][key>>63] = append(part[h][key>>63], key)
				}
			}
		})
	}
	wg.Wait()
	keys := make([]uint64, 0, n)
	for t := range 2 {
		for h := range 2 {
			keys = append(keys, part[h][t]...)
		}
	}
	low := len(part[0][0]) + len(part[1][0])
	wg.Go(func() { slices.Sort(keys[:low]) })
	slices.Sort(keys[low:])
	wg.Wait()
	return keys
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
