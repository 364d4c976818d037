package cvd

import (
	"bufio"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Tests of Regress. Each check names its source beside it: NIST's certified
// values (testdata/), gonum's linear algebra, closed forms, identities.

// readXY reads a testdata file of the form "y x" per line, '#' lines being
// its header.
func readXY(t testing.TB, name string) (y, x []float64) {
	t.Helper()
	file, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	defer file.Close()
	sc := bufio.NewScanner(file)
	for line := 1; sc.Scan(); line++ {
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		fields := strings.Fields(text)
		if len(fields) != 2 {
			t.Fatalf("%s:%d: want 2 fields, got %q", name, line, text)
		}
		yv, err1 := strconv.ParseFloat(fields[0], 64)
		xv, err2 := strconv.ParseFloat(fields[1], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s:%d: %q is not two numbers", name, line, text)
		}
		y, x = append(y, yv), append(x, xv)
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return y, x
}

// relClose reports whether got is within rel of want, relatively.
func relClose(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// checkFinite fails when any float of the result is NaN or infinite
// (identity: "no field holds a NaN").
func checkFinite(t *testing.T, res *RegressResult) {
	t.Helper()
	var bad []string
	check := func(name string, v float64) {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			bad = append(bad, fmt.Sprintf("%s = %g", name, v))
		}
	}
	check("Objective0", res.Objective0)
	check("Objective", res.Objective)
	check("RCond", res.RCond)
	for i, v := range res.X {
		check(fmt.Sprintf("X[%d]", i), v)
	}
	for i, v := range res.Residuals {
		check(fmt.Sprintf("Residuals[%d]", i), v)
	}
	for i, v := range res.History {
		check(fmt.Sprintf("History[%d]", i), v)
	}
	for i, v := range res.StdErr {
		check(fmt.Sprintf("StdErr[%d]", i), v)
	}
	for i := range res.Covariance {
		for j := range res.Covariance[i] {
			check(fmt.Sprintf("Covariance[%d][%d]", i, j), res.Covariance[i][j])
			check(fmt.Sprintf("Correlation[%d][%d]", i, j), res.Correlation[i][j])
		}
	}
	if len(bad) > 0 {
		t.Errorf("not finite: %s", strings.Join(bad, ", "))
	}
}

// checkHistory checks identities of any result: the history starts at
// Objective0, never rises, has Iterations+1 entries and ends at or above
// Objective; the residuals give Objective.
func checkHistory(t *testing.T, res *RegressResult) {
	t.Helper()
	if len(res.History) != res.Iterations+1 {
		t.Errorf("%d history entries for %d iterations, want %d", len(res.History), res.Iterations, res.Iterations+1)
	}
	if len(res.History) > 0 && res.History[0] != res.Objective0 {
		t.Errorf("History[0] = %g, want Objective0 = %g", res.History[0], res.Objective0)
	}
	for k := 1; k < len(res.History); k++ {
		if res.History[k] > res.History[k-1] {
			t.Errorf("History[%d] = %g rises above History[%d] = %g", k, res.History[k], k-1, res.History[k-1])
		}
	}
	if last := res.History[len(res.History)-1]; res.Objective > last {
		t.Errorf("Objective = %g above the last of History %g", res.Objective, last)
	}
	var sum float64
	for _, r := range res.Residuals {
		sum += r * r
	}
	if !relClose(sum, res.Objective, 1e-14) {
		t.Errorf("Σ r² of Residuals = %.17g, Objective = %.17g", sum, res.Objective)
	}
}

// line returns the residuals of a straight line y = b0 + b1 x.
func line(y, x []float64) func(b, r []float64) error {
	return func(b, r []float64) error {
		for i := range y {
			r[i] = y[i] - (b[0] + b[1]*x[i])
		}
		return nil
	}
}

// Norris: a straight line with NIST's certified estimates and standard
// deviations, and the textbook closed forms for the correlation.
func TestRegressNorrisLine(t *testing.T) {
	y, x := readXY(t, "norris.txt")
	// Certified values, NIST StRD Norris (testdata/norris.txt header).
	const (
		b0, se0 = -0.262323073774029, 0.232818234301152
		b1, se1 = 1.00211681802045, 0.429796848199937e-03
		rss     = 26.6173985294224
	)
	// The closed-form straight-line fit first, so that the data file is
	// checked against the certified values on its own: b1 = Sxy/Sxx,
	// b0 = ȳ − b1 x̄, se(b1) = s/√Sxx, se(b0) = s √(Σx²/(n Sxx)),
	// corr(b0, b1) = −x̄/√(Σx²/n) (any regression textbook, e.g. Draper, N.R.
	// and Smith, H. (1998), Applied Regression Analysis, 3rd ed., Wiley,
	// ch. 1 and 3; from memory).
	n := float64(len(y))
	var mx, my, sxx, sxy, sx2 float64
	for i := range y {
		mx += x[i] / n
		my += y[i] / n
	}
	for i := range y {
		sxx += (x[i] - mx) * (x[i] - mx)
		sxy += (x[i] - mx) * (y[i] - my)
		sx2 += x[i] * x[i]
	}
	cb1 := sxy / sxx
	cb0 := my - cb1*mx
	var crss float64
	for i := range y {
		e := y[i] - cb0 - cb1*x[i]
		crss += e * e
	}
	s := math.Sqrt(crss / (n - 2))
	cse0, cse1 := s*math.Sqrt(sx2/(n*sxx)), s/math.Sqrt(sxx)
	corr := -mx / math.Sqrt(sx2/n)
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"B0", cb0, b0}, {"B1", cb1, b1}, {"se(B0)", cse0, se0}, {"se(B1)", cse1, se1}, {"RSS", crss, rss}} {
		if !relClose(c.got, c.want, 1e-10) { // certified to 15 digits; 1e-10 allows the sums' round-off
			t.Fatalf("closed form on norris.txt: %s = %.15g, certified %.15g: the data file is wrong", c.name, c.got, c.want)
		}
	}

	f := line(y, x)
	lo, hi := []float64{-10, 0}, []float64{10, 2}
	x0 := []float64{1, 0.5}
	// Tight tolerances: the fit to the certified digits. A linear problem's
	// central differences are exact up to round-off, so the standard errors
	// too.
	tight := &RegressSettings{ObjectiveTol: 1e-15, StepTol: 1e-15}
	res, err := Regress(f, len(y), x0, lo, hi, tight)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if !res.Stop.Converged() || !res.StdErrKnown {
		t.Fatalf("stop %v, standard errors known %v", res.Stop, res.StdErrKnown)
	}
	for _, c := range []struct {
		name      string
		got, want float64
		rel       float64
	}{
		{"B0", res.X[0], b0, 1e-8}, // B0 is 1.1 of its standard error: its digits are weak
		{"B1", res.X[1], b1, 1e-11},
		{"se(B0)", res.StdErr[0], se0, 1e-8},
		{"se(B1)", res.StdErr[1], se1, 1e-8},
		{"RSS", res.Objective, rss, 1e-12},
		{"corr(B0,B1)", res.Correlation[0][1], corr, 1e-8},
		{"corr(B1,B0)", res.Correlation[1][0], corr, 1e-8},
	} {
		if !relClose(c.got, c.want, c.rel) {
			t.Errorf("Norris: %s = %.15g, want %.15g within %g (NIST StRD certified; correlation closed form)", c.name, c.got, c.want, c.rel)
		}
	}
	if res.DegreesOfFreedom != 34 { // NIST: 34 residual degrees of freedom
		t.Errorf("degrees of freedom %d, want 34", res.DegreesOfFreedom)
	}

	// Defaults: an objective tolerance of 1e-6 leaves the parameters within
	// about √(1e-6 (m − n)) ≈ 0.006 standard errors of the optimum (the
	// remaining reduction ΔF = δᵀJᵀJδ against s² = F/(m − n)); 0.02 allows
	// a factor 3.
	res, err = Regress(f, len(y), x0, lo, hi, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	if math.Abs(res.X[0]-b0) > 0.02*se0 || math.Abs(res.X[1]-b1) > 0.02*se1 {
		t.Errorf("Norris with defaults: B = %.10g, want (%.10g, %.10g) within 0.02 standard errors", res.X, b0, b1)
	}
}

// A linear least-squares problem in three parameters against gonum's QR
// solution and its (AᵀA)⁻¹ s².
func TestRegressLinearAgainstMat(t *testing.T) {
	// An invented design: a quadratic in t with a sine term, and invented
	// data; any full-rank problem serves.
	const m, n = 12, 3
	a := mat.NewDense(m, n, nil)
	b := mat.NewVecDense(m, nil)
	for i := range m {
		ti := float64(i) / 2
		a.Set(i, 0, 1)
		a.Set(i, 1, ti)
		a.Set(i, 2, ti*ti)
		b.SetVec(i, 2-0.7*ti+0.05*ti*ti+0.1*math.Sin(3*ti))
	}
	var want mat.VecDense
	if err := want.SolveVec(a, b); err != nil { // QR for a tall matrix
		t.Fatal(err)
	}
	var resid mat.VecDense
	resid.MulVec(a, &want)
	resid.SubVec(&resid, b)
	s2 := mat.Dot(&resid, &resid) / (m - n)
	var ata, cov mat.Dense
	ata.Mul(a.T(), a)
	if err := cov.Inverse(&ata); err != nil {
		t.Fatal(err)
	}
	cov.Scale(s2, &cov)

	f := func(x, r []float64) error {
		for i := range m {
			r[i] = -b.AtVec(i)
			for j := range n {
				r[i] += a.At(i, j) * x[j]
			}
		}
		return nil
	}
	res, err := Regress(f, m, []float64{0, 0, 0}, []float64{-10, -10, -10}, []float64{10, 10, 10},
		&RegressSettings{ObjectiveTol: 1e-15, StepTol: 1e-15})
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if !res.StdErrKnown {
		t.Fatal("standard errors unknown")
	}
	// Tolerances: the solution to 1e-9 of its scale (converged to round-off,
	// the problem's condition about 1e3); the covariance from central
	// differences, exact for linear residuals up to round-off: 1e-8.
	for j := range n {
		if math.Abs(res.X[j]-want.AtVec(j)) > 1e-9*(1+math.Abs(want.AtVec(j))) {
			t.Errorf("x[%d] = %.15g, want %.15g (gonum mat QR solve)", j, res.X[j], want.AtVec(j))
		}
		for k := range n {
			c := cov.At(j, k)
			if !relClose(res.Covariance[j][k], c, 1e-8) {
				t.Errorf("covariance[%d][%d] = %.12g, want %.12g (gonum mat: s²(AᵀA)⁻¹)", j, k, res.Covariance[j][k], c)
			}
			r := c / math.Sqrt(cov.At(j, j)*cov.At(k, k))
			if math.Abs(res.Correlation[j][k]-r) > 1e-8 {
				t.Errorf("correlation[%d][%d] = %.12g, want %.12g (gonum mat)", j, k, res.Correlation[j][k], r)
			}
		}
		if se := math.Sqrt(cov.At(j, j)); !relClose(res.StdErr[j], se, 1e-8) {
			t.Errorf("standard error %d = %.12g, want %.12g (gonum mat)", j, res.StdErr[j], se)
		}
	}
}

// misra1a returns the residuals of NIST's Misra1a model.
func misra1a(t testing.TB) (f func(b, r []float64) error, m int) {
	y, x := readXY(t, "misra1a.txt")
	return func(b, r []float64) error {
		for i := range y {
			r[i] = y[i] - b[0]*(1-math.Exp(-b[1]*x[i]))
		}
		return nil
	}, len(y)
}

// Misra1a from both of NIST's starts, against the certified values.
func TestRegressMisra1a(t *testing.T) {
	f, m := misra1a(t)
	// Certified values, NIST StRD Misra1a (testdata/misra1a.txt header).
	const (
		b1, se1 = 2.3894212918e+02, 2.7070075241e+00
		b2, se2 = 5.5015643181e-04, 7.2668688436e-06
		rss     = 1.2455138894e-01
	)
	lo, hi := []float64{0, 0}, []float64{1000, 0.01}
	for _, start := range [][]float64{{500, 1e-4}, {250, 5e-4}} { // NIST start 1 and start 2
		t.Run(fmt.Sprint(start), func(t *testing.T) {
			// Tight tolerances: the parameters to 1e-7 (certified to 11
			// digits; the search stops within about 1e-8 of them) and the
			// standard errors to 1e-5 (the central differences of step 1e-4
			// of the range err by about h² times the curvature: 6e-7 here).
			res, err := Regress(f, m, start, lo, hi, &RegressSettings{ObjectiveTol: 1e-14, StepTol: 1e-14})
			if err != nil {
				t.Fatal(err)
			}
			checkFinite(t, res)
			checkHistory(t, res)
			if !res.Stop.Converged() || !res.StdErrKnown {
				t.Fatalf("stop %v, standard errors known %v", res.Stop, res.StdErrKnown)
			}
			if len(res.Methods) != 1 || res.Methods[0] != LevenbergMarquardt {
				t.Errorf("methods %v, want Levenberg-Marquardt alone on a smooth problem", res.Methods)
			}
			for _, c := range []struct {
				name      string
				got, want float64
				rel       float64
			}{
				{"b1", res.X[0], b1, 1e-7}, {"b2", res.X[1], b2, 1e-7},
				{"se(b1)", res.StdErr[0], se1, 1e-5}, {"se(b2)", res.StdErr[1], se2, 1e-5},
				{"RSS", res.Objective, rss, 1e-9}, // certified to 11 digits
			} {
				if !relClose(c.got, c.want, c.rel) {
					t.Errorf("Misra1a: %s = %.11g, want %.11g within %g (NIST StRD certified)", c.name, c.got, c.want, c.rel)
				}
			}
			// Defaults: within 0.02 standard errors (see the Norris test for
			// the argument) and the standard errors to 1e-3.
			res, err = Regress(f, m, start, lo, hi, nil)
			if err != nil {
				t.Fatal(err)
			}
			checkFinite(t, res)
			if !res.Stop.Converged() {
				t.Errorf("defaults: stop %v", res.Stop)
			}
			if math.Abs(res.X[0]-b1) > 0.02*se1 || math.Abs(res.X[1]-b2) > 0.02*se2 {
				t.Errorf("Misra1a with defaults: b = %.8g, want (%.8g, %.8g) within 0.02 standard errors", res.X, b1, b2)
			}
			if !relClose(res.StdErr[0], se1, 1e-3) || !relClose(res.StdErr[1], se2, 1e-3) {
				t.Errorf("Misra1a with defaults: se = %.6g, want (%.6g, %.6g) within 1e-3", res.StdErr, se1, se2)
			}
		})
	}
}

// rosenbrock is Rosenbrock's function as residuals, 10(x2 − x1²) and
// 1 − x1: the minimum is 0 at (1, 1) (Rosenbrock, H.H. (1960), Computer
// Journal 3(3), 175–184; the start (−1.2, 1) as in Moré, Garbow and
// Hillstrom (1981), ACM TOMS 7(1), 17–41, problem 1; from memory).
func rosenbrock(x, r []float64) error {
	r[0] = 10 * (x[1] - x[0]*x[0])
	r[1] = 1 - x[0]
	return nil
}

func TestRegressRosenbrock(t *testing.T) {
	res, err := Regress(rosenbrock, 2, []float64{-1.2, 1}, []float64{-5, -5}, []float64{5, 5}, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if !res.Stop.Converged() {
		t.Errorf("stop %v, want converged", res.Stop)
	}
	// The step tolerance 1e-8 of a range of 10: 1e-7 in x; 1e-6 allows for
	// the last step's size.
	if math.Abs(res.X[0]-1) > 1e-6 || math.Abs(res.X[1]-1) > 1e-6 {
		t.Errorf("Rosenbrock: x = %v, want (1, 1) (closed form)", res.X)
	}
	if res.Objective > 1e-12 {
		t.Errorf("Rosenbrock: objective %g, want 0", res.Objective)
	}
	// m = n: no degrees of freedom, the standard errors unknown.
	if res.StdErrKnown || res.StdErr != nil || res.Correlation != nil || res.DegreesOfFreedom != 0 {
		t.Errorf("m = n: standard errors known %v (%v), degrees of freedom %d; want unknown, nil, 0", res.StdErrKnown, res.StdErr, res.DegreesOfFreedom)
	}
}

// A slope held below its unconstrained value: the fit ends at the bound,
// flagged, and the intercept is the closed-form optimum given that slope,
// ȳ − b1 x̄, with the standard error of a mean, s/√m, s² = F/(m − 1).
func TestRegressAtBound(t *testing.T) {
	y, x := readXY(t, "norris.txt") // unconstrained slope 1.0021 (NIST)
	const cap = 0.99
	f := line(y, x)
	res, err := Regress(f, len(y), []float64{1, 0.5}, []float64{-10, 0}, []float64{10, cap}, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if want := []BoundState{InsideBounds, AtUpperBound}; !reflect.DeepEqual(res.AtBound, want) {
		t.Fatalf("at bound %v, want %v", res.AtBound, want)
	}
	if res.X[1] != cap {
		t.Errorf("slope %.17g, want exactly the bound %g (projection)", res.X[1], cap)
	}
	m := float64(len(y))
	var a float64
	for i := range y {
		a += (y[i] - cap*x[i]) / m
	}
	var rss float64
	for i := range y {
		e := y[i] - a - cap*x[i]
		rss += e * e
	}
	se := math.Sqrt(rss/(m-1)) / math.Sqrt(m)
	// The default tolerance leaves the intercept within ~0.006 standard
	// errors (see the Norris test); the standard error depends on it only
	// through F, to second order.
	if math.Abs(res.X[0]-a) > 0.02*se {
		t.Errorf("intercept %.10g, want %.10g within 0.02 standard errors (closed form)", res.X[0], a)
	}
	if !res.StdErrKnown || !relClose(res.StdErr[0], se, 1e-6) || res.StdErr[1] != 0 {
		t.Errorf("standard errors %v (known %v), want (%.8g, 0) (closed form, the slope held)", res.StdErr, res.StdErrKnown, se)
	}
	if res.DegreesOfFreedom != len(y)-1 {
		t.Errorf("degrees of freedom %d, want %d: one free parameter", res.DegreesOfFreedom, len(y)-1)
	}
	if res.Correlation[0][0] != 1 || res.Correlation[0][1] != 0 || res.Correlation[1][1] != 0 {
		t.Errorf("correlation %v, want [[1 0] [0 0]]: the held slope has a zero row and column", res.Correlation)
	}
	// A lower bound, the same way: a slope of at least 1.01.
	res, err = Regress(f, len(y), []float64{1, 1.5}, []float64{-10, 1.01}, []float64{10, 2}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.AtBound[1] != AtLowerBound || res.X[1] != 1.01 {
		t.Errorf("slope %.17g (%v), want the lower bound 1.01", res.X[1], res.AtBound[1])
	}
}

// Evaluations fail in part of the domain (as when no saturation point is
// found there): the search goes around it and still finds the minimum.
func TestRegressFailingRegion(t *testing.T) {
	errNoSat := errors.New("no saturation point")
	calls, failures := 0, 0
	f := func(x, r []float64) error {
		calls++
		// Levenberg–Marquardt's first step from (−1.2, 1) lands at
		// x2 ≈ −1.13 (seen in a trace): this region makes it fail.
		if x[1] < -0.5 || (x[0] > 1.5 && x[1] > 1.5) {
			failures++
			return errNoSat
		}
		return rosenbrock(x, r)
	}
	res, err := Regress(f, 2, []float64{-1.2, 1}, []float64{-5, -5}, []float64{5, 5}, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if res.FailedEvaluations == 0 {
		t.Error("no failed evaluation: the test no longer exercises the failing region")
	}
	if res.Evaluations != calls || res.FailedEvaluations != failures {
		t.Errorf("counted %d evaluations, %d failed; the function saw %d, %d (identity)", res.Evaluations, res.FailedEvaluations, calls, failures)
	}
	if math.Abs(res.X[0]-1) > 1e-6 || math.Abs(res.X[1]-1) > 1e-6 || !res.Stop.Converged() {
		t.Errorf("x = %v (%v), want (1, 1) (closed form)", res.X, res.Stop)
	}

	// A residual that is NaN counts as a failure too.
	res, err = Regress(func(x, r []float64) error {
		if err := rosenbrock(x, r); err != nil {
			return err
		}
		if x[1] < -0.5 {
			r[0] = math.NaN()
		}
		return nil
	}, 2, []float64{-1.2, 1}, []float64{-5, -5}, []float64{5, 5}, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	if res.FailedEvaluations == 0 || math.Abs(res.X[0]-1) > 1e-6 {
		t.Errorf("NaN residuals: %d failed, x = %v; want some failed and (1, 1)", res.FailedEvaluations, res.X)
	}
}

// Two parameters that enter only as their sum: the minimum is found, the
// standard errors are unknown, nothing is NaN.
func TestRegressRankDeficient(t *testing.T) {
	// Invented data: a decay with rate near 1 and small deviations.
	const m = 10
	ts, ys := make([]float64, m), make([]float64, m)
	for i := range m {
		ts[i] = 0.3 * float64(i)
		ys[i] = math.Exp(-ts[i]) * (1 + 0.01*math.Sin(float64(3*i)))
	}
	sum := func(x, r []float64) error {
		for i := range m {
			r[i] = math.Exp(-(x[0]+x[1])*ts[i]) - ys[i]
		}
		return nil
	}
	res, err := Regress(sum, m, []float64{0.2, 0.3}, []float64{0, 0}, []float64{2, 2}, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if res.StdErrKnown || res.StdErr != nil || res.Covariance != nil || res.Correlation != nil {
		t.Errorf("standard errors known %v (%v), want unknown and nil for a rank-deficient Jacobian", res.StdErrKnown, res.StdErr)
	}
	if res.RCond >= RankTolerance {
		t.Errorf("RCond %g, want below %g", res.RCond, RankTolerance)
	}
	// The same fit in the sum alone (a round trip through Regress on a
	// well-posed problem): the rank-deficient search must reach its
	// objective and its rate.
	one, err := Regress(func(k, r []float64) error { return sum([]float64{k[0], 0}, r) }, m,
		[]float64{0.5}, []float64{0}, []float64{4}, &RegressSettings{ObjectiveTol: 1e-14, StepTol: 1e-14})
	if err != nil {
		t.Fatal(err)
	}
	if !one.StdErrKnown {
		t.Fatal("the one-parameter fit has unknown standard errors")
	}
	// Default tolerance: within 0.02 standard errors of the sum, the
	// objective within 1e-6 relative.
	if d := math.Abs(res.X[0] + res.X[1] - one.X[0]); d > 0.02*one.StdErr[0] {
		t.Errorf("a + b = %.10g, want %.10g within 0.02 standard errors (%g)", res.X[0]+res.X[1], one.X[0], one.StdErr[0])
	}
	if !relClose(res.Objective, one.Objective, 1e-6) {
		t.Errorf("objective %.10g, want %.10g", res.Objective, one.Objective)
	}
}

// A Jacobian swamped by noise: deterministic noise of 1e-2 in the residuals
// changes within the difference step (1e-4 of the range), so the forward
// and central differences err by ±100 against derivatives of 3 to 10.
// Levenberg–Marquardt stalls; Nelder–Mead takes over and reaches the
// minimum to the noise.
func TestRegressFallback(t *testing.T) {
	noisy := func(x, r []float64) error {
		e := 1e-2 * math.Sin(1e6*x[0]+3e6*x[1])
		r[0] = 10*(x[0]-0.3) + e
		r[1] = 10*(x[1]-0.7) - e
		r[2] = 3*(x[0]-0.3) + e
		return nil
	}
	x0, lo, hi := []float64{0.9, 0.1}, []float64{0, 0}, []float64{1, 1}
	res, err := Regress(noisy, 3, x0, lo, hi, &RegressSettings{MaxIterations: 300})
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if want := []RegressMethod{LevenbergMarquardt, NelderMead}; !reflect.DeepEqual(res.Methods, want) || res.Fallback == "" {
		t.Fatalf("methods %v (%q), want %v and a reason", res.Methods, res.Fallback, want)
	}
	// Noise of 1e-2 in residuals of slope 10: the minimum is blurred by
	// about 1e-3; 1e-2 allows for the simplex's own tolerance.
	if math.Abs(res.X[0]-0.3) > 1e-2 || math.Abs(res.X[1]-0.7) > 1e-2 {
		t.Errorf("x = %v, want (0.3, 0.7) within 1e-2 (construction)", res.X)
	}
	// Without the fallback the search says it could not go on.
	res, err = Regress(noisy, 3, x0, lo, hi, &RegressSettings{NoFallback: true})
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	if res.Stop != StopNoProgress || res.Stop.Converged() || len(res.Methods) != 1 || res.Fallback == "" {
		t.Errorf("no fallback: stop %v, methods %v (%q); want %v with Levenberg-Marquardt alone, and why", res.Stop, res.Methods, res.Fallback, StopNoProgress)
	}
}

// The stop reasons of the limits and of convergence, in words.
func TestRegressStops(t *testing.T) {
	start, lo, hi := []float64{-1.2, 1}, []float64{-5, -5}, []float64{5, 5}
	res, err := Regress(rosenbrock, 2, start, lo, hi, &RegressSettings{MaxIterations: 3})
	if err != nil {
		t.Fatal(err)
	}
	checkHistory(t, res)
	if res.Stop != StopIterationLimit || res.Stop.Converged() || res.Iterations != 3 {
		t.Errorf("iteration limit: stop %v after %d iterations, want %v after 3", res.Stop, res.Iterations, StopIterationLimit)
	}
	calls := 0
	counted := func(x, r []float64) error { calls++; return rosenbrock(x, r) }
	res, err = Regress(counted, 2, start, lo, hi, &RegressSettings{MaxEvaluations: 7})
	if err != nil {
		t.Fatal(err)
	}
	checkHistory(t, res)
	// m = n: no standard errors, so no evaluations beyond the limit.
	if res.Stop != StopEvaluationLimit || res.Stop.Converged() || res.Evaluations != 7 || calls != 7 {
		t.Errorf("evaluation limit: stop %v after %d evaluations (%d calls), want %v after 7", res.Stop, res.Evaluations, calls, StopEvaluationLimit)
	}
	f, m := misra1a(t)
	res, err = Regress(f, m, []float64{500, 1e-4}, []float64{0, 0}, []float64{1000, 0.01}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Stop.Converged() {
		t.Errorf("Misra1a: stop %v, want converged", res.Stop)
	}
	for _, c := range []struct {
		s    RegressStop
		want string
		conv bool
	}{
		{StopObjectiveChange, "objective change below tolerance", true},
		{StopSmallStep, "step below tolerance", true},
		{StopZeroObjective, "objective is zero", true},
		{StopIterationLimit, "iteration limit reached", false},
		{StopEvaluationLimit, "evaluation limit reached", false},
		{StopNoProgress, "no step reduces the objective", false},
	} {
		if c.s.String() != c.want || c.s.Converged() != c.conv {
			t.Errorf("%d: %q, converged %v; want %q, %v", int(c.s), c.s, c.s.Converged(), c.want, c.conv)
		}
	}
	// A start at the exact minimum stops at once.
	res, err = Regress(rosenbrock, 2, []float64{1, 1}, lo, hi, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Stop != StopZeroObjective || res.Evaluations != 1 || res.Iterations != 0 {
		t.Errorf("start at the minimum: stop %v after %d evaluations, %d iterations; want %v, 1, 0", res.Stop, res.Evaluations, res.Iterations, StopZeroObjective)
	}
}

// The progress callback sees the start and every iteration, as History; the
// evaluation count is the function's; no point is evaluated twice.
func TestRegressProgressAndCounts(t *testing.T) {
	f, m := misra1a(t)
	seen := map[[2]float64]int{}
	calls := 0
	g := func(x, r []float64) error {
		calls++
		seen[[2]float64{x[0], x[1]}]++
		err := f(x, r)
		x[0] = math.NaN() // f may not keep or change x; Regress gives it a copy
		return err
	}
	var iters []int
	var objs []float64
	var xs [][]float64
	set := &RegressSettings{Progress: func(it int, obj float64, x []float64) {
		iters, objs, xs = append(iters, it), append(objs, obj), append(xs, x)
	}}
	res, err := Regress(g, m, []float64{250, 5e-4}, []float64{0, 0}, []float64{1000, 0.01}, set)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, res)
	checkHistory(t, res)
	if len(iters) != res.Iterations+1 {
		t.Fatalf("progress called %d times for %d iterations, want %d", len(iters), res.Iterations, res.Iterations+1)
	}
	for k := range iters {
		if iters[k] != k || objs[k] != res.History[k] {
			t.Errorf("progress call %d: iteration %d, objective %g; want %d, %g (History)", k, iters[k], objs[k], k, res.History[k])
		}
	}
	if last := xs[len(xs)-1]; !reflect.DeepEqual(last, res.X) {
		t.Errorf("last progress x %v, want the result's %v", last, res.X)
	}
	if calls != res.Evaluations {
		t.Errorf("the function was called %d times, Evaluations = %d", calls, res.Evaluations)
	}
	for p, k := range seen {
		if k > 1 {
			t.Errorf("point %v evaluated %d times, want once", p, k)
		}
	}
}

func TestRegressBadInput(t *testing.T) {
	ok := func(x, r []float64) error { r[0] = x[0]; return nil }
	one, lo, hi := []float64{0.5}, []float64{0}, []float64{1}
	for _, c := range []struct {
		name       string
		f          func(x, r []float64) error
		m          int
		x0, lo, hi []float64
		s          *RegressSettings
		want       string // in the message
	}{
		{"no function", nil, 1, one, lo, hi, nil, "no residual function"},
		{"no residuals", ok, 0, one, lo, hi, nil, "0 residuals"},
		{"no parameters", ok, 1, nil, nil, nil, nil, "no parameters"},
		{"short bounds", ok, 1, one, nil, hi, nil, "lower"},
		{"bounds reversed", ok, 1, one, []float64{1}, []float64{0}, nil, "not below its upper bound"},
		{"bounds equal", ok, 1, one, []float64{0.5}, []float64{0.5}, nil, "not below its upper bound"},
		{"infinite bound", ok, 1, one, lo, []float64{math.Inf(1)}, nil, "must be finite"},
		{"NaN bound", ok, 1, one, []float64{math.NaN()}, hi, nil, "must be finite"},
		{"start outside", ok, 1, []float64{2}, lo, hi, nil, "outside its bounds"},
		{"start NaN", ok, 1, []float64{math.NaN()}, lo, hi, nil, "outside its bounds"},
		{"tolerance", ok, 1, one, lo, hi, &RegressSettings{ObjectiveTol: 2}, "objective tolerance"},
		{"step", ok, 1, one, lo, hi, &RegressSettings{StepTol: -1}, "step tolerance"},
		{"fd step", ok, 1, one, lo, hi, &RegressSettings{FDStep: 0.5}, "finite-difference step"},
		{"bound tolerance", ok, 1, one, lo, hi, &RegressSettings{BoundTolerance: -1e-6}, "bound tolerance"},
		{"iterations", ok, 1, one, lo, hi, &RegressSettings{MaxIterations: -1}, "iteration limit"},
		{"evaluations", ok, 1, one, lo, hi, &RegressSettings{MaxEvaluations: -3}, "evaluation limit"},
	} {
		res, err := Regress(c.f, c.m, c.x0, c.lo, c.hi, c.s)
		if !errors.Is(err, ErrBadRegression) || res != nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v (result %v), want ErrBadRegression saying %q", c.name, err, res, c.want)
		}
	}
	// The start must evaluate.
	errModel := errors.New("no saturation point")
	_, err := Regress(func(x, r []float64) error { return errModel }, 1, one, lo, hi, nil)
	if !errors.Is(err, ErrStartNotEvaluated) || !errors.Is(err, errModel) {
		t.Errorf("failing start: %v, want ErrStartNotEvaluated wrapping the model's error", err)
	}
	_, err = Regress(func(x, r []float64) error { r[0] = math.Inf(1); return nil }, 1, one, lo, hi, nil)
	if !errors.Is(err, ErrStartNotEvaluated) {
		t.Errorf("infinite residual at the start: %v, want ErrStartNotEvaluated", err)
	}
}

// ExampleRegress fits a straight line to five invented points.
func ExampleRegress() {
	ts := []float64{0, 1, 2, 3, 4}
	ys := []float64{1.1, 2.9, 5.2, 6.8, 9.1}
	res, err := Regress(func(b, r []float64) error {
		for i := range ts {
			r[i] = ys[i] - (b[0] + b[1]*ts[i])
		}
		return nil
	}, len(ts), []float64{0, 1}, []float64{-10, 0}, []float64{10, 5}, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("intercept %.3g ± %.2g, slope %.3g ± %.2g; %s\n",
		res.X[0], res.StdErr[0], res.X[1], res.StdErr[1], res.Stop)
	// Output: intercept 1.04 ± 0.15, slope 1.99 ± 0.06; objective change below tolerance
}

// BenchmarkRegressMisra1a: NIST's Misra1a from start 1 with the defaults;
// the cost of the engine itself, the residuals being cheap.
func BenchmarkRegressMisra1a(b *testing.B) {
	f, m := misra1a(b)
	var evals int
	b.ReportAllocs()
	for b.Loop() {
		res, err := Regress(f, m, []float64{500, 1e-4}, []float64{0, 0}, []float64{1000, 0.01}, nil)
		if err != nil {
			b.Fatal(err)
		}
		evals = res.Evaluations
	}
	b.ReportMetric(float64(evals), "evaluations/op")
}
