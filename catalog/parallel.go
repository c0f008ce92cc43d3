package catalog

import (
	"sync"

	"github.com/BurntSushi/toml"
)

// parallelMinParts is the number of [[part]] tables from which a file is
// decoded in pieces on several cores. Below it one core is quick enough
// (a 1000-part file takes about 0.1 s) and the split is not worth its cost.
const parallelMinParts = 512

// decodePieces decodes a catalog file into a map. Large files are cut at
// [[part]] headers into one piece per core and the pieces decoded at once:
// TOML parsing is most of Load's time. A piece from one [[part]] header to
// the next is a TOML document of its own holding just that part's keys and
// sub-tables, so the pieces decode to the same tables as the whole. When a
// piece fails or holds anything but whole parts, the file is decoded in one
// go instead, so errors and odd files behave exactly as without the split.
//
// decodePieces decodes with at most procs pieces.
func decodePieces(text string, lines fileLines, procs int) (map[string]any, error) {
	n := min(procs, len(lines.parts)/(parallelMinParts/4))
	if len(lines.parts) < parallelMinParts || n < 2 {
		return decodeWhole(text)
	}
	// Piece i runs from the header of part cut[i] to that of cut[i+1];
	// piece 0 also holds the keys before the first header.
	cut := make([]int, n+1)
	for i := 1; i < n; i++ {
		cut[i] = i * len(lines.parts) / n
	}
	cut[n] = len(lines.parts)
	docs := make([]map[string]any, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	for i := range n {
		lo, hi := 0, len(text)
		if i > 0 {
			lo = lines.parts[cut[i]].off
		}
		if i < n-1 {
			hi = lines.parts[cut[i+1]].off
		}
		wg.Go(func() {
			_, errs[i] = toml.Decode(text[lo:hi], &docs[i])
		})
	}
	wg.Wait()
	doc := map[string]any{}
	var all []map[string]any
	for i, d := range docs {
		tables, ok := d["part"].([]map[string]any)
		if errs[i] != nil || !ok || len(tables) != cut[i+1]-cut[i] {
			return decodeWhole(text)
		}
		all = append(all, tables...)
		for k, v := range d {
			if k == "part" {
				continue
			}
			if _, dup := doc[k]; dup || i > 0 {
				return decodeWhole(text) // keys outside parts: let the whole file speak
			}
			doc[k] = v
		}
	}
	doc["part"] = all
	return doc, nil
}

// decodeWhole decodes the file in one go.
func decodeWhole(text string) (map[string]any, error) {
	var doc map[string]any
	_, err := toml.Decode(text, &doc)
	return doc, err
}
