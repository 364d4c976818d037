package units

import (
	"errors"
	"math"
	"testing"
)

// FuzzParse checks that no string makes Parse panic, and that whatever it
// accepts is finite and physically possible, while whatever it rejects comes
// with one of the documented errors.
func FuzzParse(f *testing.F) {
	for _, tt := range parseTests {
		f.Add(tt.in, int(tt.kind))
	}
	for _, tt := range parseErrors {
		f.Add(tt.in, int(tt.kind))
	}
	f.Fuzz(func(t *testing.T, s string, kind int) {
		k := Kind(kind)
		v, err := Parse(s, k, PaPerAtm)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || v != 0 {
				t.Fatalf("Parse(%q, %d) = %g, %v: want 0 and a *units.Error", s, kind, v, err)
			}
			for _, sentinel := range []error{ErrSyntax, ErrNoUnit, ErrUnknownUnit, ErrAmbiguous, ErrWrongKind, ErrNotFinite, ErrNegative, ErrNoAtm} {
				if errors.Is(err, sentinel) {
					return
				}
			}
			t.Fatalf("Parse(%q, %d): undocumented error %v", s, kind, err)
		}
		if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 || k == Temperature && v == 0 {
			t.Fatalf("Parse(%q, %d) = %g, want a finite value >= 0 (> 0 for a temperature)", s, kind, v)
		}
	})
}
