package circuit

import (
	"strings"
	"testing"

	"nodal/grammar"
)

// Every attribute a kind takes must be an attribute word of the grammar:
// a word in a value's place that is not one is read as a parameter
// standing alone, so "led D (a, k) theta 300 K/W" would lose its theta.
func TestAttributesAreAttributeWords(t *testing.T) {
	if len(attrKinds()) < 2 {
		t.Fatal("no attributes in the kind table")
	}
	for key := range attrKinds() {
		if why := grammar.ParamNameTrouble(key); !strings.Contains(why, "attribute word") {
			t.Errorf("attribute %s is not an attribute word of the grammar (%q)", key, why)
		}
	}
}
