//go:build unix

package study

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestReadNotRegular: a study path that names a named pipe, a device or a
// folder is refused at once, with the file and what it is, instead of
// waiting on the pipe for a writer that never comes.
func TestReadNotRegular(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "study.toml")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skipf("cannot make a named pipe here: %v", err)
	}
	for _, c := range []struct{ path, what string }{
		{fifo, "named pipe"},
		{os.DevNull, "device"},
		{dir, "folder"},
	} {
		done := make(chan error, 1)
		go func() { _, err := Read(c.path); done <- err }()
		var err error
		select {
		case err = <-done:
		case <-time.After(10 * time.Second):
			if c.path == fifo { // release the reader, then fail
				if w, werr := os.OpenFile(fifo, os.O_WRONLY, 0); werr == nil {
					w.Close()
				}
			}
			t.Fatalf("Read(%s) still waiting after 10 s", c.path)
		}
		if err == nil || !strings.Contains(err.Error(), c.path) || !strings.Contains(err.Error(), c.what) || !strings.Contains(err.Error(), "not a regular file") {
			t.Errorf("Read(%s): %v; want an error naming the path, saying it is a %s and not a regular file", c.path, err, c.what)
		}
	}

	// A laboratory table that is a named pipe is refused the same way.
	lab := base + "\n[lab]\ncvd = \"" + fifo + "\"\n"
	if _, err := Parse(filepath.Join(dir, "case.toml"), []byte(lab)); err == nil || !strings.Contains(err.Error(), "lab.cvd") || !strings.Contains(err.Error(), "named pipe") {
		t.Errorf("lab.cvd naming a named pipe: %v; want an error naming lab.cvd and the pipe", err)
	}
}
