package uncertain

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// TestSampleQuantileType7 checks definition 7 of Hyndman and Fan (1996)
// on 1, …, 10: h = 9p, so the 0.1, 0.5 and 0.9 quantiles are 1.9, 5.5 and
// 9.1 (R's default quantile(1:10, c(0.1, 0.5, 0.9)) prints the same, from
// memory), and at the plotting positions p = (i − 1)/(n − 1) the order
// statistics themselves.
func TestSampleQuantileType7(t *testing.T) {
	x := []float64{7, 3, 10, 1, 5, 2, 9, 4, 8, 6} // 1..10, shuffled
	for _, c := range []struct{ p, want float64 }{{0, 1}, {0.1, 1.9}, {0.25, 3.25}, {0.5, 5.5}, {0.9, 9.1}, {1, 10}} {
		if got, err := SampleQuantile(x, c.p); err != nil || math.Abs(got-c.want) > 1e-14 {
			t.Errorf("SampleQuantile(1..10, %g) = %.17g, %v; want %g (Hyndman and Fan 1996, definition 7)", c.p, got, err, c.want)
		}
	}
	for i := range 10 {
		p := float64(i) / 9
		if got, _ := SampleQuantile(x, p); math.Abs(got-float64(i+1)) > 1e-14 {
			t.Errorf("SampleQuantile(1..10, %d/9) = %.17g, want the order statistic %d", i, got, i+1)
		}
	}
	if !slices.Equal(x, []float64{7, 3, 10, 1, 5, 2, 9, 4, 8, 6}) {
		t.Error("SampleQuantile sorted its input")
	}
	for _, p := range []float64{-0.1, 1.5, math.NaN()} {
		if _, err := SampleQuantile(x, p); !errors.Is(err, ErrBadSample) {
			t.Errorf("SampleQuantile(x, %g): %v, want an ErrBadSample", p, err)
		}
	}
}

// TestSummarize checks the summary of 1, …, 10 against closed forms: mean
// (n + 1)/2 = 5.5, sample variance n(n + 1)/12 = 55/6 (the variance of the
// integers 1..n with divisor n − 1), and the percentiles of definition 7
// under the reserves convention (P90 the 10th percentile); and that a
// sample of equal values, as fixed inputs give, summarises to that value
// exactly.
func TestSummarize(t *testing.T) {
	x := []float64{7, 3, 10, 1, 5, 2, 9, 4, 8, 6}
	s, err := Summarize(x)
	if err != nil {
		t.Fatal(err)
	}
	want := Summary{N: 10, Mean: 5.5, SD: math.Sqrt(55.0 / 6), Min: 1, Max: 10, P90: 1.9, P50: 5.5, P10: 9.1}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"Mean", s.Mean, want.Mean}, {"SD", s.SD, want.SD}, {"Min", s.Min, want.Min}, {"Max", s.Max, want.Max},
		{"P90", s.P90, want.P90}, {"P50", s.P50, want.P50}, {"P10", s.P10, want.P10},
	} {
		if math.Abs(c.got-c.want) > 1e-14*c.want {
			t.Errorf("Summarize(1..10).%s = %.17g, want %.17g", c.name, c.got, c.want)
		}
	}
	if s.N != 10 || !(s.P90 <= s.P50 && s.P50 <= s.P10) {
		t.Errorf("Summarize(1..10) = %+v: want N 10 and P90 ≤ P50 ≤ P10", s)
	}
	if !slices.Equal(x, []float64{7, 3, 10, 1, 5, 2, 9, 4, 8, 6}) {
		t.Error("Summarize sorted its input")
	}
	for _, c := range []float64{0.1, 1.0 / 3, 6.02214076e23} {
		s, err := Summarize([]float64{c, c, c, c, c, c, c})
		if err != nil || s.Mean != c || s.SD != 0 || s.Min != c || s.Max != c || s.P90 != c || s.P50 != c || s.P10 != c {
			t.Errorf("Summarize of seven %.17g = %+v, %v; want every statistic exactly %.17g and SD 0", c, s, err, c)
		}
	}
	if s, err := Summarize([]float64{4.5}); err != nil || s.N != 1 || s.SD != 0 || s.P90 != 4.5 || s.P10 != 4.5 {
		t.Errorf("Summarize of one value = %+v, %v; want the value everywhere and SD 0", s, err)
	}
	// A large offset: the shifted mean and corrected two-pass variance of
	// 1e9 + 1..10 are those of 1..10 (Chan, Golub and LeVeque 1983).
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = 1e9 + v
	}
	if s, _ := Summarize(y); math.Abs(s.SD-want.SD) > 1e-6 || s.Mean != 1e9+5.5 {
		t.Errorf("Summarize(1e9 + 1..10): mean %.17g, SD %.17g; want 1e9 + 5.5 and %.17g", s.Mean, s.SD, want.SD)
	}
}

// TestExceedance checks the fraction strictly above a threshold, counted by
// hand.
func TestExceedance(t *testing.T) {
	x := []float64{3, 1, 4, 1, 5, 9, 2, 6}
	for _, c := range []struct{ th, want float64 }{{0, 1}, {1, 0.75}, {4, 0.375}, {4.5, 0.375}, {9, 0}, {100, 0}} {
		if got, err := Exceedance(x, c.th); err != nil || got != c.want {
			t.Errorf("Exceedance(x, %g) = %g, %v; want %g", c.th, got, err, c.want)
		}
	}
	if _, err := Exceedance(x, math.NaN()); !errors.Is(err, ErrBadSample) {
		t.Errorf("Exceedance(x, NaN): %v, want an ErrBadSample", err)
	}
}

// TestHistogram checks bins of equal width that hold every value once,
// counted by hand.
func TestHistogram(t *testing.T) {
	x := make([]float64, 100)
	for i := range x {
		x[i] = float64(99 - i) // 0..99
	}
	edges, counts, err := Histogram(x, 10)
	if err != nil {
		t.Fatal(err)
	}
	if len(edges) != 11 || edges[0] != 0 || edges[10] != 99 {
		t.Fatalf("edges %v: want 11 from 0 to 99", edges)
	}
	for i, e := range edges {
		if math.Abs(e-9.9*float64(i)) > 1e-12 {
			t.Errorf("edge %d = %.17g, want %g", i, e, 9.9*float64(i))
		}
	}
	// [0, 9.9) holds 0..9, [9.9, 19.8) 10..19, …, [89.1, 99] 90..99.
	for i, c := range counts {
		if c != 10 {
			t.Errorf("bin %d [%g, %g) holds %d values, want 10", i, edges[i], edges[i+1], c)
		}
	}
	edges, counts, err = Histogram([]float64{0, 1, 1, 2, 3, 4}, 4) // bins of width 1, the last [3, 4]
	if err != nil || !slices.Equal(counts, []int{1, 2, 1, 2}) || !slices.Equal(edges, []float64{0, 1, 2, 3, 4}) {
		t.Errorf("Histogram(0 1 1 2 3 4, 4) = %v, %v, %v; want edges 0..4 and counts 1 2 1 2", edges, counts, err)
	}
	edges, counts, err = Histogram([]float64{2.5, 2.5, 2.5}, 20)
	if err != nil || !slices.Equal(edges, []float64{2.5, 2.5}) || !slices.Equal(counts, []int{3}) {
		t.Errorf("Histogram of equal values = %v, %v, %v; want one bin of zero width", edges, counts, err)
	}
	for _, bins := range []int{0, -3, MaxBins + 1} {
		if _, _, err := Histogram(x, bins); !errors.Is(err, ErrBadSample) || !strings.Contains(err.Error(), "bins") {
			t.Errorf("Histogram(x, %d): %v, want an ErrBadSample on the bins", bins, err)
		}
	}
}

// TestCumulative checks the S-curve's points, and that reading P90, P50
// and P10 off it by linear interpolation gives Summarize's (both are
// definition 7 of Hyndman and Fan 1996).
func TestCumulative(t *testing.T) {
	u, err := MonteCarlo(501, 1, 3)
	if err != nil {
		t.Fatal(err)
	}
	x := column(u, 0)
	values, below, err := Cumulative(x)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.IsSorted(values) || below[0] != 0 || below[len(below)-1] != 1 || len(values) != len(x) {
		t.Fatalf("Cumulative: want %d sorted values from probability 0 to 1", len(x))
	}
	s, _ := Summarize(x)
	read := func(p float64) float64 {
		i := slices.IndexFunc(below, func(b float64) bool { return b >= p })
		if below[i] == p {
			return values[i]
		}
		g := (p - below[i-1]) / (below[i] - below[i-1])
		return values[i-1] + g*(values[i]-values[i-1])
	}
	for _, c := range []struct{ p, want float64 }{{0.1, s.P90}, {0.5, s.P50}, {0.9, s.P10}} {
		if got := read(c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("S-curve read at %g: %.17g, Summarize %.17g", c.p, got, c.want)
		}
	}
	values, below, err = Cumulative([]float64{7})
	if err != nil || !slices.Equal(values, []float64{7, 7}) || !slices.Equal(below, []float64{0, 1}) {
		t.Errorf("Cumulative of one value = %v, %v, %v; want the vertical step (7, 0), (7, 1)", values, below, err)
	}
}

// TestSampleErrors checks that empty samples and failed cases (NaN, ±Inf)
// are refused by every summary.
func TestSampleErrors(t *testing.T) {
	for _, c := range []struct {
		x    []float64
		want string
	}{{nil, "no values"}, {[]float64{1, math.NaN()}, "value 1 is NaN"}, {[]float64{math.Inf(-1), 2}, "value 0 is -Inf"}} {
		_, e1 := Summarize(c.x)
		_, e2 := SampleQuantile(c.x, 0.5)
		_, e3 := Exceedance(c.x, 1)
		_, _, e4 := Histogram(c.x, 5)
		_, _, e5 := Cumulative(c.x)
		for i, err := range []error{e1, e2, e3, e4, e5} {
			if !errors.Is(err, ErrBadSample) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("summary %d of %v: %v, want an ErrBadSample saying %q", i, c.x, err, c.want)
			}
		}
	}
}

// TestLognormalProduct is a worked closed form: a product of independent
// lognormals is lognormal, of μ the sum of the μs and σ the root of the
// sum of the σ²s (Johnson, Kotz and Balakrishnan 1994, Ch. 14), so its
// P90, P50 and P10 are exp(μ ∓ Z90 σ) and exp(μ), and its mean
// exp(μ + σ²/2). Three invented factors of a volume (an area, a
// thickness and a recovery factor, a fixed factor besides) are sampled by
// a Latin hypercube of 10⁴ cases; the sample's percentiles and mean must
// match within four standard errors (√(p(1 − p)/n)/f(x_p), and s/√n).
func TestLognormalProduct(t *testing.T) {
	area, err := NewLognormal(4e6, 0.55) // m², invented
	if err != nil {
		t.Fatal(err)
	}
	thick, err := NewLognormal(25, 0.7) // m, invented
	if err != nil {
		t.Fatal(err)
	}
	rf := NewLognormalLog(math.Log(0.45), 0.15) // invented
	fixed := Uniform{0.18, 0.18}                // a porosity held fixed
	factors := []Distribution{area, thick, rf, fixed}
	mu := math.Log(0.18)
	var s2 float64
	for _, d := range []Lognormal{area, thick, rf} {
		mu += d.Mu()
		s2 += d.Sigma * d.Sigma
	}
	sigma := math.Sqrt(s2)

	const n = 10000
	u, err := LatinHypercube(n, len(factors), 8)
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, n)
	for i, row := range u {
		x[i] = 1
		for j, d := range factors {
			x[i] *= d.Quantile(row[j])
		}
	}
	s, err := Summarize(x)
	if err != nil {
		t.Fatal(err)
	}
	pdf := func(v float64) float64 { return refPdf((math.Log(v)-mu)/sigma) / (v * sigma) }
	for _, c := range []struct {
		name string
		p    float64
		got  float64
		want float64
	}{
		{"P90", 0.1, s.P90, math.Exp(mu - 1.2815515655446004*sigma)},
		{"P50", 0.5, s.P50, math.Exp(mu)},
		{"P10", 0.9, s.P10, math.Exp(mu + 1.2815515655446004*sigma)},
	} {
		se := math.Sqrt(c.p*(1-c.p)/n) / pdf(c.want)
		if math.Abs(c.got-c.want) > 4*se {
			t.Errorf("product of lognormals: %s %.6g, want %.6g within 4 × %.3g", c.name, c.got, c.want, se)
		}
	}
	mean := math.Exp(mu + s2/2)
	if se := s.SD / math.Sqrt(n); math.Abs(s.Mean-mean) > 4*se {
		t.Errorf("product of lognormals: mean %.6g, want %.6g within 4 × %.3g", s.Mean, mean, se)
	}
}
