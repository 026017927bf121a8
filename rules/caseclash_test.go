package rules

import (
	"cmp"
	"fmt"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/diag"
)

// clashReference is the rule's definition written the plain way: a map from
// strings.ToLower of each name to its first use, filled in index order.
// It returns "net i j" / "part i j" for each later name i that folds like
// the first use j but is spelt differently.
func clashReference(d *circuit.Design) []string {
	var out []string
	nets := map[string]int{}
	for i, n := range d.Nets {
		if n.Pins == 0 && !n.Port {
			continue
		}
		k := strings.ToLower(d.NetNameOf(&n))
		if j, ok := nets[k]; ok {
			if d.NetNameOf(&d.Nets[j]) != d.NetNameOf(&n) {
				out = append(out, fmt.Sprint("net ", i, " ", j))
			}
			continue
		}
		nets[k] = i
	}
	parts := map[string]int{}
	for i, q := range d.Parts {
		k := strings.ToLower(d.NameOf(&q))
		if j, ok := parts[k]; ok {
			if d.NameOf(&d.Parts[j]) != d.NameOf(&q) {
				out = append(out, fmt.Sprint("part ", i, " ", j))
			}
			continue
		}
		parts[k] = i
	}
	slices.Sort(out)
	return out
}

// runClash runs the rule alone and returns its findings in the reference's
// form, read back from the positions (net i and part i are placed at
// distinct positions).
func runClash(t *testing.T, d *circuit.Design) []string {
	t.Helper()
	var out []string
	p := &Pass{Analyzer: CaseClash, Design: d, Config: &Config{}, report: func(g diag.Diagnostic) {
		if len(g.Related) != 1 {
			t.Fatalf("finding with %d related locations: %+v", len(g.Related), g)
		}
		i, j := int(g.Pos), int(g.Related[0].Pos)
		if strings.HasPrefix(g.Message, "net ") {
			out = append(out, fmt.Sprint("net ", i-1, " ", j-1))
		} else {
			out = append(out, fmt.Sprint("part ", i-1-len(d.Nets), " ", j-1-len(d.Nets)))
		}
	}}
	if _, err := CaseClash.Run(p); err != nil {
		t.Fatal(err)
	}
	slices.Sort(out)
	return out
}

// The sorted, case-folded hashing finds exactly what the map of lower-cased
// names finds, on names built from letters whose case folding is unusual:
// ß and ẞ, the Kelvin sign (lower case k), Ω and ω, the Turkish dotted İ,
// an invalid UTF-8 byte and U+FFFD (strings.ToLower writes the former as
// the latter).
func TestCaseClashMatchesReference(t *testing.T) {
	alphabet := []string{"a", "A", "b", "B", "k", "K", "\u212a", "ß", "ẞ", "Ω", "ω", "İ", "i", "\xff", "\uFFFD", "_", "1"}
	for seed := uint64(0); seed < 300; seed++ {
		r := rand.New(rand.NewPCG(seed, 7))
		d := circuit.NewDesign("t.nodal")
		name := func() string {
			var sb strings.Builder
			for range 1 + r.IntN(3) {
				sb.WriteString(alphabet[r.IntN(len(alphabet))])
			}
			return sb.String()
		}
		nets := 2 + r.IntN(60)
		for i := range nets {
			pos := diag.Pos(i + 1)
			d.Nets = append(d.Nets, circuit.Net{Local: name(), Pos: pos, End: pos, Inst: -1, Pins: int32(r.IntN(3)), Port: r.IntN(8) == 0})
		}
		for i := range r.IntN(60) {
			pos := diag.Pos(nets + i + 1)
			d.Parts = append(d.Parts, circuit.Part{Local: name(), Pos: pos, End: pos, Inst: -1})
		}
		want, got := clashReference(d), runClash(t, d)
		if !slices.Equal(got, want) {
			t.Fatalf("seed %d: got %v, want %v", seed, got, want)
		}
	}
}

// Names that fold alike are found however far apart they are and however
// many names lie between: 50 000 parts, every 250th spelt in upper
// case as well.
func TestCaseClashLarge(t *testing.T) {
	d := circuit.NewDesign("t.nodal")
	for i := range 50_000 {
		pos := diag.Pos(i + 1)
		d.Parts = append(d.Parts, circuit.Part{Local: fmt.Sprintf("r%d", i), Pos: pos, End: pos, Inst: -1})
	}
	for i := 0; i < 50_000; i += 250 {
		pos := diag.Pos(len(d.Parts) + 1)
		d.Parts = append(d.Parts, circuit.Part{Local: fmt.Sprintf("R%d", i), Pos: pos, End: pos, Inst: -1})
	}
	want, got := clashReference(d), runClash(t, d)
	if len(want) != 200 || !slices.Equal(got, want) {
		t.Fatalf("%d findings, reference %d; first %v / %v", len(got), len(want), got[:min(3, len(got))], want[:min(3, len(want))])
	}
}

// The radix passes and the comparison sort of small inputs put keys in
// the same order: hashes with many repeats, indexes ascending.
func TestRadixSortHighMatchesSort(t *testing.T) {
	for _, n := range []int{0, 1, 7, smallSort, smallSort + 1, 3 * smallSort} {
		keys := make([]uint64, n)
		for i := range keys {
			h := uint64(i*2654435761) % uint64(max(n/3, 1)) * 0x9e3779b9
			keys[i] = (h&0xffffffff)<<32 | uint64(i)
		}
		want := slices.Clone(keys)
		slices.SortStableFunc(want, func(x, y uint64) int { return cmp.Compare(x>>32, y>>32) })
		radixSortHigh(keys, make([]uint64, n))
		if !slices.Equal(keys, want) {
			t.Fatalf("n=%d: orders differ", n)
		}
	}
}
