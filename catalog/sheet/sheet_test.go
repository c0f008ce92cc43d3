package sheet

import (
	"reflect"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
)

// handWritten is three invented parts (generic ids and figures of our
// own) as a catalog file written by hand: what every dialect below must
// import to.
const handWritten = `
[[part]]
id = "imp-a1"
name = "Imported test part A"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
unit_cost = 0.37
temp = ["-40 C", "125 C"]
supply = { min = "1.8 V", max = "5.5 V" }
gbw = { typ = "2.4 MHz", min = "1.9 MHz" }
slew = { typ = "1.3 V/us" }
ib = { typ = "1.5 pA", max = "12 pA" }

[[part]]
id = "imp-b2"
name = "Imported test part B, two channels"
tech = "bipolar"
channels = 2
packages = ["soic8", "dip8"]
lifecycle = "nrnd"
unit_cost = 0.21
temp = ["-40 C", "85 C"]
supply = { min = "4 V", max = "30 V" }
gbw = { typ = "1.15 MHz" }
slew = { typ = "0.6 V/us", source = "graph" }
ib = { typ = "35 nA", max = "210 nA" }

[[part]]
id = "imp-c4"
name = "Imported test part C; quad"
tech = "jfet"
channels = 4
packages = ["soic14"]
unit_cost = 1.42
temp = ["0 C", "70 C"]
supply = { min = "9 V", max = "36 V" }
gbw = { typ = "3.7 MHz", min = "2.6 MHz" }
slew = { typ = "11 V/us" }
ib = { typ = "25 pA", max = "180 pA" }
`

// The same parts as spreadsheets save them. Units are in the headers,
// in the cells (imp-b2's bias current, given in nA under a pA header:
// the cell's unit wins), or in the map file.
const (
	commaCSV = `Part,Description,Tech,Channels,Packages,Status,Price,Temp low (C),Temp high (C),Supply min (V),Supply max (V),GBW (MHz),GBW min (MHz),Slew rate (V/us),Slew source,Ib (pA),Ib max (pA),Internal ref
imp-a1,Imported test part A,CMOS,1,sot23-5,,0.37,-40,125,1.8,5.5,2.4,1.9,1.3,,1.5,12,K-17
imp-b2,"Imported test part B, two channels",bipolar,2,"soic8, dip8",nrnd,0.21,-40,85,4,30,1.15,n/a,0.6,graph,35 nA,210 nA,K-18

imp-c4,Imported test part C; quad,jfet,4,soic14,,1.42,0,70,9,36,3.7,2.6,11,,25,180,K-19
`
	// excelCSV is what a spreadsheet in a decimal-comma locale saves:
	// a byte-order mark, ";" between cells, "1,8" for 1.8, CRLF lines.
	excelCSV = "\ufeffPart;Description;Tech;Channels;Packages;Status;Price;Temp low (C);Temp high (C);Supply min;Supply max;GBW;GBW min;Slew rate;Slew source;Ib;Ib max\r\n" +
		"imp-a1;Imported test part A;cmos;1;sot23-5;;0,37;-40;125;1,8 V;5,5 V;2,4 MHz;1,9 MHz;1,3 V/us;;1,5 pA;12 pA\r\n" +
		"imp-b2;Imported test part B, two channels;bipolar;2;soic8 dip8;nrnd;0,21;-40;85;4 V;30 V;1,15 MHz;;0,6 V/us;graph;35 nA;210 nA\r\n" +
		"imp-c4;\"Imported test part C; quad\";jfet;4;soic14;;1,42;0;70;9 V;36 V;3,7 MHz;2,6 MHz;11 V/us;;25 pA;180 pA\r\n"
	// tabCSV has headers of its own, mapped by mapTOML.
	tabCSV = "Code\tText\tInput\tCh\tPkg\tLife\tEach\tTmin\tTmax\tVs lo\tVs hi\tUGBW\tUGBW guaranteed\tSR\tSR from\tBias\tBias worst\n" +
		"imp-a1\tImported test part A\tcmos\t1\tsot23-5\t\t0.37\t-40\t125\t1.8\t5.5\t2.4\t1.9\t1.3\t\t1.5\t12\n" +
		"imp-b2\tImported test part B, two channels\tbipolar\t2\tsoic8/dip8\tnrnd\t0.21\t-40\t85\t4\t30\t1.15\t\t0.6\tgraph\t35000\t210000\n" +
		"imp-c4\tImported test part C; quad\tjfet\t4\tsoic14\t\t1.42\t0\t70\t9\t36\t3.7\t2.6\t11\t\t25\t180\n"
	mapTOML = `
separator = "\t"
[columns]
Code = "id"
Text = "name"
Input = "tech"
Ch = "channels"
Pkg = "packages"
Life = "lifecycle"
Each = "unit_cost"
Tmin = { key = "temp.low", unit = "C" }
Tmax = { key = "temp.high", unit = "C" }
"Vs lo" = { key = "supply.min", unit = "V" }
"Vs hi" = { key = "supply.max", unit = "V" }
UGBW = { key = "gbw.typ", unit = "MHz" }
"UGBW guaranteed" = { key = "gbw.min", unit = "MHz" }
SR = { key = "slew.typ", unit = "V/us" }
"SR from" = "slew.source"
Bias = { key = "ib.typ", unit = "pA" }
"Bias worst" = { key = "ib.max", unit = "pA" }
`
)

// bare clears what differs between a part decoded from a file and one
// imported: its position and key lines.
func bare(ps []*catalog.Part) []catalog.Part {
	out := make([]catalog.Part, len(ps))
	for i, p := range ps {
		out[i] = *p
		out[i].Pos, out[i].Lines = catalog.Pos{}, nil
	}
	return out
}

// TestDialectsImportAsHandWritten: each dialect imports to the parts of
// the hand-written catalog, field for field.
func TestDialectsImportAsHandWritten(t *testing.T) {
	want, err := catalog.Decode("hand.toml", []byte(handWritten))
	if err != nil {
		t.Fatal(err)
	}
	m, err := ReadMap("map.toml", []byte(mapTOML))
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name     string
		csv      string
		m        *Map
		sep, dec rune
		unmapped []string
	}{
		{"comma, units in headers and cells", commaCSV, nil, ',', '.', []string{"Internal ref"}},
		{"excel: BOM, semicolon, decimal comma, CRLF", excelCSV, nil, ';', ',', nil},
		{"tab, units in the map file", tabCSV, m, '\t', '.', nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Read("parts.csv", []byte(tc.csv), tc.m)
			if err != nil {
				t.Fatal(err)
			}
			for _, p := range res.Problems {
				t.Errorf("problem: %v", p)
			}
			if res.Separator != tc.sep || res.Decimal != tc.dec || res.Rows != 3 {
				t.Errorf("separator %q decimal %q rows %d", res.Separator, res.Decimal, res.Rows)
			}
			if got, w := bare(res.Parts), bare(want); !reflect.DeepEqual(got, w) {
				t.Errorf("imported parts differ from the hand-written ones:\ngot  %+v\nwant %+v", got, w)
			}
			var unmapped []string
			for _, c := range res.Unmapped() {
				unmapped = append(unmapped, c.Header)
			}
			if !reflect.DeepEqual(unmapped, tc.unmapped) {
				t.Errorf("unmapped %q, want %q", unmapped, tc.unmapped)
			}
		})
	}
}

// TestBadRowsNamed: every row that cannot be read is reported as
// FILE:ROW:COLUMN with the check parser's message, and the good rows are
// imported.
func TestBadRowsNamed(t *testing.T) {
	csv := `id,name,tech,channels,packages,supply min (V),supply max (V),gbw (MHz),slew (V/us)
imp-ok1,Good part,cmos,1,soic8,2,5.5,1,0.5
imp-bad1,Slew in words,cmos,1,soic8,2,5.5,1,fast
imp-bad2,GBW as a voltage,cmos,1,soic8,2,5.5,2 V,0.5
,No id,cmos,1,soic8,2,5.5,1,0.5
imp-bad4,"Escape ` + "\x1b" + `[2J in name",cmos,1,soic8,2,5.5,1,0.5
imp-ok1,Duplicate,cmos,1,soic8,2,5.5,1,0.5
imp-bad6,Channels in words,cmos,two,soic8,2,5.5,1,0.5
imp-ok2,Another good part,bipolar,2,dip8,3,30,1.2,0.7
`
	res, err := Read("bad.csv", []byte(csv), nil)
	if err != nil {
		t.Fatal(err)
	}
	var ids []string
	for _, p := range res.Parts {
		ids = append(ids, p.ID)
	}
	if strings.Join(ids, " ") != "imp-ok1 imp-ok2" {
		t.Errorf("imported %v, want imp-ok1 imp-ok2", ids)
	}
	var got []string
	for _, p := range res.Problems {
		got = append(got, p.Error())
	}
	all := strings.Join(got, "\n")
	for _, want := range []string{
		`bad.csv:3:9: column "slew (V/us)": field "slew": typ = "fast" is not a number with a unit`,
		`bad.csv:4:8: column "gbw (MHz)": field "gbw": typ = "2 V" is a voltage, want a frequency`,
		`bad.csv:5: field "id": missing`,
		`bad.csv:6:2: column "name": field "name": holds U+001B (a control character)`,
		`bad.csv:7:1: column "id": duplicate id "imp-ok1", first in row 2`,
		`bad.csv:8:4: column "channels": "two" is not a whole number`,
	} {
		if !strings.Contains(all, want) {
			t.Errorf("problems lack %q:\n%s", want, all)
		}
	}
	if len(res.Problems) != 6 {
		t.Errorf("%d problems, want 6:\n%s", len(res.Problems), all)
	}
	if strings.ContainsRune(all, '\x1b') {
		t.Error("a problem carries the raw escape byte")
	}
}

func TestHeaders(t *testing.T) {
	tests := []struct {
		header string
		want   string // target.String() and unit, "" unmapped
	}{
		{"GBW (MHz)", "gbw.typ MHz"},
		{"Ib max (nA)", "ib.max nA"},
		{"Vos max OT [mV]", "vos.max_ot mV"},
		{"gbw.min", "gbw.min "},
		{"Input CM low (V)", "input_cm.low V"},
		{"input_cm high (V)", "input_cm.high V"},
		{"Output load (kOhm)", "output.load kOhm"},
		{"Supply (V)", ""}, // which end?
		{"Temp max", "temp.high "},
		{"Slew source", "slew.source "},
		{"Part number", "id "},
		{"Colour", ""},
	}
	var m Map
	for _, tc := range tests {
		tg, ok := m.target(tc.header)
		got := ""
		if ok {
			got = tg.String() + " " + tg.Unit
		}
		if got != tc.want {
			t.Errorf("%q → %q, want %q", tc.header, got, tc.want)
		}
	}
}

func TestReadRefuses(t *testing.T) {
	tests := []struct {
		name, csv, want string
	}{
		{"not UTF-8", "id,name\n\xff\xfe,x\n", "not UTF-8"},
		{"empty", "", "empty; want a header row"},
		{"two columns for one key", "GBW (MHz),gbw typ\n1,2\n", `column "gbw typ" fills gbw.typ, as column 1 "GBW (MHz)" does`},
		{"bad quoting", "id,name\n\"a,b\n", "parse error"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read("x.csv", []byte(tc.csv), nil)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want it to contain %q", err, tc.want)
			}
		})
	}
	for _, bad := range []string{`bogus = 1`, "[columns]\nX = \"gbx.typ\"", "[columns]\nX = { key = \"name\", unit = \"V\" }", `separator = "|"`} {
		if _, err := ReadMap("m.toml", []byte(bad)); err == nil {
			t.Errorf("map %q accepted", bad)
		}
	}
}
