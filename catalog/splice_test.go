package catalog

import (
	"bytes"
	"errors"
	"strings"
	"testing"
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
			mid := out[start : len(out)-(len(data)-end)]
			var enc bytes.Buffer
			_ = Encode(&enc, []*Part{p})
			want := strings.TrimPrefix(enc.String(), "[[part]]\n") // the header line stays as written
			if end == len(data) {
				want = strings.TrimRight(want, "\n") // the file had no final newline
			}
			if string(mid) != want {
				t.Errorf("table text = %q, want Encode's %q", mid, want)
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
