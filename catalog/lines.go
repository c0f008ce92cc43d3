package catalog

import (
	"cmp"
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog/tomlpos"
)

// fileLines is where things are in one catalog file, read from the one
// TOML position index (catalog/tomlpos). It only ever feeds error messages
// and the split points of large files: a line it gets wrong makes a
// message point at the part's header instead, never a wrong decode.
type fileLines struct {
	top   map[string]int // keys and tables outside any [[part]]
	parts []partLines    // one per [[part]] table, in file order
}

// partLines is where one [[part]] table and its keys are.
type partLines struct {
	line int            // line of the [[part]] header
	off  int            // byte offset of the header in the file
	keys map[string]int // first line of each key of the part ("slew" for slew.typ too)
}

// scanLines finds the [[part]] tables of a catalog file and the line of
// every key in each part.
func scanLines(text string) fileLines {
	ix := tomlpos.Scan(text)
	fl := fileLines{top: map[string]int{}}
	for _, k := range ix.Keys("") {
		fl.top[k] = ix.Line(k)
	}
	ix.Elements("part", func(_ int, at tomlpos.Pos, keys []tomlpos.Entry) {
		pl := partLines{line: at.Line, off: at.Offset, keys: make(map[string]int, len(keys))}
		for _, k := range keys {
			pl.keys[k.Key] = k.Pos.Line
		}
		fl.parts = append(fl.parts, pl)
	})
	return fl
}

// scanHeaders finds the [[part]] headers of a plain catalog file with a
// quick line scan, without the lines of the keys. ok is false, and the
// caller scans with scanLines, when the file has anything the quick scan
// could misread: a multi-line string, or a line starting with "[" that is
// not a [[part]] header (another table, an array continued on a new line).
func scanHeaders(text string) (fl fileLines, ok bool) {
	if strings.Contains(text, `"""`) || strings.Contains(text, "'''") {
		return fileLines{}, false
	}
	for off, line := 0, 1; off < len(text); line++ {
		end := strings.IndexByte(text[off:], '\n')
		if end < 0 {
			end = len(text) - off
		}
		l := text[off : off+end]
		if off == 0 {
			l = strings.TrimPrefix(l, "\ufeff") // a byte-order mark the decoder skips
		}
		l = strings.TrimLeft(l, " \t")
		if strings.HasPrefix(l, "[") {
			if !isPartHeader(l) {
				return fileLines{}, false
			}
			fl.parts = append(fl.parts, partLines{line: line, off: off})
		}
		off += end + 1
	}
	return fl, true
}

// isPartHeader reports whether a line (leading blanks removed) is exactly
// a [[part]] header, with optional blanks and a comment.
func isPartHeader(l string) bool {
	l, ok := strings.CutPrefix(l, "[[")
	if !ok {
		return false
	}
	l, ok = strings.CutPrefix(strings.TrimLeft(l, " \t"), "part")
	if !ok {
		return false
	}
	l, ok = strings.CutPrefix(strings.TrimLeft(l, " \t"), "]]")
	if !ok {
		return false
	}
	l = strings.TrimRight(strings.TrimLeft(l, " \t"), "\r")
	return l == "" || l[0] == '#'
}

// keyLine returns the line of key in the part whose header is on line
// header, or header when the key is not found.
func (fl fileLines) keyLine(header int, key string) int {
	i, ok := slices.BinarySearchFunc(fl.parts, header, func(pl partLines, l int) int { return cmp.Compare(pl.line, l) })
	if ok {
		if l, ok := fl.parts[i].keys[key]; ok && l > 0 {
			return l
		}
	}
	return header
}

// KeyLine returns the line key is written on in the part whose [[part]]
// header is on line header of the catalog file data ("slew" for slew.typ
// too), or header when the part does not write the key. Decoded parts keep
// only their header's line (Part.Pos); this re-derives the rest when a
// message or an editor needs it.
func KeyLine(data []byte, header int, key string) int {
	return scanLines(string(data)).keyLine(header, key)
}
