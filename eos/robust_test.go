package eos

import (
	"math"
	"math/rand"
	"os"
	"testing"
)

// randomCondensate draws a gas condensate in the range of the trade's
// lean-to-rich condensates (common practice, no published source): 60-85 %
// methane, 1-12 % C7+ of molar mass 110-200 g/mol.
func randomCondensate(tb testing.TB, rng *rand.Rand) (*Fluid, []float64) {
	u := func(a, b float64) float64 { return a + (b-a)*rng.Float64() }
	names := []string{"N2", "CO2", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "nC6"}
	frac := []float64{u(0, 2), u(0, 6), u(60, 85), u(4, 10), u(2, 6), u(0.3, 1), u(0.5, 2.5), u(0.3, 1), u(0.3, 1.2), u(0.3, 1.2)}
	plusZ := u(1, 12)
	mPlus := u(110, 200)
	sg := 0.70 + 0.12*(mPlus-110)/90 + u(-0.01, 0.02)
	return characterized(tb, names, frac, plusZ, PlusFraction{Name: "C7+", FirstCarbon: 7, M: mPlus / 1000, SG: sg},
		Characterization{Pseudo: 1 + rng.Intn(5)}, Options{VolumeShift: true})
}

// TestRandomCondensates runs the saturation, flash and envelope solvers on
// many invented condensates and checks them against each other.
func TestRandomCondensates(t *testing.T) {
	rng := rand.New(rand.NewSource(7))
	cases := 40
	if os.Getenv("DEWCELL_LONG") != "" {
		cases = 1000
	}
	if testing.Short() {
		cases = 10
	}
	for k := 0; k < cases; k++ {
		fl, z := randomCondensate(t, rng)
		T := degF(150 + 200*rng.Float64())
		f := NewFlasher(fl, nil)
		var r FlashResult
		up, err := UpperSaturation(fl, T, z, nil)
		if err != nil {
			// a lean gas can be above its cricondentherm: confirm with flashes
			for _, p := range []float64{500, 1500, 3000, 5000, 8000} {
				if ferr := f.Flash(&r, T, p*psi, z); ferr != nil || r.Phases != 1 {
					t.Errorf("case %d: no saturation point (%v) but a flash at %g psia has %d phases (%v)", k, err, p, r.Phases, ferr)
				}
			}
			continue
		}
		if e := f.Flash(&r, T, up.P*0.999, z); e != nil || r.Phases != 2 {
			t.Errorf("case %d (%v at %g psia): 0.1%% below: %d phases, %v", k, up.Type, up.P/psi, r.Phases, e)
		}
		if e := f.Flash(&r, T, up.P*1.001, z); e != nil || r.Phases != 1 {
			t.Errorf("case %d (%v at %g psia): 0.1%% above: %d phases, %v", k, up.Type, up.P/psi, r.Phases, e)
		}
		for _, frac := range []float64{0.9, 0.7, 0.5, 0.3, 0.1} {
			if e := f.Flash(&r, T, up.P*frac, z); e != nil {
				t.Errorf("case %d: flash at %g of the saturation pressure: %v", k, frac, e)
			} else if r.Phases == 2 && r.Resid > 1e-10 {
				t.Errorf("case %d: residual %g", k, r.Resid)
			}
		}
		if up.Type == Dew {
			lo, err := LowerDewPoint(fl, T, z, up.P, nil)
			if err == nil && !(lo.P < up.P) {
				t.Errorf("case %d: lower dew point %g above upper %g", k, lo.P, up.P)
			}
		}
		env, err := TraceEnvelope(fl, z, nil)
		if err != nil {
			t.Errorf("case %d: envelope: %v", k, err)
			continue
		}
		if env.Cricondentherm[0] < T-0.5 {
			t.Errorf("case %d: saturation point at %g K above the cricondentherm %g K", k, T, env.Cricondentherm[0])
		}
		// Where the trace stopped at the boundary of two dense phases, a
		// saturation point colder than the last traced point lies on that
		// boundary, beyond the vapour–liquid envelope the trace lists.
		last := env.Points[len(env.Points)-1]
		beyond := env.End == EndDensePhases && T < last.T
		if env.Cricondenbar[1] < up.P*(1-1e-3) && !beyond {
			t.Errorf("case %d: saturation pressure %g above the cricondenbar %g", k, up.P/psi, env.Cricondenbar[1]/psi)
		}
		if math.IsNaN(env.Critical[0]) {
			t.Errorf("case %d: NaN critical point", k)
		}
	}
}

// TestEnvelopeStopsShortOfAnUncrossableCriticalRegion: for this invented rich
// condensate (heavy C7+ of 180 g/mol in five SCN groups up to C35+) the
// dew branch climbs to a nearly flat top where every K is within 1 % of 1 but
// the continuation can neither cross a critical point nor follow the curve.
// The trace must end there as Truncated with its converged points, not fail,
// and the points must still bound the saturation pressure found on its own.
func TestEnvelopeStopsShortOfAnUncrossableCriticalRegion(t *testing.T) {
	names := []string{"N2", "CO2", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "nC6"}
	pct := []float64{1.5314, 4.8369, 70.0333, 5.0497, 5.3579, 0.4391, 2.0659, 0.6103, 0.3529, 0.5161}
	fl, z := characterized(t, names, pct, 10.7947, PlusFraction{Name: "C7+", FirstCarbon: 7, M: 0.18012, SG: 0.8063},
		Characterization{Pseudo: 5}, Options{VolumeShift: true})
	env, err := TraceEnvelope(fl, z, nil)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("truncated %v, critical %v, %d points, cricondenbar %.1f psia at %.1f K", env.Truncated, env.HasCritical, len(env.Points), env.Cricondenbar[1]/psi, env.Cricondenbar[0])
	if !env.Truncated || !env.NearCritical || env.HasCritical {
		t.Fatalf("want the trace to stop short of the critical region (the case this test was written for); truncated %v, critical %v", env.Truncated, env.HasCritical)
	}
	last := env.Points[len(env.Points)-1]
	for i, k := range last.K {
		if math.Abs(math.Log(k)) > envCritK {
			t.Errorf("last point: ln K of %s = %g, want within %g of 0 (close to the critical point)", fl.Component(i).Name, math.Log(k), envCritK)
		}
	}
	T := degF(221.43)
	up, err := UpperSaturation(fl, T, z, nil)
	if err != nil {
		t.Fatal(err)
	}
	if up.P > env.Cricondenbar[1]*(1+1e-3) {
		t.Errorf("saturation pressure %g psia above the traced cricondenbar %g psia", up.P/psi, env.Cricondenbar[1]/psi)
	}
	if env.Cricondentherm[0] < T {
		t.Errorf("cricondentherm %g K below a temperature with a saturation point, %g K", env.Cricondentherm[0], T)
	}
}

// TestFlashWorkIsBounded: at a tenth of its dew pressure this invented
// condensate (case 908 of TestRandomCondensates) leaves 0.3 % of its moles
// as liquid, and the last residual of the split sits in a trace of a heavy
// component in the vapour, whose share of the Gibbs energy is below its
// round-off: Newton's line search crept there for a thousand evaluations and
// the flash failed. It must converge, and cheaply: within 60 evaluations of
// the split (a few substitution and Newton steps), far inside the flash's
// bound of flashEvals.
func TestFlashWorkIsBounded(t *testing.T) {
	rng := rand.New(rand.NewSource(7))
	var fl *Fluid
	var z []float64
	var T float64
	for k := 0; k <= 908; k++ {
		fl, z = randomCondensate(t, rng)
		T = degF(150 + 200*rng.Float64())
	}
	up, err := UpperSaturation(fl, T, z, nil)
	if err != nil {
		t.Fatal(err)
	}
	f := NewFlasher(fl, nil)
	var r FlashResult
	if err := f.Flash(&r, T, 0.1*up.P, z); err != nil || r.Phases != 2 {
		t.Fatalf("flash at a tenth of the dew pressure: %d phases, %v", r.Phases, err)
	}
	if f.w.evals > 60 {
		t.Errorf("%d evaluations of the split, want at most 60", f.w.evals)
	}
}

// TestFlashFromAgreesWithFlash: a flash started from the K-values of a flash
// 3 % higher in pressure (the step of a depletion) lands on the split the
// full flash finds, to the flash tolerance; started from K-values that
// belong to no split there (all K = 1.5, which Rachford–Rice cannot solve)
// it falls back to the full flash; and it allocates nothing.
func TestFlashFromAgreesWithFlash(t *testing.T) {
	for _, c := range benchCases(t) {
		f, g := NewFlasher(c.fl, nil), NewFlasher(c.fl, nil)
		var a, b, hot FlashResult
		k := make([]float64, c.fl.N())
		p := c.p
		if err := f.Flash(&a, c.t, p, c.z); err != nil || a.Phases != 2 {
			t.Fatalf("%s: %v", c.name, err)
		}
		for step := 0; step < 8; step++ {
			for i := range k {
				k[i] = a.Y[i] / a.X[i]
			}
			p *= 0.97
			if err := f.FlashFrom(&hot, c.t, p, c.z, k); err != nil {
				t.Fatalf("%s at %g psia: %v", c.name, p/psi, err)
			}
			if err := g.Flash(&b, c.t, p, c.z); err != nil {
				t.Fatalf("%s at %g psia: %v", c.name, p/psi, err)
			}
			if hot.Phases != b.Phases || math.Abs(hot.Beta-b.Beta) > 1e-10 {
				t.Errorf("%s at %g psia: from K: %d phases, vapour fraction %.12g; full flash: %d, %.12g", c.name, p/psi, hot.Phases, hot.Beta, b.Phases, b.Beta)
			}
			for i := range b.X {
				if math.Abs(hot.X[i]-b.X[i]) > 1e-9*b.X[i]+1e-15 {
					t.Errorf("%s at %g psia: x_%d %g from K, %g full", c.name, p/psi, i, hot.X[i], b.X[i])
					break
				}
			}
			a, hot = hot, a
		}
		for i := range k {
			k[i] = 1.5
		}
		if err := f.FlashFrom(&hot, c.t, c.p, c.z, k); err != nil || hot.Phases != 2 {
			t.Errorf("%s: from K = 1.5: %v, %d phases", c.name, err, hot.Phases)
		}
		if err := g.Flash(&b, c.t, c.p, c.z); err != nil || math.Abs(hot.Beta-b.Beta) > 1e-10 {
			t.Errorf("%s: from K = 1.5: vapour fraction %g, full flash %g (%v)", c.name, hot.Beta, b.Beta, err)
		}
		for i := range k {
			k[i] = a.Y[i] / a.X[i]
		}
		if n := testing.AllocsPerRun(50, func() { f.FlashFrom(&hot, c.t, c.p*0.97, c.z, k) }); n != 0 {
			t.Errorf("%s: FlashFrom allocates %g times", c.name, n)
		}
	}
}
