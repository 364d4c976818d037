package uncertain

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// TestSpearman checks Spearman's coefficient on a worked example and on
// cases with ties worked by hand from the definition (the Pearson
// correlation of the ranks, ties at their average rank).
func TestSpearman(t *testing.T) {
	for _, c := range []struct {
		name string
		x, y []float64
		want float64
		src  string
	}{{
		name: "IQ against hours of television",
		x:    []float64{106, 100, 86, 101, 99, 103, 97, 113, 112, 110},
		y:    []float64{7, 27, 2, 50, 28, 29, 20, 12, 6, 17},
		want: -29.0 / 165, // 1 − 6 Σd²/(n(n² − 1)) with Σd² = 194, n = 10
		src:  "the worked example of Wikipedia's article on Spearman's rank correlation, from memory; Σd² = 194 checked by hand",
	}, {
		name: "a tie in x",
		x:    []float64{1, 2, 2, 3},
		y:    []float64{1, 2, 3, 4},
		want: 3 / math.Sqrt(10), // ranks 1, 2.5, 2.5, 4 against 1, 2, 3, 4: 4.5/√(4.5 × 5)
		src:  "by hand",
	}, {
		name: "ties in both",
		x:    []float64{5, 5, 7, 7},
		y:    []float64{1, 3, 3, 9},
		want: 1 / math.Sqrt(2), // ranks 1.5, 1.5, 3.5, 3.5 against 1, 2.5, 2.5, 4: 3/√(4 × 4.5)
		src:  "by hand",
	}, {
		name: "a monotone transform",
		x:    []float64{0.3, -2, 7, 1.5, 4, 0},
		y:    []float64{math.Exp(0.3), math.Exp(-2), math.Exp(7), math.Exp(1.5), math.Exp(4), 1},
		want: 1,
		src:  "ranks are unchanged by an increasing transform",
	}, {
		name: "a decreasing transform",
		x:    []float64{0.3, -2, 7, 1.5, 4, 0},
		y:    []float64{-0.3, 2, -7, -1.5, -4, 0},
		want: -1,
		src:  "ranks reversed",
	}} {
		got, err := Spearman(c.x, c.y)
		if err != nil || math.Abs(got-c.want) > 1e-15 {
			t.Errorf("%s: Spearman = %.17g, %v; want %.17g (%s)", c.name, got, err, c.want, c.src)
		}
	}
	for _, c := range []struct {
		x, y []float64
		want string
	}{
		{[]float64{1, 2}, []float64{1}, "2 values of x but 1 of y"},
		{[]float64{1}, []float64{1}, "at least 2"},
		{[]float64{3, 3, 3}, []float64{1, 2, 3}, "x is constant"},
		{[]float64{1, 2, 3}, []float64{4, 4, 4}, "y is constant"},
		{[]float64{1, math.NaN()}, []float64{1, 2}, "NaN"},
	} {
		if _, err := Spearman(c.x, c.y); !errors.Is(err, ErrBadCorrelation) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("Spearman(%v, %v): %v, want an ErrBadCorrelation saying %q", c.x, c.y, err, c.want)
		}
	}
}

// symmetric returns the k×k correlation matrix with the given entries
// above the diagonal, row by row.
func symmetric(k int, upper ...float64) [][]float64 {
	m := square(k)
	for i := range k {
		m[i][i] = 1
		for j := i + 1; j < k; j++ {
			m[i][j], m[j][i] = upper[0], upper[0]
			upper = upper[1:]
		}
	}
	return m
}

// TestImanConover checks that the method of Iman and Conover (1982) gives
// three inputs the rank correlations asked for, within 0.05 at 1000 cases
// and within 0.02 at 10⁴, the sampling error of a rank correlation being
// about (1 − ρ²)/√n; that each column keeps its values; that the design
// passed in is not modified; and that the result depends on the seed only.
func TestImanConover(t *testing.T) {
	for _, target := range [][][]float64{
		symmetric(3, -0.6, 0.3, 0.1),
		symmetric(3, 0.8, 0.3, 0.5),
		symmetric(3, 0, 0, 0),
	} {
		for _, c := range []struct {
			n   int
			tol float64
		}{{1000, 0.05}, {10000, 0.02}} {
			for _, dsn := range []struct {
				name string
				f    func(n, k int, seed uint64) ([][]float64, error)
			}{{"Monte Carlo", MonteCarlo}, {"Latin hypercube", LatinHypercube}} {
				u, err := dsn.f(c.n, 3, 5)
				if err != nil {
					t.Fatal(err)
				}
				before := clone(u)
				v, err := ImanConover(u, target, 99)
				if err != nil {
					t.Fatalf("%s, n=%d, target %v: %v", dsn.name, c.n, target, err)
				}
				for i := range u {
					if !slices.Equal(u[i], before[i]) {
						t.Fatalf("%s, n=%d: ImanConover modified its input at row %d", dsn.name, c.n, i)
					}
				}
				for j := range 3 {
					a, b := column(u, j), column(v, j)
					slices.Sort(a)
					slices.Sort(b)
					if !slices.Equal(a, b) {
						t.Errorf("%s, n=%d: column %d does not hold the same values after reordering", dsn.name, c.n, j)
					}
				}
				for i := range 3 {
					for j := i + 1; j < 3; j++ {
						r, err := Spearman(column(v, i), column(v, j))
						if err != nil {
							t.Fatal(err)
						}
						if math.Abs(r-target[i][j]) > c.tol {
							t.Errorf("%s, n=%d: rank correlation of columns %d and %d is %.4f, want %g within %g (Iman and Conover 1982)", dsn.name, c.n, i, j, r, target[i][j], c.tol)
						}
					}
				}
				again, _ := ImanConover(u, target, 99)
				other, _ := ImanConover(u, target, 100)
				differ := false
				for i := range v {
					if !slices.Equal(v[i], again[i]) {
						t.Fatalf("%s, n=%d: ImanConover with seed 99 twice differs at row %d", dsn.name, c.n, i)
					}
					differ = differ || !slices.Equal(v[i], other[i])
				}
				if !differ {
					t.Errorf("%s, n=%d: ImanConover with seeds 99 and 100 gives the same design", dsn.name, c.n)
				}
			}
		}
	}
}

// TestImanConoverMeans checks, over 20 seeds of 1000 cases, that the mean
// rank correlation reached is within 0.005 of the target: the conversion
// 2 sin(πρ/6) of the rank correlations to those of the normal scores
// removes the bias of up to 0.018 (Kruskal 1958) that Iman and Conover's
// use of the target itself leaves (at ρ = 0.6, (6/π) arcsin(0.3) = 0.582).
func TestImanConoverMeans(t *testing.T) {
	target := symmetric(3, 0.6, -0.4, 0.2)
	var sum [3][3]float64
	const seeds = 20
	for seed := range uint64(seeds) {
		u, err := LatinHypercube(1000, 3, seed)
		if err != nil {
			t.Fatal(err)
		}
		v, err := ImanConover(u, target, seed)
		if err != nil {
			t.Fatal(err)
		}
		for i := range 3 {
			for j := i + 1; j < 3; j++ {
				r, _ := Spearman(column(v, i), column(v, j))
				sum[i][j] += r / seeds
			}
		}
	}
	for i := range 3 {
		for j := i + 1; j < 3; j++ {
			if math.Abs(sum[i][j]-target[i][j]) > 0.005 {
				t.Errorf("columns %d and %d: mean rank correlation %.4f over %d seeds, want %g within 0.005", i, j, sum[i][j], seeds, target[i][j])
			}
		}
	}
}

// TestImanConoverErrors checks the targets and designs it refuses, and
// that an inconsistent target names the pair of columns to change.
func TestImanConoverErrors(t *testing.T) {
	u, err := LatinHypercube(100, 3, 1)
	if err != nil {
		t.Fatal(err)
	}
	bad := func(f func(m [][]float64)) [][]float64 {
		m := symmetric(3, 0.2, 0.1, 0.3)
		f(m)
		return m
	}
	for _, c := range []struct {
		name   string
		u      [][]float64
		target [][]float64
		i, j   int // the pair a *CorrelationError names; -1 for another error
		want   string
	}{
		{"not 3×3", u, symmetric(2, 0.5), -1, -1, "2 rows for a design of 3 columns"},
		{"ragged", u, [][]float64{{1, 0, 0}, {0, 1}, {0, 0, 1}}, -1, -1, "row 1 has 2 entries"},
		{"diagonal", u, bad(func(m [][]float64) { m[1][1] = 0.9 }), 1, 1, "the diagonal is 0.9"},
		{"asymmetric", u, bad(func(m [][]float64) { m[2][0] = 0.4 }), 0, 2, "must be symmetric"},
		{"above 1", u, bad(func(m [][]float64) { m[0][1], m[1][0] = 1.2, 1.2 }), 0, 1, "outside [-1, 1]"},
		{"NaN", u, bad(func(m [][]float64) { m[0][1], m[1][0] = math.NaN(), math.NaN() }), 0, 1, "outside [-1, 1]"},
		{"perfect", u, bad(func(m [][]float64) { m[1][2], m[2][1] = -1, -1 }), 1, 2, "perfectly correlated"},
		// ρ01 = −0.6, ρ12 = 0.8 allow ρ02 only in (−0.96, 0), which 0.3
		// misses by the most of the three: ρ01 = −0.6 and ρ12 = 0.8
		// miss their ranges (−0.33, 0.81) and (−0.94, 0.58) by less.
		{"inconsistent", u, symmetric(3, -0.6, 0.3, 0.8), 0, 2, "strictly between -0.96 and 0"},
		{"few rows", u[:3], symmetric(3, 0.2, 0.1, 0.3), -1, -1, "3 rows for 3 columns"},
		{"no rows", nil, symmetric(3, 0.2, 0.1, 0.3), -1, -1, "no rows"},
		{"NaN in the design", [][]float64{{0.1, 0.2, 0.3}, {0.4, math.NaN(), 0.6}}, symmetric(3, 0, 0, 0), -1, -1, "(1, 1) is NaN"},
	} {
		v, err := ImanConover(c.u, c.target, 1)
		var ce *CorrelationError
		switch {
		case v != nil || !errors.Is(err, ErrBadCorrelation) || !strings.Contains(err.Error(), c.want):
			t.Errorf("%s: %v; want an ErrBadCorrelation saying %q", c.name, err, c.want)
		case c.i >= 0 && (!errors.As(err, &ce) || ce.I != c.i || ce.J != c.j):
			t.Errorf("%s: %v; want a *CorrelationError naming columns %d and %d", c.name, err, c.i, c.j)
		}
	}
	// Four columns of equal correlation −0.34: every three are consistent
	// (the 3×3 matrix's smallest eigenvalue is 1 + 2ρ = 0.32) but not all
	// four (1 + 3ρ = −0.02), which the factorisation finds at column 3.
	w, err := LatinHypercube(100, 4, 1)
	if err != nil {
		t.Fatal(err)
	}
	_, err = ImanConover(w, symmetric(4, -0.34, -0.34, -0.34, -0.34, -0.34, -0.34), 1)
	var ce *CorrelationError
	if !errors.As(err, &ce) || ce.J != 3 || !strings.Contains(err.Error(), "not positive definite") {
		t.Errorf("equicorrelation -0.34 of 4 columns: %v; want a *CorrelationError at column 3 saying it is not positive definite", err)
	}
}

func clone(u [][]float64) [][]float64 {
	c := make([][]float64, len(u))
	for i, row := range u {
		c[i] = slices.Clone(row)
	}
	return c
}

func column(u [][]float64, j int) []float64 {
	c := make([]float64, len(u))
	for i, row := range u {
		c[i] = row[j]
	}
	return c
}
