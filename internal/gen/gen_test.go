package gen_test

import (
	"bytes"
	"math"
	"testing"

	"nodal/check"
	"nodal/internal/gen"
)

// Every generated design must check clean: that is the generator's promise
// and what makes it usable for benchmarks of the clean path.
func TestGeneratedDesignsCheckClean(t *testing.T) {
	cases := []struct {
		name  string
		parts int
		write func(*bytes.Buffer) error
	}{
		{"mesh1", (&gen.Mesh{K: 30, Supplies: 1}).Parts(), func(b *bytes.Buffer) error { return (&gen.Mesh{K: 30, Supplies: 1}).Write(b) }},
		{"mesh4", (&gen.Mesh{K: 41, Supplies: 4, Loads: 100, Seed: 9}).Parts(), func(b *bytes.Buffer) error {
			return (&gen.Mesh{K: 41, Supplies: 4, Loads: 100, Seed: 9}).Write(b)
		}},
		{"mesh rated", (&gen.Mesh{K: 30, Supplies: 4, Rated: 1}).Parts(), func(b *bytes.Buffer) error {
			return (&gen.Mesh{K: 30, Supplies: 4, Rated: 1}).Write(b)
		}},
		{"ladder", (&gen.Ladder{N: 3000}).Parts(), func(b *bytes.Buffer) error { return (&gen.Ladder{N: 3000, Seed: 2}).Write(b) }},
		{"blocks", (&gen.Blocks{N: 2000}).Parts(), func(b *bytes.Buffer) error { return (&gen.Blocks{N: 2000, Seed: 3}).Write(b) }},
	}
	// Small designs are solved too, so the rating rules see them.
	for seed := uint64(1); seed <= 10; seed++ {
		for _, n := range []int{200, 5000} {
			seed, n := seed, n
			cases = append(cases, struct {
				name  string
				parts int
				write func(*bytes.Buffer) error
			}{"random", 0, func(b *bytes.Buffer) error { return (&gen.Random{Parts: n, Seed: seed}).Write(b) }})
		}
	}
	cases = append(cases, struct {
		name  string
		parts int
		write func(*bytes.Buffer) error
	}{"small mesh", (&gen.Mesh{K: 12, Supplies: 2}).Parts(), func(b *bytes.Buffer) error { return (&gen.Mesh{K: 12, Supplies: 2}).Write(b) }})
	for _, c := range cases {
		var buf bytes.Buffer
		if err := c.write(&buf); err != nil {
			t.Fatal(err)
		}
		res, err := check.Source(c.name+".nodal", buf.Bytes(), nil)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range res.Diags {
			t.Errorf("%s: %s: %s [%s]", c.name, res.Fset.Position(d.Pos), d.Message, d.Rule)
		}
		if c.parts > 0 && len(res.Build.Design.Parts) != c.parts {
			t.Errorf("%s: %d parts built, Parts() says %d", c.name, len(res.Build.Design.Parts), c.parts)
		}
		if c.name == "random" && len(res.Build.Design.Parts) < 190 {
			t.Errorf("random: only %d parts", len(res.Build.Design.Parts))
		}
	}
}

// A rated mesh carries the rating on every segment and on nothing else,
// like a real power grid whose segments are specified by their dissipation.
func TestMeshRatedEverySegment(t *testing.T) {
	m := &gen.Mesh{K: 20, Supplies: 4, Rated: 1}
	var buf bytes.Buffer
	if err := m.Write(&buf); err != nil {
		t.Fatal(err)
	}
	segments, rated := 0, 0
	for _, line := range bytes.Split(buf.Bytes(), []byte("\n")) {
		seg := bytes.HasPrefix(line, []byte("resistor h")) || bytes.HasPrefix(line, []byte("resistor v"))
		r := bytes.HasSuffix(line, []byte(" rated 1 W"))
		if seg {
			segments++
		}
		if r {
			rated++
			if !seg {
				t.Errorf("rating on a line that is no segment: %s", line)
			}
		}
	}
	if segments != 2*20*19 || rated != segments {
		t.Errorf("%d segments, %d rated; want %d of each", segments, rated, 2*20*19)
	}
}

func TestDeterministic(t *testing.T) {
	var a, b bytes.Buffer
	(&gen.Random{Parts: 2000, Seed: 4}).Write(&a)
	(&gen.Random{Parts: 2000, Seed: 4}).Write(&b)
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Fatal("same seed, different designs")
	}
	a.Reset()
	(&gen.Random{Parts: 2000, Seed: 5}).Write(&a)
	if bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Fatal("different seeds, same design")
	}
}

// The nodal matrix of a resistor network is a weighted graph Laplacian plus
// the conductances to fixed-voltage nodes on the diagonal (modified nodal
// analysis, e.g. Ho, Ruehli & Brennan, IEEE Trans. Circuits Syst. 22(6),
// 1975, from memory): symmetric, and each row sums to the conductance that
// row's net has to a supply pad.
func TestMeshSystem(t *testing.T) {
	m := &gen.Mesh{K: 7, Supplies: 2, Loads: 5, Seed: 3}
	n, rows, cols, vals, rhs := m.System()
	if n != 49 {
		t.Fatalf("n = %d", n)
	}
	dense := make([]float64, n*n)
	for k := range vals {
		dense[int(rows[k])*n+int(cols[k])] += vals[k]
	}
	pad := map[int]bool{0: true, n - 1: true}
	for i := 0; i < n; i++ {
		sum := 0.0
		for j := 0; j < n; j++ {
			if dense[i*n+j] != dense[j*n+i] {
				t.Fatalf("not symmetric at %d,%d", i, j)
			}
			sum += dense[i*n+j]
		}
		want := 0.0
		if pad[i] {
			want = 1 / 0.001
		}
		if math.Abs(sum-want) > 1e-9*want+1e-9 {
			t.Errorf("row %d sums to %g, want %g", i, sum, want)
		}
	}
	// Sources: 1 V through each 1 mΩ pad; sinks: 1 mA each.
	total := 0.0
	for _, v := range rhs {
		total += v
	}
	if want := 2*1/0.001 - 5*0.001; math.Abs(total-want) > 1e-9 {
		t.Errorf("rhs sums to %g, want %g", total, want)
	}
}
