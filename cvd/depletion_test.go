package cvd

import (
	"errors"
	"math"
	"testing"

	"dewcell/eos"
	"dewcell/internal/testfluid"
)

const psi = 6894.757293168361 // Pa per psi (lb, g_n and inch definitions)

func degF(f float64) float64 { return (f + 459.67) / 1.8 }

// condensate is the invented 12-component condensate of internal/testfluid,
// used where the test checks identities rather than published values.
func condensate(tb testing.TB, shift bool) (*eos.Fluid, []float64) {
	tb.Helper()
	fl, z, err := testfluid.Condensate(shift)
	if err != nil {
		tb.Fatal(err)
	}
	return fl, z
}

var twoStage = &Train{Stages: []Conditions{{T: degF(95), P: 1050 * psi}, {T: degF(80), P: 120 * psi}}}

// TestDepletionBalances checks the identities of a constant-volume depletion
// at every step: each component's initial moles equal those left in the cell
// plus those produced (1e-10 relative), the cell contents fill the dew-point
// volume after each removal (1e-9 relative), the dropout is zero at the dew
// point, and the cumulative surface volumes grow.
func TestDepletionBalances(t *testing.T) {
	for _, shift := range []bool{false, true} {
		fl, z := condensate(t, shift)
		T := degF(250)
		d, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 600 * psi, Steps: 10, Train: twoStage})
		if err != nil {
			t.Fatal(err)
		}
		if len(d.Steps) != 11 {
			t.Fatalf("%d steps, want the dew point and 10 below it", len(d.Steps))
		}
		if d.Steps[0].LiquidDropout != 0 || d.Steps[0].P != d.Dew.P {
			t.Errorf("first step at %g Pa with dropout %g, want the dew point %g Pa with none", d.Steps[0].P, d.Steps[0].LiquidDropout, d.Dew.P)
		}
		if d.Steps[len(d.Steps)-1].P != 600*psi {
			t.Errorf("last step at %g psia, want the abandonment pressure", d.Steps[len(d.Steps)-1].P/psi)
		}
		produced := make([]float64, len(z))
		prevGas, prevOil := 0.0, 0.0
		for k, s := range d.Steps {
			for i := range z {
				produced[i] += s.StepProduced * s.Stream[i]
				if got := s.Cell[i] + produced[i]; math.Abs(got-z[i]) > 1e-10*z[i] {
					t.Errorf("shift=%v step %d: %s balance %.15g, want %.15g", shift, k, fl.Component(i).Name, got, z[i])
				}
			}
			if k == 0 {
				continue
			}
			// volume of what is left: liquid plus remaining vapour
			nV := (1 - s.Produced) - s.LiquidMoles
			v := s.LiquidMoles*s.Liquid.V + nV*s.Gas.V
			if s.CellVolume != d.CellVolume || math.Abs(v/d.CellVolume-1) > 1e-9 {
				t.Errorf("shift=%v step %d: cell contents fill %.12g of the cell volume", shift, k, v/d.CellVolume)
			}
			if s.Surface.CumGas <= prevGas || s.Surface.CumOil < prevOil {
				t.Errorf("step %d: cumulative surface volumes fell", k)
			}
			prevGas, prevOil = s.Surface.CumGas, s.Surface.CumOil
			// two-phase Z by its definition p V_d / (n R T) (Whitson and Torp 1983)
			if z2 := s.P * d.CellVolume / ((1 - s.Produced) * eos.R * T); math.Abs(z2-s.ZTwoPhase) > 1e-12 {
				t.Errorf("step %d: two-phase Z %g, definition gives %g", k, s.ZTwoPhase, z2)
			}
		}
	}
}

// TestDropoutMaximum: a retrograde condensate's liquid dropout rises below the
// dew point, passes a maximum inside the pressure range and falls again as
// liquid revaporizes at low pressure (common practice, no published source:
// the shape of every gas-condensate CVD report). The maximum is that of the
// continuous depletion, so no step of an adaptive run lies above it.
func TestDropoutMaximum(t *testing.T) {
	fl, z := condensate(t, true)
	d, err := Deplete(fl, z, degF(250), DepletionOptions{Abandonment: 500 * psi, Steps: 12, Adaptive: true})
	if err != nil {
		t.Fatal(err)
	}
	last := d.Steps[len(d.Steps)-1]
	if !(d.MaxDropoutP < d.Dew.P && d.MaxDropoutP > last.P) {
		t.Errorf("maximum dropout at %g psia, outside (%g, %g)", d.MaxDropoutP/psi, last.P/psi, d.Dew.P/psi)
	}
	if !(last.LiquidDropout < d.MaxDropout) {
		t.Errorf("no revaporization: dropout %g at the end, maximum %g", last.LiquidDropout, d.MaxDropout)
	}
	for _, s := range d.Steps {
		if s.LiquidDropout > d.MaxDropout*(1+1e-9) {
			t.Errorf("step at %g psia has dropout %g above the reported maximum %g", s.P/psi, s.LiquidDropout, d.MaxDropout)
		}
	}
}

// TestMaxDropoutRich: on a rich, near-critical condensate, whose dropout
// rises steeply below the dew point, the reported maximum is that of the
// continuous depletion: within 0.1 vol% (the tolerance asked of it) of the
// largest step of a 1000-step depletion, the laboratory's procedure in steps
// of under 4 psi, and at a pressure between that step's neighbours. A
// parabola through coarse steps and the zero at the dew point overshoots
// here; a first-order coarse step overstates the dropout too.
func TestMaxDropoutRich(t *testing.T) {
	c, err := testfluid.Rich()
	if err != nil {
		t.Fatal(err)
	}
	fine, err := Deplete(c.Fluid, c.Z, c.T, DepletionOptions{Abandonment: c.Abandonment, Steps: 1000, SkipMaxDropout: true})
	if err != nil {
		t.Fatal(err)
	}
	k := 0
	for i, s := range fine.Steps {
		if s.LiquidDropout > fine.Steps[k].LiquidDropout {
			k = i
		}
	}
	want := fine.Steps[k].LiquidDropout
	lo, hi := fine.Steps[k+1].P, fine.Steps[k-1].P
	for _, o := range []DepletionOptions{
		{Abandonment: c.Abandonment, Steps: 8},
		{Abandonment: c.Abandonment, Steps: 10, Adaptive: true},
	} {
		d, err := Deplete(c.Fluid, c.Z, c.T, o)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("adaptive %v: maximum %.4f %% at %.1f psia; 1000 steps %.4f %% at %.1f psia", o.Adaptive, 100*d.MaxDropout, d.MaxDropoutP/psi, 100*want, fine.Steps[k].P/psi)
		if math.Abs(d.MaxDropout-want) > 1e-3 {
			t.Errorf("adaptive %v: maximum dropout %.4f %%, 1000 steps give %.4f %%", o.Adaptive, 100*d.MaxDropout, 100*want)
		}
		if !(d.MaxDropoutP > lo && d.MaxDropoutP < hi) {
			t.Errorf("adaptive %v: maximum at %.1f psia, want between %.1f and %.1f psia", o.Adaptive, d.MaxDropoutP/psi, lo/psi, hi/psi)
		}
	}
}

// TestBrentMin: Brent's search finds the minimum of a parabola and of a
// cosine (closed forms: 2 and π) from an interior point, to its tolerance.
func TestBrentMin(t *testing.T) {
	x, fx := brentMin(func(x float64) float64 { return (x-2)*(x-2) + 1 }, 0, 5, 4, 5, 1e-6)
	if math.Abs(x-2) > 1e-5 || math.Abs(fx-1) > 1e-10 {
		t.Errorf("parabola: minimum %g at %g, want 1 at 2", fx, x)
	}
	x, fx = brentMin(math.Cos, 2, 5, 2.5, math.Cos(2.5), 1e-6)
	if math.Abs(x-math.Pi) > 1e-5 || math.Abs(fx+1) > 1e-10 {
		t.Errorf("cosine: minimum %g at %g, want -1 at pi", fx, x)
	}
}

// TestDepletionFromAbove: starting above the dew point, the steps above it
// produce gas of the feed composition, the cell volume is that at the start,
// and the dew point itself is a step.
func TestDepletionFromAbove(t *testing.T) {
	fl, z := condensate(t, true)
	T := degF(250)
	plain, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 1000 * psi, Steps: 4})
	if err != nil {
		t.Fatal(err)
	}
	pd := plain.Dew.P
	start := pd + 500*psi
	d, err := Deplete(fl, z, T, DepletionOptions{Start: start, Pressures: []float64{pd + 250*psi, 3000 * psi, 2000 * psi}})
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{start, pd + 250*psi, pd, 3000 * psi, 2000 * psi}
	if len(d.Steps) != len(want) {
		t.Fatalf("%d steps, want %d", len(d.Steps), len(want))
	}
	for k, s := range d.Steps {
		if s.P != want[k] {
			t.Errorf("step %d at %g psia, want %g", k, s.P/psi, want[k]/psi)
		}
		if k > 0 && k <= 2 {
			if s.TwoPhase || s.LiquidDropout != 0 {
				t.Errorf("step %d above or at the dew point is two-phase", k)
			}
			for i := range z {
				if math.Abs(s.Y[i]-z[i]) > 1e-12 {
					t.Fatalf("step %d: produced gas is not the feed", k)
				}
			}
		}
	}
	// above the dew point the produced moles follow p/Z of the feed
	s := d.Steps[2]
	if got, want := 1-s.Produced, s.P*d.CellVolume/(s.ZGas*eos.R*T); math.Abs(got/want-1) > 1e-10 {
		t.Errorf("moles at the dew point %g, p V/(Z R T) %g", got, want)
	}
}

func TestDepletionBadOptions(t *testing.T) {
	fl, z := condensate(t, false)
	T := degF(250)
	for _, o := range []DepletionOptions{
		{Pressures: []float64{3000 * psi, 3500 * psi}},
		{Pressures: []float64{9000 * psi}},
		{Pressures: []float64{-1}},
		{Abandonment: 0},
		{Abandonment: 500 * psi, Steps: -2},
	} {
		if _, err := Deplete(fl, z, T, o); !errors.Is(err, ErrBadOptions) {
			t.Errorf("%+v: err = %v, want ErrBadOptions", o, err)
		}
	}
	if _, err := Deplete(fl, z, degF(900), DepletionOptions{Abandonment: 500 * psi}); !errors.Is(err, eos.ErrNoSaturation) {
		t.Errorf("above the cricondentherm: err = %v, want ErrNoSaturation", err)
	}
}

// TestExpansionShape: relative volume 1 at the saturation point, below 1 above
// it and rising below it; liquid only below it; compressibility positive in
// the single phase.
func TestExpansionShape(t *testing.T) {
	fl, z := condensate(t, true)
	T := degF(250)
	d, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 1000 * psi, Steps: 1})
	if err != nil {
		t.Fatal(err)
	}
	pd := d.Dew.P
	e, err := Expand(fl, z, T, []float64{1.2 * pd, 1.1 * pd, pd, 0.9 * pd, 0.7 * pd, 0.5 * pd}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(e.Steps[2].RelativeVolume-1) > 1e-9 {
		t.Errorf("V/Vsat at the saturation pressure = %.12g", e.Steps[2].RelativeVolume)
	}
	for k, s := range e.Steps {
		above := s.P > pd
		if above && (s.RelativeVolume >= 1 || s.TwoPhase || !(s.Compressibility > 0)) {
			t.Errorf("step %d above saturation: %+v", k, s)
		}
		if s.P < pd && (!s.TwoPhase || s.RelativeVolume <= 1 || s.LiquidVolume <= 0) {
			t.Errorf("step %d below saturation: %+v", k, s)
		}
		if k > 0 && s.RelativeVolume <= e.Steps[k-1].RelativeVolume {
			t.Errorf("relative volume does not rise as pressure falls at step %d", k)
		}
	}
}

// TestLiquidFlow: with a liquid flow function the liquid flows once it
// exceeds a critical fraction, the component balance still closes, each
// laboratory step's flowing share is that of the cell it leaves (the step is
// implicit), the liquid fraction never falls below the critical one while
// liquid flows, and the stock-tank condensate produced exceeds that of the
// plain depletion (the liquid that flowed is recovered).
func TestLiquidFlow(t *testing.T) {
	fl, z := condensate(t, true)
	T := degF(250)
	const crit = 0.05
	// a Corey-like share, zero up to the critical fraction (an invented
	// function for the test, not the reservoir's)
	flow := func(s FlowState) float64 {
		if s.LiquidFraction <= crit {
			return 0
		}
		sn := (s.LiquidFraction - crit) / (1 - crit)
		kl, kg := sn*sn, (1-sn)*(1-sn)
		return kl / s.LiquidViscosity / (kl/s.LiquidViscosity + kg/s.GasViscosity)
	}
	plain, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 600 * psi, Steps: 10, Train: twoStage})
	if err != nil {
		t.Fatal(err)
	}
	if plain.MaxDropout <= crit {
		t.Fatalf("test fluid drops out only %g; pick a smaller critical fraction", plain.MaxDropout)
	}
	for _, adaptive := range []bool{false, true} {
		mob, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 600 * psi, Steps: 10, Train: twoStage, LiquidFlow: flow, Adaptive: adaptive})
		if err != nil {
			t.Fatal(err)
		}
		produced := make([]float64, len(z))
		flowed := false
		for k, s := range mob.Steps {
			if s.LiquidOut > 0 && s.LiquidDropout < crit*(1-1e-9) {
				t.Errorf("adaptive %v step %d: liquid flowed, yet the dropout %g is below the critical %g", adaptive, k, s.LiquidDropout, crit)
			}
			if s.TwoPhase {
				want := flow(FlowState{P: s.P, LiquidFraction: s.LiquidDropout, GasViscosity: s.GasViscosity, LiquidViscosity: s.LiquidViscosity})
				if math.Abs(s.LiquidFlow-want) > 1e-9 {
					t.Errorf("adaptive %v step %d: liquid share %g, the function gives %g for the cell", adaptive, k, s.LiquidFlow, want)
				}
			}
			flowed = flowed || s.LiquidOut > 0
			for i := range z {
				produced[i] += s.StepProduced * s.Stream[i]
				if got := s.Cell[i] + produced[i]; math.Abs(got-z[i]) > 1e-10*z[i] {
					t.Errorf("adaptive %v step %d: %s balance %.15g, want %.15g", adaptive, k, fl.Component(i).Name, got, z[i])
				}
			}
		}
		if !flowed {
			t.Errorf("adaptive %v: no liquid flowed", adaptive)
		}
		lastP, lastM := plain.Steps[len(plain.Steps)-1].Surface, mob.Steps[len(mob.Steps)-1].Surface
		if !(lastM.CumOil > lastP.CumOil) {
			t.Errorf("adaptive %v: condensate with flowing liquid %g not above the plain depletion %g", adaptive, lastM.CumOil, lastP.CumOil)
		}
	}
}

// TestAdaptiveDepletion checks the continuous depletion for the identities
// of every depletion: component balances to 1e-10, the contents filling the
// cell to the step's settling tolerance (1e-6), the two-phase Z by its
// definition, cumulative surface volumes that grow; and that it steps onto
// every reported pressure, taking more steps than it reports, each with an
// error estimate.
func TestAdaptiveDepletion(t *testing.T) {
	fl, z := condensate(t, true)
	T := degF(250)
	d, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 600 * psi, Steps: 6, Train: twoStage, Adaptive: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(d.Steps) != 7 || d.Steps[6].P != 600*psi {
		t.Fatalf("%d steps ending at %g psia, want the dew point and 6 down to 600 psia", len(d.Steps), d.Steps[len(d.Steps)-1].P/psi)
	}
	if !(d.IntegrationSteps > 6) {
		t.Errorf("%d integration steps for 6 reported", d.IntegrationSteps)
	}
	produced := make([]float64, len(z))
	prevOil := 0.0
	sub := 0
	for k, s := range d.Steps {
		sub += s.Substeps
		for i := range z {
			produced[i] += s.StepProduced * s.Stream[i]
			if got := s.Cell[i] + produced[i]; math.Abs(got-z[i]) > 1e-10*z[i] {
				t.Errorf("step %d: %s balance %.15g, want %.15g", k, fl.Component(i).Name, got, z[i])
			}
		}
		if k == 0 {
			continue
		}
		if s.P != d.Dew.P-(d.Dew.P-600*psi)*float64(k)/6 && k < 6 {
			t.Errorf("step %d at %.6f psia, not on the reported pressure", k, s.P/psi)
		}
		nV := (1 - s.Produced) - s.LiquidMoles
		if v := s.LiquidMoles*s.Liquid.V + nV*s.Gas.V; math.Abs(v/d.CellVolume-1) > 1e-6 {
			t.Errorf("step %d: contents fill %.9g of the cell", k, v/d.CellVolume)
		}
		if z2 := s.P * d.CellVolume / ((1 - s.Produced) * eos.R * T); math.Abs(z2-s.ZTwoPhase) > 1e-12 {
			t.Errorf("step %d: two-phase Z %g, definition gives %g", k, s.ZTwoPhase, z2)
		}
		if !(s.Surface.CumOil > prevOil) || s.ProducedError == nil {
			t.Errorf("step %d: cumulative oil %g after %g, error estimate %v", k, s.Surface.CumOil, prevOil, s.ProducedError)
		}
		prevOil = s.Surface.CumOil
	}
	if sub != d.IntegrationSteps {
		t.Errorf("substeps add to %d, integration steps %d", sub, d.IntegrationSteps)
	}
}

// TestSinglePhaseDepletion: above the dew point the cell holds one phase and
// produces the feed, so with a rigid cell the moles left are exactly
// (p/Z)/(p_start/Z_start) of the initial (Z of the feed from the equation of
// state at each pressure), for laboratory steps and adaptive ones alike.
func TestSinglePhaseDepletion(t *testing.T) {
	fl, z := condensate(t, true)
	T := degF(250)
	plain, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 1000 * psi, Steps: 1, SkipMaxDropout: true})
	if err != nil {
		t.Fatal(err)
	}
	pd := plain.Dew.P
	start := pd + 1500*psi
	zOf := func(p float64) float64 {
		pp, _ := fl.Props(T, p, z)
		return pp.Z
	}
	for _, adaptive := range []bool{false, true} {
		for _, ps := range [][]float64{{pd + 1000*psi, pd + 10*psi}, {pd + 500*psi}} {
			d, err := Deplete(fl, z, T, DepletionOptions{Start: start, Pressures: ps, Adaptive: adaptive})
			if err != nil {
				t.Fatal(err)
			}
			for _, s := range d.Steps[1:] {
				want := 1 - (s.P/zOf(s.P))/(start/zOf(start))
				if math.Abs(s.Produced-want) > 1e-12 {
					t.Errorf("adaptive %v, steps %v: produced %.15g at %g psia, closed form %.15g", adaptive, ps, s.Produced, s.P/psi, want)
				}
			}
		}
	}
}

// TestPoreCompressibility: a shrinking pore volume follows
// V = V_start [1 − c (p_start − p)], the contents fill it, and more moles are
// expelled than from the rigid cell.
func TestPoreCompressibility(t *testing.T) {
	fl, z := condensate(t, true)
	T := degF(250)
	c := 1e-5 / psi // a large effective compressibility, to make the effect plain
	rigid, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 600 * psi, Steps: 6})
	if err != nil {
		t.Fatal(err)
	}
	soft, err := Deplete(fl, z, T, DepletionOptions{Abandonment: 600 * psi, Steps: 6, PoreCompressibility: c})
	if err != nil {
		t.Fatal(err)
	}
	p0 := soft.Steps[0].P
	for k, s := range soft.Steps[1:] {
		want := soft.CellVolume * (1 - c*(p0-s.P))
		if math.Abs(s.CellVolume/want-1) > 1e-14 {
			t.Errorf("step %d: cell volume %g, want %g", k+1, s.CellVolume, want)
		}
		nV := (1 - s.Produced) - s.LiquidMoles
		if v := s.LiquidMoles*s.Liquid.V + nV*s.Gas.V; math.Abs(v/want-1) > 1e-9 {
			t.Errorf("step %d: contents fill %g of the cell", k+1, v/want)
		}
		if !(s.Produced > rigid.Steps[k+1].Produced) {
			t.Errorf("step %d: produced %g not above the rigid cell's %g", k+1, s.Produced, rigid.Steps[k+1].Produced)
		}
	}
}
