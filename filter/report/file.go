package report

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/signal"
	"path/filepath"
	"syscall"

	"github.com/opsift/opsift/catalog/safe"
)

// WriteOptions change what WriteFileWith accepts as a target.
type WriteOptions struct {
	// Force replaces a read-only target (its permissions are kept).
	Force bool
}

// WriteFile is WriteFileWith without options: a read-only target is
// refused.
func WriteFile(path string, data []byte) error { return WriteFileWith(path, data, WriteOptions{}) }

// stdoutPaths are the names of standard output that are written through
// rather than replaced.
var stdoutPaths = map[string]bool{"/dev/stdout": true, "/dev/fd/1": true, "/proc/self/fd/1": true}

// WriteFileWith writes data to path so that it holds either its old
// content or all of the new: a temporary file in the same directory,
// synced, given the old file's permissions (0644 for a new file), then
// renamed over the target. Every output opsift writes to a user's file
// goes through it. The target is:
//
//   - a symbolic link's final target, not the link, which is kept;
//   - never a device, a FIFO, a socket or a directory (an error), except
//     /dev/stdout, which is written through as it is, not atomically;
//   - a read-only file only with Force.
//
// A failure, SIGINT or SIGTERM leaves no temporary file behind (on a
// signal the file is removed and the signal delivered again).
func WriteFileWith(path string, data []byte, opt WriteOptions) (err error) {
	shown := safe.Text(path)
	if stdoutPaths[filepath.Clean(path)] {
		return writeThrough(path, shown, data)
	}
	target, err := resolveLinks(path)
	if err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if stdoutPaths[target] {
		return writeThrough(target, shown, data) // a link to /dev/stdout
	}
	perm := os.FileMode(0o644)
	if st, serr := os.Stat(target); serr == nil {
		if err := writable(st, opt); err != nil {
			return fmt.Errorf("write %s: %w", shown, err)
		}
		perm = st.Mode().Perm()
	}
	dir := filepath.Dir(target)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(target)+".tmp-*")
	if err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	name := tmp.Name()
	stop := removeOnSignal(name)
	defer stop()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if err = os.Chmod(name, perm); err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if err = os.Rename(name, target); err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	return nil
}

// writable refuses a target that is not a regular file, or is read-only
// without Force.
func writable(st fs.FileInfo, opt WriteOptions) error {
	m := st.Mode()
	switch {
	case m.IsRegular():
		if m.Perm()&0o222 == 0 && !opt.Force {
			return errors.New("the file is read-only; pass --force to replace it")
		}
		return nil
	case m.IsDir():
		return errors.New("is a directory")
	case m&fs.ModeNamedPipe != 0:
		return errors.New("is a named pipe (FIFO); opsift writes only regular files, or /dev/stdout")
	case m&fs.ModeDevice != 0:
		return errors.New("is a device; opsift writes only regular files, or /dev/stdout")
	}
	return errors.New("is not a regular file; opsift writes only regular files, or /dev/stdout")
}

// resolveLinks follows symbolic links from path to the file they end at,
// which need not exist yet (a dangling link names the file to create); it
// stops at a name of standard output.
func resolveLinks(path string) (string, error) {
	for range 40 { // the usual kernel limit on links in a path
		st, err := os.Lstat(path)
		if errors.Is(err, fs.ErrNotExist) {
			return path, nil
		}
		if err != nil {
			return "", err
		}
		if st.Mode()&fs.ModeSymlink == 0 || stdoutPaths[path] {
			return path, nil // stop at standard output's own names
		}
		to, err := os.Readlink(path)
		if err != nil {
			return "", err
		}
		if !filepath.IsAbs(to) {
			to = filepath.Join(filepath.Dir(path), to)
		}
		path = to
	}
	return "", errors.New("too many levels of symbolic links")
}

// writeThrough writes data to standard output named by path.
func writeThrough(path, shown string, data []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY, 0)
	if err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return fmt.Errorf("write %s: %w", shown, err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("write %s: %w", shown, err)
	}
	return nil
}

// removeOnSignal removes the file name when SIGINT or SIGTERM arrives
// before the returned stop is called, then delivers the signal again
// with this handler gone, so the program ends as it would have.
func removeOnSignal(name string) (stop func()) {
	sigs := make(chan os.Signal, 1)
	done := make(chan struct{})
	signal.Notify(sigs, syscall.SIGINT, syscall.SIGTERM)
	go func() {
		select {
		case sig := <-sigs:
			os.Remove(name)
			signal.Stop(sigs)
			if s, ok := sig.(syscall.Signal); ok {
				_ = syscall.Kill(os.Getpid(), s)
			}
		case <-done:
		}
	}()
	return func() {
		signal.Stop(sigs)
		close(done)
	}
}
