package check

import (
	"fmt"
	"strings"
	"testing"
)

// hierDesign is a design of n instances of a four-part channel block inside
// rows of ten, for measuring that elaboration is linear in expanded size.
func hierDesign(rows int) []byte {
	var b strings.Builder
	b.WriteString(`block ch (s, k) [i = 10 mA] {
  resistor R (s, a) ((12 V - 2 V) / i) rated 250 mW
  led      D (a, m) vf 2.0 V at 20 mA
  resistor S (m, k) 10 Ω
  capacitor C (a, k) 100 nF
}
block row (s, k) [i = 10 mA] {
`)
	for i := 0; i < 10; i++ {
		fmt.Fprintf(&b, "  ch C%d (s, k) [i = (i + %d mA)]\n", i, i)
	}
	b.WriteString("}\nground gnd\nsource V (vin, gnd) 12 V\n")
	for r := 0; r < rows; r++ {
		fmt.Fprintf(&b, "row R%d (vin, gnd)\n", r)
	}
	return []byte(b.String())
}

// BenchmarkCheckHier checks designs of 4 000 to 400 000 expanded parts; the
// ns/part figure should stay flat as the size grows.
func BenchmarkCheckHier(b *testing.B) {
	for _, rows := range []int{100, 1000, 10000} {
		src := hierDesign(rows)
		parts := rows * 40
		b.Run(fmt.Sprintf("parts=%d", parts), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				r, err := Source("hier.nodal", src, nil)
				if err != nil || len(r.Build.Design.Parts) != parts+1 {
					b.Fatalf("%v: %d parts", err, len(r.Build.Design.Parts))
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(parts), "ns/part")
		})
	}
}

// BenchmarkMergedFindings checks a design whose block has a bad value and
// an overloaded resistor, used by 100 000 instances: the findings of every
// instance are merged as they are made, so memory stays that of the design.
func BenchmarkMergedFindings(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("block bad (s, k) {\n  resistor R (s, k) 100 Ω rated 125 mW\n  resistor Z (s, k) 0 Ω\n}\nblock ten (s, k) {\n")
	for i := 0; i < 10; i++ {
		fmt.Fprintf(&sb, "  bad B%d (s, k)\n", i)
	}
	sb.WriteString("}\nblock hundred (s, k) {\n")
	for i := 0; i < 10; i++ {
		fmt.Fprintf(&sb, "  ten T%d (s, k)\n", i)
	}
	sb.WriteString("}\nground gnd\nsource V (vin, gnd) 5 V\n")
	for i := 0; i < 1000; i++ {
		fmt.Fprintf(&sb, "hundred H%d (vin, gnd)\n", i)
	}
	src := []byte(sb.String())
	b.ReportAllocs()
	for b.Loop() {
		r, err := Source("merged.nodal", src, nil)
		if err != nil || len(r.Diags) != 1 {
			b.Fatalf("%v: %d findings, want the one bad value merged", err, len(r.Diags))
		}
	}
}
