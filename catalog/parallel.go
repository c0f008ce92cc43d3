package catalog

import (
	"sync"
	"sync/atomic"

	"github.com/BurntSushi/toml"
)

// pieceParts is the number of [[part]] tables decoded as one piece. A
// piece's maps are turned into parts right after they are decoded, while
// they are still in the caches, and are garbage within milliseconds, so a
// collection during the load has little to mark; a whole file's maps (some
// 40 MB for 4000 parts) would stay live until its last part is read. Small
// pieces also let every core work to the end of a load of unequal files.
// The decoder itself is at best a few per cent quicker on a small document
// (BenchmarkPieceSize).
const pieceParts = 128

// decodeInPieces decodes a catalog file whose [[part]] headers are at
// lines.parts, cut at those headers into pieces of per tables. A
// piece from one [[part]] header to the next is a TOML document of its
// own holding just those parts' keys and sub-tables, so the pieces decode
// to the same tables as the whole file. Each piece is decoded and turned
// into parts at once, on up to workers goroutines, each holding a token of
// sem (when not nil) while it works.
//
// ok is false when any piece fails to decode, holds anything but its
// parts, or has a part with a problem: the caller then decodes the whole
// file, so errors and odd files read exactly as without the split, and
// problems are placed and capped for the file as a whole.
func decodeInPieces(file, text string, lines fileLines, per, workers int, sem chan struct{}) ([]*Part, bool) {
	n := len(lines.parts)
	if n == 0 || per < 1 {
		return nil, false // nothing to split: let the whole file speak
	}
	pieces := (n + per - 1) / per
	out := make([][]*Part, pieces)
	var next atomic.Int64
	var failed atomic.Bool
	work := func() {
		var f fileDecoder
		for !failed.Load() {
			i := int(next.Add(1) - 1)
			if i >= pieces {
				return
			}
			holding(sem, func() {
				parts, ok := f.piece(file, text, lines, i*per, min((i+1)*per, n))
				out[i] = parts
				if !ok {
					failed.Store(true)
				}
			})
		}
	}
	var wg sync.WaitGroup
	for range min(workers, pieces) - 1 {
		wg.Go(work)
	}
	work()
	wg.Wait()
	if failed.Load() {
		return nil, false
	}
	all := make([]*Part, 0, n)
	for _, ps := range out {
		all = append(all, ps...)
	}
	return all, true
}

// piece decodes parts lo … hi-1 of the file (indices into lines.parts)
// and returns them; false when the piece is not exactly those parts, each
// without a problem. Piece 0 also holds the text before the first header.
func (f *fileDecoder) piece(file, text string, lines fileLines, lo, hi int) ([]*Part, bool) {
	start, end := 0, len(text)
	if lo > 0 {
		start = lines.parts[lo].off
	}
	if hi < len(lines.parts) {
		end = lines.parts[hi].off
	}
	doc, err := decodeWhole(text[start:end])
	if err != nil || len(doc) != 1 {
		return nil, false
	}
	tables, ok := doc["part"].([]map[string]any)
	if !ok || len(tables) != hi-lo {
		return nil, false
	}
	parts := make([]*Part, 0, len(tables))
	for j, t := range tables {
		p, _, _ := f.part(file, lo+j+1, t, lines.parts[lo+j])
		if p == nil {
			return nil, false
		}
		parts = append(parts, p)
	}
	return parts, true
}

// holding runs f while holding one of sem's tokens; a nil sem has no
// limit.
func holding(sem chan struct{}, f func()) {
	if sem != nil {
		sem <- struct{}{}
		defer func() { <-sem }()
	}
	f()
}

// decodeWhole decodes a TOML document in one go.
func decodeWhole(text string) (map[string]any, error) {
	var doc map[string]any
	_, err := toml.Decode(text, &doc)
	return doc, err
}
