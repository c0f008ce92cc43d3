package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/opsift/opsift/filter/schema"
)

// TestInitWritesSchemas: init writes both schemas, each starter file's
// first line names its schema by a path that resolves from the file's
// directory (as a TOML language server resolves it), and each starter
// file validates against the schema it names, checked with a
// general-purpose JSON Schema library.
func TestInitWritesSchemas(t *testing.T) {
	if catalogSchemaFile != schema.FileName("catalog") || designSchemaFile != schema.FileName("design") {
		t.Fatalf("init's schema names %s, %s differ from schema.FileName", catalogSchemaFile, designSchemaFile)
	}
	dir := t.TempDir()
	if r := runOpsift(t, nil, "init", dir); r.code != 0 {
		t.Fatalf("init exit %d: %s", r.code, r.stderr)
	}
	for _, f := range []string{filepath.Join(dir, "catalog.d", "example.toml"), filepath.Join(dir, "design.toml")} {
		text, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		first, _, _ := strings.Cut(string(text), "\n")
		ref, ok := strings.CutPrefix(first, "#:schema ")
		if !ok {
			t.Fatalf("%s: first line %q is not a #:schema directive", f, first)
		}
		schemaPath := filepath.Join(filepath.Dir(f), ref)
		raw, err := os.ReadFile(schemaPath)
		if err != nil {
			t.Fatalf("%s names %s, which init did not write: %v", f, ref, err)
		}
		doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(raw))
		if err != nil {
			t.Fatal(err)
		}
		c := jsonschema.NewCompiler()
		if err := c.AddResource("file.json", doc); err != nil {
			t.Fatal(err)
		}
		sch, err := c.Compile("file.json")
		if err != nil {
			t.Fatal(err)
		}
		var v map[string]any
		if _, err := toml.Decode(string(text), &v); err != nil {
			t.Fatal(err)
		}
		b, _ := json.Marshal(v)
		inst, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		if err := sch.Validate(inst); err != nil {
			t.Errorf("%s fails the schema it names:\n%v", f, err)
		}
	}
}

func TestSchemaCommand(t *testing.T) {
	tests := []struct {
		args  []string
		code  int
		out   string
		errIn string
	}{
		{[]string{"schema", "catalog"}, 0, `"title": "opsift catalog file"`, ""},
		{[]string{"schema", "design"}, 0, `"title": "opsift design file"`, ""},
		{[]string{"schema"}, 2, "", "schema: want one of catalog, design"},
		{[]string{"schema", "parts"}, 2, "", `unknown schema "parts"`},
		{[]string{"schema", "--help"}, 0, "#:schema ./opsift-catalog.schema.json", ""},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			r := runOpsift(t, nil, tc.args...)
			if r.code != tc.code || !strings.Contains(r.stdout, tc.out) || !strings.Contains(r.stderr, tc.errIn) {
				t.Errorf("exit %d\nstdout %.200q\nstderr %q", r.code, r.stdout, r.stderr)
			}
			if tc.code == 0 && tc.args[1] != "--help" && !json.Valid([]byte(r.stdout)) {
				t.Error("output is not JSON")
			}
		})
	}
}
