package main

import (
	"flag"
	"io"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/opsift/opsift/filter/report"
)

// env is what a command may touch of the outside world. Tests build one
// with buffers and a temporary config directory.
type env struct {
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
	// getenv reads an environment variable (NO_COLOR, XDG_CONFIG_HOME, HOME, EDITOR).
	getenv func(string) string
	// isTTY reports whether stdout is a terminal (colour, width).
	isTTY bool
	// errTTY reports whether stderr is a terminal (progress of slow reads).
	errTTY bool
	// noCache is the --no-cache flag of the command being run: catalogs
	// are read without the parsed-catalog cache.
	noCache bool
	// now is the clock outputs are dated with; tests fix it.
	now func() time.Time
	// flagSets, when set, is shown every flag set a command makes (shell
	// completion reads the flags from it).
	flagSets func(*flag.FlagSet)
}

// newEnv returns the process's real environment.
func newEnv() *env {
	return &env{
		stdin:  os.Stdin,
		stdout: os.Stdout,
		stderr: os.Stderr,
		getenv: os.Getenv,
		isTTY:  isTerminal(os.Stdout),
		errTTY: isTerminal(os.Stderr),
		now:    time.Now,
	}
}

// isTerminal reports whether f is a character device (a terminal).
func isTerminal(f *os.File) bool {
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// columns is $COLUMNS when it is a positive number, else def: the width
// text output is laid out for.
func (e *env) columns(def int) int {
	if n, err := strconv.Atoi(strings.TrimSpace(e.getenv("COLUMNS"))); err == nil && n > 0 {
		return n
	}
	return def
}

// tableWidth is the width a table is laid out for: unlimited
// (report.Unclipped) when it goes to a file with -o, else $COLUMNS when
// set, else the default on a terminal and unlimited into a pipe or a
// redirected file, so no name is shortened where nobody reads it at a
// terminal's width.
func (e *env) tableWidth(toFile bool) int {
	if toFile {
		return report.Unclipped
	}
	if n := e.columns(0); n > 0 {
		return n
	}
	if e.isTTY {
		return report.DefaultWidth
	}
	return report.Unclipped
}
