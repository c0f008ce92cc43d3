package catalog

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"syscall"
)

// Limits on an input file, checked before the TOML decoder sees it. The
// decoder's time and memory grow faster than linearly with nesting and
// with the parts of a dotted key, so a small hostile file could exhaust
// the machine; no honest catalog or design comes near these.
const (
	// MaxFileSize is the largest catalog or design file read, in bytes
	// (4 MiB: some 4,000 fully specified parts).
	MaxFileSize = 4 << 20
	// MaxNesting is the deepest nesting of arrays and inline tables.
	MaxNesting = 16
	// MaxKeyParts is the most parts a dotted key or table header may have.
	MaxKeyParts = 16
)

// ErrLimit is matched by errors.Is for every file refused by a guard
// (not a regular file, too big, nested or dotted too deeply).
var ErrLimit = errors.New("input limit")

// LimitError is a file refused before decoding. Line is 0 when the
// problem is the file as a whole.
type LimitError struct {
	Line int
	Msg  string
}

// Error says what was refused.
func (e *LimitError) Error() string { return e.Msg }

// Is lets errors.Is(err, ErrLimit) find limit errors.
func (e *LimitError) Is(target error) bool { return target == ErrLimit }

// ReadFile reads an input file, refusing anything but a regular file (a
// FIFO would block, a device never ends) and files above MaxFileSize.
// Symbolic links are followed. The error does not repeat the path.
func ReadFile(path string) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, plainErr(err)
	}
	if err := regular(st); err != nil {
		return nil, err
	}
	// O_NONBLOCK: should the file be swapped for a FIFO after the Stat,
	// the open does not wait for a writer, and the Fstat below refuses it.
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, plainErr(err)
	}
	defer f.Close()
	if st, err = f.Stat(); err != nil {
		return nil, plainErr(err)
	}
	if err := regular(st); err != nil {
		return nil, err
	}
	return readCapped(f)
}

// readFS is ReadFile for a file of an fs.FS.
func readFS(fsys fs.FS, name string) ([]byte, error) {
	st, err := fs.Stat(fsys, name)
	if err != nil {
		return nil, plainErr(err)
	}
	if err := regular(st); err != nil {
		return nil, err
	}
	f, err := fsys.Open(name)
	if err != nil {
		return nil, plainErr(err)
	}
	defer f.Close()
	return readCapped(f)
}

// readCapped reads r to its end, failing past MaxFileSize.
func readCapped(r io.Reader) ([]byte, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxFileSize+1))
	if err != nil {
		return nil, plainErr(err)
	}
	if len(data) > MaxFileSize {
		return nil, tooBig()
	}
	return data, nil
}

func tooBig() error {
	return &LimitError{Msg: fmt.Sprintf("file is larger than %d MiB, the most opsift reads from one file; split it", MaxFileSize>>20)}
}

// regular refuses everything but a regular file, naming what it is.
func regular(st fs.FileInfo) error {
	m := st.Mode()
	if m.IsRegular() {
		if st.Size() > MaxFileSize {
			return tooBig()
		}
		return nil
	}
	what := "a special file"
	switch {
	case m.IsDir():
		what = "a directory"
	case m&fs.ModeNamedPipe != 0:
		what = "a named pipe (FIFO)"
	case m&fs.ModeCharDevice != 0:
		what = "a character device"
	case m&fs.ModeDevice != 0:
		what = "a block device"
	case m&fs.ModeSocket != 0:
		what = "a socket"
	}
	return &LimitError{Msg: "is " + what + ", not a regular file; opsift reads only regular files"}
}

// Prescan refuses TOML text nested deeper than MaxNesting or with a dotted
// key of more than MaxKeyParts parts, in one linear pass that knows
// strings and comments and nothing else. It runs before the decoder.
func Prescan(text string) error {
	line, depth, dots := 1, 0, 0
	for i := 0; i < len(text); i++ {
		c := text[i]
		switch c {
		case '\n':
			line++
			dots = 0
		case '#':
			for i+1 < len(text) && text[i+1] != '\n' {
				i++
			}
		case '"', '\'':
			end, lines := skipString(text, i)
			line += lines
			i = end
		case '[', '{':
			depth++
			dots = 0
			if depth > MaxNesting {
				return &LimitError{Line: line, Msg: fmt.Sprintf("arrays and inline tables nested more than %d deep; opsift refuses such files before decoding", MaxNesting)}
			}
		case ']', '}':
			depth = max(depth-1, 0)
			dots = 0
		case '=', ',':
			dots = 0
		case '.':
			dots++
			if dots >= MaxKeyParts {
				return &LimitError{Line: line, Msg: fmt.Sprintf("a dotted key with more than %d parts; opsift refuses such files before decoding", MaxKeyParts)}
			}
		}
	}
	return nil
}

// skipString returns the index of the last byte of the string starting
// at text[i] (a quote), and the newlines inside it. An unclosed string
// runs to the end of its line, or of the text for a multi-line one; the
// decoder reports it.
func skipString(text string, i int) (end, lines int) {
	q := text[i]
	multi := len(text) >= i+3 && text[i+1] == q && text[i+2] == q
	j := i + 1
	if multi {
		j = i + 3
	}
	for ; j < len(text); j++ {
		c := text[j]
		switch {
		case c == '\\' && q == '"':
			if j+1 < len(text) && text[j+1] == '\n' {
				lines++
			}
			j++
		case c == '\n' && !multi:
			return j - 1, 0
		case c == '\n':
			lines++
		case c == q && !multi:
			return j, lines
		case c == q && len(text) >= j+3 && text[j+1] == q && text[j+2] == q:
			// Up to two more quotes may close a multi-line string ("""a"""").
			j += 2
			for k := 0; k < 2 && j+1 < len(text) && text[j+1] == q; k++ {
				j++
			}
			return j, lines
		}
	}
	return len(text) - 1, lines
}
