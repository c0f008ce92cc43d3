package main

import (
	"errors"
	"fmt"
)

// exitError carries the exit status a failure maps to. A nil err means the
// command already printed what the user needs (check's problem list).
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string {
	if e.err == nil {
		return fmt.Sprintf("exit status %d", e.code)
	}
	return e.err.Error()
}

func (e *exitError) Unwrap() error { return e.err }

// usageError is bad usage: exit status 2.
func usageError(format string, a ...any) error {
	return &exitError{code: 2, err: fmt.Errorf(format, a...)}
}

// inputError is an input file that cannot be read or is invalid: exit status 2.
func inputError(err error) error { return &exitError{code: 2, err: err} }

// problemsFound is check's "the catalog has problems": exit status 1, the
// problems already printed.
func problemsFound() error { return &exitError{code: 1} }

// withPrefix puts the command's name before err: an exitError keeps its
// status, anything else is bad usage (an unknown part id).
func withPrefix(cmd string, err error) error {
	var ex *exitError
	if errors.As(err, &ex) {
		return &exitError{code: ex.code, err: fmt.Errorf("%s: %w", cmd, ex.err)}
	}
	return usageError("%s: %w", cmd, err)
}
