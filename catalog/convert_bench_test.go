package catalog_test

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/internal/gencat"
)

// BenchmarkConvert splits decoding a 2000-part generated file (the
// generator the scale benchmark uses) into its two steps: the TOML decode
// into maps, the floor a load is held to, and turning those maps into
// parts with their checks. The second's time over the first's is the
// load's own overhead on one core.
func BenchmarkConvert(b *testing.B) {
	files, err := gencat.Write(b.TempDir(), 2000, 2000, 1)
	if err != nil {
		b.Fatal(err)
	}
	data, err := os.ReadFile(files[0])
	if err != nil {
		b.Fatal(err)
	}
	text := string(data)
	doc, err := catalog.DecodeMaps(text)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("toml", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := catalog.DecodeMaps(text); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("parts", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if n, probs := catalog.PartsOf("gen.toml", text, doc); n != 2000 || probs > 0 {
				b.Fatalf("%d parts, %d problems", n, probs)
			}
		}
	})
}

// BenchmarkPieceSize decodes the TOML of a 2000-part generated file in
// pieces of n [[part]] tables, one after another on one goroutine: the
// decoder's speed per part against the size of the document it reads,
// which is what the pieces of a load are sized by.
func BenchmarkPieceSize(b *testing.B) {
	files, err := gencat.Write(b.TempDir(), 2000, 2000, 1)
	if err != nil {
		b.Fatal(err)
	}
	data, err := os.ReadFile(files[0])
	if err != nil {
		b.Fatal(err)
	}
	text := string(data)
	var offs []int
	for i := 0; ; {
		j := strings.Index(text[i:], "[[part]]")
		if j < 0 {
			break
		}
		offs = append(offs, i+j)
		i += j + len("[[part]]")
	}
	for _, n := range []int{2000, 512, 128, 32, 1} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			for b.Loop() {
				for k := 0; k < len(offs); k += n {
					end := len(text)
					if k+n < len(offs) {
						end = offs[k+n]
					}
					if _, err := catalog.DecodeMaps(text[offs[k]:end]); err != nil {
						b.Fatal(err)
					}
				}
			}
		})
	}
}
