package tui

import "strings"

// column is one column of a table pane.
type column struct {
	title string
	width int  // cells; the flex column's least width
	prio  int  // higher stays longer when the pane is narrow
	flex  bool // takes the width left over
	right bool // align right
}

// fitColumns picks the columns that fit in w cells (one space between
// columns), dropping the lowest priority first, and widens the flex
// column to use the rest. It returns the widths, 0 for a dropped column.
func fitColumns(cols []column, w int) []int {
	keep := make([]bool, len(cols))
	for i := range keep {
		keep[i] = true
	}
	need := func() int {
		n, k := 0, 0
		for i, c := range cols {
			if keep[i] {
				n += c.width
				k++
			}
		}
		return n + max(0, k-1)
	}
	for need() > w {
		drop := -1
		for i, c := range cols {
			if keep[i] && (drop < 0 || c.prio < cols[drop].prio) {
				drop = i
			}
		}
		if drop < 0 {
			break
		}
		keep[drop] = false
	}
	widths := make([]int, len(cols))
	spare := w - need()
	for i, c := range cols {
		if !keep[i] {
			continue
		}
		widths[i] = c.width
		if c.flex && spare > 0 {
			widths[i] += spare
			spare = 0
		}
	}
	return widths
}

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
