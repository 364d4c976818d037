package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
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

// Within a few degrees of the critical temperature (263.48 degF, by the
// Heidemann–Khalil criteria: eos.TestNearCriticalSaturation) satpoint
// calls the point a bubble point below it and a dew point above it, and
// recover refuses the oil below it, naming the critical temperature, and
// runs the condensate above it: never an oil at one temperature and a
// condensate two degrees away on the same side.
func TestNearCriticalSidesAgree(t *testing.T) {
	base, err := os.ReadFile(filepath.Join("testdata", "rich-near-critical.toml"))
	if err != nil {
		t.Fatal(err)
	}
	for _, T := range []float64{258, 260, 262, 263, 264, 266, 268} {
		study := filepath.Join(t.TempDir(), "study.toml")
		text := strings.Replace(string(base), `temperature = "280 degF"`, fmt.Sprintf(`temperature = "%g degF"`, T), 1)
		if err := os.WriteFile(study, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		sat := runJSON(t, "satpoint", study)
		want := "dew"
		if T < 263.48 {
			want = "bubble"
		}
		if sat["type"] != want {
			t.Errorf("%g degF: satpoint says %v, want %s", T, sat["type"], want)
		}
		code, _, stderr := dewcell("recover", study)
		switch {
		case want == "bubble" && (code == 0 || !strings.Contains(stderr, "is an oil") || !strings.Contains(stderr, "critical temperature of 263.477 degF")):
			t.Errorf("%g degF: recover exit %d: %s; want it to refuse the oil and name the critical temperature", T, code, stderr)
		case want == "dew" && code != 0:
			t.Errorf("%g degF: recover exit %d: %s; want the condensate's recovery", T, code, stderr)
		}
	}
}
