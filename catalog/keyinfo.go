package catalog

import "slices"

// PartKeys returns the keys a [[part]] table may hold, in the order the
// catalog format documents them.
func PartKeys() []string { return slices.Clone(partKeys) }

// SubKeys returns the keys of a table-valued part key — a figure (gbw,
// slew, …), supply, input_cm or output — and nil for any other key.
func SubKeys(key string) []string {
	switch key {
	case "supply":
		return slices.Clone(spanKeys)
	case "input_cm":
		return slices.Clone(cmKeys)
	case "output":
		return slices.Clone(swingKeys)
	}
	if _, ok := figureByKey(key); ok {
		return slices.Clone(specKeys)
	}
	return nil
}

// IsFigure reports whether key is a figure: an inline table of typ, min,
// max, min_ot, max_ot and source.
func IsFigure(key string) bool {
	_, ok := figureByKey(key)
	return ok
}

// KeyDim returns the dimension of the quantities a part key holds: a
// figure's, a single quantity's (cload), supply/input_cm/output in volts
// (output.load is OutputLoadDim), temp in °C. ok is false for keys that
// hold no quantity.
func KeyDim(key string) (d Dim, ok bool) {
	if f, ok := figureByKey(key); ok {
		return f.dim, true
	}
	if s, ok := scalarByKey(key); ok {
		return s.dim, true
	}
	switch key {
	case "supply", "input_cm", "output":
		return Volt, true
	case "temp":
		return Celsius, true
	}
	return 0, false
}

// OutputLoadDim is the dimension of output.load, the load the swing is
// given at.
const OutputLoadDim = Ohm

// Techs returns the values the tech key accepts.
func Techs() []string { return slices.Clone(techs) }

// Lifecycles returns the values the lifecycle key accepts.
func Lifecycles() []string { return slices.Clone(lifecycles) }

// Sources returns the values a figure's source key accepts.
func Sources() []string { return slices.Clone(sources) }

// IDPattern is the regular expression every part id matches.
const IDPattern = `^[a-z0-9._-]+$`
