package sheet

import (
	"bytes"
	"testing"

	"github.com/opsift/opsift/catalog"
)

// FuzzRead feeds arbitrary sheets to Read: it never panics, and every
// part it imports is one the catalog decoder accepts when encoded.
func FuzzRead(f *testing.F) {
	for _, s := range []string{commaCSV, excelCSV, tabCSV, "id;gbw (MHz)\nx;1,5\n", "\ufeff\"a\nb\",c\n"} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		res, err := Read("fuzz.csv", data, nil)
		if err != nil {
			return
		}
		for _, p := range res.Parts {
			var buf bytes.Buffer
			if err := catalog.Encode(&buf, []*catalog.Part{p}); err != nil {
				t.Fatal(err)
			}
			if _, err := catalog.Decode("again.toml", buf.Bytes()); err != nil {
				t.Fatalf("imported part %q does not read back: %v\n%s", p.ID, err, buf.Bytes())
			}
		}
	})
}
