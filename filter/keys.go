package filter

// DesignParams lists the design-level inputs in file order, as the
// decoder reads them: supply.*, environment.temp.low and .high (written
// as the pair environment.temp), choose.* and policy.*.
func DesignParams() []Param {
	var d Design
	ps := d.designParams()
	out := make([]Param, len(ps))
	for i, p := range ps {
		out[i] = p.Param
	}
	return out
}

// TopKeys lists the keys a design file may have at its top level.
func TopKeys() []string { return topKeys() }
