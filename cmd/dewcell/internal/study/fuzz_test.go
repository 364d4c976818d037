package study

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
)

// FuzzRead checks that no study file makes Parse panic; that a rejected file
// gets a *study.Error naming the file; and that an accepted one gives a
// usable feed: one mole fraction per component, none negative, summing to 1.
func FuzzRead(f *testing.F) {
	f.Add([]byte(base))
	for _, path := range []string{"../../../../testdata/o9.toml", "../../../../examples/sablewick.toml"} {
		if data, err := os.ReadFile(path); err == nil {
			f.Add(data)
		}
	}
	for _, tt := range badStudies {
		if strings.Contains(base, tt.old) {
			f.Add([]byte(strings.Replace(base, tt.old, tt.new, 1)))
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		st, err := Parse("fuzz.toml", data)
		if err != nil {
			var se *Error
			if !errors.As(err, &se) || !strings.HasPrefix(err.Error(), "fuzz.toml: ") {
				t.Fatalf("error %q (%T) is not a *study.Error naming the file", err, err)
			}
			return
		}
		fl := st.Fluid
		if fl == nil || len(st.Z) != fl.N() {
			t.Fatalf("accepted study with fluid %v and %d mole fractions", fl, len(st.Z))
		}
		if err := fl.CheckComposition(st.Z); err != nil {
			t.Fatalf("accepted study with a bad feed: %v", err)
		}
		sum := 0.0
		for _, z := range st.Z {
			sum += z
		}
		if math.Abs(sum-1) > 1e-12 {
			t.Fatalf("mole fractions sum to %.17g", sum)
		}
		if !(st.Reservoir.Temperature > 0) {
			t.Fatalf("accepted reservoir temperature %g K", st.Reservoir.Temperature)
		}
	})
}
