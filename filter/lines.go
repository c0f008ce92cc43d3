package filter

import (
	"strconv"
	"strings"
)

// lineIndex maps the dotted key paths of a TOML file to the line they are
// written on. BurntSushi/toml does not expose key positions, so this scans
// the text: table headers, [[stage]] headers (numbered "stage.0",
// "stage.1", …) and "key =" lines. Keys inside an inline table are found on
// their parent's line by lookup. It is only used after the file parsed, so
// it can stay simple.
type lineIndex map[string]int

func indexLines(data []byte) lineIndex {
	idx := lineIndex{}
	table := ""
	arrays := map[string]int{}
	depth := 0 // open brackets of a multi-line value
	for n, line := range strings.Split(string(data), "\n") {
		ln := n + 1
		t := strings.TrimSpace(line)
		if depth > 0 {
			depth += bracketDelta(t)
			continue
		}
		if t == "" || t[0] == '#' {
			continue
		}
		if strings.HasPrefix(t, "[[") {
			name := cleanKey(strings.TrimSuffix(strings.SplitN(t[2:], "]]", 2)[0], "]]"))
			i := arrays[name]
			arrays[name] = i + 1
			table = name + "." + strconv.Itoa(i)
			idx[table] = ln
			continue
		}
		if t[0] == '[' {
			table = cleanKey(strings.SplitN(t[1:], "]", 2)[0])
			if _, ok := idx[table]; !ok {
				idx[table] = ln
			}
			continue
		}
		k, rest, ok := strings.Cut(t, "=")
		if !ok {
			continue
		}
		path := cleanKey(k)
		if table != "" {
			path = table + "." + path
		}
		idx[path] = ln
		depth = bracketDelta(rest)
		if depth < 0 {
			depth = 0
		}
	}
	return idx
}

// cleanKey removes quotes and spaces around the parts of a dotted key.
func cleanKey(k string) string {
	parts := strings.Split(k, ".")
	for i, p := range parts {
		parts[i] = strings.Trim(strings.TrimSpace(p), `"'`)
	}
	return strings.Join(parts, ".")
}

// bracketDelta counts [ minus ] outside strings and comments.
func bracketDelta(s string) int {
	d := 0
	var quote byte
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case quote != 0:
			if c == '\\' && quote == '"' {
				i++
			} else if c == quote {
				quote = 0
			}
		case c == '"' || c == '\'':
			quote = c
		case c == '#':
			return d
		case c == '[' || c == '{':
			d++
		case c == ']' || c == '}':
			d--
		}
	}
	return d
}

// line returns the line of path, else of its nearest parent, else 0.
func (idx lineIndex) line(path string) int {
	for {
		if l, ok := idx[path]; ok {
			return l
		}
		i := strings.LastIndexByte(path, '.')
		if i < 0 {
			return 0
		}
		path = path[:i]
	}
}
