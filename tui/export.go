package tui

import (
	"bytes"
	"fmt"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
)

// exportShortlist writes the marked parts, in rank order, in format f with
// the same writers as opsift rank: the design, its requirements with their
// formulas, every candidate's margins and checks, and the caution.
func (m *Model) exportShortlist(path string, f report.Format) error {
	if m.resPlan == nil {
		return fmt.Errorf("export: the design cannot be derived, nothing to export")
	}
	res := m.marks.results(m.results)
	if len(res) == 0 {
		return fmt.Errorf("export: no marked part is in the current ranking")
	}
	for i := range res {
		explain(m.resPlan, &res[i], m.cfg.Strict)
	}
	doc := &report.Doc{Plan: m.resPlan, Results: res, Sort: m.narrow.sortKey(), All: true,
		Strict: m.cfg.Strict, Sources: m.cat.Sources}
	var buf bytes.Buffer
	if err := report.Write(&buf, f, doc); err != nil {
		return fmt.Errorf("export %s: %w", path, err)
	}
	if err := report.WriteFile(path, buf.Bytes()); err != nil {
		return fmt.Errorf("export: %w", err)
	}
	m.setMessage("exported %s as %s to %s", plural(len(res), "part"), f, path)
	return nil
}

// saveDesign writes the design in force as design TOML.
func (m *Model) saveDesign(path string) error {
	var buf bytes.Buffer
	if err := filter.EncodeDesign(&buf, m.design); err != nil {
		return fmt.Errorf("save design: %w", err)
	}
	if err := report.WriteFile(path, buf.Bytes()); err != nil {
		return fmt.Errorf("save design: %w", err)
	}
	m.setMessage("saved the design to %s", path)
	return nil
}
