package units

import (
	"errors"
	"math"
	"testing"
)

// FuzzParse checks that no string makes Parse or ParseState panic, and that
// whatever they accept is finite and physically possible (for ParseState,
// within the range of a state), while whatever they reject comes with one
// of the documented errors.
func FuzzParse(f *testing.F) {
	for _, tt := range parseTests {
		f.Add(tt.in, int(tt.kind))
	}
	for _, tt := range parseErrors {
		f.Add(tt.in, int(tt.kind))
	}
	documented := func(t *testing.T, fn, s string, kind int, v float64, err error) {
		var e *Error
		if !errors.As(err, &e) || v != 0 {
			t.Fatalf("%s(%q, %d) = %g, %v: want 0 and a *units.Error", fn, s, kind, v, err)
		}
		for _, sentinel := range []error{ErrSyntax, ErrNoUnit, ErrUnknownUnit, ErrAmbiguous, ErrWrongKind, ErrNotFinite, ErrNegative, ErrNoAtm, ErrOutOfRange} {
			if errors.Is(err, sentinel) {
				return
			}
		}
		t.Fatalf("%s(%q, %d): undocumented error %v", fn, s, kind, err)
	}
	f.Fuzz(func(t *testing.T, s string, kind int) {
		k := Kind(kind)
		v, err := Parse(s, k, PaPerAtm)
		if err != nil {
			documented(t, "Parse", s, kind, v, err)
		} else if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 || k == Temperature && v == 0 {
			t.Fatalf("Parse(%q, %d) = %g, want a finite value >= 0 (> 0 for a temperature)", s, kind, v)
		}
		vs, errS := ParseState(s, k, PaPerAtm)
		switch {
		case errS != nil:
			documented(t, "ParseState", s, kind, vs, errS)
			if err == nil && !errors.Is(errS, ErrOutOfRange) {
				t.Fatalf("ParseState(%q, %d): %v, where Parse accepts it", s, kind, errS)
			}
		case err != nil || vs != v:
			t.Fatalf("ParseState(%q, %d) = %g, Parse %g, %v: want the same value", s, kind, vs, v, err)
		case k == Pressure && !(v >= MinStatePressure && v <= MaxStatePressure),
			k == Temperature && !(v >= MinStateTemperature && v <= MaxStateTemperature):
			t.Fatalf("ParseState(%q, %d) = %g, outside the range of a state", s, kind, v)
		}
	})
}
