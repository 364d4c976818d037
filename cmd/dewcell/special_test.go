//go:build unix

package main

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestStudyNotRegular: a named pipe, a device or a folder as the study file
// is bad input (exit 2) reported at once, naming the path.
func TestStudyNotRegular(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "study.toml")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skipf("cannot make a named pipe here: %v", err)
	}
	for _, path := range []string{fifo, os.DevNull, dir} {
		type result struct {
			code           int
			stdout, stderr string
		}
		done := make(chan result, 1)
		go func() {
			code, stdout, stderr := dewcell("fluid", path)
			done <- result{code, stdout, stderr}
		}()
		select {
		case r := <-done:
			if r.code != 2 || r.stdout != "" || !strings.Contains(r.stderr, path) || !strings.Contains(r.stderr, "not a regular file") {
				t.Errorf("dewcell fluid %s: exit %d, stdout %q, stderr %q; want 2 and a refusal naming the path", path, r.code, r.stdout, r.stderr)
			}
		case <-time.After(10 * time.Second):
			if w, err := os.OpenFile(fifo, os.O_WRONLY, 0); err == nil {
				w.Close()
			}
			t.Fatalf("dewcell fluid %s still waiting after 10 s", path)
		}
	}
}
