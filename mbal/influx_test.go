package mbal

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// tTwoSided5 is the two-sided p-value of Student's t with 5 degrees of
// freedom in closed form: for odd ν, A(t|ν) = (2/π)(θ + sin θ (cos θ +
// (2/3) cos³ θ + …)), θ = arctan(t/√ν), the series ending at the
// cos^(ν−2) θ term (Abramowitz and Stegun 1964, Handbook of Mathematical
// Functions, 26.7.3); p = 1 − A.
func tTwoSided5(t float64) float64 {
	th := math.Atan(t / math.Sqrt(5))
	c := math.Cos(th)
	return 1 - 2/math.Pi*(th+math.Sin(th)*(c+2.0/3*c*c*c))
}

// TestInfluxStatistics checks the two tests of HavlenaOdeh on a noisy pot
// aquifer against least squares done here independently: the weighted
// regression of gonum's stat.LinearRegression for the trend of
// F/(E_g+E_fw) (weights (E_g+E_fw)²), the normal equations of the quadratic
// through the corrected p/Z points and the initial point for the curvature,
// each t statistic |b|/SE(b) with SE from the residual variance, and the
// p-values from the closed form of Student's t with 5 degrees of freedom
// (7 points less 2 parameters; 8 points less 3).
func TestInfluxStatistics(t *testing.T) {
	t.Parallel()
	pts, par := hBalance(hPot)
	eps := hNormals(len(pts), 17)
	for i := range pts {
		pts[i].P += 0.002 * hRes.pi * eps[i]
	}
	zi := hZ(hRes.pi)
	res, err := HavlenaOdeh(pts, hRes.pi, zi, par, nil)
	if err != nil {
		t.Fatal(err)
	}
	n := len(pts)
	v := res.Influx

	// The trend: F/(E_g+E_fw) against G_p, weights (E_g+E_fw)².
	x, y, w := make([]float64, n), make([]float64, n), make([]float64, n)
	for i, hp := range res.Points {
		e := hp.Eg + hp.Efw
		x[i], y[i], w[i] = pts[i].CumWetGas, hp.F/e, e*e
	}
	a, b := stat.LinearRegression(x, y, w, false)
	xm := stat.Mean(x, w)
	ss, sxx := 0.0, 0.0
	for i := range x {
		r := y[i] - a - b*x[i]
		ss += w[i] * r * r
		sxx += w[i] * (x[i] - xm) * (x[i] - xm)
	}
	tTrend := math.Abs(b) / math.Sqrt(ss/float64(n-2)/sxx)
	// Tolerances: 1e-11 relative for the fits, which differ only in
	// rounding (QR against normal equations on a well-scaled basis); 1e-9
	// for the p-values near 1e-5, where 1 − A(t|ν) cancels five digits.
	check := func(name string, got, want, tol float64) {
		t.Helper()
		if hRel(got, want) > tol {
			t.Errorf("%s = %.12g, want %.12g (independent least squares; Abramowitz and Stegun 26.7.3)", name, got, want)
		}
	}
	check("trend slope", v.Trend.Estimate, b, 1e-11)
	check("trend t", v.Trend.T, tTrend, 1e-11)
	check("trend p", v.Trend.P, tTwoSided5(tTrend), 1e-9)
	if v.Trend.DOF != 5 || res.TrendP != v.Trend.P || res.TrendChange != v.Trend.Change {
		t.Errorf("trend: DOF %d, want 5; p %g and change %g, want the result's %g and %g", v.Trend.DOF, v.Trend.P, v.Trend.Change, res.TrendP, res.TrendChange)
	}

	// The curvature: y = c0 + c1 x + c2 x² through (0, p_i/Z_i) and the
	// corrected points, by the normal equations on x scaled to [0, 1].
	xs := []float64{0}
	ys := []float64{hRes.pi / zi}
	for _, hp := range res.Points {
		xs = append(xs, hp.Abscissa)
		ys = append(ys, hp.CorrectedPZ)
	}
	xmax := xs[len(xs)-1]
	m := len(xs)
	X := mat.NewDense(m, 3, nil)
	for i, xv := range xs {
		u := xv / xmax
		X.SetRow(i, []float64{1, u, u * u})
	}
	var xtx, inv mat.Dense
	xtx.Mul(X.T(), X)
	if err := inv.Inverse(&xtx); err != nil {
		t.Fatal(err)
	}
	var xty, coef mat.VecDense
	xty.MulVec(X.T(), mat.NewVecDense(m, ys))
	coef.MulVec(&inv, &xty)
	ss = 0
	for i, u := range xs {
		u /= xmax
		r := ys[i] - coef.AtVec(0) - coef.AtVec(1)*u - coef.AtVec(2)*u*u
		ss += r * r
	}
	c2 := coef.AtVec(2) / (xmax * xmax)
	se := math.Sqrt(ss/float64(m-3)*inv.At(2, 2)) / (xmax * xmax)
	check("curvature", v.Curvature.Estimate, c2, 1e-11)
	check("curvature t", v.Curvature.T, math.Abs(c2)/se, 1e-11)
	check("curvature p", v.Curvature.P, tTwoSided5(math.Abs(c2)/se), 1e-9)
	if v.Curvature.DOF != 5 || v.Curvature.P != res.Line.CurvatureP || v.Curvature.T != res.Line.CurvatureT {
		t.Errorf("curvature: DOF %d, want 5; p %g, t %g, want Line's %g, %g", v.Curvature.DOF, v.Curvature.P, v.Curvature.T, res.Line.CurvatureP, res.Line.CurvatureT)
	}

	// The corrected points are (p/Z₂)(1 − c_e(p_i − p)) against
	// G_p + W_p B_w/B_g (METHODS 9.2).
	ce := (hRes.cw*hRes.sw + hRes.cf) / (1 - hRes.sw)
	for i, hp := range res.Points {
		pt := pts[i]
		check("corrected p/Z", hp.CorrectedPZ, pt.P/pt.Z2*(1-ce*(hRes.pi-pt.P)), 1e-14)
		check("abscissa", hp.Abscissa, pt.CumWetGas+pt.CumWater*hp.Bw/hp.Bg, 1e-14)
	}
	conf := DefaultConfidence
	if v.Alpha != (1-conf)/2 || v.Materiality != InfluxMateriality {
		t.Errorf("alpha %g, materiality %g; want (1 − %g)/2 and %g (documented)", v.Alpha, v.Materiality, DefaultConfidence, InfluxMateriality)
	}
}

// TestInfluxVerdict: the outcome from the two tests, as HavlenaOdeh's
// documentation states it (METHODS 9.2, 9.3): a rising F/(E_g+E_fw) or a
// flattening line is influx growing with time, a falling one or a
// steepening line support that fades; a test counts only when significant
// and material; two that count in opposite directions conflict.
func TestInfluxVerdict(t *testing.T) {
	t.Parallel()
	const alpha = 0.025
	test := func(est, p, change float64) InfluxTest {
		return InfluxTest{Estimate: est, P: p, Change: change, Significant: p < alpha, Material: math.Abs(change) >= InfluxMateriality}
	}
	quiet := test(0.001, 0.6, 0.0005)
	for _, c := range []struct {
		name             string
		trend, curvature InfluxTest
		want             InfluxOutcome
		triggered        InfluxTests
	}{
		{"neither significant", quiet, quiet, NoInflux, 0},
		{"trend significant, immaterial", test(-0.01, 1e-10, -0.007), quiet, NoInflux, 0},
		{"trend material, not significant", test(0.3, 0.08, 0.2), quiet, NoInflux, 0},
		{"trend rises", test(0.3, 1e-4, 0.2), quiet, GrowingInflux, TrendTest},
		{"trend falls", test(-0.3, 1e-4, -0.2), quiet, FadingSupport, TrendTest},
		{"line flattens", quiet, test(2e-30, 1e-8, 0.19), GrowingInflux, CurvatureTest},
		{"line steepens", quiet, test(-2e-30, 1e-8, -0.05), FadingSupport, CurvatureTest},
		{"both rising", test(0.3, 1e-4, 0.2), test(2e-30, 1e-8, 0.19), GrowingInflux, TrendTest | CurvatureTest},
		{"both falling", test(-0.3, 1e-4, -0.2), test(-2e-30, 1e-8, -0.05), FadingSupport, TrendTest | CurvatureTest},
		{"opposite directions", test(0.3, 1e-4, 0.2), test(-2e-30, 1e-8, -0.05), ConflictingTests, TrendTest | CurvatureTest},
		{"immaterial curvature against a rising trend", test(0.3, 1e-4, 0.2), test(-2e-30, 1e-8, -0.001), GrowingInflux, TrendTest},
	} {
		v := influxVerdict(c.trend, c.curvature, alpha)
		if v.Outcome != c.want || v.Triggered != c.triggered {
			t.Errorf("%s: outcome %v, triggered %b; want %v, %b", c.name, v.Outcome, v.Triggered, c.want, c.triggered)
		}
	}
}
