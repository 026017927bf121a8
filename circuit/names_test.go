package circuit

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"

	"nodal/diag"
)

// joined is the dotted path of instance i built the plain way, by joining
// the names from the top: the reference the accessors are checked against.
func joined(d *Design, i int32) string {
	var names []string
	for ; i >= 0; i = d.Instances[i].Parent {
		names = append([]string{d.Instances[i].Local}, names...)
	}
	return strings.Join(names, ".")
}

// randomTree is a design of n instances, each inside an earlier one or at
// the top, with names from an alphabet that has dots and quotes in it (as
// quoted names may), and a part and a local net in each.
func randomTree(r *rand.Rand, n int) *Design {
	d := NewDesign("t.nodal")
	name := func() string {
		const alpha = `ab.-"A`
		b := make([]byte, r.IntN(4))
		for i := range b {
			b[i] = alpha[r.IntN(len(alpha))]
		}
		return string(b)
	}
	for i := 0; i < n; i++ {
		parent := int32(r.IntN(i+1)) - 1
		d.Instances = append(d.Instances, Instance{Local: name(), Block: "b", Parent: parent})
		d.Parts = append(d.Parts, Part{Local: name(), Inst: int32(i)})
		d.Nets = append(d.Nets, Net{Local: name(), Inst: int32(i)})
	}
	d.Parts = append(d.Parts, Part{Local: "top", Inst: -1})
	return d
}

// The accessors spell the same names as joining the paths would, and the
// comparisons order them as strings.Compare orders the joined names.
func TestNamesMatchJoinedPaths(t *testing.T) {
	for seed := uint64(1); seed <= 30; seed++ {
		r := rand.New(rand.NewPCG(seed, 7))
		d := randomTree(r, 40)
		for i := range d.Instances {
			in := int32(i)
			want := joined(d, in)
			if got := d.InstancePath(in); got != want {
				t.Fatalf("seed %d: InstancePath(%d) = %q, want %q", seed, i, got, want)
			}
			if got := d.PathLen(in); got != len(want) {
				t.Fatalf("seed %d: PathLen(%d) = %d, want %d", seed, i, got, len(want))
			}
			if got := d.PartName(PartID(i)); got != want+"."+d.Parts[i].Local {
				t.Fatalf("seed %d: PartName(%d) = %q", seed, i, got)
			}
			if got := d.NetName(NetID(i)); got != want+"."+d.Nets[i].Local {
				t.Fatalf("seed %d: NetName(%d) = %q", seed, i, got)
			}
			for j := range d.Instances {
				if got, want := d.ComparePaths(in, int32(j)), strings.Compare(want, joined(d, int32(j))); got != want {
					t.Fatalf("seed %d: ComparePaths(%q, %q) = %d, want %d", seed, joined(d, in), joined(d, int32(j)), got, want)
				}
			}
		}
		for a := range d.Parts {
			for b := range d.Parts {
				pa, pb := d.PartName(PartID(a)), d.PartName(PartID(b))
				if got, want := d.CompareParts(PartID(a), PartID(b)), strings.Compare(pa, pb); got != want {
					t.Fatalf("seed %d: CompareParts(%q, %q) = %d, want %d", seed, pa, pb, got, want)
				}
			}
		}
		if got := d.PartName(PartID(len(d.Parts) - 1)); got != "top" {
			t.Fatalf("a part at the top level is named %q", got)
		}
		var total int64
		for i := range d.Parts {
			total += int64(len(d.PartName(PartID(i))))
		}
		for i := range d.Nets {
			total += int64(len(d.NetName(NetID(i))))
		}
		if got := d.NameBytes(); got != total {
			t.Fatalf("seed %d: NameBytes() = %d, want %d", seed, got, total)
		}
	}
}

// A part or net is found by its dotted name, whatever dots its own name
// and the instance names around it hold; a name with two readings finds
// the part made first, as a scan of the parts in order would.
func TestInstanceOfByName(t *testing.T) {
	for seed := uint64(1); seed <= 30; seed++ {
		r := rand.New(rand.NewPCG(seed, 11))
		d := randomTree(r, 40)
		for i := range d.Instances {
			name := d.PartName(PartID(i))
			first := -1
			for k := range d.Parts {
				if d.PartName(PartID(k)) == name {
					first = k
					break
				}
			}
			if got, want := d.InstanceOf(name), d.Parts[first].Inst; got != want {
				t.Fatalf("seed %d: InstanceOf(%q) = %d, want %d", seed, name, got, want)
			}
			net := d.NetName(NetID(i))
			firstNet := NoNet
			for k := range d.Nets {
				if d.NetName(NetID(k)) == net {
					firstNet = NetID(k)
					break
				}
			}
			if got := d.LookupNet(net); got != firstNet {
				t.Fatalf("seed %d: LookupNet(%q) = %d, want %d", seed, net, got, firstNet)
			}
		}
	}
	d := NewDesign("t.nodal")
	if d.InstanceOf("A.R") != -1 || d.LookupNet("A.x") != NoNet {
		t.Errorf("a design without instances finds names inside one")
	}
}

// A related location spells a long instance path by its end: the text
// of a finding's chain of instances grows with the depth, not with its
// square.
func TestShownPathBounded(t *testing.T) {
	d := NewDesign("t.nodal")
	long := strings.Repeat("x", 3000)
	for i := 0; i < 60; i++ {
		d.Instances = append(d.Instances, Instance{Local: fmt.Sprintf("N%d%s", i, long), Parent: int32(i) - 1})
	}
	d.Instances = append(d.Instances, Instance{Local: "A", Parent: -1}, Instance{Local: "B", Parent: 60})
	if got := d.ShownPath(61); got != "A.B" {
		t.Errorf("a short path is shown as %q", got)
	}
	for _, i := range []int32{0, 1, 59} {
		got, full := d.ShownPath(i), d.InstancePath(i)
		if !strings.HasPrefix(got, "…") || len(got) > MaxShownPath+len("…") || !strings.HasSuffix(full, strings.TrimPrefix(got, "…")) {
			t.Errorf("instance %d: shown as %d bytes %.20q…", i, len(got), got)
		}
	}
	var total int
	for _, r := range d.InstanceRelated(59) {
		total += len(r.Message)
	}
	if total > 60*(MaxShownPath+64) {
		t.Errorf("the chain of 60 instances takes %d bytes", total)
	}
}

// Past the bound on the text of findings, the findings left are not kept
// but counted in one expansion-limit error at the first of them.
func TestFindingTextBounded(t *testing.T) {
	saved := maxFindingText
	defer func() { maxFindingText = saved }()
	maxFindingText = 1000
	var fs Findings
	for i := 0; i < 25; i++ {
		fs.Add(Finding{Diagnostic: diag.Diagnostic{Pos: diag.Pos(i + 1), Rule: "shorted-part", Message: strings.Repeat("m", 90)}, Inst: -1})
	}
	out := fs.Finish(NewDesign("t.nodal"))
	kept, limits := 0, 0
	for _, f := range out {
		switch f.Rule {
		case "shorted-part":
			kept++
		case "expansion-limit":
			limits++
			if f.Severity != diag.Error || f.Pos != 12 || !strings.Contains(f.Message, "14 more findings were not kept") {
				t.Errorf("limit finding %+v", f)
			}
		}
	}
	if kept != 11 || limits != 1 {
		t.Errorf("%d findings kept and %d limit findings; want 11 and 1", kept, limits)
	}
}
