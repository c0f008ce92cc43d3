// Command opsift helps choose an op-amp: it derives what a circuit needs from
// the op-amp, evaluates every part of a catalog at worst case and ranks the
// survivors by their smallest margin. With no subcommand it starts the
// interactive selector.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/opsift/opsift/catalog/safe"
)

// version is set at build time with -ldflags "-X main.version=…".
var version = "0.1.0-dev"

func main() {
	os.Exit(exitCode(run(os.Args[1:], newEnv()), os.Stderr))
}

// exitCode prints err once, as "opsift: …", and maps it to the exit status
// the command line contract promises. Error text may quote input files, so
// it passes through the sanitiser (line breaks between problems are kept).
func exitCode(err error, stderr io.Writer) int {
	if err == nil {
		return 0
	}
	var ex *exitError
	if errors.As(err, &ex) {
		if ex.err != nil {
			fmt.Fprintf(stderr, "opsift: %s\n", safe.Lines(ex.err.Error()))
		}
		return ex.code
	}
	fmt.Fprintf(stderr, "opsift: %s\n", safe.Lines(err.Error()))
	return 2
}
