// Package plot renders small line plots as text: braille cells (U+2800 …
// U+28FF, 2 × 4 dots each) for the traces, with a y axis labelled in the
// series' unit, a time axis in engineering units and a legend. Traces are
// told apart without colour: a solid braille line, a dotted braille line
// (every third dot of the path) or one marker glyph per column; a caller
// may add colour with a style function per series.
//
//	11 V ┤  ··⣀··            ·⢀⣀··
//	     │ ⢀⡴⠋⠉⠑⢦⡀          ⣠⠴⠋⠈⠳⢄⡀
//	 6 V ┤⠞⠉     ⠉⠲⣄     ⢀⡤⠚⠁     ⠙⠦⣀     ⣀⡴
//	     │         ⠈⠑⢦⡀⣠⠖⠋          ⠈⠳⢄⣀⣠⠞⠁
//	 1 V ┤          ··⠉⠁·            ··⠉··
//	     └──────────────────────────────────
//	      0 s            50 µs        100 µs
//	      ⠒⠒⠒⠒ out  · ·  ideal
//
// The package is pure string rendering: no terminal state, no bubbletea.
package plot
