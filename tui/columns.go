package tui

import (
	"strings"

	"github.com/opsift/opsift/filter/present"
)

// column is one column of a table pane.
type column struct {
	title string
	width int  // cells; the flex column's least width
	prio  int  // higher stays longer when the pane is narrow
	flex  bool // takes the width left over
	right bool // align right
	grow  int  // widens to this from the width left over, before the flex column
}

// fitColumns picks the columns that fit in w cells (one space between
// columns), dropping the lowest priority first, and widens the flex
// column to use the rest, after widening a growing column (present.Fit,
// the one column fitter). It returns
// the widths, 0 for a dropped column.
func fitColumns(cols []column, w int) []int {
	pc := make([]present.Column, len(cols))
	for i, c := range cols {
		pc[i] = present.Column{Width: c.width, Drop: 1 + maxPrio - c.prio, Flex: c.flex, Grow: c.grow}
	}
	return present.Fit(pc, w, 1)
}

// maxPrio is the highest column priority: a column of it is dropped last.
const maxPrio = 100

// row joins cells into a line, fitting each to its column's width and
// leaving out dropped columns.
func row(cols []column, widths []int, cells []string) string {
	var b strings.Builder
	first := true
	for i, c := range cols {
		if widths[i] == 0 {
			continue
		}
		if !first {
			b.WriteByte(' ')
		}
		first = false
		if c.right {
			b.WriteString(fitRight(cells[i], widths[i]))
		} else {
			b.WriteString(fit(cells[i], widths[i]))
		}
	}
	return b.String()
}

// header is the titles of the columns as a row.
func header(cols []column, widths []int) string {
	titles := make([]string, len(cols))
	for i, c := range cols {
		titles[i] = c.title
	}
	return row(cols, widths, titles)
}
