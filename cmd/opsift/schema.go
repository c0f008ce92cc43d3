package main

import (
	"strings"

	"github.com/opsift/opsift/filter/schema"
)

const schemaUsage = `Usage: opsift schema catalog|design [-o FILE [--force]]

Print the JSON Schema (draft 2020-12) of a catalog or a design file: its
keys, their types and enums, the unit spellings each quantity accepts, and
a description of each key. Point a TOML language server at it with a first
line such as

  #:schema ./opsift-catalog.schema.json

and it validates and completes keys while you type (opsift init writes
both schemas and that line). The schema checks form only; ranges,
min <= typ <= max and unique ids are opsift check's.

Options:
`

func runSchema(e *env, args []string) error {
	var out outputFlags
	fset := newFlagSet(e, "schema", schemaUsage)
	out.register(fset)
	pos, err := replaceParseArgs(fset, args)
	if helped, err := flagResult(e, fset, err); helped || err != nil {
		return err
	}
	if len(pos) != 1 {
		return usageError("schema: want one of %s (see opsift schema --help)", strings.Join(schema.Names(), ", "))
	}
	s, err := schema.ByName(pos[0])
	if err != nil {
		return usageError("schema: %w", err)
	}
	b, err := schema.Marshal(s)
	if err != nil {
		return err
	}
	return out.emit(e, b)
}
