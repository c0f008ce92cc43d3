package replace

import (
	"fmt"
	"github.com/opsift/opsift/internal/golden"
	"path/filepath"
	"strings"
	"testing"
)

// dump writes a Result as plain text for the golden files: every
// candidate, its fit, changes and fields.
func dump(res Result) string {
	var b strings.Builder
	fmt.Fprintf(&b, "original %s; designed %v; obsolete left out %d\n", res.Original.ID, res.Designed, res.ObsoleteLeftOut)
	for i, c := range res.Candidates {
		fmt.Fprintf(&b, "\n%d %s drop_in=%v strict=%v shared=%v\n  %s\n", i+1, c.Part.ID, c.DropIn, c.Strict, c.Shared, c.Footprint)
		if d := c.Design; d != nil {
			fmt.Fprintf(&b, "  design pass=%v margin=%s binding=%s/%s failed=%v\n", d.Pass, marginStr(d), d.Binding.Stage, d.Binding.Key, d.Failed)
		}
		for _, r := range c.Regressions {
			fmt.Fprintf(&b, "  worse  [%d] %s\n", r.Class, r.Reason())
		}
		for _, m := range c.Missing {
			fmt.Fprintf(&b, "  missing %s\n", m)
		}
		for _, r := range c.Improvements {
			fmt.Fprintf(&b, "  better [%d] %s\n", r.Class, r.Reason())
		}
		for _, f := range c.Fields {
			line := fmt.Sprintf("  %-13s %-8s %-14s %-22s %-14s %-22s %s", f.Key, f.Verdict,
				f.Format(f.Original), string(f.Original.Basis)+"/"+string(f.Original.Limit),
				f.Format(f.Candidate), string(f.Candidate.Basis)+"/"+string(f.Candidate.Limit), f.Note)
			b.WriteString(strings.TrimRight(line, " ") + "\n")
		}
	}
	return b.String()
}

func marginStr(d *Fit) string {
	if !d.WorstMargin.Known() {
		return "none"
	}
	return fmt.Sprintf("%.4f", d.WorstMargin.V())
}

// TestGolden pins the whole Result for the test catalog, with and without
// the 12 V design. Review a change with -update and the diff.
func TestGolden(t *testing.T) {
	parts, by := loadQuads(t)
	tests := []struct {
		name string
		opts func() Options
	}{
		{"catalog_only", func() Options { return Options{} }},
		{"obsolete_included", func() Options { return Options{IncludeObsolete: true} }},
		{"design_split5", func() Options { return Options{Plan: loadPlan(t, "split5.toml")} }},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			orig := by["bq4-old"]
			if tt.name == "obsolete_included" {
				orig = by["bq4-bip"]
			}
			got := dump(Find(orig, parts, tt.opts()))
			path := filepath.Join("testdata", "find_"+tt.name+".golden")
			golden.Check(t, path, []byte(got))
		})
	}
}
