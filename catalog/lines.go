package catalog

import "strings"

// The TOML decoder does not say on which line a key of the n-th [[part]]
// table was written, so scanLines reads the file once more, line by line,
// with just enough of TOML's lexical rules (strings, multi-line strings,
// comments, brackets) to find table headers and the keys at their top level.
// It only ever feeds error messages: a line it gets wrong makes a message
// point at the part's header instead, never a wrong decode.

// fileLines is where things are in one catalog file.
type fileLines struct {
	top   map[string]int // keys and tables outside any [[part]]
	parts []partLines    // one per [[part]] header, in file order
}

// partLines is where one [[part]] table and its keys are.
type partLines struct {
	line int            // line of the [[part]] header
	off  int            // byte offset of the header line in the file
	keys map[string]int // first line of each key of the part ("slew" for slew.typ too)
}

// scanLines finds the [[part]] headers of a catalog file and the line of
// every key in each part.
func scanLines(text string) fileLines {
	fl := fileLines{top: map[string]int{}}
	var cur *partLines // the part whose keys are being read; nil outside
	inSub := false     // inside a [part.x] or other sub-table: keys are not the part's
	depth := 0         // open [ and { of a value spanning lines
	ml := ""           // delimiter of an open multi-line string
	off := 0           // byte offset of the current line
	for n := 1; len(text) > 0; n++ {
		start := off
		line := text
		if i := strings.IndexByte(text, '\n'); i >= 0 {
			line, text = text[:i], text[i+1:]
			off += i + 1
		} else {
			text = ""
		}
		if ml != "" {
			i := strings.Index(line, ml)
			if i < 0 {
				continue
			}
			line, ml = line[i+len(ml):], ""
		} else if depth == 0 {
			t := strings.TrimLeft(line, " \t")
			if strings.HasPrefix(t, "[") {
				array := strings.HasPrefix(t, "[[")
				name := headerName(t)
				switch {
				case array && name == "part":
					fl.parts = append(fl.parts, partLines{line: n, off: start, keys: map[string]int{}})
					cur, inSub = &fl.parts[len(fl.parts)-1], false
				case strings.HasPrefix(name, "part.") && cur != nil:
					k, _, _ := strings.Cut(strings.TrimPrefix(name, "part."), ".")
					record(cur.keys, k, n)
					inSub = true
				default:
					k, _, _ := strings.Cut(name, ".")
					record(fl.top, k, n)
					cur, inSub = nil, true
				}
				continue
			}
			if k := leadKey(t); k != "" {
				switch {
				case cur != nil && !inSub:
					record(cur.keys, k, n)
				case cur == nil && !inSub:
					record(fl.top, k, n)
				}
			}
		}
		ml, depth = lexLine(line, depth)
	}
	return fl
}

// record keeps the first line a key was seen on.
func record(m map[string]int, key string, line int) {
	if _, ok := m[key]; !ok {
		m[key] = line
	}
}

// headerName returns the dotted name of a table header such as
// `[[ "part" ]]` or `[part.slew]`, without quotes and spaces.
func headerName(t string) string {
	t = strings.TrimLeft(t, "[")
	if i := strings.IndexByte(t, ']'); i >= 0 {
		t = t[:i]
	}
	return strings.Map(func(r rune) rune {
		switch r {
		case ' ', '\t', '"', '\'':
			return -1
		}
		return r
	}, t)
}

// leadKey returns the first segment of the key of a `key = value` line,
// or "" when the line holds none.
func leadKey(t string) string {
	if t == "" {
		return ""
	}
	var key, rest string
	switch t[0] {
	case '"', '\'':
		end := strings.IndexByte(t[1:], t[0])
		if end < 0 {
			return ""
		}
		key, rest = t[1:1+end], t[2+end:]
	default:
		i := 0
		for i < len(t) && isBareKeyChar(t[i]) {
			i++
		}
		key, rest = t[:i], t[i:]
	}
	rest = strings.TrimLeft(rest, " \t")
	if key == "" || rest == "" || (rest[0] != '=' && rest[0] != '.') {
		return ""
	}
	return key
}

// isBareKeyChar reports whether c may appear in a bare TOML key.
func isBareKeyChar(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}

// lexLine follows brackets and strings to the end of a line. It returns the
// delimiter of a multi-line string left open, and the bracket depth.
func lexLine(s string, depth int) (ml string, _ int) {
	for i := 0; i < len(s); i++ {
		switch c := s[i]; c {
		case '#':
			return "", depth
		case '[', '{':
			depth++
		case ']', '}':
			depth = max(0, depth-1)
		case '"', '\'':
			delim := strings.Repeat(string(c), 3)
			if strings.HasPrefix(s[i:], delim) {
				end := strings.Index(s[i+3:], delim)
				if end < 0 {
					return delim, depth
				}
				i += 3 + end + 2
				continue
			}
			j := i + 1
			for j < len(s) && s[j] != c {
				if c == '"' && s[j] == '\\' {
					j++
				}
				j++
			}
			i = j
		}
	}
	return "", depth
}
