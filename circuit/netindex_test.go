package circuit

import (
	"math/rand/v2"
	"strings"
	"testing"

	"nodal/diag"
)

// netsByMap is what Design.Net did before the flat index: a map from each
// top-level name to the net first made for it.
type netsByMap struct {
	ids   map[string]NetID
	names []string
}

func (m *netsByMap) net(name string) NetID {
	if id, ok := m.ids[name]; ok {
		return id
	}
	id := NetID(len(m.names))
	m.ids[name] = id
	m.names = append(m.names, name)
	return id
}

// TestNetIndexAsMap gives Design.Net and LookupNet the same random names,
// in the same order, as the map they replace, with the real hash and with
// hashes under which many or all names collide: every id, every new net's
// order and every lookup (of names present and absent) must agree.
func TestNetIndexAsMap(t *testing.T) {
	defer func(h func(string) uint64) { netHash = h }(netHash)
	hashes := map[string]func(string) uint64{
		"maphash":  netHash,
		"length":   func(s string) uint64 { return uint64(len(s)) * 0x9e3779b97f4a7c15 }, // names of a length collide
		"low half": func(s string) uint64 { return uint64(len(s)) },                      // high halves all zero
		"constant": func(string) uint64 { return 7 << 32 },
	}
	r := rand.New(rand.NewPCG(5, 6))
	// Names differing only in case, or by a quote, or by a byte past an
	// equal prefix, are different nets.
	letters := []string{"a", "A", "b", "B", "_", "\"", "ß", "\xff", "0"}
	word := func() string {
		var sb strings.Builder
		for range r.IntN(5) {
			sb.WriteString(letters[r.IntN(len(letters))])
		}
		return sb.String()
	}
	for hname, h := range hashes {
		netHash = h
		for round := range 100 {
			d := NewDesign("t.nodal")
			if round%2 == 0 {
				d.Reserve(0, r.IntN(50)) // sometimes too few, sometimes none
			}
			m := &netsByMap{ids: map[string]NetID{}}
			n := r.IntN(600)
			for i := range n {
				name := word()
				if hname == "maphash" && r.IntN(3) == 0 {
					name = "N" + strings.Repeat("x", r.IntN(3)) + string(rune('0'+i%10))
				}
				got, want := d.Net(name, diag.NoPos, diag.NoPos), m.net(name)
				if got != want {
					t.Fatalf("hash %s, round %d: Net(%q) = %d, the map %d", hname, round, name, got, want)
				}
				if d.Nets[got].Local != name || d.Nets[got].Inst != -1 {
					t.Fatalf("hash %s, round %d: net %d is %+v, want %q", hname, round, got, d.Nets[got], name)
				}
			}
			if len(d.Nets) != len(m.names) {
				t.Fatalf("hash %s, round %d: %d nets, the map %d", hname, round, len(d.Nets), len(m.names))
			}
			for range 200 {
				name := word()
				want, ok := m.ids[name]
				if !ok {
					want = NoNet
				}
				if got := d.LookupNet(name); got != want {
					t.Fatalf("hash %s, round %d: LookupNet(%q) = %d, the map %d", hname, round, name, got, want)
				}
			}
		}
	}
}

// TestNetCaseMatters pins down that net names are told apart by case, as a
// map of the names as written did.
func TestNetCaseMatters(t *testing.T) {
	d := NewDesign("t.nodal")
	vcc, Vcc := d.Net("vcc", diag.NoPos, diag.NoPos), d.Net("Vcc", diag.NoPos, diag.NoPos)
	if vcc == Vcc || d.Net("vcc", diag.NoPos, diag.NoPos) != vcc || d.LookupNet("VCC") != NoNet || d.LookupNet("Vcc") != Vcc {
		t.Fatalf("vcc %d, Vcc %d, VCC %d: names differing in case must be different nets", vcc, Vcc, d.LookupNet("VCC"))
	}
	var zero Design // a design not made by NewDesign finds nothing
	if zero.LookupNet("vcc") != NoNet {
		t.Fatal("an empty design found a net")
	}
}
