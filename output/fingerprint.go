package output

// fingerprint.go: what identifies a finding across revisions — its rule,
// the design it was found in, and the part or net it is about — so that a
// finding keeps its identity when lines move above it. The same key pairs
// findings when two revisions are compared (package output/review) and
// names them in SARIF's partialFingerprints (SARIF 2.1.0 §3.27.17).

import (
	"crypto/sha256"
	"encoding/hex"
	"regexp"
	"strconv"
	"strings"
	"sync"
)

// FingerprintName is the key of nodal's entry in a SARIF result's
// partialFingerprints; the version suffix changes if the key's recipe does.
const FingerprintName = "nodalFinding/v1"

// numberRE matches a number standing on its own: not the digits of a name
// such as R1 or ROW2.C4, but a value ("1.44 W", "4k7"), a line ("line 4")
// or a position ("lib.nodal:4:1"). Both expressions are compiled when first
// used, not at every start of the program: the Unicode classes alone take
// a tenth of a millisecond, and most runs print no fingerprint.
var numberRE = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`(^|[^\pL\pN_.])[-+]?[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?`)
})

// lineRE matches a reference to a line in a message: "line 4", or
// "lib/stages.nodal:4" with an optional column.
var lineRE = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`(\bline |\.nodal:)[0-9]+(:[0-9]+)?`)
})

// Shape returns a message with its numbers masked: what stays when values
// and line numbers change.
func Shape(msg string) string {
	return numberRE().ReplaceAllString(msg, "${1}#")
}

// Lineless returns a message with its references to lines masked: two
// findings whose Lineless messages are equal say the same thing.
func Lineless(msg string) string {
	return lineRE().ReplaceAllString(msg, "${1}#")
}

// Key identifies a finding without its line: the rule, the design, and
// the part or net path it is about. A finding that names no part or net
// (a syntax error, say) is identified by the file it points into and its
// message with the numbers masked.
func (f *Finding) Key() string {
	var b strings.Builder
	b.WriteString(f.Rule)
	b.WriteByte(0)
	b.WriteString(f.Design)
	b.WriteByte(0)
	if f.Subject != "" {
		b.WriteString("subject\x00")
		b.WriteString(f.Subject)
	} else {
		b.WriteString("message\x00")
		b.WriteString(f.File)
		b.WriteByte(0)
		b.WriteString(Shape(f.Message))
	}
	return b.String()
}

// Fingerprints returns one fingerprint per finding, in the order given:
// a hash of the finding's Key with the design named by designName (so
// that the same design checked from another folder keeps its
// fingerprints), and an occurrence number when several findings share a
// key, counted in the order of fs (which Sort makes the order of lines, so
// it survives lines inserted above them). Findings absent from a
// comparison's later revision are counted apart from the others, so every
// finding of the later revision keeps the fingerprint a plain check gives
// it.
func Fingerprints(fs []Finding, designName func(string) string) []string {
	out := make([]string, len(fs))
	seen := map[string]int{}
	for i := range fs {
		f := fs[i]
		k := ""
		if f.Baseline == "absent" {
			k = "absent\x00"
		}
		if designName != nil {
			f.Design = designName(f.Design)
			if f.Subject == "" {
				f.File = designName(f.File)
			}
		}
		k += f.Key()
		n := seen[k]
		seen[k] = n + 1
		sum := sha256.Sum256([]byte(f.Key()))
		out[i] = hex.EncodeToString(sum[:16])
		if n > 0 {
			out[i] += ":" + strconv.Itoa(n+1)
		}
	}
	return out
}
