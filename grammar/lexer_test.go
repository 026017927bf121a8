package grammar

import (
	"strings"
	"testing"

	"nodal/units"
)

// The length bound that lets classifyWord skip the unit tables must not
// hide a unit: every prefix with every symbol of package units' doc
// comment (p n u µ μ m k M G T; Ω Ω ohm F H V A W).
func TestUnitWordsFitTheBound(t *testing.T) {
	prefixes := []string{"", "p", "n", "u", "\u00b5", "\u03bc", "m", "k", "M", "G", "T"}
	symbols := []string{"\u03a9", "\u2126", "ohm", "F", "H", "V", "A", "W"}
	for _, p := range prefixes {
		for _, s := range symbols {
			w := p + s
			if !units.IsUnit(w) {
				t.Errorf("%q is not a unit to package units", w)
			}
			if len(w) > maxUnitBytes {
				t.Errorf("%q is %d bytes, over maxUnitBytes", w, len(w))
			}
			if got := classifyWord(w); got != TokUnit {
				t.Errorf("classifyWord(%q) = %v, want TokUnit", w, got)
			}
		}
	}
}

// The attributes named in messages are the attribute words, but "at" and
// the switch states.
func TestAttributeListIsTheAttributeWords(t *testing.T) {
	listed := map[string]bool{}
	for _, w := range strings.Split(attributeList, ", ") {
		listed[w] = true
		if !attrWords[w] {
			t.Errorf("%s is listed but is no attribute word", w)
		}
	}
	for w := range attrWords {
		if !listed[w] && w != "at" && w != "open" && w != "closed" {
			t.Errorf("attribute word %s is missing from attributeList", w)
		}
	}
}
