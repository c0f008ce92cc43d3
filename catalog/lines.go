package catalog

import "github.com/opsift/opsift/catalog/tomlpos"

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
