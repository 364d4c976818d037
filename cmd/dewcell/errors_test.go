package main

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
)

// A failure deep in a depletion reaches the user in the study's units and in
// words: every step of what was being done, no package names, no SI values,
// no iteration counts, and the error is still the library's for errors.Is.
func TestExplainInTheStudysUnits(t *testing.T) {
	// 394.261 K = 250 degF; 3.79212e7 Pa = 5500 psia (1 psi = 6894.757293168 Pa, exact)
	inner := &eos.SolveError{Op: "Flash", Iter: 712, Residual: 3e-7, Err: eos.ErrNoConvergence}
	err := fmt.Errorf("constant-volume depletion at 250 degF: %w",
		&eos.StateError{What: "flash of the cell", T: 394.26111111111111, P: 5500 * 6894.757293168362, Err: inner})
	cases := []struct {
		sys  units.System
		want string
	}{
		{units.Field, "constant-volume depletion at 250 degF: flash of the cell at 250 degF and 5500 psia: the flash: iteration did not converge"},
		{units.Metric, "constant-volume depletion at 250 degF: flash of the cell at 121.111 degC and 379.212 bara: the flash: iteration did not converge"},
	}
	for _, c := range cases {
		got := explain(err, c.sys)
		if got != c.want {
			t.Errorf("%v: %q, want %q", c.sys, got, c.want)
		}
		for _, bad := range []string{"eos", "cvd", "mbal", " Pa", " K ", "712", "iterations"} {
			if strings.Contains(got, bad) {
				t.Errorf("%v: %q contains %q", c.sys, got, bad)
			}
		}
		if ue := userError(err, c.sys); !errors.Is(ue, eos.ErrNoConvergence) || ue.Error() != c.want {
			t.Errorf("%v: userError %q loses the library error or its text", c.sys, ue)
		}
	}
	// a depletion that cannot continue, in a "%w: detail" form inside a state
	e2 := &eos.StateError{What: "the depletion", T: 394.26111111111111, P: 1000 * 6894.757293168362,
		Err: fmt.Errorf("%w: the cell contents fill 1.02 of the cell volume; no gas can be removed", cvd.ErrNotDew)}
	if got, want := explain(e2, units.Field), "the depletion at 250 degF and 1000 psia: depletion cannot continue: the cell contents fill 1.02 of the cell volume; no gas can be removed"; got != want {
		t.Errorf("%q, want %q", got, want)
	}
}
