package mbal

import (
	"errors"
	"math"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/internal/testfluid"
)

// Trade constants (METHODS 5.1, C9): the conversions of the field units.
const (
	rPsi  = 6894.757293168361 // Pa per psi, from the lb, g_n and inch definitions
	rFt   = 0.3048            // m, exact
	rFt3  = rFt * rFt * rFt
	rAcre = 43560 * rFt * rFt // 43,560 ft² per acre
)

func rDegF(f float64) float64 { return (f + 459.67) / 1.8 }

// rCondensate is the invented 12-component condensate of internal/testfluid
// (with volume shift), for identity checks.
func rCondensate(tb testing.TB) (*eos.Fluid, []float64) {
	tb.Helper()
	fl, z, err := testfluid.Condensate(true)
	if err != nil {
		tb.Fatal(err)
	}
	return fl, z
}

var rTrain = cvd.Train{Stages: []cvd.Conditions{{T: rDegF(95), P: 1050 * rPsi}, {T: rDegF(80), P: 120 * rPsi}}}

// field640 is the hand-worked reservoir of TestInPlaceHandWorked.
var field640 = Reservoir{
	T: rDegF(250), Pi: 5200 * rPsi, Abandonment: 700 * rPsi,
	BulkVolume: 640 * rAcre * 100 * rFt, Porosity: 0.20, Sw: 0.25,
}

// TestInPlaceHandWorked checks the volumetrics of the equation-of-state route
// against a hand calculation in field units (our own numbers):
//
//	bulk   = 640 acre × 100 ft × 43,560 ft²/acre        = 2.787840e9 ft³
//	PV     = 0.20 × bulk                                 = 5.575680e8 ft³
//	HCPV   = PV × (1 − 0.25)                             = 4.181760e8 ft³
//	moles  = p HCPV / (Z R T) = 5200 × 4.18176e8 / (Z × 10.7316 × 709.67)
//	       ≈ 2.8552e8 / Z lbmol
//	wet gas = moles × R T_sc/p_sc = p HCPV T_sc / (Z T p_sc)
//	        = 5200 × 4.18176e8 × 519.67 / (Z × 709.67 × 14.696) = 1.083514e11 / Z scf
//
// (R cancels; with the rounded 10.7316 and 379.49 the product is 1.08354e11,
// 3e-5 high). Z is the reservoir fluid's Z at 5200 psia and 250 °F, which the
// test takes from the result and checks against p v/(R T).
func TestInPlaceHandWorked(t *testing.T) {
	fl, z := rCondensate(t)
	ip, err := InPlaceEOS(fl, z, field640, rTrain, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got := ip.HCPV / rFt3; math.Abs(got/4.181760e8-1) > 1e-6 {
		t.Errorf("HCPV = %.7g ft³, want 4.181760e8 (hand calculation)", got)
	}
	if zv := field640.Pi * ip.V / (eos.R * field640.T); math.Abs(zv-ip.Z) > 1e-12 {
		t.Errorf("Z = %g, p v/(R T) = %g", ip.Z, zv)
	}
	wantScf := 1.083514e11 / ip.Z // hand calculation, 7 digits
	if got := ip.WetGas / rFt3; math.Abs(got/wantScf-1) > 2e-6 {
		t.Errorf("wet gas in place = %.7g scf, hand calculation %.7g", got, wantScf)
	}
	// the separator splits the wet gas into sales gas and condensate
	if !(ip.SalesGas < ip.WetGas && ip.Condensate > 0) {
		t.Errorf("sales gas %g, wet gas %g, condensate %g", ip.SalesGas, ip.WetGas, ip.Condensate)
	}
}

// TestRecoveryBalances: recovery rises monotonically as pressure falls; the
// surface gas moles, the stock-tank oil moles (the condensate's gas
// equivalent) and the moles left in the reservoir add up to the initial
// moles; the condensate saturation is the dropout times (1 − Sw).
func TestRecoveryBalances(t *testing.T) {
	fl, z := rCondensate(t)
	r := field640
	r.Cf, r.Cw = 4e-6/rPsi, 3e-6/rPsi
	rec, err := Recover(fl, z, r, rTrain, RecoverOptions{Steps: 10})
	if err != nil {
		t.Fatal(err)
	}
	n := rec.InPlace.Moles
	if rec.Steps[0].P != r.Pi || rec.Steps[len(rec.Steps)-1].P != r.Abandonment {
		t.Errorf("steps from %g to %g psia, want the initial to the abandonment pressure", rec.Steps[0].P/rPsi, rec.Steps[len(rec.Steps)-1].P/rPsi)
	}
	for k, s := range rec.Steps {
		if got := s.SalesGasMoles + s.OilMoles + s.Remaining; math.Abs(got/n-1) > 1e-9 {
			t.Errorf("step %d: surface gas + oil + remaining = %.12g of the initial moles", k, got/n)
		}
		d := rec.Depletion.Steps[k]
		if math.Abs(s.So-d.LiquidDropout*(1-r.Sw)) > 1e-15 {
			t.Errorf("step %d: So %g, dropout %g", k, s.So, d.LiquidDropout)
		}
		if k == 0 {
			continue
		}
		prev := rec.Steps[k-1]
		if !(s.P < prev.P && s.WetGasRF > prev.WetGasRF && s.SalesGasRF > prev.SalesGasRF && s.CondensateRF >= prev.CondensateRF) {
			t.Errorf("step %d: recovery not monotone: %+v after %+v", k, s, prev)
		}
	}
	last := rec.Steps[len(rec.Steps)-1]
	// in place = produced + left, by definition of the condensate left
	if got := last.Condensate + rec.CondensateLeft; math.Abs(got/rec.InPlace.Condensate-1) > 1e-12 {
		t.Errorf("produced + left condensate = %.15g of the in place", got/rec.InPlace.Condensate)
	}
	// the stock-tank liquid of the remaining fluid, processed, is reported
	// on its own: positive, and not the condensate left (yields do not add)
	if !(rec.RemainingFluidCondensate > 0) || rec.RemainingFluidCondensate == rec.CondensateLeft {
		t.Errorf("remaining fluid processed gives %g, condensate left %g", rec.RemainingFluidCondensate, rec.CondensateLeft)
	}
	// each component: moles in place = produced + left (1e-9 relative)
	d := rec.Depletion
	produced := make([]float64, len(z))
	for _, s := range d.Steps {
		for i := range z {
			produced[i] += s.StepProduced * s.Stream[i]
		}
	}
	cell := d.Steps[len(d.Steps)-1].Cell
	for i := range z {
		if got := n * (produced[i] + cell[i]); math.Abs(got/(n*z[i])-1) > 1e-9 {
			t.Errorf("%s: produced + left = %.12g of the moles in place", fl.Component(i).Name, got/(n*z[i]))
		}
	}
	if !(last.CondensateRF < last.SalesGasRF) {
		t.Errorf("condensate recovery %g not below gas recovery %g: retrograde loss missing", last.CondensateRF, last.SalesGasRF)
	}
}

// TestMobileLiquidBounds: letting the condensate above the critical
// saturation flow with its mobility share recovers more condensate than
// keeping it immobile; liquid flows only above the critical saturation. The
// produced stream stays physical. The cumulative producing CGR stays below
// the initial CGR: what stays in the rock holds the retrograde liquid, so
// what was produced is leaner than the original fluid (mass balance). The
// condensate's share of the flow stays below its share of the hydrocarbon
// pore volume, k_rc/μ_c below k_rg/μ_g × S_c/S_g, as it must with the
// default curves and a liquid more viscous than its gas, so the stream is
// leaner than the reservoir's contents; and here, where the rock holds up to
// 28 % condensate, the producing CGR never exceeds the reservoir fluid's own
// yield. (The old rule, all the liquid above the critical saturation
// flowing, produced 2.6 times the initial yield on a rich condensate.)
func TestMobileLiquidBounds(t *testing.T) {
	c, err := testfluid.Rich()
	if err != nil {
		t.Fatal(err)
	}
	r := field640
	r.T, r.Pi, r.Abandonment = c.T, c.Pi, c.Abandonment
	r.Sc = 0.10
	lo, err := Recover(c.Fluid, c.Z, r, rTrain, RecoverOptions{Steps: 20})
	if err != nil {
		t.Fatal(err)
	}
	hi, err := Recover(c.Fluid, c.Z, r, rTrain, RecoverOptions{Steps: 20, MobileLiquid: true})
	if err != nil {
		t.Fatal(err)
	}
	if lo.CriticalP == 0 {
		t.Fatal("the immobile case never passes the critical saturation; the test needs a richer fluid")
	}
	cgr0 := hi.InPlace.Surface.CGR
	flowed := false
	for _, s := range hi.Steps {
		if s.CondensateFlow > 0 && !(s.So > r.Sc) {
			t.Errorf("at %g psia condensate flows (share %g) at saturation %g, not above the critical %g", s.P/rPsi, s.CondensateFlow, s.So, r.Sc)
		}
		flowed = flowed || s.CondensateFlow > 0
		if s.CondensateFlow > s.So/(1-r.Sw) {
			t.Errorf("at %g psia the condensate's share of the flow %g exceeds its share of the hydrocarbon volume %g", s.P/rPsi, s.CondensateFlow, s.So/(1-r.Sw))
		}
		if s.CGR > cgr0*(1+1e-9) {
			t.Errorf("at %g psia the producing CGR is %.4g of the initial", s.P/rPsi, s.CGR/cgr0)
		}
		if s.SalesGas > 0 && s.Condensate/s.SalesGas > cgr0 {
			t.Errorf("at %g psia the cumulative CGR is %.4g of the initial", s.P/rPsi, s.Condensate/s.SalesGas/cgr0)
		}
	}
	if !flowed {
		t.Error("no condensate flowed")
	}
	a, b := lo.Steps[len(lo.Steps)-1], hi.Steps[len(hi.Steps)-1]
	if !(b.CondensateRF > a.CondensateRF) {
		t.Errorf("condensate recovery mobile %g, immobile %g", b.CondensateRF, a.CondensateRF)
	}
}

// TestRecoveryStepConverged: the default recovery is the step-converged one.
// On the invented lean, sour and rich condensates of internal/testfluid its
// condensate recovery at abandonment lies within 0.05 percentage points of
// a depletion in 1000 fixed first-order steps (the target asked of it), and
// within 0.01 points of the limit of the fixed-step runs, from Richardson
// extrapolation of 500 and 1000 steps (their error is proportional to the
// step: R = 2 R₁₀₀₀ − R₅₀₀), where ten fixed steps miss by 0.3 to 2.5
// points. Its estimated error is reported, and is below 0.02 points.
func TestRecoveryStepConverged(t *testing.T) {
	for _, mk := range []func() (testfluid.Case, error){testfluid.Lean, testfluid.Sour, testfluid.Rich} {
		c, err := mk()
		if err != nil {
			t.Fatal(err)
		}
		r := field640
		r.T, r.Pi, r.Abandonment = c.T, c.Pi, c.Abandonment
		r.Cf, r.Cw = 4e-6/rPsi, 3e-6/rPsi
		rf := func(o RecoverOptions) (float64, RecoveryStep) {
			o.SkipMaxSaturation = true
			rec, err := Recover(c.Fluid, c.Z, r, rTrain, o)
			if err != nil {
				t.Fatal(err)
			}
			last := rec.Steps[len(rec.Steps)-1]
			return 100 * last.CondensateRF, last
		}
		def, last := rf(RecoverOptions{})
		f10, _ := rf(RecoverOptions{FixedSteps: 10})
		f500, _ := rf(RecoverOptions{FixedSteps: 500})
		f1000, _ := rf(RecoverOptions{FixedSteps: 1000})
		limit := 2*f1000 - f500
		t.Logf("%s: default %.4f %% (estimated error %.4f), 10 fixed steps %.4f, 1000 %.4f, extrapolated %.4f",
			c.Name, def, 100*last.CondensateRFError, f10, f1000, limit)
		if math.Abs(def-f1000) > 0.05 {
			t.Errorf("%s: condensate recovery %.4f %%, 1000 fixed steps %.4f %%", c.Name, def, f1000)
		}
		if math.Abs(def-limit) > 0.01 {
			t.Errorf("%s: condensate recovery %.4f %%, extrapolated limit %.4f %%", c.Name, def, limit)
		}
		if e := 100 * last.CondensateRFError; !(math.Abs(e) < 0.02) || e == 0 {
			t.Errorf("%s: estimated error %g percentage points", c.Name, e)
		}
		if math.Abs(f10-f1000) < 0.3 {
			t.Errorf("%s: 10 fixed steps are only %.3f points off: the case does not show the step-size bias", c.Name, f1000-f10)
		}
	}
}

// TestRecoverSinglePhase: above the dew point the reservoir holds one phase
// and produces its own fluid, so with no rock or water compressibility the
// wet gas recovered is exactly 1 − (p/Z)/(p_i/Z_i) (the single-phase gas
// material balance; Z of the reservoir fluid from the equation of state),
// whatever the steps: adaptive or fixed, few or many.
func TestRecoverSinglePhase(t *testing.T) {
	fl, z := rCondensate(t)
	r := field640
	r.Pi = 6500 * rPsi
	zOf := func(p float64) float64 {
		pp, _ := fl.Props(r.T, p, z)
		return pp.Z
	}
	for _, o := range []RecoverOptions{
		{Pressures: []float64{6000 * rPsi, 5500 * rPsi, 5000 * rPsi}},
		{Pressures: []float64{5000 * rPsi}},
		{FixedSteps: 3},
	} {
		rec, err := Recover(fl, z, r, rTrain, o)
		if err != nil {
			t.Fatal(err)
		}
		pd := rec.Depletion.Dew.P
		n := 0
		for _, s := range rec.Steps[1:] {
			if s.P < pd {
				break
			}
			n++
			want := 1 - (s.P/zOf(s.P))/(r.Pi/zOf(r.Pi))
			if math.Abs(s.WetGasRF-want) > 1e-12 {
				t.Errorf("%+v: wet gas recovery %.15g at %g psia, closed form %.15g", o, s.WetGasRF, s.P/rPsi, want)
			}
		}
		if n == 0 {
			t.Errorf("%+v: no step above the dew point", o)
		}
	}
}
func TestReservoirChecks(t *testing.T) {
	fl, z := rCondensate(t)
	for _, mod := range []func(*Reservoir){
		func(r *Reservoir) { r.Porosity = 0 },
		func(r *Reservoir) { r.Sw = 1 },
		func(r *Reservoir) { r.Abandonment = r.Pi },
		func(r *Reservoir) { r.BulkVolume = 0 },
		func(r *Reservoir) { r.Cf = -1 },
		func(r *Reservoir) { r.Sc = 0.9 },
	} {
		r := field640
		mod(&r)
		if _, err := InPlaceEOS(fl, z, r, rTrain, nil); !errors.Is(err, ErrBadReservoir) {
			t.Errorf("%+v: err = %v, want ErrBadReservoir", r, err)
		}
	}
	if _, err := Recover(fl, z, field640, rTrain, RecoverOptions{Pressures: []float64{3000 * rPsi, 500 * rPsi}}); !errors.Is(err, ErrBadReservoir) {
		t.Errorf("a recovery pressure below abandonment: err = %v, want ErrBadReservoir", err)
	}
	for _, o := range []RecoverOptions{{FixedSteps: 10, Steps: 5}, {FixedSteps: 10, Pressures: []float64{3000 * rPsi}}, {FixedSteps: 1001}, {FixedSteps: -1}} {
		if _, err := Recover(fl, z, field640, rTrain, o); !errors.Is(err, ErrBadReservoir) {
			t.Errorf("%+v: err = %v, want ErrBadReservoir", o, err)
		}
	}
	r := field640
	r.Pi = 2000 * rPsi // below the dew point
	if _, err := InPlaceEOS(fl, z, r, rTrain, nil); !errors.Is(err, ErrInitiallyTwoPhase) {
		t.Errorf("initial pressure below the dew point: err = %v", err)
	}
}

// TestHistoryFitRecoversModel: fed the model's own depletion as production
// history, the two-phase p/Z line gives back the wet gas in place within 1 %
// (the requirement; for a rigid pore volume p/Z2 = n R T/V is exactly
// linear in the moles produced, so the fit is in fact exact to round-off),
// and pressure noise widens the confidence interval and moves the estimate.
func TestHistoryFitRecoversModel(t *testing.T) {
	fl, z := rCondensate(t)
	rec, err := Recover(fl, z, field640, rTrain, RecoverOptions{Steps: 12})
	if err != nil {
		t.Fatal(err)
	}
	var p, z2, gp []float64
	for _, s := range rec.Steps[1:] {
		p = append(p, s.P)
		z2 = append(z2, s.Z2)
		gp = append(gp, s.WetGas)
	}
	pts, err := HistoryFromSeries(p, z2, gp, nil)
	if err != nil {
		t.Fatal(err)
	}
	first := rec.Steps[0]
	fit, err := FitPZ(pts, first.P, first.Z2, nil)
	if err != nil {
		t.Fatal(err)
	}
	G := rec.InPlace.WetGas
	if math.Abs(fit.G/G-1) > 0.01 {
		t.Errorf("p/Z fit gives G = %.6g, volumetric %.6g: off by %.3g %%", fit.G, G, 100*(fit.G/G-1))
	}
	if math.Abs(fit.G/G-1) > 1e-9 {
		t.Errorf("exact history: G = %.12g, want %.12g", fit.G, G)
	}
	// 1 % pressure noise, fixed pattern (alternating signs, growing)
	noisy := append([]HistoryPoint(nil), pts...)
	for k := range noisy {
		noisy[k].P *= 1 + 0.01*float64(1-2*(k%2))*float64(k%3+1)/3
	}
	nfit, err := FitPZ(noisy, first.P, first.Z2, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !(nfit.GHigh-nfit.GLow > 100*(fit.GHigh-fit.GLow)) || math.Abs(nfit.G/G-1) < 1e-4 {
		t.Errorf("noise does not show: interval %g -> %g, error %g", fit.GHigh-fit.GLow, nfit.GHigh-nfit.GLow, nfit.G/G-1)
	}
}

// TestRecoverRefusesOil: a fluid with a bubble point is an oil; the
// condensate model, which leaves the liquid in the rock, does not apply.
func TestRecoverRefusesOil(t *testing.T) {
	var comps []eos.Component
	for _, nm := range []string{"C1", "C3", "nC6"} {
		c, _ := eos.LibraryComponent(nm)
		comps = append(comps, c)
	}
	dec, _ := eos.LibraryComponent("nC6")
	dec.Name, dec.M, dec.Tc, dec.Pc, dec.Omega = "P1", 0.240, 780, 1.6e6, 0.7 // an invented heavy pseudo-component
	comps = append(comps, dec)
	fl, err := eos.NewFluid(comps, nil, eos.Options{})
	if err != nil {
		t.Fatal(err)
	}
	z := []float64{0.35, 0.10, 0.15, 0.40}
	r := field640
	r.Pi, r.Abandonment = 5000*rPsi, 500*rPsi
	if _, err := Recover(fl, z, r, rTrain, RecoverOptions{Steps: 4}); !errors.Is(err, ErrNotCondensate) {
		t.Errorf("oil: err = %v, want ErrNotCondensate", err)
	}
}
