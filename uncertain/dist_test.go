package uncertain

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// The closed forms below are written out here from the references, apart
// from the package's code: Φ from Go's math.Erf and Φ⁻¹ from math.Erfinv,
// not gonum's AS 241 that the package uses.

// refPhi is the standard normal distribution function, (1 + erf(z/√2))/2.
func refPhi(z float64) float64 { return 0.5 * (1 + math.Erf(z/math.Sqrt2)) }

// refPdf is the standard normal density.
func refPdf(z float64) float64 { return math.Exp(-z*z/2) / math.Sqrt(2*math.Pi) }

// refProbit is Φ⁻¹(p) = √2 erfinv(2p − 1), accurate for p away from 0 and
// 1 (2p − 1 rounds there), which is where the tests use it.
func refProbit(p float64) float64 { return math.Sqrt2 * math.Erfinv(2*p-1) }

// A reference case: a distribution with its closed-form mean, quantile
// function, CDF and density, and where they come from.
type refCase struct {
	name     string
	d        Distribution
	mean     float64
	quantile func(p float64) float64
	cdf      func(x float64) float64
	pdf      func(x float64) float64
	src      string
}

// refCases are the distributions whose samples, quantiles and means the
// tests compare with closed forms.
func refCases(t testing.TB) []refCase {
	// Triangular on a = 1, c = 2, b = 6 (Kotz and van Dorp (2004), Ch. 1).
	ta, tc, tb := 1.0, 2.0, 6.0
	// Normal of mean 10 and sd 2, truncated to [7, 16]: a = −1.5, b = 3.
	nmu, nsd, nlo, nhi := 10.0, 2.0, 7.0, 16.0
	na, nb := (nlo-nmu)/nsd, (nhi-nmu)/nsd
	nz := refPhi(nb) - refPhi(na)
	// Lognormal of median 50 and P90 ratio 0.6; truncated to [30, 90].
	lmed, lratio := 50.0, 0.6
	ls := -math.Log(lratio) / 1.2815515655446004 // Φ⁻¹(0.9); tables give 1.28155, from memory
	llo, lhi := 30.0, 90.0
	la, lb := math.Log(llo/lmed)/ls, math.Log(lhi/lmed)/ls
	lz := refPhi(lb) - refPhi(la)
	logn, err := NewLognormal(lmed, lratio)
	if err != nil {
		t.Fatal(err)
	}
	return []refCase{{
		name: "uniform [2, 5]", d: Uniform{2, 5},
		mean:     3.5,
		quantile: func(p float64) float64 { return 2 + 3*p },
		cdf:      func(x float64) float64 { return (x - 2) / 3 },
		pdf:      func(float64) float64 { return 1.0 / 3 },
		src:      "uniform: mean (a+b)/2, F = (x−a)/(b−a) (Johnson, Kotz and Balakrishnan 1995, Ch. 26)",
	}, {
		name: "triangular (1, 2, 6)", d: Triangular{ta, tc, tb},
		mean: (ta + tb + tc) / 3,
		quantile: func(p float64) float64 {
			if p < (tc-ta)/(tb-ta) {
				return ta + math.Sqrt(p*(tb-ta)*(tc-ta))
			}
			return tb - math.Sqrt((1-p)*(tb-ta)*(tb-tc))
		},
		cdf: func(x float64) float64 {
			if x <= tc {
				return (x - ta) * (x - ta) / ((tb - ta) * (tc - ta))
			}
			return 1 - (tb-x)*(tb-x)/((tb-ta)*(tb-tc))
		},
		pdf: func(x float64) float64 {
			if x <= tc {
				return 2 * (x - ta) / ((tb - ta) * (tc - ta))
			}
			return 2 * (tb - x) / ((tb - ta) * (tb - tc))
		},
		src: "triangular: mean (a+b+c)/3 and its quantile (Kotz and van Dorp 2004, Ch. 1)",
	}, {
		name: "normal (10, 2)", d: NewNormal(nmu, nsd),
		mean:     nmu,
		quantile: func(p float64) float64 { return nmu + nsd*refProbit(p) },
		cdf:      func(x float64) float64 { return refPhi((x - nmu) / nsd) },
		pdf:      func(x float64) float64 { return refPdf((x-nmu)/nsd) / nsd },
		src:      "normal (Johnson, Kotz and Balakrishnan 1994, Ch. 13)",
	}, {
		name: "normal (10, 2) truncated to [7, 16]", d: NewNormal(nmu, nsd).Truncated(nlo, nhi),
		mean:     nmu + nsd*(refPdf(na)-refPdf(nb))/nz,
		quantile: func(p float64) float64 { return nmu + nsd*refProbit(refPhi(na)+p*nz) },
		cdf:      func(x float64) float64 { return (refPhi((x-nmu)/nsd) - refPhi(na)) / nz },
		pdf:      func(x float64) float64 { return refPdf((x-nmu)/nsd) / (nsd * nz) },
		src:      "truncated normal: mean μ + σ(φ(a) − φ(b))/(Φ(b) − Φ(a)) (Johnson, Kotz and Balakrishnan 1994, Ch. 13, Sec. 10.1, from memory)",
	}, {
		name: "half-normal", d: NewNormal(0, 1).Truncated(0, math.Inf(1)),
		mean:     math.Sqrt(2 / math.Pi),
		quantile: func(p float64) float64 { return refProbit((1 + p) / 2) },
		cdf:      func(x float64) float64 { return 2*refPhi(x) - 1 },
		pdf:      func(x float64) float64 { return 2 * refPdf(x) },
		src:      "half-normal: mean √(2/π), F = 2Φ(x) − 1 (Johnson, Kotz and Balakrishnan 1994, Ch. 13)",
	}, {
		name: "lognormal (median 50, P90 ratio 0.6)", d: logn,
		mean:     lmed * math.Exp(ls*ls/2),
		quantile: func(p float64) float64 { return lmed * math.Exp(ls*refProbit(p)) },
		cdf:      func(x float64) float64 { return refPhi(math.Log(x/lmed) / ls) },
		pdf:      func(x float64) float64 { return refPdf(math.Log(x/lmed)/ls) / (x * ls) },
		src:      "lognormal: mean exp(μ + σ²/2) (Johnson, Kotz and Balakrishnan 1994, Ch. 14)",
	}, {
		name: "lognormal truncated to [30, 90]", d: logn.Truncated(llo, lhi),
		mean:     lmed * math.Exp(ls*ls/2) * (refPhi(lb-ls) - refPhi(la-ls)) / lz,
		quantile: func(p float64) float64 { return lmed * math.Exp(ls*refProbit(refPhi(la)+p*lz)) },
		cdf:      func(x float64) float64 { return (refPhi(math.Log(x/lmed)/ls) - refPhi(la)) / lz },
		pdf:      func(x float64) float64 { return refPdf(math.Log(x/lmed)/ls) / (x * ls * lz) },
		src:      "truncated lognormal: mean exp(μ + σ²/2)(Φ(b − σ) − Φ(a − σ))/(Φ(b) − Φ(a)) (Johnson, Kotz and Balakrishnan 1994, Ch. 14, from memory)",
	}}
}

// TestClosedForms compares Mean, Quantile and CDF with the closed forms of
// refCases, for probabilities away from the tails where refProbit is
// accurate; the tolerances allow the rounding of the closed forms
// themselves (a few units of 1e-16 each, amplified by at most 1/f).
func TestClosedForms(t *testing.T) {
	for _, c := range refCases(t) {
		if err := c.d.Validate(); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if got := c.d.Mean(); math.Abs(got-c.mean) > 1e-13*math.Abs(c.mean) {
			t.Errorf("%s: Mean() = %.17g, want %.17g (%s)", c.name, got, c.mean, c.src)
		}
		for _, p := range []float64{0.001, 0.01, 0.1, 0.2, 0.25, 0.5, 0.75, 0.9, 0.99, 0.999} {
			want := c.quantile(p)
			if got := c.d.Quantile(p); math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
				t.Errorf("%s: Quantile(%g) = %.17g, want %.17g (%s)", c.name, p, got, want, c.src)
			}
			if got := c.d.CDF(want); math.Abs(got-p) > 1e-13 {
				t.Errorf("%s: CDF(%.17g) = %.17g, want %g (%s)", c.name, want, got, p, c.src)
			}
		}
	}
}

// TestNormalQuantileTabulated checks the normal quantiles at 0.9 and 0.975
// against their tabulated values.
func TestNormalQuantileTabulated(t *testing.T) {
	d := NewNormal(3, 0.5)
	for _, c := range []struct{ p, z float64 }{
		{0.9, 1.2815515655446004},  // Φ⁻¹(0.9); tables give 1.28155, from memory
		{0.975, 1.959963984540054}, // Φ⁻¹(0.975), the two-sided 95 % point, from memory
		{0.5, 0},
	} {
		want := 3 + 0.5*c.z
		if got := d.Quantile(c.p); math.Abs(got-want) > 4e-16*want {
			t.Errorf("normal(3, 0.5).Quantile(%g) = %.17g, want %.17g", c.p, got, want)
		}
		want = 3 - 0.5*c.z
		if got := d.Quantile(1 - c.p); math.Abs(got-want) > 4e-16*want {
			t.Errorf("normal(3, 0.5).Quantile(%g) = %.17g, want %.17g (symmetry)", 1-c.p, got, want)
		}
	}
}

// TestLognormalP90Ratio checks the median and P90-ratio parameters: by the
// definition, the 0.1 quantile is the ratio times the median, and by the
// symmetry of the normal in the logarithm, the 0.9 quantile is the median
// divided by the ratio.
func TestLognormalP90Ratio(t *testing.T) {
	d, err := NewLognormal(100, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ u, want float64 }{{0.1, 50}, {0.5, 100}, {0.9, 200}} {
		if got := d.Quantile(c.u); math.Abs(got-c.want) > 1e-13*c.want {
			t.Errorf("lognormal(100, 0.5).Quantile(%g) = %.17g, want %g", c.u, got, c.want)
		}
	}
	if got := d.P90Ratio(); math.Abs(got-0.5) > 1e-15 {
		t.Errorf("P90Ratio() = %.17g, want 0.5", got)
	}
	if got := d.Mu(); math.Abs(got-math.Log(100)) > 1e-15 {
		t.Errorf("Mu() = %.17g, want ln 100", got)
	}
	g := NewLognormalLog(math.Log(100), d.Sigma)
	if math.Abs(g.Median-100) > 1e-12 || g.Sigma != d.Sigma || g.Min != 0 || !math.IsInf(g.Max, 1) {
		t.Errorf("NewLognormalLog(ln 100, %g) = %+v, want median 100, the same sigma, no truncation", d.Sigma, g)
	}
}

// TestTruncatedMeans checks the truncated means where the interval is
// narrow, which the package integrates numerically, against limiting
// forms: on [a, a + w] the density is proportional to 1 − a t + O(t²) in
// t = z − a, so the mean of t is w/2 − a w²/12 + O(w³); and, for wider
// intervals where the closed form does not cancel badly, against it.
func TestTruncatedMeans(t *testing.T) {
	for _, c := range []struct{ a, w float64 }{{1, 1e-9}, {-2, 1e-7}, {0, 1e-6}, {5, 1e-8}, {-30, 1e-12}} {
		d := NewNormal(0, 1).Truncated(c.a, c.a+c.w)
		want := c.a + c.w/2 - c.a*c.w*c.w/12
		if got := d.Mean(); math.Abs(got-want) > 4e-16*math.Max(1, math.Abs(c.a))+math.Abs(c.a)*c.w*c.w*c.w {
			t.Errorf("normal(0, 1) on [%g, %g + %g]: Mean() = %.17g, want %.17g (midpoint limit)", c.a, c.a, c.w, got, want)
		}
	}
	for _, c := range []struct{ a, b float64 }{{1, 1.5}, {-0.4, 0.3}, {2, 2.4}, {-3, -2.8}} {
		d := NewNormal(0, 1).Truncated(c.a, c.b)
		want := (refPdf(c.a) - refPdf(c.b)) / (refPhi(c.b) - refPhi(c.a))
		if got := d.Mean(); math.Abs(got-want) > 1e-13 {
			t.Errorf("normal(0, 1) on [%g, %g]: Mean() = %.17g, want %.17g (Johnson, Kotz and Balakrishnan 1994, Ch. 13)", c.a, c.b, got, want)
		}
	}
	logn, err := NewLognormal(50, 0.6)
	if err != nil {
		t.Fatal(err)
	}
	s := logn.Sigma
	for _, c := range []struct{ lo, hi float64 }{{40, 40.5}, {49, 52}, {70, 71}} {
		d := logn.Truncated(c.lo, c.hi)
		a, b := math.Log(c.lo/50)/s, math.Log(c.hi/50)/s
		want := 50 * math.Exp(s*s/2) * (refPhi(b-s) - refPhi(a-s)) / (refPhi(b) - refPhi(a))
		if got := d.Mean(); math.Abs(got-want) > 1e-12*want {
			t.Errorf("lognormal(50, 0.6) on [%g, %g]: Mean() = %.17g, want %.17g (Johnson, Kotz and Balakrishnan 1994, Ch. 14)", c.lo, c.hi, got, want)
		}
	}
	// Truncated at the median, [0, median]: Φ(b) − Φ(a) = 1/2.
	d := logn.Truncated(0, 50)
	want := 50 * math.Exp(s*s/2) * refPhi(-s) / 0.5
	if got := d.Mean(); math.Abs(got-want) > 1e-13*want {
		t.Errorf("lognormal(50, 0.6) on [0, 50]: Mean() = %.17g, want %.17g", got, want)
	}
}

// roundTripCases are distributions for the tail round trip: the reference
// cases and a few more, with truncations on either side and in a tail.
func roundTripCases(t testing.TB) []Distribution {
	var ds []Distribution
	for _, c := range refCases(t) {
		ds = append(ds, c.d)
	}
	logn, err := NewLognormal(3e9, 0.25)
	if err != nil {
		t.Fatal(err)
	}
	return append(ds,
		Uniform{-1e3, 5e4},
		Triangular{0, 0, 1}, Triangular{0, 1, 1},
		NewNormal(-40, 7).Truncated(-45, math.Inf(1)),
		NewNormal(0, 1).Truncated(4, 9),
		NewNormal(0, 1).Truncated(-12, -6),
		NewNormal(0, 1).Truncated(-0.5, 0.25),
		logn, logn.Truncated(1e9, math.Inf(1)), logn.Truncated(0, 2e9),
	)
}

// TestRoundTrip checks that CDF inverts Quantile from u = 1e-12 to
// 1 − 1e-12, and Quantile CDF inside the support. For an untruncated
// normal or lognormal this compares gonum's AS 241 with Go's erfc, two
// independent implementations. The tolerance is 1e-9 relative to
// min(u, 1 − u), plus what float64 cannot resolve: 1e-15 absolute (the
// spacing of numbers near 1, and the cancellation in Φ(x) − Φ(min) next to
// a truncation) and four times the CDF's step across one unit in the last
// place of the quantile.
func TestRoundTrip(t *testing.T) {
	us := []float64{1e-12, 1e-10, 1e-8, 1e-6, 1e-4, 0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99, 1 - 1e-4, 1 - 1e-6, 1 - 1e-8, 1 - 1e-10, 1 - 1e-12}
	for _, d := range roundTripCases(t) {
		if err := d.Validate(); err != nil {
			t.Fatalf("%+v: %v", d, err)
		}
		for _, u := range us {
			x := d.Quantile(u)
			if !finite(x) {
				t.Errorf("%+v: Quantile(%g) = %g, want a finite value", d, u, x)
				continue
			}
			got := d.CDF(x)
			step := math.Max(d.CDF(math.Nextafter(x, math.Inf(1)))-got, got-d.CDF(math.Nextafter(x, math.Inf(-1))))
			tol := 1e-9*math.Min(u, 1-u) + 1e-15 + 4*step
			if math.Abs(got-u) > tol {
				t.Errorf("%+v: CDF(Quantile(%g) = %.17g) = %.17g, off by %.3g, want within %.3g", d, u, x, got, got-u, tol)
			}
		}
		for _, u := range []float64{0.05, 0.3, 0.6, 0.95} {
			x := d.Quantile(u)
			if back := d.Quantile(d.CDF(x)); math.Abs(back-x) > 1e-12*math.Max(1, math.Abs(x)) {
				t.Errorf("%+v: Quantile(CDF(%.17g)) = %.17g", d, x, back)
			}
		}
	}
}

// TestSupport checks the ends of the support at u = 0 and 1, NaN outside
// [0, 1], and that quantiles never leave the truncation.
func TestSupport(t *testing.T) {
	for _, d := range roundTripCases(t) {
		for _, u := range []float64{-0.1, 1.1, math.NaN(), math.Inf(1)} {
			if x := d.Quantile(u); !math.IsNaN(x) {
				t.Errorf("%+v: Quantile(%g) = %g, want NaN outside [0, 1]", d, u, x)
			}
		}
		lo, hi := d.Quantile(0), d.Quantile(1)
		if d.CDF(lo) != 0 && !math.IsInf(lo, -1) || d.CDF(hi) != 1 {
			t.Errorf("%+v: CDF at Quantile(0) = %g and Quantile(1) = %g: %g and %g, want 0 and 1", d, lo, hi, d.CDF(lo), d.CDF(hi))
		}
		for _, u := range []float64{1e-300, 1e-17, 0.5, 1 - 1e-16} {
			if x := d.Quantile(u); !(x >= lo && x <= hi) {
				t.Errorf("%+v: Quantile(%g) = %g outside [%g, %g]", d, u, x, lo, hi)
			}
		}
	}
	if x := NewNormal(0, 1).Quantile(0); !math.IsInf(x, -1) {
		t.Errorf("normal: Quantile(0) = %g, want -Inf", x)
	}
	if x := NewNormal(1, 2).Truncated(0, 5).Quantile(0); x != 0 {
		t.Errorf("normal on [0, 5]: Quantile(0) = %g, want 0", x)
	}
}

// TestDiscrete checks the inverse of the step CDF, inf{x : F(x) ≥ u}, on
// values 1, 2, 5 of probabilities 0.2, 0.5, 0.3 (F = 0.2, 0.7, 1; mean
// 0.2 + 1.0 + 1.5 = 2.7).
func TestDiscrete(t *testing.T) {
	d := Discrete{Values: []float64{1, 2, 5}, Probs: []float64{0.2, 0.5, 0.3}}
	if err := d.Validate(); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ u, want float64 }{{1e-12, 1}, {0.1, 1}, {0.2, 1}, {0.2000001, 2}, {0.69, 2}, {0.71, 5}, {1 - 1e-12, 5}} {
		if got := d.Quantile(c.u); got != c.want {
			t.Errorf("Quantile(%g) = %g, want %g", c.u, got, c.want)
		}
	}
	for _, c := range []struct{ x, want float64 }{{0.5, 0}, {1, 0.2}, {1.5, 0.2}, {2, 0.7}, {4.9, 0.7}, {5, 1}, {9, 1}} {
		if got := d.CDF(c.x); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("CDF(%g) = %g, want %g", c.x, got, c.want)
		}
	}
	if got := d.Mean(); math.Abs(got-2.7) > 1e-15 {
		t.Errorf("Mean() = %.17g, want 2.7", got)
	}
}

// TestZeroWidth checks that distributions of zero width return their
// constant exactly, bit for bit, whatever u, so that fixed inputs
// reproduce a deterministic run (a closed-form limiting case).
func TestZeroWidth(t *testing.T) {
	for _, c := range []float64{0.1, 1.0 / 3, 2718.281828, -7.25e-3, 0} {
		ds := []Distribution{
			Uniform{c, c},
			Triangular{c, c, c},
			NewNormal(c, 0),
			NewNormal(c, 0).Truncated(c, c+1),
			Discrete{Values: []float64{c}, Probs: []float64{1}},
		}
		if c > 0 {
			ds = append(ds, Lognormal{Median: c, Sigma: 0, Min: 0, Max: math.Inf(1)})
		}
		for _, d := range ds {
			if err := d.Validate(); err != nil {
				t.Errorf("%+v: %v", d, err)
				continue
			}
			for _, u := range []float64{1e-300, 1e-12, 0.1, 0.5, 0.9, 1 - 1e-12} {
				if got := d.Quantile(u); got != c {
					t.Errorf("%+v: Quantile(%g) = %.17g, want exactly %.17g", d, u, got, c)
				}
			}
			if got := d.Mean(); got != c {
				t.Errorf("%+v: Mean() = %.17g, want exactly %.17g", d, got, c)
			}
			if d.CDF(math.Nextafter(c, math.Inf(-1))) != 0 || d.CDF(c) != 1 {
				t.Errorf("%+v: CDF below and at %g = %g, %g; want 0 and 1", d, c, d.CDF(math.Nextafter(c, math.Inf(-1))), d.CDF(c))
			}
		}
	}
}

// TestValidateErrors checks that bad parameters give an error wrapping
// ErrBadDistribution that says what is wrong, and that Quantile, CDF and
// Mean on them return without panicking.
func TestValidateErrors(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	for _, c := range []struct {
		d    Distribution
		want string
	}{
		{Uniform{5, 3}, "min 5 is above max 3"},
		{Uniform{nan, 3}, "finite"},
		{Uniform{0, inf}, "finite"},
		{Uniform{-1e308, 1e308}, "overflows"},
		{Triangular{5, 4, 3}, "min 5 is above max 3"},
		{Triangular{1, 4, 3}, "mode 4 lies outside"},
		{Triangular{1, nan, 3}, "finite"},
		{NewNormal(1, -2), "sd -2 is negative"},
		{NewNormal(nan, 2), "mean NaN"},
		{NewNormal(1, inf), "sd +Inf"},
		{Normal{Mu: 1, SD: 2}, "min 0 is not below max 0"},
		{NewNormal(1, 2).Truncated(5, 3), "min 5 is not below max 3"},
		{NewNormal(1, 2).Truncated(nan, 3), "must be numbers"},
		{NewNormal(4, 0).Truncated(0, 3), "fixed value 4"},
		{NewNormal(0, 1).Truncated(40, 41), "too far in a tail"},
		{Lognormal{Median: -1, Sigma: 1, Max: inf}, "median -1"},
		{Lognormal{Median: 1, Sigma: -1, Max: inf}, "sigma -1 is negative"},
		{Lognormal{Median: 1, Sigma: 1}, "min 0 is not below max 0"},
		{Lognormal{Median: 1, Sigma: 1, Min: -2, Max: inf}, "min -2 is negative"},
		{Lognormal{Median: 1, Sigma: 40, Max: inf}, "overflows"},
		{Lognormal{Median: 1, Sigma: 0, Min: 2, Max: 3}, "fixed value 1"},
		{Discrete{}, "no values"},
		{Discrete{Values: []float64{1, 2}, Probs: []float64{1}}, "2 values but 1 probabilities"},
		{Discrete{Values: []float64{2, 1}, Probs: []float64{0.5, 0.5}}, "increasing order"},
		{Discrete{Values: []float64{1, 2}, Probs: []float64{1.5, -0.5}}, "probability 2 is -0.5"},
		{Discrete{Values: []float64{1, 2}, Probs: []float64{0.5, 0.49}}, "sum to 0.99"},
		{Discrete{Values: []float64{1, inf}, Probs: []float64{0.5, 0.5}}, "value 2 is +Inf"},
	} {
		err := c.d.Validate()
		if err == nil || !errors.Is(err, ErrBadDistribution) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%+v: Validate() = %v, want an ErrBadDistribution saying %q", c.d, err, c.want)
		}
		for _, u := range []float64{0, 0.5, 1} {
			c.d.Quantile(u)
			c.d.CDF(u)
		}
		c.d.Mean()
	}
	for _, r := range []float64{0, 1, 1.5, -0.5, nan} {
		if _, err := NewLognormal(10, r); err == nil || !errors.Is(err, ErrBadDistribution) || !strings.Contains(err.Error(), "P90 ratio") {
			t.Errorf("NewLognormal(10, %g): %v, want an error on the P90 ratio", r, err)
		}
	}
	if _, err := NewLognormal(-3, 0.5); err == nil || !strings.Contains(err.Error(), "median -3") {
		t.Errorf("NewLognormal(-3, 0.5): %v, want an error on the median", err)
	}
	// A probability sum within 1e-9 of 1 is accepted and normalised.
	d := Discrete{Values: []float64{1, 2}, Probs: []float64{0.5, 0.5 + 5e-10}}
	if err := d.Validate(); err != nil || d.CDF(2) != 1 {
		t.Errorf("%+v: Validate() = %v, CDF(2) = %g; want nil and 1", d, err, d.CDF(2))
	}
}

// TestTails checks the relative accuracy of the quantiles far in both
// tails of an untruncated normal and lognormal, u and 1 − u from 1e-12 to
// 0.45: the probability below Quantile(u), by Go's erfc (Sun's fdlibm),
// must be u within 1e-13 relative, and the probability above
// Quantile(1 − u) must be 1 − u as float64 holds it, likewise. gonum's
// AS 241 is accurate to about 1e-16 (Wichura 1988); the tolerance allows
// the erfc and the amplification by |z| of an error in z.
func TestTails(t *testing.T) {
	logn, err := NewLognormal(3e9, 0.25)
	if err != nil {
		t.Fatal(err)
	}
	for _, d := range []Distribution{NewNormal(0, 1), NewNormal(-5, 2), logn} {
		for _, u := range []float64{1e-12, 1e-11, 1e-10, 1e-9, 1e-8, 1e-6, 1e-4, 0.01, 0.07, 0.2, 0.45} {
			x := d.Quantile(u)
			if got := d.CDF(x); math.Abs(got/u-1) > 1e-13 {
				t.Errorf("%+v: CDF(Quantile(%g) = %.17g) = %.17g, relative error %.3g", d, u, x, got, got/u-1)
			}
			w := 1 - u
			v := 1 - w // exactly the probability above that float64 holds
			x = d.Quantile(w)
			var above float64
			switch d := d.(type) {
			case Normal:
				above = 0.5 * math.Erfc((x-d.Mu)/(d.SD*math.Sqrt2))
			case Lognormal:
				above = 0.5 * math.Erfc(math.Log(x/d.Median)/(d.Sigma*math.Sqrt2))
			}
			if math.Abs(above/v-1) > 1e-13 {
				t.Errorf("%+v: probability above Quantile(1 - %g) = %.17g is %.17g, relative error %.3g", d, v, x, above, above/v-1)
			}
		}
	}
}
