package main

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

// cmdResult is what one run of opsift printed and the exit status.
type cmdResult struct {
	stdout, stderr string
	code           int
}

// testNow is the clock of command tests, so dated outputs stay golden.
var testNow = time.Date(2026, 3, 4, 5, 6, 7, 0, time.UTC)

// runOpsift runs opsift with args, stdout not a terminal; see runCLI.
func runOpsift(t *testing.T, vars map[string]string, args ...string) cmdResult {
	t.Helper()
	return runCLI(t, false, vars, args...)
}

// runCLI runs opsift with args in a test environment: the environment is
// vars, with HOME and XDG_CONFIG_HOME defaulting to an empty temporary
// directory so no user catalog is found unless a test makes one; tty makes
// stdout a terminal.
func runCLI(t *testing.T, tty bool, vars map[string]string, args ...string) cmdResult {
	t.Helper()
	home := t.TempDir()
	var out, errb bytes.Buffer
	e := &env{
		stdin:  strings.NewReader(""),
		stdout: &out,
		stderr: &errb,
		getenv: func(k string) string {
			if v, ok := vars[k]; ok {
				return v
			}
			switch k {
			case "XDG_CONFIG_HOME", "HOME":
				return home
			}
			return ""
		},
		isTTY: tty,
		now:   func() time.Time { return testNow },
	}
	code := exitCode(run(args, e), &errb)
	return cmdResult{out.String(), errb.String(), code}
}
