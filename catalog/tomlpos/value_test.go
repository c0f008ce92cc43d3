package tomlpos

import "testing"

// TestValue checks the text of value spans, which an in-place editor
// replaces: strings of each form (with a comment after), bare numbers,
// arrays and their elements, inline tables and their keys. The wanted
// texts are read off the document by hand.
func TestValue(t *testing.T) {
	text := "title = \"a # not a comment\"  # a comment\n" +
		"[supply]\npos = '12 V'\ngain = 5 # bare\n" +
		"[environment]\ntemp = [\"-20 C\",  \"70 C\"]\n" +
		"[[stage]]\nname = \"s\"\nsignal = { peak = \"1 V\", freq = \"1 kHz\" }\nnote = \"\"\"x\ny\"\"\"\n"
	ix := Scan(text)
	want := map[string]string{
		"title":               `"a # not a comment"`,
		"supply.pos":          `'12 V'`,
		"supply.gain":         `5`,
		"environment.temp":    `["-20 C",  "70 C"]`,
		"environment.temp.0":  `"-20 C"`,
		"environment.temp.1":  `"70 C"`,
		"stage.0.name":        `"s"`,
		"stage.0.signal":      `{ peak = "1 V", freq = "1 kHz" }`,
		"stage.0.signal.freq": `"1 kHz"`,
		"stage.0.note":        "\"\"\"x\ny\"\"\"",
	}
	for path, w := range want {
		sp, ok := ix.Value(path)
		if !ok {
			t.Errorf("%s: no value span", path)
			continue
		}
		if got := text[sp.Start:sp.End]; got != w {
			t.Errorf("%s: span %q, want %q", path, got, w)
		}
	}
	if _, ok := ix.Value("supply"); ok {
		t.Error("a [table] header has a value span")
	}
}
