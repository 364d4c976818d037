package uncertain

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// TestLatinStrata checks the defining property of a Latin hypercube
// (McKay, Beckman and Conover 1979): each column holds exactly one value
// in each of the n strata [i/n, (i+1)/n), all within (0, 1).
func TestLatinStrata(t *testing.T) {
	for _, n := range []int{1, 2, 3, 7, 10, 100, 1000, 4097} {
		for _, k := range []int{1, 3, 7} {
			u, err := LatinHypercube(n, k, uint64(31*n+k))
			if err != nil {
				t.Fatal(err)
			}
			if len(u) != n {
				t.Fatalf("n=%d k=%d: %d rows", n, k, len(u))
			}
			for j := range k {
				hits := make([]int, n)
				for i := range n {
					x := u[i][j]
					s := int(x * float64(n))
					if !(x > 0 && x < 1) || s < 0 || s >= n {
						t.Fatalf("n=%d k=%d: u[%d][%d] = %g outside (0, 1)", n, k, i, j, x)
					}
					if x < float64(s)/float64(n) || x >= float64(s+1)/float64(n) {
						t.Fatalf("n=%d k=%d: u[%d][%d] = %.17g is not in stratum %d's [%d/n, %d/n)", n, k, i, j, x, s, s, s+1)
					}
					hits[s]++
				}
				for s, h := range hits {
					if h != 1 {
						t.Fatalf("n=%d k=%d column %d: stratum %d holds %d values, want exactly 1", n, k, j, s, h)
					}
				}
			}
		}
	}
}

// TestDeterminism checks that a design depends on its seed only: the same
// seed gives the same design bit for bit, another seed another, and a
// Monte Carlo design of fewer cases the first rows of a larger one.
func TestDeterminism(t *testing.T) {
	for _, c := range []struct {
		name string
		f    func(n, k int, seed uint64) ([][]float64, error)
	}{{"MonteCarlo", MonteCarlo}, {"LatinHypercube", LatinHypercube}} {
		a, _ := c.f(200, 4, 11)
		b, _ := c.f(200, 4, 11)
		d, _ := c.f(200, 4, 12)
		for i := range a {
			if !slices.Equal(a[i], b[i]) {
				t.Fatalf("%s: two designs of seed 11 differ at row %d", c.name, i)
			}
		}
		same := 0
		for i := range a {
			for j := range a[i] {
				if a[i][j] == d[i][j] {
					same++
				}
			}
		}
		if same > 0 {
			t.Errorf("%s: designs of seeds 11 and 12 share %d of 800 values, want none", c.name, same)
		}
	}
	small, _ := MonteCarlo(50, 4, 11)
	large, _ := MonteCarlo(200, 4, 11)
	for i := range small {
		if !slices.Equal(small[i], large[i]) {
			t.Fatalf("MonteCarlo: row %d of 50 cases differs from row %d of 200", i, i)
		}
	}
}

// TestStreams checks Stream: reproducible; and across streams 0 to 9999 of
// one seed, and across seeds 0 to 9999 of one index, the first draws
// uniform by the Kolmogorov–Smirnov test at the 1 % level (D√n below
// 1.628, the Kolmogorov distribution's 1 % point, from memory;
// ≈ √(−ln(0.005)/2)), and the draws of neighbouring streams uncorrelated
// (|r| < 4/√n, four standard errors of a correlation of independent
// variables).
func TestStreams(t *testing.T) {
	a, b := Stream(5, 9), Stream(5, 9)
	for range 100 {
		if a.Uint64() != b.Uint64() {
			t.Fatal("Stream(5, 9) twice gives different numbers")
		}
	}
	const n = 10000
	for _, c := range []struct {
		name   string
		stream func(i uint64) uint64
	}{
		{"streams 0..9999 of seed 42", func(i uint64) uint64 { return Stream(42, i).Uint64() }},
		{"seeds 0..9999 of stream 0", func(i uint64) uint64 { return Stream(i, 0).Uint64() }},
		{"seeds 0..9999 of stream i", func(i uint64) uint64 { return Stream(i, i).Uint64() }},
	} {
		x := make([]float64, n)
		for i := range x {
			x[i] = (float64(c.stream(uint64(i))>>11) + 0.5) / (1 << 53)
		}
		var r float64
		var s1, s2 float64
		for i := 1; i < n; i++ {
			r += (x[i] - 0.5) * (x[i-1] - 0.5)
			s1 += (x[i] - 0.5) * (x[i] - 0.5)
			s2 += (x[i-1] - 0.5) * (x[i-1] - 0.5)
		}
		r /= math.Sqrt(s1 * s2)
		if math.Abs(r) > 4/math.Sqrt(n) {
			t.Errorf("%s: correlation of neighbours %.4f, want |r| < %.4f", c.name, r, 4/math.Sqrt(n))
		}
		slices.Sort(x)
		d := 0.0
		for i, v := range x {
			d = math.Max(d, math.Max(float64(i+1)/n-v, v-float64(i)/n))
		}
		if d*math.Sqrt(n) > 1.628 {
			t.Errorf("%s: Kolmogorov–Smirnov D√n = %.3f, want below 1.628 (uniform at the 1 %% level)", c.name, d*math.Sqrt(n))
		}
	}
}

// TestDesignErrors checks the sizes a design refuses.
func TestDesignErrors(t *testing.T) {
	for _, f := range []func(n, k int, seed uint64) ([][]float64, error){MonteCarlo, LatinHypercube} {
		for _, c := range []struct {
			n, k int
			want string
		}{{0, 3, "0 cases"}, {-5, 3, "-5 cases"}, {10, 0, "0 inputs"}, {MaxDesignValues, 2, "more than"}} {
			u, err := f(c.n, c.k, 1)
			if u != nil || !errors.Is(err, ErrBadDesign) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("n=%d k=%d: %v, %v; want nil and an ErrBadDesign saying %q", c.n, c.k, u != nil, err, c.want)
			}
		}
	}
}

// sampleColumns returns, for the reference cases, n values of each drawn
// through its Quantile from one column of a design of the given kind.
func sampleColumns(t *testing.T, design func(n, k int, seed uint64) ([][]float64, error), cases []refCase, n int, seed uint64) [][]float64 {
	t.Helper()
	u, err := design(n, len(cases), seed)
	if err != nil {
		t.Fatal(err)
	}
	x := make([][]float64, len(cases))
	for j, c := range cases {
		x[j] = make([]float64, n)
		for i := range n {
			x[j][i] = c.d.Quantile(u[i][j])
		}
	}
	return x
}

// TestSampledMoments draws 10⁴ values of each reference distribution by
// Monte Carlo and by Latin hypercube, and compares the sample mean and the
// 10, 50 and 90 % sample quantiles with the closed forms within four
// standard errors: s/√n for the mean, and the asymptotic standard error of
// a sample quantile, √(p(1 − p)/n)/f(x_p) (David, H.A. and Nagaraja, H.N.
// (2003), Order Statistics, 3rd ed., Wiley, Ch. 10, from memory). For an
// output monotone in each input, as an input itself is, a Latin
// hypercube's sample mean varies no more than simple random sampling's
// (McKay et al. 1979), so the mean's bound holds for it. Its quantiles are
// held to a tighter bound of their own: with one value per stratum the
// sample's empirical CDF is within 1/n of F everywhere, so F at a sample
// quantile lies within 3/n of p (and so well within four standard errors).
func TestSampledMoments(t *testing.T) {
	const n = 10000
	cases := refCases(t)
	for _, dsn := range []struct {
		name string
		f    func(n, k int, seed uint64) ([][]float64, error)
	}{{"Monte Carlo", MonteCarlo}, {"Latin hypercube", LatinHypercube}} {
		x := sampleColumns(t, dsn.f, cases, n, 2024)
		for j, c := range cases {
			s, err := Summarize(x[j])
			if err != nil {
				t.Fatal(err)
			}
			if se := s.SD / math.Sqrt(n); math.Abs(s.Mean-c.mean) > 4*se {
				t.Errorf("%s, %s: sample mean %.6g, want %.6g within 4 × %.3g (%s)", dsn.name, c.name, s.Mean, c.mean, se, c.src)
			}
			for _, q := range []struct{ p, got float64 }{{0.1, s.P90}, {0.5, s.P50}, {0.9, s.P10}} {
				want := c.quantile(q.p)
				se := math.Sqrt(q.p*(1-q.p)/n) / c.pdf(want)
				if math.Abs(q.got-want) > 4*se {
					t.Errorf("%s, %s: sample %g-quantile %.6g, want %.6g within 4 × %.3g (%s)", dsn.name, c.name, q.p, q.got, want, se, c.src)
				}
				if dsn.name == "Latin hypercube" && math.Abs(c.cdf(q.got)-q.p) > 3.0/n {
					t.Errorf("%s, %s: F(sample %g-quantile) = %.6g, want within 3/n of %g", dsn.name, c.name, q.p, c.cdf(q.got), q.p)
				}
			}
		}
		// The columns are independent: rank correlations of pairs within
		// four standard errors, 4/√(n − 1), of 0.
		for j := 1; j < len(x); j++ {
			r, err := Spearman(x[j-1], x[j])
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(r) > 4/math.Sqrt(n-1) {
				t.Errorf("%s: columns %d and %d have rank correlation %.4f, want |r| < %.4f", dsn.name, j-1, j, r, 4/math.Sqrt(n-1))
			}
		}
	}
}

// TestDiscreteFrequencies draws 10⁴ values of a discrete distribution by
// Monte Carlo: each value's frequency within four binomial standard
// errors √(p(1 − p)/n) of its probability, and by Latin hypercube within
// 2/n (each stratum of width 1/n falls in one value's range of u but for
// the one at each of the value's two boundaries).
func TestDiscreteFrequencies(t *testing.T) {
	const n = 10000
	d := Discrete{Values: []float64{10, 20, 35, 50}, Probs: []float64{0.15, 0.45, 0.3, 0.1}}
	for _, dsn := range []struct {
		name string
		f    func(n, k int, seed uint64) ([][]float64, error)
		tol  func(p float64) float64
	}{
		{"Monte Carlo", MonteCarlo, func(p float64) float64 { return 4 * math.Sqrt(p*(1-p)/n) }},
		{"Latin hypercube", LatinHypercube, func(float64) float64 { return 2.0 / n }},
	} {
		u, err := dsn.f(n, 1, 77)
		if err != nil {
			t.Fatal(err)
		}
		count := map[float64]int{}
		for _, row := range u {
			count[d.Quantile(row[0])]++
		}
		for i, v := range d.Values {
			f := float64(count[v]) / n
			if math.Abs(f-d.Probs[i]) > dsn.tol(d.Probs[i]) {
				t.Errorf("%s: value %g drawn with frequency %.4f, want %.4f within %.4f", dsn.name, v, f, d.Probs[i], dsn.tol(d.Probs[i]))
			}
		}
	}
}
