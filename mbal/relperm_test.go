package mbal

import (
	"errors"
	"math"
	"testing"
)

// TestFractionalFlowHandWorked checks the Corey relative permeabilities and
// the fractional flow against a case worked by hand (our own numbers, exact
// fractions):
//
//	S_w = 0.2, S_cc = 0.1, S_c = 0.3, n_g = 2, n_c = 3, k_rg° = 0.8, k_rc° = 0.5,
//	μ_c = 0.20 cP, μ_g = 0.025 cP
//	S_n  = (0.3 − 0.1)/(1 − 0.2 − 0.1) = 2/7
//	k_rc = 0.5 (2/7)³ = 4/343 = 0.0116618
//	k_rg = 0.8 (5/7)² = 20/49 = 0.408163
//	k_rc/μ_c = 20/343, k_rg/μ_g = 800/49 = 5600/343
//	f_c  = 20/(20 + 5600) = 1/281 = 0.00355872
//
// and the limits: no flow at or below the critical saturation (with the gas
// at its end point), no gas flow when the condensate fills 1 − S_w.
func TestFractionalFlowHandWorked(t *testing.T) {
	k := RelativePermeability{GasExponent: 2, CondensateExponent: 3, GasEndpoint: 0.8, CondensateEndpoint: 0.5}
	if err := k.Check(); err != nil {
		t.Fatal(err)
	}
	fc, krg, krc := k.FractionalFlow(0.3, 0.2, 0.1, 0.20e-3, 0.025e-3)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"k_rc", krc, 4.0 / 343},
		{"k_rg", krg, 20.0 / 49},
		{"f_c", fc, 1.0 / 281},
	} {
		if math.Abs(c.got/c.want-1) > 1e-14 {
			t.Errorf("%s = %.15g, hand calculation %.15g", c.name, c.got, c.want)
		}
	}
	if fc, krg, krc := k.FractionalFlow(0.1, 0.2, 0.1, 0.2, 0.025); fc != 0 || krc != 0 || krg != 0.8 {
		t.Errorf("at the critical saturation: f_c %g, k_rc %g, k_rg %g; want 0, 0 and the end point 0.8", fc, krc, krg)
	}
	if fc, krg, krc := k.FractionalFlow(0.8, 0.2, 0.1, 0.2, 0.025); fc != 1 || krg != 0 || krc != 0.5 {
		t.Errorf("condensate filling 1 - Sw: f_c %g, k_rg %g, k_rc %g; want 1, 0 and the end point 0.5", fc, krg, krc)
	}
	// the defaults: quadratic curves with end points of 1
	var d RelativePermeability
	if krg, krc := d.Relative(0.3, 0.2, 0.1); math.Abs(krc-4.0/49) > 1e-15 || math.Abs(krg-25.0/49) > 1e-15 {
		t.Errorf("defaults: k_rc %g, k_rg %g; want (2/7)² and (5/7)²", krc, krg)
	}
}

func TestRelativePermeabilityChecks(t *testing.T) {
	for _, k := range []RelativePermeability{
		{GasExponent: 0.5}, {CondensateExponent: 11}, {GasEndpoint: 1.2}, {CondensateEndpoint: -0.1}, {GasExponent: math.NaN()},
	} {
		if err := k.Check(); !errors.Is(err, ErrBadReservoir) {
			t.Errorf("%+v: err = %v, want ErrBadReservoir", k, err)
		}
	}
	r := field640
	r.RelPerm.GasEndpoint = 2
	if err := r.Check(); !errors.Is(err, ErrBadReservoir) {
		t.Errorf("a reservoir with a gas end point of 2: err = %v", err)
	}
}
