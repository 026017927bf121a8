package circuit

// netindex.go: the top-level nets by name. Building a large design looks a
// net up once per pin, so the table is kept small and flat: one uint64 per
// slot, holding the high half of the name's hash above 1 + the net's id,
// in an open-addressing table (linear probing) at most half full. A slot
// whose hash half matches is confirmed by comparing the name with the
// net's own (Net.Local, made once when the net is added), so a hash
// collision costs a comparison, never a wrong net, whatever the hash
// function (TestNetIndexAsMap). Names are compared byte for byte: case
// matters for a net's identity, as it always has.

import "hash/maphash"

var netSeed = maphash.MakeSeed()

// netHash hashes a net's name; tests swap in a weak hash to make names
// collide.
var netHash = func(s string) uint64 { return maphash.String(netSeed, s) }

// add holds id, the net just made for name, in the slot find returned.
func (x *netIndex) add(slot int, h uint64, id NetID) {
	x.slots[slot] = h>>32<<32 | uint64(uint32(id)+1)
	x.n++
}

// netIndex maps top-level net names to their ids; its zero value is an
// empty index.
type netIndex struct {
	slots []uint64 // 0: empty; else hash>>32<<32 | uint64(id)+1
	n     int      // nets held
}

// reserve sizes the table for at least n nets without growing.
func (x *netIndex) reserve(n int) {
	size := 8
	for size < 2*n {
		size *= 2
	}
	if size > len(x.slots) {
		x.rehash(size)
	}
}

// find returns the slot where name is held or would go, and the id held
// there (NoNet if the slot is empty). nets are the design's nets.
func (x *netIndex) find(name string, h uint64, nets []Net) (int, NetID) {
	mask := len(x.slots) - 1
	tag := h >> 32 << 32
	for i := int(h>>32) & mask; ; i = (i + 1) & mask {
		s := x.slots[i]
		if s == 0 {
			return i, NoNet
		}
		if s&^(1<<32-1) == tag {
			id := NetID(uint32(s) - 1)
			if nets[id].Local == name {
				return i, id
			}
		}
	}
}

// lookup returns the id of the net named name, or NoNet.
func (x *netIndex) lookup(name string, nets []Net) NetID {
	if x.n == 0 {
		return NoNet
	}
	_, id := x.find(name, netHash(name), nets)
	return id
}

// rehash moves the table to size slots (a power of two).
func (x *netIndex) rehash(size int) {
	old := x.slots
	x.slots = make([]uint64, size)
	mask := size - 1
	for _, s := range old {
		if s == 0 {
			continue
		}
		i := int(s>>32) & mask // where find starts: the high half of the hash
		for x.slots[i] != 0 {
			i = (i + 1) & mask
		}
		x.slots[i] = s
	}
}
