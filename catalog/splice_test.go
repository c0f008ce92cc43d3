package catalog

import (
	"bytes"
	"errors"
	"io/fs"
	"strings"
	"testing"

	"github.com/opsift/opsift/data"
)

// spliceFile is a catalog file with comments around and inside its parts,
// an aligned layout and a sub-table written as a header; the figures are
// invented.
const spliceFile = `# team catalog: invented parts for the splice tests
# (keep this comment)

[[part]]   # first
id = "sp-a"
name = "Splice test part A"
tech = "cmos"
channels = 2
packages = ["soic8"]
supply = { min = "2 V", max = "5.5 V" }
gbw  = { typ = "3 MHz" }     # aligned comment
slew = { typ = "1.5 V/us" }

# ---- the next part is a dual ----
[[part]]
id = "sp-b"
name = "Splice test part B"
tech = "bipolar"
channels = 2
packages = [
  "dip8",
  "soic8",
]
supply = { min = "4 V", max = "30 V" }
gbw = { typ = "1 MHz" }
[part.slew]
typ = "0.5 V/us"   # trailing comment on the last value

# tail comment of the file
[[part]]
id = "sp-c"
name = "Splice test part C"
tech = "jfet"
channels = 1
packages = ["sot23-5"]
supply = { min = "5 V", max = "36 V" }
gbw = { typ = "8 MHz" }
slew = { typ = "20 V/us" }`

// mustPart decodes the one part of a catalog text.
func mustPart(t *testing.T, text string) *Part {
	t.Helper()
	ps, err := Decode("t.toml", []byte(text))
	if err != nil || len(ps) != 1 {
		t.Fatalf("decode: %v (%d parts)", err, len(ps))
	}
	return ps[0]
}

const newPart = `[[part]]
id = "sp-new"
name = "Splice test part, new"
tech = "bicmos"
channels = 4
packages = ["tssop14"]
lifecycle = "active"
supply = { min = "2.7 V", max = "12 V" }
gbw = { typ = "10 MHz", min = "7 MHz" }
slew = { typ = "5 V/us", source = "graph" }
`

func TestReplacePartKeepsTheRest(t *testing.T) {
	data := []byte(spliceFile)
	for _, tc := range []struct {
		id, first, last string // the table's first key and last text, as written
	}{
		{"sp-a", "id = \"sp-a\"", `slew = { typ = "1.5 V/us" }` + "\n"},
		{"sp-b", "id = \"sp-b\"", `typ = "0.5 V/us"   # trailing comment on the last value` + "\n"},
		{"sp-c", "id = \"sp-c\"", `slew = { typ = "20 V/us" }`},
	} {
		t.Run(tc.id, func(t *testing.T) {
			start := strings.Index(spliceFile, tc.first)
			end := strings.Index(spliceFile[start:], tc.last) + start + len(tc.last)
			p := mustPart(t, strings.Replace(newPart, `"sp-new"`, `"`+tc.id+`"`, 1))
			out, err := ReplacePart(data, tc.id, p)
			if err != nil {
				t.Fatal(err)
			}
			// Every byte before and after the table is the same.
			if !bytes.HasPrefix(out, data[:start]) {
				t.Errorf("text before the table changed:\n%s", out)
			}
			if !bytes.HasSuffix(out, data[end:]) {
				t.Errorf("text after the table changed:\n%s", out)
			}
			mid := string(out[start : len(out)-(len(data)-end)])
			var enc bytes.Buffer
			_ = Encode(&enc, []*Part{p})
			switch tc.id {
			case "sp-b":
				// Written with a [part.slew] sub-table: the table is written
				// anew as Encode writes it, its header line kept.
				if want := strings.TrimPrefix(enc.String(), "[[part]]\n"); mid != want {
					t.Errorf("table text = %q, want Encode's %q", mid, want)
				}
			case "sp-a":
				// Key by key: a changed value's comment stays.
				if !strings.Contains(mid, `gbw  = { typ = "10 MHz", min = "7 MHz" }     # aligned comment`) { // a sub-key added: the value whole
					t.Errorf("the changed gbw lost its alignment or comment:\n%s", mid)
				}
			}
			ps, err := Decode("t.toml", out)
			if err != nil || len(ps) != 3 {
				t.Fatalf("result: %v (%d parts)", err, len(ps))
			}
		})
	}
}

func TestAppendPart(t *testing.T) {
	p := mustPart(t, newPart)
	for _, tc := range []struct{ name, data, sep string }{
		{"empty", "", ""},
		{"final newline", spliceFile + "\n", "\n"},
		{"no final newline", spliceFile, "\n\n"},
		{"crlf", strings.ReplaceAll(spliceFile, "\n", "\r\n") + "\r\n", "\r\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, err := AppendPart([]byte(tc.data), p)
			if err != nil {
				t.Fatal(err)
			}
			table := newPart
			if strings.Contains(tc.data, "\r\n") {
				table = strings.ReplaceAll(table, "\n", "\r\n")
			}
			if want := tc.data + tc.sep + table; string(out) != want {
				t.Errorf("got\n%q\nwant\n%q", out, want)
			}
		})
	}
}

func TestSpliceRefuses(t *testing.T) {
	p := mustPart(t, newPart)
	if _, err := ReplacePart([]byte(spliceFile), "sp-gone", p); !errors.Is(err, ErrPartNotInFile) {
		t.Errorf("replacing a part not in the file: %v, want ErrPartNotInFile", err)
	}
	// Appending a part whose id the file holds makes a duplicate, which
	// does not read back.
	dup := mustPart(t, strings.Replace(newPart, `"sp-new"`, `"sp-a"`, 1))
	if _, err := AppendPart([]byte(spliceFile), dup); err == nil {
		t.Error("appending a duplicate id: no error")
	}
}

func TestDecodeTableMessages(t *testing.T) {
	// The same fault written in a file and given as a table reads the same.
	_, err := DecodeTable("t.toml", map[string]any{"id": "x1", "name": "n", "tech": "cmos", "channels": int64(1),
		"packages": []any{"soic8"}, "supply": map[string]any{"min": "2 V", "max": "5 V"},
		"gbw": map[string]any{"typ": "1 MHz"}, "slew": map[string]any{"typ": "1 MHz"}})
	_, ferr := Decode("t.toml", []byte(`[[part]]
id = "x1"
name = "n"
tech = "cmos"
channels = 1
packages = ["soic8"]
supply = { min = "2 V", max = "5 V" }
gbw = { typ = "1 MHz" }
slew = { typ = "1 MHz" }
`))
	var a, b Problems
	if !errors.As(err, &a) || !errors.As(ferr, &b) || len(a) != 1 || len(b) != 1 {
		t.Fatalf("table: %v; file: %v", err, ferr)
	}
	if a[0].Field != "slew" || a[0].Err.Error() != b[0].Err.Error() {
		t.Errorf("table says %s: %v; the file says %s: %v", a[0].Field, a[0].Err, b[0].Field, b[0].Err)
	}
}

// TestReplacePartEditsValues: an edit that changes one value, drops a key
// and adds one writes exactly that: the value in place (its comment
// stays), the dropped key's line removed, the new key on a line after the
// table's last value; every other byte as it was.
func TestReplacePartEditsValues(t *testing.T) {
	data := strings.Replace(spliceFile, `packages = ["soic8"]
`, `packages = ["soic8"]
pinout = "so8-a"   # drop-in family
`, 1)
	ps, err := Decode("t.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	p := *ps[0]
	p.GBW.Typ = Some(3.3e6)
	p.Pinout = ""
	p.Iq.Typ = Some(0.6e-3)
	out, err := ReplacePart([]byte(data), "sp-a", &p)
	if err != nil {
		t.Fatal(err)
	}
	want := strings.Replace(data, `pinout = "so8-a"   # drop-in family
`, "", 1)
	want = strings.Replace(want, `gbw  = { typ = "3 MHz" }     # aligned comment`, `gbw  = { typ = "3.3 MHz" }     # aligned comment`, 1)
	want = strings.Replace(want, `slew = { typ = "1.5 V/us" }
`, `slew = { typ = "1.5 V/us" }
iq = { typ = "600 uA" }
`, 1)
	if string(out) != want {
		t.Errorf("got\n%s\nwant\n%s", out, want)
	}
	// One sub-value of an inline table changed: only its text changes,
	// the others keep their spelling.
	text := []byte(`[[part]]
id = "sp-d"
name = "Splice test part D"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
supply = {min="2.70V",max = "5.5 V"}   # tight
gbw = { typ = "0.80 MHz", min = "0.6 MHz" }
slew = { typ = "0.3 V/us" }
`)
	ps, err = Decode("t.toml", text)
	if err != nil {
		t.Fatal(err)
	}
	q := *ps[0]
	q.Supply.Max = Some(6)
	q.GBW.Min = Some(0.65e6)
	out, err = ReplacePart(text, "sp-d", &q)
	if err != nil {
		t.Fatal(err)
	}
	want = strings.Replace(strings.Replace(string(text), `max = "5.5 V"`, `max = "6 V"`, 1), `min = "0.6 MHz"`, `min = "650 kHz"`, 1)
	if string(out) != want {
		t.Errorf("got\n%s\nwant\n%s", out, want)
	}
}

// TestReplacePartOnDemoFiles edits every part of every demo catalog file
// in turn (its GBW raised by a tenth, its notes dropped, a cload given):
// each edit reads back, and every other part of the file decodes as before.
func TestReplacePartOnDemoFiles(t *testing.T) {
	files, err := fs.Glob(data.Catalog, "*.toml")
	if err != nil || len(files) == 0 {
		t.Fatalf("demo files: %v", err)
	}
	enc := func(p *Part) string {
		var b bytes.Buffer
		_ = Encode(&b, []*Part{p})
		return b.String()
	}
	for _, name := range files {
		text, err := fs.ReadFile(data.Catalog, name)
		if err != nil {
			t.Fatal(err)
		}
		parts, err := Decode(name, text)
		if err != nil {
			t.Fatal(err)
		}
		for i, orig := range parts {
			p := *orig
			if p.GBW.Typ.Known() {
				p.GBW.Typ = Some(p.GBW.Typ.V() * 1.1)
			}
			p.Notes, p.CLoad = "", Some(220e-12)
			out, err := ReplacePart(text, p.ID, &p)
			if err != nil {
				t.Errorf("%s: %s: %v", name, p.ID, err)
				continue
			}
			after, err := Decode(name, out)
			if err != nil || len(after) != len(parts) {
				t.Errorf("%s: %s: the edited file reads %d parts: %v", name, p.ID, len(after), err)
				continue
			}
			for j := range parts {
				if j != i && enc(after[j]) != enc(parts[j]) {
					t.Errorf("%s: editing %s changed %s", name, p.ID, parts[j].ID)
				}
			}
		}
	}
}
