package output

import (
	"bytes"
	"encoding/json"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"nodal/internal/sarifschema"
)

func TestSARIFSchema(t *testing.T) {
	sch := sarifschema.Compile(t)
	for _, name := range []string{"findings", "empty", "outside-root"} {
		r, opt := report(t), goldenOpts
		switch name {
		case "empty":
			r = &Report{}
		case "outside-root":
			opt.Root = "/elsewhere"
		}
		var buf bytes.Buffer
		if err := Write(&buf, "sarif", r, opt); err != nil {
			t.Fatal(err)
		}
		inst, err := jsonschema.UnmarshalJSON(&buf)
		if err != nil {
			t.Fatal(err)
		}
		if err := sch.Validate(inst); err != nil {
			t.Errorf("%s: SARIF does not validate: %v", name, err)
		}
	}
	// The schema must be able to fail: a result without a message is
	// invalid (SARIF 2.1.0 §3.27.11, message is required).
	bad := map[string]any{"version": "2.1.0", "runs": []any{map[string]any{
		"tool":    map[string]any{"driver": map[string]any{"name": "nodal"}},
		"results": []any{map[string]any{"ruleId": "x"}}}}}
	b, _ := json.Marshal(bad)
	inst, _ := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if sch.Validate(inst) == nil {
		t.Error("schema accepted a result without a message")
	}
}

// Artifact locations are relative to the repository root, and columns
// count code points (SARIF's columnKind) rather than bytes.
func TestSARIFLocations(t *testing.T) {
	var buf bytes.Buffer
	if err := Write(&buf, "sarif", report(t), goldenOpts); err != nil {
		t.Fatal(err)
	}
	var log struct {
		Runs []struct {
			ColumnKind string `json:"columnKind"`
			Tool       struct {
				Driver struct {
					Rules []struct {
						ID string `json:"id"`
					} `json:"rules"`
				} `json:"driver"`
			} `json:"tool"`
			Results []struct {
				RuleID    string `json:"ruleId"`
				RuleIndex int    `json:"ruleIndex"`
				Locations []struct {
					PhysicalLocation struct {
						ArtifactLocation struct {
							URI       string `json:"uri"`
							URIBaseID string `json:"uriBaseId"`
						} `json:"artifactLocation"`
						Region struct {
							StartLine, StartColumn, EndLine, EndColumn int
						} `json:"region"`
					} `json:"physicalLocation"`
				} `json:"locations"`
				Related []any `json:"relatedLocations"`
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(buf.Bytes(), &log); err != nil {
		t.Fatal(err)
	}
	run := log.Runs[0]
	if run.ColumnKind != "unicodeCodePoints" {
		t.Errorf("columnKind %q", run.ColumnKind)
	}
	related := 0
	for _, r := range run.Results {
		if got := run.Tool.Driver.Rules[r.RuleIndex].ID; got != r.RuleID {
			t.Errorf("ruleIndex %d names %s, not %s", r.RuleIndex, got, r.RuleID)
		}
		loc := r.Locations[0].PhysicalLocation
		if loc.ArtifactLocation.URI != "testdata/mixed.nodal" || loc.ArtifactLocation.URIBaseID != SrcRoot {
			t.Errorf("artifact %+v", loc.ArtifactLocation)
		}
		related += len(r.Related)
		// "pad→1" (with quotes) is 9 bytes but 7 code points, from column 19.
		if r.RuleID == "floating-net" && loc.Region.StartLine == 7 {
			if loc.Region.StartColumn != 19 || loc.Region.EndColumn != 26 {
				t.Errorf("pad→1 region %+v, want columns 19 to 26", loc.Region)
			}
		}
	}
	if related == 0 {
		t.Error("no related locations (case-clash names the first use)")
	}
}
