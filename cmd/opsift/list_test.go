package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// Every format of list, pinned on the rank test catalog and design.
func TestListGolden(t *testing.T) {
	cols := "gbw,slew,vos,ib,iq,supply_current,en,cload,tech,margin"
	tests := []struct {
		name string
		args []string
	}{
		{"list_table.golden", []string{"list", "--catalog", rankCat, "--design", rankDesign, "--columns", cols}},
		{"list_table_nodesign.golden", []string{"list", "--catalog", rankCat, "--sort", "-slew"}},
		{"list_table_typical.golden", []string{"list", "--catalog", rankCat, "--design", rankDesign, "--typical", "--columns", "gbw,slew,vos,iq,supply_current"}},
		{"list_csv.golden", []string{"list", "--catalog", rankCat, "--design", rankDesign, "--columns", cols, "--format", "csv"}},
		{"list_json.golden", []string{"list", "--catalog", rankCat, "--design", rankDesign, "--columns", cols, "--format", "json"}},
		{"list_md.golden", []string{"list", "--catalog", rankCat, "--design", rankDesign, "--columns", cols, "--format", "md"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runCLI(t, false, nil, tc.args...)
			if r.code != 0 || r.stderr != "" {
				t.Fatalf("exit %d, stderr %q", r.code, r.stderr)
			}
			assertGolden(t, tc.name, r.stdout)
		})
	}
}

// listDoc is the JSON of opsift list as DESIGN.md "Contract additions"
// (Listing) fixes it.
type listDoc struct {
	Parts []struct {
		ID      string
		Name    string
		Pass    *bool
		Figures map[string]struct {
			Value any
			Unit  string
			Basis *string
		}
	}
}

func listJSON(t *testing.T, args ...string) listDoc {
	t.Helper()
	r := runCLI(t, false, nil, append([]string{"list", "--catalog", rankCat, "--format", "json"}, args...)...)
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	var doc listDoc
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	return doc
}

// The listed figures are the worst case at the design's conditions, by
// the rules of DESIGN.md "Worst case and margins", worked by hand for
// tb-fet-fast (JFET input) on audio-split.toml (0 … 50 °C: |ΔT| = 25 K, 25 K
// above 25 °C; default policy: derate 0.7, inflate 2, speed_tempco
// 0.002/K):
//
//	gbw  min 3.1 MHz × (1 − 0.002·25) = 2.945 MHz, guaranteed
//	vos  max 9.1 mV + drift typ 9.5 µV/K × 2 × 25 K = 9.575 mV, typical
//	     (the drift is a typical figure, so the sum is no guarantee)
//	ib   max 185 pA × 2^(25/10) = 1.04652 nA (FET input), guaranteed
//	en   typ 19 nV/√Hz × 2 = 38 nV/√Hz, typical
//	supply_current: 2 stages on a dual = 1 package × 2 × 2.3 mA = 4.6 mA
func TestListWorstCaseFigures(t *testing.T) {
	doc := listJSON(t, "--design", rankDesign, "--columns", "gbw,vos,ib,en,supply_current,tech")
	want := map[string]struct {
		v     float64
		unit  string
		basis string
	}{
		"gbw":            {2.945e6, "Hz", "guaranteed"},
		"vos":            {9.575e-3, "V", "typical"},
		"ib":             {185e-12 * math.Exp2(2.5), "A", "guaranteed"},
		"en":             {38e-9, "V/√Hz", "typical"},
		"supply_current": {4.6e-3, "A", "guaranteed"},
	}
	if len(doc.Parts) != 5 {
		t.Fatalf("%d parts listed, want all 5", len(doc.Parts))
	}
	for _, p := range doc.Parts {
		if p.Pass == nil {
			t.Errorf("%s: pass is null with a design", p.ID)
		}
		if p.ID != "tb-fet-fast" {
			continue
		}
		for key, w := range want {
			f := p.Figures[key]
			v, _ := f.Value.(float64)
			if math.Abs(v-w.v) > 1e-9*w.v || f.Unit != w.unit || f.Basis == nil || *f.Basis != w.basis {
				t.Errorf("%s = %v %s %v, want %g %s %s", key, f.Value, f.Unit, f.Basis, w.v, w.unit, w.basis)
			}
		}
		if f := p.Figures["tech"]; f.Value != "jfet" || f.Basis != nil {
			t.Errorf("tech = %v basis %v", f.Value, f.Basis)
		}
	}
	// Without a design: no verdict, figures at 25 °C (gbw min as given).
	for _, p := range listJSON(t, "--columns", "gbw").Parts {
		if p.Pass != nil {
			t.Errorf("%s: pass %v without a design, want null", p.ID, *p.Pass)
		}
		if p.ID == "tb-fet-fast" && p.Figures["gbw"].Value != 3.1e6 {
			t.Errorf("gbw at 25 °C = %v, want the min 3.1 MHz", p.Figures["gbw"].Value)
		}
	}
	// --typical: the catalog's typical as written, 4.3 MHz and 1.35 mA.
	for _, p := range listJSON(t, "--typical", "--columns", "gbw,iq").Parts {
		if p.ID == "tb-fet-fast" && (p.Figures["gbw"].Value != 4.3e6 || p.Figures["iq"].Value != 1.35e-3) {
			t.Errorf("typical gbw %v iq %v, want 4.3 MHz and 1.35 mA", p.Figures["gbw"].Value, p.Figures["iq"].Value)
		}
	}
}

// --sort orders by any column both ways; parts lacking the figure (cload
// is not given by td-lv-cmos and te-old-bip) come last either way, ties by id.
func TestListSort(t *testing.T) {
	ids := func(args ...string) string {
		var out []string
		for _, p := range listJSON(t, args...).Parts {
			out = append(out, p.ID)
		}
		return strings.Join(out, " ")
	}
	tests := []struct{ sort, want string }{
		// cload: ta 120 pF, tc 520 pF, tb 1.8 nF; td and te give none.
		{"cload", "ta-slow-bip tc-rr-quad tb-fet-fast td-lv-cmos te-old-bip"},
		{"-cload", "tb-fet-fast tc-rr-quad ta-slow-bip td-lv-cmos te-old-bip"},
		// tech words: bipolar (ta, te), cmos (tc, td), jfet (tb).
		{"tech", "ta-slow-bip te-old-bip tc-rr-quad td-lv-cmos tb-fet-fast"},
		{"-id", "te-old-bip td-lv-cmos tc-rr-quad tb-fet-fast ta-slow-bip"},
	}
	for _, tc := range tests {
		if got := ids("--columns", "cload,tech", "--sort", tc.sort); got != tc.want {
			t.Errorf("--sort %s: %s\nwant %s", tc.sort, got, tc.want)
		}
	}
}

// Bad columns, sort keys and formats are usage errors with a did-you-mean.
func TestListUsageErrors(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"--columns", "gbw,slw"}, `--columns: unknown column "slw" (did you mean "slew"?)`},
		{[]string{"--sort", "-vso"}, `--sort: unknown column "vso" (did you mean "vos"?)`},
		{[]string{"--format", "toml"}, `--format: format "toml" is not one of table, csv, json, md`},
		{[]string{"extra"}, `unexpected argument "extra"`},
	}
	for _, tc := range tests {
		r := runCLI(t, false, nil, append([]string{"list", "--catalog", rankCat}, tc.args...)...)
		if r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("%v: exit %d, stderr %q, want 2 and %q", tc.args, r.code, r.stderr, tc.want)
		}
	}
}
