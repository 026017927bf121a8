// Package sarifschema gives tests the official SARIF 2.1.0 JSON schema
// (OASIS, errata 01), compiled, from the copy the go-sarif module carries
// in the module cache, so that every SARIF log nodal writes can be
// validated against the standard rather than against our own reading of
// it.
package sarifschema

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	// The module carries the schema; importing it keeps it in go.mod.
	_ "github.com/owenrumney/go-sarif/v3/pkg/report/v210/sarif"
	"github.com/santhosh-tekuri/jsonschema/v6"
)

// URL is the schema's address, as nodal's logs name it in $schema.
const URL = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"

// Document reads the schema as a JSON value.
func Document(t testing.TB) any {
	t.Helper()
	out, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}}", "github.com/owenrumney/go-sarif/v3").Output()
	if err != nil {
		t.Fatalf("locating go-sarif: %v", err)
	}
	src, err := os.ReadFile(filepath.Join(strings.TrimSpace(string(out)), "pkg", "report", "v210", "sarif", "schema.go"))
	if err != nil {
		t.Fatal(err)
	}
	s := string(src)
	start := strings.Index(s, "`")
	end := strings.LastIndex(s, "`")
	if start < 0 || end <= start {
		t.Fatal("schema.go holds no raw string")
	}
	doc, err := jsonschema.UnmarshalJSON(strings.NewReader(s[start+1 : end]))
	if err != nil {
		t.Fatal(err)
	}
	if m, ok := doc.(map[string]any); !ok || !strings.Contains(m["title"].(string), "SARIF") || !strings.Contains(m["id"].(string), "sarif-schema-2.1.0") {
		t.Fatalf("not the SARIF 2.1.0 schema")
	}
	return doc
}

// Compile returns the compiled schema, with formats asserted.
func Compile(t testing.TB) *jsonschema.Schema {
	t.Helper()
	c := jsonschema.NewCompiler()
	c.AssertFormat()
	if err := c.AddResource(URL, Document(t)); err != nil {
		t.Fatal(err)
	}
	sch, err := c.Compile(URL)
	if err != nil {
		t.Fatal(err)
	}
	return sch
}
