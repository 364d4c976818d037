package mbal

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat"

	"dewcell/cvd"
)

const (
	hPsi = 6894.757293168362 // Pa per psi: 1 lbf/in², exact from the lb, g_n and inch definitions
	hScf = 0.028316846592    // m³ per ft³, exact (1 ft = 0.3048 m)
	hBcf = 1e9 * hScf        // m³ per 10⁹ ft³
)

func hRel(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// hC10 is the p/Z identity of METHODS C10 (self, for unit tests): p_i = 5000
// psia, Z_i = 1.0, G = 100 Bscf; G_p = 40 Bscf gives p/Z = 3000 psia.
var hC10 = struct{ pi, zi, g float64 }{5000 * hPsi, 1.0, 100 * hBcf}

// hC10History builds a volumetric history on the C10 line,
// p/Z = (p_i/Z_i)(1 − G_p/G), at the given cumulative productions (Bscf).
// Z₂ is an invented smooth function of the recovery, 1 − 0.3 f + 0.2 f²
// (no published source; the line depends on p/Z only, so any Z will do).
func hC10History(gpBscf []float64) []HistoryPoint {
	pts := make([]HistoryPoint, len(gpBscf))
	for i, g := range gpBscf {
		gp := g * hBcf
		f := gp / hC10.g
		z := 1 - 0.3*f + 0.2*f*f
		pz := hC10.pi / hC10.zi * (1 - f)
		pts[i] = HistoryPoint{P: z * pz, Z2: z, CumWetGas: gp}
	}
	return pts
}

// TestFitPZRecoversVolumetricG: an exact volumetric history returns the G it
// was built with, in both intercept modes.
func TestFitPZRecoversVolumetricG(t *testing.T) {
	t.Parallel()
	pts := hC10History([]float64{10, 20, 30, 40, 50, 60, 70})
	// METHODS C10: G_p = 40 Bscf → p/Z = 3000 psia (exact identity).
	if got := pts[3].P / pts[3].Z2 / hPsi; math.Abs(got-3000) > 1e-9 {
		t.Fatalf("C10 history: p/Z at 40 Bscf = %.12g psia, want 3000 (METHODS C10)", got)
	}
	for _, fixed := range []bool{false, true} {
		f, err := FitPZ(pts, hC10.pi, hC10.zi, &PZOptions{FixIntercept: fixed})
		if err != nil {
			t.Fatalf("fixed=%v: %v", fixed, err)
		}
		const tol = 1e-9 // exact data: rounding only
		if e := hRel(f.G, hC10.g); e > tol {
			t.Errorf("fixed=%v: G = %.12g Bscf, want 100 (METHODS C10); rel. error %.2g", fixed, f.G/hBcf, e)
		}
		if e := hRel(f.Intercept, hC10.pi/hC10.zi); e > tol {
			t.Errorf("fixed=%v: intercept = %.12g psia, want 5000 (METHODS C10)", fixed, f.Intercept/hPsi)
		}
		if e := hRel(f.PZAt(40*hBcf), 3000*hPsi); e > tol {
			t.Errorf("fixed=%v: fitted p/Z at 40 Bscf = %.12g psia, want 3000 (METHODS C10)", fixed, f.PZAt(40*hBcf)/hPsi)
		}
		if f.R2 < 1-1e-12 {
			t.Errorf("fixed=%v: R² = %.15g, want 1 for exact data", fixed, f.R2)
		}
		if f.CurvatureSignificant {
			t.Errorf("fixed=%v: exact straight line flagged as curved (p = %g)", fixed, f.CurvatureP)
		}
		if rel := (f.GHigh - f.GLow) / f.G; rel > 1e-9 {
			t.Errorf("fixed=%v: interval width %.3g of G on exact data, want ~0", fixed, rel)
		}
		wantN, wantDOF := 8, 6 // 7 points + the initial one, 2 parameters
		if fixed {
			wantN, wantDOF = 7, 6 // 7 points, 1 parameter
		}
		if f.N != wantN || f.DOF != wantDOF || f.FixedIntercept != fixed {
			t.Errorf("fixed=%v: N, DOF = %d, %d, want %d, %d", fixed, f.N, f.DOF, wantN, wantDOF)
		}
		cmp, err := f.CompareVolumetric(110 * hBcf)
		if err != nil {
			t.Fatal(err)
		}
		if hRel(cmp.Ratio, 100.0/110) > tol || hRel(cmp.Difference, -10*hBcf) > 1e-7 || cmp.Inside {
			t.Errorf("fixed=%v: comparison with 110 Bscf = %+v, want ratio 0.90909, difference −10 Bscf, outside", fixed, cmp)
		}
	}
}

// hNormals are fixed pseudo-random standard normal deviates (PCG, fixed seed).
func hNormals(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 7))
	e := make([]float64, n)
	for i := range e {
		e[i] = rng.NormFloat64()
	}
	return e
}

// hEarlyGp is an early-life history: 5 to 50 % of G in ten steps (Bscf).
var hEarlyGp = []float64{5, 10, 15, 20, 25, 30, 35, 40, 45, 50}

// TestFitPZMatchesGonumRegression checks the fitted line against gonum's
// stat.LinearRegression and stat.RSquared on the same noisy points, and the
// residual standard error against its definition.
func TestFitPZMatchesGonumRegression(t *testing.T) {
	t.Parallel()
	pts := hC10History(hEarlyGp)
	eps := hNormals(len(pts), 11)
	xs := []float64{0}
	ys := []float64{hC10.pi / hC10.zi}
	for i := range pts {
		pts[i].P += 0.01 * hC10.pi * eps[i]
		xs = append(xs, pts[i].CumWetGas)
		ys = append(ys, pts[i].P/pts[i].Z2)
	}
	f, err := FitPZ(pts, hC10.pi, hC10.zi, nil)
	if err != nil {
		t.Fatal(err)
	}
	alpha, beta := stat.LinearRegression(xs, ys, nil, false)
	r2 := stat.RSquared(xs, ys, nil, alpha, beta)
	if hRel(f.Intercept, alpha) > 1e-12 || hRel(f.Slope, -beta) > 1e-10 || hRel(f.R2, r2) > 1e-10 {
		t.Errorf("line a, b, R² = %.12g, %.12g, %.12g; gonum stat gives %.12g, %.12g, %.12g",
			f.Intercept, f.Slope, f.R2, alpha, -beta, r2)
	}
	ss := 0.0
	for i := range xs {
		r := ys[i] - (alpha + beta*xs[i])
		ss += r * r
	}
	if want := math.Sqrt(ss / float64(len(xs)-2)); hRel(f.ResidualSE, want) > 1e-9 {
		t.Errorf("residual SE = %.10g Pa, want sqrt(SS/(n−2)) = %.10g Pa", f.ResidualSE, want)
	}
	for i := range pts {
		want := ys[i+1] - (alpha + beta*xs[i+1])
		if math.Abs(f.Residuals[i]-want) > 1e-6*hC10.pi*0.01 {
			t.Errorf("residual %d = %g Pa, want %g Pa", i, f.Residuals[i], want)
		}
	}
}

// TestFitPZDegradesWithNoise: the same pseudo-random errors, scaled up,
// widen the interval on G in proportion and lower R², while G stays within
// three standard errors of the truth.
func TestFitPZDegradesWithNoise(t *testing.T) {
	t.Parallel()
	levels := []float64{0, 0.001, 0.003, 0.01, 0.03} // σ of pressure as a fraction of p_i
	eps := hNormals(len(hEarlyGp), 2024)
	var prevWidth, prevR2 float64
	for k, lev := range levels {
		pts := hC10History(hEarlyGp)
		for i := range pts {
			pts[i].P += lev * hC10.pi * eps[i]
		}
		f, err := FitPZ(pts, hC10.pi, hC10.zi, nil)
		if err != nil {
			t.Fatalf("noise %g: %v", lev, err)
		}
		width := (f.GHigh - f.GLow) / hC10.g
		t.Logf("noise %5.3f: G = %7.3f Bscf, SE %.3g Bscf, 95%% interval %.3f–%.3f, R² %.6f, curvature p %.3g",
			lev, f.G/hBcf, f.GSE/hBcf, f.GLow/hBcf, f.GHigh/hBcf, f.R2, f.CurvatureP)
		if k == 0 {
			if hRel(f.G, hC10.g) > 1e-9 {
				t.Errorf("no noise: G = %.12g Bscf, want 100 (METHODS C10)", f.G/hBcf)
			}
		} else {
			if math.Abs(f.G-hC10.g) > 3*f.GSE {
				t.Errorf("noise %g: G = %.4g Bscf is %.2g standard errors from 100 Bscf", lev, f.G/hBcf, math.Abs(f.G-hC10.g)/f.GSE)
			}
			if !(width > prevWidth) || !(f.R2 < prevR2) {
				t.Errorf("noise %g: interval width %.3g (previous %.3g), R² %.8g (previous %.8g): want wider and lower",
					lev, width, prevWidth, f.R2, prevR2)
			}
			// The residual scatter scales with the noise, so SE(G)/σ stays
			// nearly constant (G itself moves a little).
			if k > 1 {
				ratio := (width / lev) / (prevWidth / levels[k-1])
				if ratio < 0.8 || ratio > 1.25 {
					t.Errorf("noise %g: interval width per unit noise changed by a factor %.3g, want about 1", lev, ratio)
				}
			}
			cmp, err := f.CompareVolumetric(hC10.g)
			if err != nil {
				t.Fatal(err)
			}
			if !cmp.Inside {
				t.Logf("noise %g: the true G lies outside the %.0f%% interval", lev, 100*f.Confidence)
			}
		}
		prevWidth, prevR2 = width, f.R2
	}
	// Visibly worse: at 3 % pressure noise the interval spans more than
	// ±5 % of G, against ±1e-9 without noise.
	if prevWidth < 0.10 {
		t.Errorf("at 3%% noise the interval spans %.3g of G, want > 0.10", prevWidth)
	}
}

// TestFitPZIntervalCoverage checks the delta-method standard error and the
// Student-t interval by Monte Carlo: over many noisy histories the scatter
// of G matches the mean reported SE, about 95 % of the 95 % intervals hold
// the true G, and the curvature test of a straight line fires about 5 % of
// the time (the nominal levels; Casella and Berger 2002, §5.5.4, from
// memory, for the delta method, whose first-order error is small at this
// noise). The errors
// match each mode's assumptions: with a free intercept the initial pressure
// is a measurement like the others and carries the same error; with a fixed
// one it is exact.
func TestFitPZIntervalCoverage(t *testing.T) {
	t.Parallel()
	const runs = 4000
	const lev = 0.005
	for _, fixed := range []bool{false, true} {
		rng := rand.New(rand.NewPCG(99, 3))
		var gs []float64
		seSum, cover, curved := 0.0, 0, 0
		for r := 0; r < runs; r++ {
			pts := hC10History(hEarlyGp)
			for i := range pts {
				pts[i].P += lev * hC10.pi * rng.NormFloat64()
			}
			pi := hC10.pi
			if !fixed {
				pi += lev * hC10.pi * rng.NormFloat64()
			}
			f, err := FitPZ(pts, pi, hC10.zi, &PZOptions{FixIntercept: fixed})
			if err != nil {
				t.Fatal(err)
			}
			gs = append(gs, f.G)
			seSum += f.GSE
			if f.GLow <= hC10.g && hC10.g <= f.GHigh {
				cover++
			}
			if f.CurvatureSignificant {
				curved++
			}
		}
		sd := stat.StdDev(gs, nil)
		meanSE := seSum / runs
		cv, cu := float64(cover)/runs, float64(curved)/runs
		t.Logf("fixed=%v: SD of G %.4g Bscf, mean SE %.4g Bscf, coverage %.4f, curvature alarms %.4f",
			fixed, sd/hBcf, meanSE/hBcf, cv, cu)
		// Sampling error of a standard deviation from 4000 runs is about
		// 1.1 %; 10 % leaves room for the delta method's first-order error.
		if hRel(meanSE, sd) > 0.10 {
			t.Errorf("fixed=%v: mean delta-method SE %.4g Bscf, Monte Carlo SD of G %.4g Bscf", fixed, meanSE/hBcf, sd/hBcf)
		}
		// Binomial SD of a 95 % proportion over 4000 runs is 0.0034; allow ±0.015.
		if math.Abs(cv-0.95) > 0.015 {
			t.Errorf("fixed=%v: 95%% interval covers the true G in %.4f of runs, want 0.95", fixed, cv)
		}
		if math.Abs(cu-0.05) > 0.015 {
			t.Errorf("fixed=%v: curvature test fires on %.4f of straight lines, want 0.05", fixed, cu)
		}
	}
}

// hRes is an invented reservoir for the Havlena–Odeh tests (no real field):
// 380 K, p_i = 30 MPa, G = 1.0e9 standard m³ at 15 °C and 101.325 kPa,
// S_w = 0.2, c_w = 4.4e-10 1/Pa (≈ 3e-6 1/psi), c_f = 5.8e-10 1/Pa (≈ 4e-6
// 1/psi) (typical magnitudes: common practice, no published source),
// B_w = 1.02, and 2e-6 m³ of water per standard m³ of wet gas.
var hRes = struct {
	T, pi, g, sw, cw, cf, bw, wgr float64
	std                           cvd.Conditions
}{380, 30e6, 1.0e9, 0.2, 4.4e-10, 5.8e-10, 1.02, 2e-6, cvd.StandardMetric}

// hZ is an invented smooth two-phase Z (no published source): 0.98 at
// 30 MPa, 0.88 at 15 MPa, 0.896 at 9 MPa.
func hZ(p float64) float64 { u := (p - 15e6) / 15e6; return 0.88 + 0.10*u*u }

var hPressures = []float64{27e6, 24e6, 21e6, 18e6, 15e6, 12e6, 9e6}

// hBalance builds a history that satisfies the gas material balance of
// METHODS 9.2 exactly,
//
//	G_p B_g + W_p B_w = G (E_g + E_fw) + W_e,  W_p = wgr · G_p,
//
// solved for G_p at each pressure, with influx we(i) (reservoir m³).
func hBalance(we func(i int) float64) ([]HistoryPoint, HavlenaOdehParams) {
	r := hRes
	par := HavlenaOdehParams{T: r.T, Sw: r.sw, Cw: r.cw, Cf: r.cf, Bw: r.bw, Std: r.std}
	bg := func(p float64) float64 { return hZ(p) * r.T * r.std.P / (p * r.std.T) }
	ce := (r.cw*r.sw + r.cf) / (1 - r.sw)
	pts := make([]HistoryPoint, len(hPressures))
	for i, p := range hPressures {
		e := bg(p) - bg(r.pi) + bg(r.pi)*ce*(r.pi-p)
		gp := (r.g*e + we(i)) / (bg(p) + r.wgr*r.bw)
		pts[i] = HistoryPoint{P: p, Z2: hZ(p), CumWetGas: gp, CumWater: r.wgr * gp}
	}
	return pts, par
}

// hPot is the pot aquifer of METHODS 9.3, W_e = (c_w + c_f) W_i f (p_i − p),
// with f = 1 and W_i = 3.0e7 m³ (invented). Worked by hand: B_gi = 0.98 ×
// 380 × 101325/(30e6 × 288.15) = 4.365e-3, so the gas fills 4.37e6
// reservoir m³ and the aquifer is about 7 times larger; (c_w + c_f) W_i =
// 0.0306 m³/Pa. At 27 MPa W_e = 91 800 m³ against G(E_g + E_fw) ≈ 317 800
// m³ (B_g = 4.672e-3, E_fw = 1.09e-5), so F/(E_g+E_fw) ≈ 1.29 G; at 9 MPa
// W_e = 642 600 m³ against ≈ 9.01e6 m³ (B_g = 1.330e-2), ≈ 1.07 G: the
// apparent gas in place falls towards G as pressure falls.
func hPot(i int) float64 { return (hRes.cw + hRes.cf) * 3.0e7 * (hRes.pi - hPressures[i]) }

// hSteady is a history under a steady-state aquifer (Schilthuis 1936, from
// memory), W_e = k ∫ (p_i − p) dt with k = 0.02 reservoir m³/(Pa·year),
// trapezoidal in time, produced at a constant 6e7 standard m³ of wet gas a
// year (6 % of G) for ten years, one point a year (invented numbers). Each
// year's pressure is solved from the balance of hBalance by bisection. The
// aquifer holds the pressure up (it levels off near 17 MPa) while the influx
// keeps growing, so F/(E_g+E_fw) rises. It returns the points and W_e.
func hSteady(t *testing.T) ([]HistoryPoint, HavlenaOdehParams, []float64) {
	const k, q, years = 0.02, 6e7, 10
	r := hRes
	par := HavlenaOdehParams{T: r.T, Sw: r.sw, Cw: r.cw, Cf: r.cf, Bw: r.bw, Std: r.std}
	bg := func(p float64) float64 { return hZ(p) * r.T * r.std.P / (p * r.std.T) }
	ce := (r.cw*r.sw + r.cf) / (1 - r.sw)
	var pts []HistoryPoint
	var wes []float64
	we, prev := 0.0, r.pi
	for j := 1; j <= years; j++ {
		gp := q * float64(j)
		wp := r.wgr * gp
		weAt := func(p float64) float64 { return we + k*(r.pi-(prev+p)/2) }
		resid := func(p float64) float64 {
			e := bg(p) - bg(r.pi) + bg(r.pi)*ce*(r.pi-p)
			return gp*bg(p) + wp*r.bw - r.g*e - weAt(p)
		}
		lo, hi := 1e6, r.pi // resid(lo) < 0 < resid(hi)
		if !(resid(lo) < 0 && resid(hi) > 0) {
			t.Fatalf("steady-state aquifer, year %d: balance not bracketed", j)
		}
		for it := 0; it < 200; it++ { // to the last bit
			if mid := (lo + hi) / 2; resid(mid) > 0 {
				hi = mid
			} else {
				lo = mid
			}
		}
		p := (lo + hi) / 2
		we, prev = weAt(p), p
		pts = append(pts, HistoryPoint{P: p, Z2: hZ(p), CumWetGas: gp, CumWater: wp})
		wes = append(wes, we)
	}
	return pts, par, wes
}

// A pot aquifer a thousand times smaller than hPot's moves F/(E_g+E_fw) by
// about 0.02 % of G over the history: with exact data the trend is
// significant, but it is far below InfluxMateriality, so the history is
// not flagged, and the reason says why. hPot itself (F/(E_g+E_fw) from
// 1.29 G to 1.07 G, worked above) is flagged, with TrendChange near −0.2.
func TestHavlenaOdehMateriality(t *testing.T) {
	t.Parallel()
	zi := hZ(hRes.pi)
	pts, par := hBalance(func(i int) float64 { return hPot(i) / 1000 })
	res, err := HavlenaOdeh(pts, hRes.pi, zi, par, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !(res.TrendP < (1-DefaultConfidence)/2) {
		t.Fatalf("premise: the small aquifer's trend should be significant with exact data (p = %g)", res.TrendP)
	}
	if c := math.Abs(res.TrendChange); !(c > 0 && c < InfluxMateriality) {
		t.Errorf("trend change %g of G, want a small non-zero fraction below %g", res.TrendChange, InfluxMateriality)
	}
	if v := res.Influx; res.WaterInfluxSuspected || v.Outcome != NoInflux || v.Triggered != 0 ||
		!v.Trend.Significant || v.Trend.Material || v.Trend.Change != res.TrendChange {
		t.Errorf("flagged %v, verdict %+v: want not flagged, the trend significant but immaterial", res.WaterInfluxSuspected, v)
	}
	pts, par = hBalance(hPot)
	res, err = HavlenaOdeh(pts, hRes.pi, zi, par, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !res.WaterInfluxSuspected || !(res.TrendChange < -0.1 && res.TrendChange > -0.35) {
		t.Errorf("pot aquifer: flagged %v, trend change %g of G; want flagged, about -0.2", res.WaterInfluxSuspected, res.TrendChange)
	}
	if v := res.Influx; v.Triggered&TrendTest == 0 || v.Outcome != FadingSupport {
		t.Errorf("pot aquifer: verdict %+v: want the trend test triggered and fading support", v)
	}
}

func TestHavlenaOdehVolumetric(t *testing.T) {
	t.Parallel()
	pts, par := hBalance(func(int) float64 { return 0 })
	zi := hZ(hRes.pi)
	res, err := HavlenaOdeh(pts, hRes.pi, zi, par, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Without influx F/(E_g+E_fw) = G at every point (METHODS 9.2).
	for i, hp := range res.Points {
		if e := hRel(hp.FOverE, hRes.g); e > 1e-9 {
			t.Errorf("point %d: F/(Eg+Efw) = %.12g, want G = %.12g (METHODS 9.2)", i, hp.FOverE, hRes.g)
		}
	}
	if e := hRel(res.Line.G, hRes.g); e > 1e-9 {
		t.Errorf("corrected p/Z line: G = %.12g, want %.12g", res.Line.G, hRes.g)
	}
	if v := res.Influx; res.WaterInfluxSuspected || v.Outcome != NoInflux || v.Triggered != 0 {
		t.Errorf("volumetric history flagged: %+v", v)
	}
	// The plain p/Z line leaves out rock and water expansion and water
	// production, so it overstates G, though by little at normal pressure.
	f, err := FitPZ(pts, hRes.pi, zi, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !(f.G > hRes.g) || hRel(f.G, hRes.g) > 0.05 {
		t.Errorf("plain p/Z: G = %.6g, want a little above %.6g", f.G, hRes.g)
	}
	t.Logf("plain p/Z G/G_true = %.5f; corrected line G/G_true = %.12f; %v", f.G/hRes.g, res.Line.G/hRes.g, res.Influx.Outcome)
}

func TestHavlenaOdehAquifers(t *testing.T) {
	t.Parallel()
	zi := hZ(hRes.pi)
	pot := func(t *testing.T) ([]HistoryPoint, HavlenaOdehParams, []float64) {
		pts, par := hBalance(hPot)
		we := make([]float64, len(pts))
		for i := range we {
			we[i] = hPot(i)
		}
		return pts, par, we
	}
	cases := []struct {
		name   string
		build  func(*testing.T) ([]HistoryPoint, HavlenaOdehParams, []float64)
		rising bool
	}{
		{"pot aquifer", pot, false},
		{"steady-state aquifer", hSteady, true},
	}
	for _, c := range cases {
		for _, lev := range []float64{0, 0.002} { // σ of pressure as a fraction of p_i
			pts, par, we := c.build(t)
			eps := hNormals(len(pts), 5)
			for i := range pts {
				pts[i].P += lev * hRes.pi * eps[i]
			}
			res, err := HavlenaOdeh(pts, hRes.pi, zi, par, nil)
			if err != nil {
				t.Fatalf("%s, noise %g: %v", c.name, lev, err)
			}
			t.Logf("%s, noise %g: p %.4g–%.4g MPa; F/E first %.4g, last %.4g; line G %.4g; %s", c.name, lev,
				pts[0].P/1e6, pts[len(pts)-1].P/1e6, res.Points[0].FOverE/hRes.g, res.Points[len(pts)-1].FOverE/hRes.g,
				res.Line.G/hRes.g, res.Influx.Outcome)
			if !res.WaterInfluxSuspected {
				t.Errorf("%s, noise %g: not flagged: %+v", c.name, lev, res.Influx)
			}
			if want := map[bool]InfluxOutcome{true: GrowingInflux, false: FadingSupport}[c.rising]; res.Influx.Outcome != want {
				t.Errorf("%s, noise %g: outcome %v, want %v", c.name, lev, res.Influx.Outcome, want)
			}
			if lev > 0 {
				continue
			}
			// F/(E_g+E_fw) = G + W_e/(E_g+E_fw) (METHODS 9.2), point by point.
			for i, hp := range res.Points {
				want := hRes.g + we[i]/(hp.Eg+hp.Efw)
				if hRel(hp.FOverE, want) > 1e-9 {
					t.Errorf("%s: point %d: F/(Eg+Efw) = %.10g, want G + We/E = %.10g", c.name, i, hp.FOverE, want)
				}
			}
			if (res.TrendSlope > 0) != c.rising || (res.Line.Curvature > 0) != c.rising {
				t.Errorf("%s: trend slope %g, curvature %g: want both %s", c.name, res.TrendSlope, res.Line.Curvature,
					map[bool]string{true: "positive", false: "negative"}[c.rising])
			}
			if !(res.Line.G > hRes.g) {
				t.Errorf("%s: the line ignoring influx gives G = %.6g, want above the true %.6g", c.name, res.Line.G, hRes.g)
			}
		}
	}
}

// TestHavlenaOdehFalseAlarms: on noisy volumetric histories the flag, two
// tests at 2.5 % each, fires on at most about 5 % of them.
func TestHavlenaOdehFalseAlarms(t *testing.T) {
	t.Parallel()
	const runs = 2000
	rng := rand.New(rand.NewPCG(4, 4))
	zi := hZ(hRes.pi)
	flagged := 0
	for r := 0; r < runs; r++ {
		pts, par := hBalance(func(int) float64 { return 0 })
		for i := range pts {
			pts[i].P += 0.002 * hRes.pi * rng.NormFloat64()
		}
		res, err := HavlenaOdeh(pts, hRes.pi, zi, par, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.WaterInfluxSuspected {
			flagged++
		}
	}
	// Binomial SD of a 5 % proportion over 2000 runs is 0.005.
	if fr := float64(flagged) / runs; fr > 0.065 {
		t.Errorf("volumetric histories flagged in %.4f of runs, want at most about 0.05", fr)
	} else {
		t.Logf("false-alarm rate %.4f", fr)
	}
}

func TestHistoryBadInput(t *testing.T) {
	t.Parallel()
	good := hC10History([]float64{10, 20, 30, 40})
	pi, zi := hC10.pi, hC10.zi
	mod := func(f func(p []HistoryPoint)) []HistoryPoint {
		p := append([]HistoryPoint(nil), good...)
		f(p)
		return p
	}
	cases := []struct {
		name   string
		pts    []HistoryPoint
		pi, zi float64
		opt    *PZOptions
		err    error
		field  string
	}{
		{"two points", good[:2], pi, zi, nil, ErrHistoryShort, "points"},
		{"no points", nil, pi, zi, nil, ErrHistoryShort, "points"},
		{"zero initial pressure", good, 0, zi, nil, ErrHistoryValue, "pi"},
		{"NaN initial Z", good, pi, math.NaN(), nil, ErrHistoryValue, "zi"},
		{"negative pressure", mod(func(p []HistoryPoint) { p[2].P = -1 }), pi, zi, nil, ErrHistoryValue, "P"},
		{"infinite pressure", mod(func(p []HistoryPoint) { p[1].P = math.Inf(1) }), pi, zi, nil, ErrHistoryValue, "P"},
		{"zero Z", mod(func(p []HistoryPoint) { p[1].Z2 = 0 }), pi, zi, nil, ErrHistoryValue, "Z2"},
		{"zero first production", mod(func(p []HistoryPoint) { p[0].CumWetGas = 0 }), pi, zi, nil, ErrHistoryValue, "CumWetGas"},
		{"production repeats", mod(func(p []HistoryPoint) { p[2].CumWetGas = p[1].CumWetGas }), pi, zi, nil, ErrHistoryValue, "CumWetGas"},
		{"production falls", mod(func(p []HistoryPoint) { p[3].CumWetGas = p[1].CumWetGas / 2 }), pi, zi, nil, ErrHistoryValue, "CumWetGas"},
		{"NaN production", mod(func(p []HistoryPoint) { p[3].CumWetGas = math.NaN() }), pi, zi, nil, ErrHistoryValue, "CumWetGas"},
		{"water falls", mod(func(p []HistoryPoint) { p[1].CumWater = 5; p[2].CumWater = 4 }), pi, zi, nil, ErrHistoryValue, "CumWater"},
		{"negative water", mod(func(p []HistoryPoint) { p[0].CumWater = -1 }), pi, zi, nil, ErrHistoryValue, "CumWater"},
		{"confidence 1", good, pi, zi, &PZOptions{Confidence: 1}, ErrHistoryValue, "Confidence"},
		{"confidence negative", good, pi, zi, &PZOptions{Confidence: -0.5}, ErrHistoryValue, "Confidence"},
		{"p/Z rising", mod(func(p []HistoryPoint) {
			for i := range p {
				p[i].P = pi * (1 + 0.1*float64(i+1))
				p[i].Z2 = 1
			}
		}), pi, zi, nil, ErrPZNotFalling, "slope"},
		{"p/Z level", mod(func(p []HistoryPoint) {
			for i := range p {
				p[i].P, p[i].Z2 = pi, zi
			}
		}), pi, zi, &PZOptions{FixIntercept: true}, ErrPZNotFalling, "slope"},
	}
	for _, c := range cases {
		f, err := FitPZ(c.pts, c.pi, c.zi, c.opt)
		var he *HistoryError
		if !errors.Is(err, c.err) || !errors.As(err, &he) || he.Field != c.field || f != nil {
			t.Errorf("FitPZ, %s: got %v (fit %v), want %v on field %s", c.name, err, f != nil, c.err, c.field)
			continue
		}
		if !strings.Contains(err.Error(), c.field) {
			t.Errorf("FitPZ, %s: message %q does not name the field %s", c.name, err, c.field)
		}
	}

	// Havlena–Odeh settings and points.
	pts, par := hBalance(func(int) float64 { return 0 })
	zi0 := hZ(hRes.pi)
	hoCases := []struct {
		name  string
		pts   []HistoryPoint
		par   func(p *HavlenaOdehParams)
		field string
	}{
		{"zero temperature", pts, func(p *HavlenaOdehParams) { p.T = 0 }, "T"},
		{"Sw of 1", pts, func(p *HavlenaOdehParams) { p.Sw = 1 }, "Sw"},
		{"negative Cw", pts, func(p *HavlenaOdehParams) { p.Cw = -1e-10 }, "Cw"},
		{"NaN Cf", pts, func(p *HavlenaOdehParams) { p.Cf = math.NaN() }, "Cf"},
		{"negative Bw", pts, func(p *HavlenaOdehParams) { p.Bw = -1 }, "Bw"},
		{"negative standard pressure", pts, func(p *HavlenaOdehParams) { p.Std.P = -1 }, "Std.P"},
		{"huge compressibility", pts, func(p *HavlenaOdehParams) { p.Cf = 1e-6 }, "P"},
		{"pressure above initial", func() []HistoryPoint {
			q := append([]HistoryPoint(nil), pts...)
			q[0].P = 1.01 * hRes.pi
			q[0].Z2 = zi0
			return q
		}(), func(*HavlenaOdehParams) {}, "P"},
	}
	for _, c := range hoCases {
		p := par
		c.par(&p)
		res, err := HavlenaOdeh(c.pts, hRes.pi, zi0, p, nil)
		var he *HistoryError
		if !errors.Is(err, ErrHistoryValue) || !errors.As(err, &he) || he.Field != c.field || res != nil {
			t.Errorf("HavlenaOdeh, %s: got %v, want ErrHistoryValue on field %s", c.name, err, c.field)
		}
	}
	if _, err := HavlenaOdeh(good[:2], pi, zi, par, nil); !errors.Is(err, ErrHistoryShort) {
		t.Errorf("HavlenaOdeh, two points: got %v, want ErrHistoryShort", err)
	}

	// Series of unequal length; a bad volumetric figure.
	if _, err := HistoryFromSeries([]float64{1, 2}, []float64{1}, []float64{1, 2}, nil); !errors.Is(err, ErrHistoryValue) {
		t.Errorf("HistoryFromSeries, unequal lengths: got %v, want ErrHistoryValue", err)
	}
	f, err := FitPZ(good, pi, zi, nil)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := f.CompareVolumetric(0); !errors.Is(err, ErrHistoryValue) {
		t.Errorf("CompareVolumetric(0): got %v, want ErrHistoryValue", err)
	}
}

// TestHistoryFromSeries: parallel series become points that FitPZ reads as
// hC10History's.
func TestHistoryFromSeries(t *testing.T) {
	t.Parallel()
	want := hC10History([]float64{10, 20, 30, 40})
	var p, z, g []float64
	for _, pt := range want {
		p, z, g = append(p, pt.P), append(z, pt.Z2), append(g, pt.CumWetGas)
	}
	got, err := HistoryFromSeries(p, z, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("point %d = %+v, want %+v", i, got[i], want[i])
		}
	}
	f, err := FitPZ(got, hC10.pi, hC10.zi, nil)
	if err != nil {
		t.Fatal(err)
	}
	if hRel(f.G, hC10.g) > 1e-9 {
		t.Errorf("G = %.12g Bscf, want 100 (METHODS C10)", f.G/hBcf)
	}
}

// ExampleFitPZ reads the gas in place off the p/Z line of METHODS C10
// (p_i = 5000 psia, Z_i = 1, G = 100 Bscf), given in SI.
func ExampleFitPZ() {
	const psi, bcf = 6894.757293168362, 1e9 * 0.028316846592 // Pa per psi; m³ per 10⁹ ft³
	pts := []HistoryPoint{                                   // p/Z = 4500, 4000, 3000 psia after 10, 20, 40 Bscf
		{P: 4500 * psi * 0.95, Z2: 0.95, CumWetGas: 10 * bcf},
		{P: 4000 * psi * 0.92, Z2: 0.92, CumWetGas: 20 * bcf},
		{P: 3000 * psi * 0.90, Z2: 0.90, CumWetGas: 40 * bcf},
	}
	f, err := FitPZ(pts, 5000*psi, 1.0, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("G = %.4g Bscf, R² = %.4g\n", f.G/bcf, f.R2)
	// Output: G = 100 Bscf, R² = 1
}

// TestHavlenaOdehPointBw: a history that satisfies the balance of hBalance
// exactly with a water formation volume factor that changes with pressure
// (invented: 1.00 + 0.01 per point) gives back G to round-off when each
// point carries its own B_w, and each point reports the B_w it used; with
// the one constant B_w of the parameters it does not.
func TestHavlenaOdehPointBw(t *testing.T) {
	t.Parallel()
	r := hRes
	par := HavlenaOdehParams{T: r.T, Sw: r.sw, Cw: r.cw, Cf: r.cf, Bw: r.bw, Std: r.std}
	bg := func(p float64) float64 { return hZ(p) * r.T * r.std.P / (p * r.std.T) }
	ce := (r.cw*r.sw + r.cf) / (1 - r.sw)
	pts := make([]HistoryPoint, len(hPressures))
	for i, p := range hPressures {
		bw := 1.0 + 0.01*float64(i)
		e := bg(p) - bg(r.pi) + bg(r.pi)*ce*(r.pi-p)
		gp := r.g * e / (bg(p) + 50*r.wgr*bw) // much water, so that B_w shows
		pts[i] = HistoryPoint{P: p, Z2: hZ(p), CumWetGas: gp, CumWater: 50 * r.wgr * gp, Bw: bw}
	}
	zi := hZ(r.pi)
	res, err := HavlenaOdeh(pts, r.pi, zi, par, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, hp := range res.Points {
		if hp.Bw != pts[i].Bw || hRel(hp.FOverE, r.g) > 1e-9 {
			t.Errorf("point %d: B_w %g (given %g), F/(Eg+Efw) = %.12g, want G = %.12g", i, hp.Bw, pts[i].Bw, hp.FOverE, r.g)
		}
	}
	for i := range pts {
		pts[i].Bw = 0
	}
	res, err = HavlenaOdeh(pts, r.pi, zi, par, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Points[0].Bw != r.bw || hRel(res.Points[len(pts)-1].FOverE, r.g) < 1e-4 {
		t.Errorf("one constant B_w: first point %g, last F/(Eg+Efw) %.8g of G; want the parameters' %g and a visible error", res.Points[0].Bw, res.Points[len(pts)-1].FOverE/r.g, r.bw)
	}
}
