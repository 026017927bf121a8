package rules_test

import (
	"path/filepath"
	"reflect"
	"testing"

	"nodal/check"
	"nodal/circuit"
	"nodal/rules"
)

// TestRatingsPassKeepsEveryReportedUse: the ratings pass, which judges
// each part once for all the rating rules, keeps exactly the nominal uses
// past a rating or a derating limit that judging every part on its own
// gives, in part order, and exactly the parts whose voltage or current is
// undetermined, on every rule's test designs and the examples.
func TestRatingsPassKeepsEveryReportedUse(t *testing.T) {
	var paths []string
	for _, g := range []string{"../testdata/rules/*/*.nodal", "../examples/*.nodal"} {
		m, err := filepath.Glob(g)
		if err != nil {
			t.Fatal(err)
		}
		paths = append(paths, m...)
	}
	flagged, undetermined := 0, 0
	for _, path := range paths {
		res, err := check.File(path, nil)
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		_, results, err := rules.RunResults(res.Fset, res.Build, []*rules.Analyzer{rules.Ratings}, nil)
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		got := results[rules.Ratings].(*rules.Judged)
		want := &rules.Judged{}
		unknown := map[circuit.PartID]bool{}
		if res.Solved != nil && res.Solved.OP != nil {
			pt := res.Solved.Point()
			for i := range res.Build.Design.Parts {
				id := circuit.PartID(i)
				qs := pt.Part(id)
				us := rules.Judge(&res.Build.Design.Parts[i], qs, rules.DefaultDerating())
				if qs.VoltageUnknown || qs.CurrentUnknown {
					unknown[id] = true
					if len(rules.Judge(&res.Build.Design.Parts[i], rules.Quantities{}, rules.DefaultDerating())) > 0 {
						want.Undetermined = append(want.Undetermined, id) // a rated part
					}
				}
				for _, u := range us {
					if u.Over() || u.Derated() {
						want.Flagged = append(want.Flagged, rules.PartUse{Part: id, Use: u})
					}
				}
			}
		}
		if !reflect.DeepEqual(got.Flagged, want.Flagged) {
			t.Errorf("%s: the pass keeps %+v, judging each part gives %+v", path, got.Flagged, want.Flagged)
		}
		// Every undetermined rated part is listed, in part order, and no
		// part that is determined (unrated ones may be).
		k := 0
		for j, id := range got.Undetermined {
			if !unknown[id] || j > 0 && id <= got.Undetermined[j-1] {
				t.Errorf("%s: undetermined parts %v: part %d is determined or out of order", path, got.Undetermined, id)
			}
			if k < len(want.Undetermined) && want.Undetermined[k] == id {
				k++
			}
		}
		if k < len(want.Undetermined) {
			t.Errorf("%s: undetermined parts %v, want every rated one of %v", path, got.Undetermined, want.Undetermined)
		}
		flagged += len(want.Flagged)
		undetermined += len(want.Undetermined)
	}
	if flagged == 0 || undetermined == 0 {
		t.Fatalf("%d designs give %d uses past a limit and %d undetermined rated parts: the comparison saw none", len(paths), flagged, undetermined)
	}
}
