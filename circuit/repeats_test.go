package circuit

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"testing"

	"nodal/grammar"
)

// repeatsByMap is what prepare did before repeats: a map from each name to
// the first statement of known kind that has it.
func repeatsByMap(b *builder, bd *blockDef) []int {
	first := make([]int, len(bd.body))
	names := map[string]int{}
	for k, st := range bd.body {
		first[k] = -1
		if !b.knownWord(st.pt.Kind.Text) {
			continue
		}
		if j, seen := names[st.pt.Name.Text]; seen {
			first[k] = j
		} else {
			names[st.pt.Name.Text] = k
		}
	}
	return first
}

func TestRepeatsAsMap(t *testing.T) {
	defer func(h func(string) uint64) { nameHash = h }(nameHash)
	hashes := map[string]func(string) uint64{
		"maphash":  nameHash,
		"length":   func(s string) uint64 { return uint64(len(s)) }, // every name of a length collides
		"constant": func(string) uint64 { return 7 },
	}
	r := rand.New(rand.NewPCG(3, 4))
	words := []string{"resistor", "capacitor", "cell", "resistr", "gizmo"}
	defer func(s func(int, int) (int, int)) { aheadSplit = s }(aheadSplit)
	for name, h := range hashes {
		nameHash = h
		for round := 0; round < 200; round++ {
			// Odd rounds make and sort the keys on two goroutines.
			workers := round % 2
			aheadSplit = func(int, int) (int, int) { return 1, workers }
			b := &builder{blocks: map[string]*blockDef{"cell": {name: "cell"}}}
			bd := &blockDef{}
			n := r.IntN(300)
			pool := 1 + r.IntN(n+1)
			for range n {
				pt := &grammar.Part{Kind: &grammar.Name{Text: words[r.IntN(len(words))]}, Name: &grammar.Name{Text: fmt.Sprintf("R%d", r.IntN(pool))}}
				bd.body = append(bd.body, treeStmt(pt, 0, 0))
			}
			got, want := b.repeats(bd), repeatsByMap(b, bd)
			if !reflect.DeepEqual(got, want) {
				t.Fatalf("hash %s, round %d (%d workers): repeats %v, the map %v", name, round, workers, got, want)
			}
		}
	}
}
