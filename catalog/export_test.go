package catalog

// DecodeMaps and PartsOf expose the two steps of decoding a file to the
// package's external benchmarks: the TOML decode into maps, and turning
// the maps into parts (with the header scan it needs). PartsOf returns
// the numbers of valid parts and of problems.
func DecodeMaps(text string) (map[string]any, error) { return decodeWhole(text) }

func PartsOf(file, text string, doc map[string]any) (parts, problems int) {
	lines, ok := scanHeaders(text)
	if !ok {
		lines = scanLines(text)
	}
	ps, probs, _ := partsOf(file, doc, lines)
	return len(ps), len(probs)
}
