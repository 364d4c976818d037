package main

import (
	"io"
	"testing"
)

// BenchmarkRecoverCommand: the whole recover command on the bundled example
// (reading the study, the fluid in place, the depletion and the other
// condensate bound, the JSON report), as a user runs it.
func BenchmarkRecoverCommand(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if code := run([]string{"dewcell", "recover", "--format", "json", exampleStudy}, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}
