package uncertain

import (
	"math"
	"testing"
)

// fuzzDist builds a distribution of the given kind from four parameters.
func fuzzDist(kind uint8, p1, p2, p3, p4 float64) Distribution {
	switch kind % 5 {
	case 0:
		return Uniform{p1, p2}
	case 1:
		return Triangular{p1, p2, p3}
	case 2:
		return Normal{Mu: p1, SD: p2, Min: p3, Max: p4}
	case 3:
		return Lognormal{Median: p1, Sigma: p2, Min: p3, Max: p4}
	}
	return Discrete{Values: []float64{p1, p2, p3}, Probs: []float64{0.25, 0.5, 0.25}}
}

// FuzzQuantile checks that no parameters make Validate, Quantile, CDF or
// Mean panic, and that for every distribution Validate accepts, Quantile
// is finite on (0, 1), within the support, and non-decreasing (to within
// 1e-12 of the values and of the spread: the rational approximations of
// Φ⁻¹ and the branches of the triangular quantile may disagree in the last
// bits where they meet), CDF lies in [0, 1] and does not decrease, and the
// mean is finite and within the support.
func FuzzQuantile(f *testing.F) {
	f.Add(uint8(0), 2.0, 5.0, 0.0, 0.0, 0.3, 0.7)
	f.Add(uint8(1), 1.0, 2.0, 6.0, 0.0, 0.2, 0.2000001)
	f.Add(uint8(2), 10.0, 2.0, 7.0, 16.0, 1e-12, 0.5)
	f.Add(uint8(3), 50.0, 0.4, 0.0, math.Inf(1), 0.1, 0.9)
	f.Add(uint8(4), 1.0, 2.0, 5.0, 0.0, 0.25, 0.75)
	f.Fuzz(func(t *testing.T, kind uint8, p1, p2, p3, p4, u1, u2 float64) {
		d := fuzzDist(kind, p1, p2, p3, p4)
		err := d.Validate()
		for _, u := range []float64{u1, u2, 0, 1} {
			d.Quantile(u)
			d.CDF(u)
		}
		mean := d.Mean()
		if err != nil {
			return
		}
		if !(u1 > 0 && u1 < 1 && u2 > 0 && u2 < 1) {
			return
		}
		if u1 > u2 {
			u1, u2 = u2, u1
		}
		x1, x2 := d.Quantile(u1), d.Quantile(u2)
		lo, hi := d.Quantile(0), d.Quantile(1)
		spread := math.Abs(d.Quantile(1-1e-9) - d.Quantile(1e-9))
		tol := 1e-12 * (math.Abs(x1) + math.Abs(x2) + spread)
		switch {
		case !finite(x1) || !finite(x2):
			t.Fatalf("%+v: Quantile(%g) = %g, Quantile(%g) = %g: want finite values", d, u1, x1, u2, x2)
		case x1 < lo || x2 > hi:
			t.Fatalf("%+v: Quantile(%g) = %g, Quantile(%g) = %g outside the support [%g, %g]", d, u1, x1, u2, x2, lo, hi)
		case x2 < x1-tol:
			t.Fatalf("%+v: Quantile(%g) = %.17g above Quantile(%g) = %.17g", d, u1, x1, u2, x2)
		case !finite(mean) || mean < lo || mean > hi:
			t.Fatalf("%+v: Mean() = %g, want a finite value in [%g, %g]", d, mean, lo, hi)
		}
		c1, c2 := d.CDF(x1), d.CDF(x2)
		if !(c1 >= 0 && c1 <= 1 && c2 >= 0 && c2 <= 1) || x1 <= x2 && c1 > c2 {
			t.Fatalf("%+v: CDF(%g) = %g, CDF(%g) = %g: want values in [0, 1], not decreasing", d, x1, c1, x2, c2)
		}
	})
}
