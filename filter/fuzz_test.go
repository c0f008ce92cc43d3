package filter_test

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
)

// FuzzDecodeDesign feeds arbitrary bytes to the design decoder: it must
// never panic; every error must name the file and hold no control byte;
// an accepted design must derive or fail cleanly, and one that derives
// must survive EncodeDesign → DecodeDesign.
func FuzzDecodeDesign(f *testing.F) {
	for _, glob := range []string{"../testdata/designs/*.toml", "../testdata/hostile/designs/*.toml", "../data/designs/*.toml"} {
		seeds, _ := filepath.Glob(glob)
		for _, s := range seeds {
			if b, err := os.ReadFile(s); err == nil {
				f.Add(b)
			}
		}
	}
	f.Add([]byte("title = \"a\\u001b[2J\"\n[[stage]]\nname = \"s\"\nkind = \"follower\"\n"))
	f.Add([]byte("a = {a = {a = {a = 1}}}\n"))
	f.Add([]byte("[supply]\npos = \"5 V\"\n[choose.limit]\nvos = { max = \"6 mV\" }\ngbw = { min = \"1 MHz\", max = \"9 MHz\" }\n\"v\\u001bos\" = { mx = \"1\" }\n[[stage]]\nname = \"s\"\nkind = \"follower\"\nsignal = { peak = \"1 V\", freq = \"1 kHz\" }\n"))
	clean := func(t *testing.T, err error) {
		t.Helper()
		msg := err.Error()
		if !strings.HasPrefix(msg, "fuzz.toml") {
			t.Fatalf("error does not name the file: %q", msg)
		}
		if cerr := safe.CheckOutput(msg); cerr != nil {
			t.Fatalf("error message %q: %v", msg, cerr)
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		d, err := filter.DecodeDesign("fuzz.toml", data)
		if err != nil {
			clean(t, err)
			return
		}
		if _, err := filter.Derive(d); err != nil {
			clean(t, err)
			return
		}
		var b bytes.Buffer
		if err := filter.EncodeDesign(&b, d); err != nil {
			t.Fatalf("encode: %v", err)
		}
		if _, err := filter.DecodeDesign("fuzz.toml", b.Bytes()); err != nil {
			t.Fatalf("the encoded design does not decode: %v\n%s", err, b.String())
		}
	})
}
