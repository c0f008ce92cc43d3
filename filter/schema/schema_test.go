package schema

import (
	"bytes"
	"encoding/json"
	"errors"
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// compile compiles a schema with a general-purpose JSON Schema library,
// which also checks it against the draft's meta-schema.
func compile(t *testing.T, name string) *jsonschema.Schema {
	t.Helper()
	s, err := ByName(name)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Marshal(s)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	c := jsonschema.NewCompiler()
	url := FileName(name)
	if err := c.AddResource(url, doc); err != nil {
		t.Fatal(err)
	}
	sch, err := c.Compile(url)
	if err != nil {
		t.Fatalf("%s schema does not compile: %v", name, err)
	}
	return sch
}

// tomlAsJSON decodes TOML text and re-reads it as the JSON value a
// language server validates.
func tomlAsJSON(t *testing.T, text string) any {
	t.Helper()
	var v map[string]any
	if _, err := toml.Decode(text, &v); err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

// repoTOML lists the repository's TOML files by kind: catalogs hold
// [[part]] tables, designs [[stage]] tables.
func repoTOML(t *testing.T) (catalogs, designs []string) {
	t.Helper()
	root := filepath.Join("..", "..")
	err := filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && strings.HasPrefix(d.Name(), ".") && p != root {
			return filepath.SkipDir
		}
		if d.IsDir() || !strings.HasSuffix(p, ".toml") {
			return nil
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		switch s := string(b); {
		case strings.Contains(s, "[[part]]"):
			catalogs = append(catalogs, p)
		case strings.Contains(s, "[[stage]]"):
			designs = append(designs, p)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return catalogs, designs
}

// TestRepoFilesValidate: every catalog and design in the repository that
// opsift's decoder accepts validates against the schema (the demo data,
// the test data, the packages' testdata).
func TestRepoFilesValidate(t *testing.T) {
	cats, designs := repoTOML(t)
	catSchema, designSchema := compile(t, "catalog"), compile(t, "design")
	valid := 0
	for _, p := range cats {
		b, _ := os.ReadFile(p)
		if _, err := catalog.Decode(p, b); err != nil {
			continue // faulty on purpose (testdata/bad, hostile): see TestSchemaRejects
		}
		valid++
		if err := catSchema.Validate(tomlAsJSON(t, string(b))); err != nil {
			t.Errorf("%s: decodes but fails the catalog schema:\n%v", p, err)
		}
	}
	for _, p := range designs {
		b, _ := os.ReadFile(p)
		if _, err := filter.DecodeDesign(p, b); err != nil {
			continue
		}
		valid++
		if err := designSchema.Validate(tomlAsJSON(t, string(b))); err != nil {
			t.Errorf("%s: decodes but fails the design schema:\n%v", p, err)
		}
	}
	t.Logf("%d catalogs and designs decode and validate", valid)
	// 7 demo catalog files and 5 demo designs at least, plus test data.
	if valid < 20 {
		t.Errorf("only %d valid files found (catalogs %d, designs %d)", valid, len(cats), len(designs))
	}
}

// TestSchemaRejects: the faulty catalogs whose fault is one of form — an
// unknown key, a wrong unit, a bad enum, a wrong type, a missing key —
// fail the schema too, so the editor flags them while typing.
func TestSchemaRejects(t *testing.T) {
	sch := compile(t, "catalog")
	for _, name := range []string{"unknown_key", "unknown_subkey", "wrong_dimension", "bare_number", "bad_tech",
		"bad_lifecycle", "unknown_source", "figure_as_string", "top_level_key", "single_table", "wrong_types",
		"bad_id_charset", "missing_required"} {
		t.Run(name, func(t *testing.T) {
			b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "bad", name+".toml"))
			if err != nil {
				t.Fatal(err)
			}
			if err := sch.Validate(tomlAsJSON(t, string(b))); err == nil {
				t.Errorf("testdata/bad/%s.toml passes the catalog schema", name)
			}
		})
	}
}

// TestCatalogKeysMatchDecoder compares the schema's keys with the keys
// the catalog decoder reads, taken from its source: the case labels of
// partDecoder.field and the keys of the figures and scalars tables. A
// key added to the decoder without the schema (or the reverse) fails.
func TestCatalogKeysMatchDecoder(t *testing.T) {
	dec := decoderCatalogKeys(t)
	got := Properties(Catalog(), "part")
	if !slices.Equal(got, dec) {
		t.Errorf("schema part keys %v\ndecoder keys     %v", got, dec)
	}
	for _, k := range dec {
		subs := catalog.SubKeys(k)
		slices.Sort(subs)
		if got := Properties(Catalog(), "part."+k); !slices.Equal(got, subs) && !(subs == nil && got == nil) {
			t.Errorf("%s: schema keys %v, decoder keys %v", k, got, subs)
		}
	}
	if top := Properties(Catalog(), ""); !slices.Equal(top, []string{"part"}) {
		t.Errorf("top-level keys %v, want [part]", top)
	}
}

// TestRequiredMatchesValidation: each key the schema requires is one
// validation insists on (leaving it out is a problem naming it), and no
// other key of the starter part is.
func TestRequiredMatchesValidation(t *testing.T) {
	full := example(Catalog()["$defs"].(obj)["part"].(obj))
	for _, k := range decoderCatalogKeys(t) {
		part := cloneMap(full.(map[string]any))
		delete(part, k)
		_, err := catalog.Decode("x.toml", encodeTOML(t, map[string]any{"part": []any{part}}))
		missing := err != nil && strings.Contains(err.Error(), `field "`+k+`": missing`)
		if want := slices.Contains(requiredPartKeys, k); missing != want {
			t.Errorf("%s: a part without it is refused as missing = %v, schema requires = %v (%v)", k, missing, want, err)
		}
	}
}

// TestSchemaExampleDecodes builds the largest document each schema
// allows from its examples (every key, every stage kind) and checks that
// it validates and that the decoder reads every key of it: no "unknown
// key" anywhere.
func TestSchemaExampleDecodes(t *testing.T) {
	cat := example(Catalog()).(map[string]any)
	cat["part"] = []any{example(Catalog()["$defs"].(obj)["part"].(obj))}
	if err := compile(t, "catalog").Validate(roundTrip(t, cat)); err != nil {
		t.Fatalf("the schema's own example fails it: %v", err)
	}
	_, err := catalog.Decode("example.toml", encodeTOML(t, cat))
	var ps catalog.Problems
	if errors.As(err, &ps) {
		for _, p := range ps {
			if strings.Contains(p.Error(), "unknown key") {
				t.Errorf("decoder does not know a schema key: %v", p)
			}
		}
	}

	design := example(Design()).(map[string]any)
	stageSchema := Design()["$defs"].(obj)["stage"].(obj)
	sch := compile(t, "design")
	for _, branch := range stageSchema["allOf"].([]any) {
		b := branch.(obj)
		kind := b["if"].(obj)["properties"].(obj)["kind"].(obj)["const"].(string)
		st := example(b["then"].(obj)).(map[string]any)
		st["name"], st["kind"] = "s1", kind
		design["stage"] = []any{st}
		if err := sch.Validate(roundTrip(t, design)); err != nil {
			t.Errorf("%s: the schema's own example fails it: %v", kind, err)
		}
		if _, err := filter.DecodeDesign("example.toml", encodeTOML(t, design)); err != nil && strings.Contains(err.Error(), "unknown") {
			t.Errorf("%s: decoder does not know a schema key: %v", kind, err)
		}
		// And the reverse: every key the template takes is in the schema.
		// An unknown stage key fails the branch (additionalProperties).
		st["gian"] = 11
		if err := sch.Validate(roundTrip(t, design)); err == nil {
			t.Errorf("%s: a stage with an unknown key passes the schema", kind)
		}
		delete(st, "gian")
		want := []string{"kind", "name"} // repeated in the branch so additionalProperties spares them
		for _, p := range mustTemplate(t, kind).Params() {
			want = append(want, p.Key)
		}
		slices.Sort(want)
		if got := leafKeys("", b["then"].(obj)); !slices.Equal(got, want) {
			t.Errorf("%s: schema keys %v, template keys %v", kind, got, want)
		}
	}
}

// TestDesignKeysMatchDecoder compares the design schema's top-level and
// table keys with the decoder's: the case labels of designDecoder.design
// and filter.DesignParams.
func TestDesignKeysMatchDecoder(t *testing.T) {
	cases := caseLabels(t, filepath.Join("..", "decode.go"), "design")
	slices.Sort(cases)
	if got := Properties(Design(), ""); !slices.Equal(got, cases) {
		t.Errorf("schema top-level keys %v, decoder %v", got, cases)
	}
	want := map[string][]string{}
	for _, p := range filter.DesignParams() {
		table, key, _ := strings.Cut(p.Key, ".")
		key, _, _ = strings.Cut(key, ".") // environment.temp.low → temp
		if !slices.Contains(want[table], key) {
			want[table] = append(want[table], key)
		}
	}
	// [choose.limit] is read by its own decoder (filter/limit.go): its
	// keys are the catalog's figure keys, each with min and max.
	want["choose"] = append(want["choose"], "limit")
	var figs []string
	for _, fk := range catalog.FigureKeys() {
		figs = append(figs, fk.Key)
		if got := Properties(Design(), "choose.limit."+fk.Key); !slices.Equal(got, []string{"max", "min"}) {
			t.Errorf("choose.limit.%s: schema keys %v, want [max min]", fk.Key, got)
		}
	}
	slices.Sort(figs)
	if got := Properties(Design(), "choose.limit"); !slices.Equal(got, figs) {
		t.Errorf("choose.limit: schema keys %v, figures %v", got, figs)
	}
	for table, keys := range want {
		slices.Sort(keys)
		if got := Properties(Design(), table); !slices.Equal(got, keys) {
			t.Errorf("[%s]: schema keys %v, decoder keys %v", table, got, keys)
		}
	}
}

// TestUnitPatternsInSchema spot-checks the quantities as an editor sees
// them (examples of our own; the unit rules are the README's).
func TestUnitPatternsInSchema(t *testing.T) {
	sch := compile(t, "catalog")
	tests := []struct {
		slew string
		ok   bool
	}{
		{"0.5 V/us", true}, {"0.5V/µs", true}, {"12 V / ms", true}, {"3 MHz", false}, {"0.5", false}, {"fast", false},
	}
	for _, tc := range tests {
		text := `[[part]]
id = "t1"
name = "t"
tech = "cmos"
channels = 1
packages = ["soic8"]
supply = { min = "2 V", max = "5 V" }
gbw = { typ = "1 MHz" }
slew = { typ = "` + tc.slew + `" }
`
		if err := sch.Validate(tomlAsJSON(t, text)); (err == nil) != tc.ok {
			t.Errorf("slew %q: valid = %v, want %v (%v)", tc.slew, err == nil, tc.ok, err)
		}
	}
}

// decoderCatalogKeys reads the catalog decoder's keys from its source.
func decoderCatalogKeys(t *testing.T) []string {
	t.Helper()
	dir := filepath.Join("..", "..", "catalog")
	keys := caseLabels(t, filepath.Join(dir, "decode.go"), "field")
	keys = append(keys, tableKeys(t, filepath.Join(dir, "keys.go"), "figures", "scalars")...)
	slices.Sort(keys)
	return slices.Compact(keys)
}

// caseLabels returns the string case labels of the switches in the
// method or function fn of a Go file.
func caseLabels(t *testing.T, file, fn string) []string {
	t.Helper()
	f := parseGo(t, file)
	var out []string
	for _, d := range f.Decls {
		fd, ok := d.(*ast.FuncDecl)
		if !ok || fd.Name.Name != fn {
			continue
		}
		ast.Inspect(fd.Body, func(n ast.Node) bool {
			if cc, ok := n.(*ast.CaseClause); ok {
				for _, e := range cc.List {
					if s, ok := stringLit(e); ok {
						out = append(out, s)
					}
				}
			}
			return true
		})
	}
	if len(out) == 0 {
		t.Fatalf("no case labels in %s of %s", fn, file)
	}
	return out
}

// tableKeys returns the first string of each element of the composite
// literals assigned to the named package variables.
func tableKeys(t *testing.T, file string, vars ...string) []string {
	t.Helper()
	f := parseGo(t, file)
	var out []string
	ast.Inspect(f, func(n ast.Node) bool {
		vs, ok := n.(*ast.ValueSpec)
		if !ok || len(vs.Names) != 1 || !slices.Contains(vars, vs.Names[0].Name) || len(vs.Values) != 1 {
			return true
		}
		lit, ok := vs.Values[0].(*ast.CompositeLit)
		if !ok {
			return true
		}
		for _, el := range lit.Elts {
			if c, ok := el.(*ast.CompositeLit); ok && len(c.Elts) > 0 {
				if s, ok := stringLit(c.Elts[0]); ok {
					out = append(out, s)
				}
			}
		}
		return true
	})
	if len(out) == 0 {
		t.Fatalf("no keys in %v of %s", vars, file)
	}
	return out
}

func parseGo(t *testing.T, file string) *ast.File {
	t.Helper()
	f, err := parser.ParseFile(token.NewFileSet(), file, nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func stringLit(e ast.Expr) (string, bool) {
	bl, ok := e.(*ast.BasicLit)
	if !ok || bl.Kind != token.STRING {
		return "", false
	}
	s, err := strconv.Unquote(bl.Value)
	return s, err == nil
}

// example builds the fullest value a schema allows from its examples,
// enums and types.
func example(s obj) any {
	if ex, ok := s["examples"].([]string); ok && len(ex) > 0 {
		return ex[0]
	}
	if e, ok := s["enum"].([]string); ok {
		return e[0]
	}
	switch s["type"] {
	case "object":
		out := map[string]any{}
		props, _ := s["properties"].(obj)
		for k, v := range props {
			if v, ok := v.(obj); ok {
				if _, isRef := items(v)["$ref"]; isRef {
					continue // the [[part]] and [[stage]] arrays are filled in by the tests
				}
				out[k] = example(v)
			}
		}
		return out
	case "array":
		it := example(items(s))
		if n, ok := s["minItems"].(int); ok && n == 2 {
			return []any{it, it}
		}
		return []any{it}
	case "integer":
		return int64(2)
	case "number":
		return 0.5
	case "string":
		if p, ok := s["pattern"].(string); ok && p == catalog.IDPattern {
			return "ex-1"
		}
		return "example text"
	}
	if props, ok := s["properties"].(obj); ok { // a then-branch: properties only
		return example(obj{"type": "object", "properties": props})
	}
	return nil
}

// leafKeys lists the dotted keys of the quantities and words an object
// schema holds, as template Params name them ("signal.freq").
func leafKeys(prefix string, s obj) []string {
	var out []string
	props, _ := s["properties"].(obj)
	for _, k := range sortedKeys(props) {
		v := props[k].(obj)
		if v["type"] == "object" {
			out = append(out, leafKeys(prefix+k+".", v)...)
			continue
		}
		out = append(out, prefix+k)
	}
	slices.Sort(out)
	return out
}

func mustTemplate(t *testing.T, kind string) filter.Template {
	t.Helper()
	tp, ok := filter.TemplateFor(kind)
	if !ok {
		t.Fatalf("no template %q", kind)
	}
	return tp
}

func encodeTOML(t *testing.T, v map[string]any) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := toml.NewEncoder(&buf).Encode(v); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func roundTrip(t *testing.T, v map[string]any) any {
	t.Helper()
	return tomlAsJSON(t, string(encodeTOML(t, v)))
}

func cloneMap(m map[string]any) map[string]any {
	out := make(map[string]any, len(m))
	for k, v := range m {
		out[k] = v
	}
	return out
}
