package uncertain

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
)

// ErrBadCorrelation is wrapped by the errors of ImanConover and Spearman.
var ErrBadCorrelation = errors.New("invalid rank correlation")

// symTolerance is how far a target correlation matrix may be from
// symmetric, or its diagonal from 1.
const symTolerance = 1e-12

// A CorrelationError says which entry of a target rank-correlation matrix
// is wrong: the pair of columns (inputs) I and J, counted from 0, and why.
// It wraps ErrBadCorrelation.
type CorrelationError struct {
	I, J   int    // the columns, I ≤ J
	Reason string // what is wrong and what to do; may name other columns
}

func (e *CorrelationError) Error() string {
	if e.I == e.J {
		return fmt.Sprintf("%v: target entry (%d, %d): %s", ErrBadCorrelation, e.I, e.J, e.Reason)
	}
	return fmt.Sprintf("%v: target for columns %d and %d: %s", ErrBadCorrelation, e.I, e.J, e.Reason)
}

// Unwrap returns ErrBadCorrelation.
func (e *CorrelationError) Unwrap() error { return ErrBadCorrelation }

// ImanConover returns the design u with the values of each column
// reordered so that the columns have, approximately, the rank correlations
// of target, by the method of Iman and Conover (1982). The values of each
// column, and so each input's marginal distribution, are unchanged; only
// their pairing into rows changes. u is not modified.
//
// The steps, for n rows and k columns:
//
//  1. The van der Waerden scores a_i = Φ⁻¹(i/(n+1)), i = 1, …, n, are put
//     in a random order of their own in each column of an n×k matrix R
//     (the permutations drawn from streams derived from seed).
//  2. The target C, a matrix of rank (Spearman) correlations, becomes the
//     linear correlation of normal scores that gives them,
//     2 sin(π ρ/6) entry by entry (the inverse of Pearson's relation
//     ρ_S = (6/π) arcsin(ρ/2) for a bivariate normal; Kruskal (1958)).
//     Iman and Conover use C itself, which gives rank correlations up to
//     0.018 smaller in magnitude.
//  3. P is the lower Cholesky factor of that matrix, Q that of the sample
//     correlation T of R's columns, and R* = R (P Q⁻¹)ᵀ, whose sample
//     correlation is exactly P Pᵀ.
//  4. Each column of u is rearranged so that its values have the ranks of
//     the same column of R*.
//
// target must be k×k, symmetric and with unit diagonal (within 1e-12),
// with entries in [−1, 1], and positive definite; n must exceed k, so that
// T can be positive definite. An error about an entry of target is a
// *CorrelationError naming the pair; every error wraps ErrBadCorrelation,
// and the design returned with it is nil.
func ImanConover(u [][]float64, target [][]float64, seed uint64) ([][]float64, error) {
	n := len(u)
	if n == 0 {
		return nil, fmt.Errorf("%w: the design has no rows", ErrBadCorrelation)
	}
	k := len(u[0])
	for i, row := range u {
		if len(row) != k {
			return nil, fmt.Errorf("%w: design row %d has %d values, row 0 %d: a design is a rectangular matrix", ErrBadCorrelation, i, len(row), k)
		}
		for j, v := range row {
			if math.IsNaN(v) {
				return nil, fmt.Errorf("%w: design value (%d, %d) is NaN", ErrBadCorrelation, i, j)
			}
		}
	}
	if k == 0 {
		return nil, fmt.Errorf("%w: the design has no columns", ErrBadCorrelation)
	}
	if err := checkTarget(target, k); err != nil {
		return nil, err
	}
	if n <= k {
		return nil, fmt.Errorf("%w: %d rows for %d columns: inducing a correlation needs more cases than inputs", ErrBadCorrelation, n, k)
	}

	// 2. The linear correlation of the scores that gives the target's rank
	// correlations, and its Cholesky factor P.
	c := square(k)
	for i := range k {
		for j := range k {
			if i == j {
				c[i][j] = 1
			} else {
				c[i][j] = 2 * math.Sin(math.Pi*target[i][j]/6)
			}
		}
	}
	p, fail := cholesky(c)
	if fail >= 0 {
		return nil, fmt.Errorf("%w: the target is positive definite, but not the linear correlation of normal scores it converts to, 2 sin(π ρ/6), from column %d on: move the correlations of column %d away from ±1 or from each other", ErrBadCorrelation, fail, fail)
	}

	// 1. Scores in a random order per column.
	scores := make([]float64, n)
	for i := range scores {
		scores[i] = probit(float64(i+1) / float64(n+1))
	}
	r := matrix(n, k)
	perm := make([]int, n)
	s := derive(seed, tagImanCon)
	for j := range k {
		shuffle(Stream(s, uint64(j)), perm)
		for i, pi := range perm {
			r[i][j] = scores[pi]
		}
	}

	// 3. Q from the sample correlation of R, then each row r of R becomes
	// P Q⁻¹ rᵀ: y solves Q y = rᵀ by forward substitution, r* = P y.
	q, fail := cholesky(correlation(r))
	if fail >= 0 {
		return nil, fmt.Errorf("%w: the random scores of %d rows came out linearly dependent (column %d): use more cases or another seed", ErrBadCorrelation, n, fail)
	}
	y := make([]float64, k)
	for _, row := range r {
		for a := range k {
			v := row[a]
			for b := range a {
				v -= q[a][b] * y[b]
			}
			y[a] = v / q[a][a]
		}
		for a := range k {
			v := 0.0
			for b := 0; b <= a; b++ {
				v += p[a][b] * y[b]
			}
			row[a] = v
		}
	}

	// 4. Each column of u takes the ranks of its column of R*.
	out := matrix(n, k)
	sorted := make([]float64, n)
	order := make([]int, n)
	for j := range k {
		for i := range n {
			sorted[i] = u[i][j]
			order[i] = i
		}
		slices.Sort(sorted)
		slices.SortFunc(order, func(a, b int) int {
			return cmp.Or(cmp.Compare(r[a][j], r[b][j]), cmp.Compare(a, b))
		})
		for rank, i := range order {
			out[i][j] = sorted[rank]
		}
	}
	return out, nil
}

// square returns a k×k matrix of zeros.
func square(k int) [][]float64 { return matrix(k, k) }

// checkTarget reports a target rank-correlation matrix that is not k×k,
// not symmetric with unit diagonal, has an entry outside [−1, 1], or is
// not positive definite.
func checkTarget(t [][]float64, k int) error {
	if len(t) != k {
		return fmt.Errorf("%w: the target has %d rows for a design of %d columns: give a %d×%d matrix", ErrBadCorrelation, len(t), k, k, k)
	}
	for i, row := range t {
		if len(row) != k {
			return fmt.Errorf("%w: target row %d has %d entries: give a %d×%d matrix", ErrBadCorrelation, i, len(row), k, k)
		}
	}
	for i := range k {
		if v := t[i][i]; !(math.Abs(v-1) <= symTolerance) {
			return &CorrelationError{I: i, J: i, Reason: fmt.Sprintf("the diagonal is %g: a column's correlation with itself is 1", v)}
		}
		for j := i + 1; j < k; j++ {
			v, w := t[i][j], t[j][i]
			switch {
			case !(v >= -1 && v <= 1):
				return &CorrelationError{I: i, J: j, Reason: fmt.Sprintf("%g lies outside [-1, 1]", v)}
			case !(math.Abs(v-w) <= symTolerance):
				return &CorrelationError{I: i, J: j, Reason: fmt.Sprintf("%g, but %g for columns %d and %d: the matrix must be symmetric", v, w, j, i)}
			case math.Abs(v) == 1:
				return &CorrelationError{I: i, J: j, Reason: fmt.Sprintf("%g: perfectly correlated inputs are one input; use a correlation strictly between -1 and 1", v)}
			}
		}
	}
	if _, fail := cholesky(t); fail < 0 {
		return nil
	}
	// Not positive definite: name the pair that is furthest outside the
	// range that its correlations with a third column allow. For three
	// columns with correlations a = ρ_ij, b = ρ_il and c = ρ_jl, the matrix
	// is positive definite if and only if a lies strictly between
	// b c ∓ √((1 − b²)(1 − c²)) (its determinant
	// 1 − a² − b² − c² + 2abc is then positive).
	var worst *CorrelationError
	worstOff := 0.0
	for i := range k {
		for j := i + 1; j < k; j++ {
			for l := range k {
				if l == i || l == j {
					continue
				}
				a, b, c := t[i][j], t[i][l], t[j][l]
				h := math.Sqrt((1 - b*b) * (1 - c*c))
				lo, hi := b*c-h, b*c+h
				off := math.Max(lo-a, a-hi)
				if off < 0 || worst != nil && off <= worstOff {
					continue
				}
				worstOff = off
				worst = &CorrelationError{I: i, J: j, Reason: fmt.Sprintf(
					"%g cannot go with %g for columns %d and %d and %g for columns %d and %d: given those it must lie strictly between %.4g and %.4g (the matrix is not positive definite); change one of the three",
					a, b, min(i, l), max(i, l), c, min(j, l), max(j, l), tidy(lo), tidy(hi))}
			}
		}
	}
	if worst != nil {
		return worst
	}
	// Every three columns are consistent, yet not all together: name the
	// column where the Cholesky factorisation fails and its largest
	// correlation with the columns before it.
	_, fail := cholesky(t)
	i := 0
	for l := range fail {
		if math.Abs(t[l][fail]) > math.Abs(t[i][fail]) {
			i = l
		}
	}
	return &CorrelationError{I: i, J: fail, Reason: fmt.Sprintf(
		"the matrix is not positive definite: the correlations of column %d with columns 0 to %d are inconsistent with theirs among themselves, its largest being %g with column %d; weaken some of them",
		fail, fail-1, t[i][fail], i)}
}

// tidy returns x with a rounding error about 0 made 0, for messages.
func tidy(x float64) float64 {
	if math.Abs(x) < 1e-12 {
		return 0
	}
	return x
}

// cholesky returns the lower-triangular L with L Lᵀ = a for a symmetric
// k×k matrix a, and −1; or, if a is not positive definite, nil and the
// first column whose pivot is not positive. It reads only the lower
// triangle.
func cholesky(a [][]float64) (l [][]float64, fail int) {
	k := len(a)
	l = square(k)
	for j := range k {
		d := a[j][j]
		for m := range j {
			d -= l[j][m] * l[j][m]
		}
		if !(d > 0) {
			return nil, j
		}
		l[j][j] = math.Sqrt(d)
		for i := j + 1; i < k; i++ {
			v := a[i][j]
			for m := range j {
				v -= l[i][m] * l[j][m]
			}
			l[i][j] = v / l[j][j]
		}
	}
	return l, -1
}

// correlation returns the k×k sample (Pearson) correlation of the columns
// of the n×k matrix x.
func correlation(x [][]float64) [][]float64 {
	n, k := len(x), len(x[0])
	mean := make([]float64, k)
	for _, row := range x {
		for j, v := range row {
			mean[j] += v
		}
	}
	for j := range mean {
		mean[j] /= float64(n)
	}
	cov := square(k)
	for _, row := range x {
		for a := range k {
			da := row[a] - mean[a]
			for b := 0; b <= a; b++ {
				cov[a][b] += da * (row[b] - mean[b])
			}
		}
	}
	c := square(k)
	for a := range k {
		for b := 0; b <= a; b++ {
			v := cov[a][b] / math.Sqrt(cov[a][a]*cov[b][b])
			if a == b {
				v = 1
			}
			c[a][b], c[b][a] = v, v
		}
	}
	return c
}

// ranks returns the ranks of x, 1 to n, ties given the average of the ranks
// they span.
func ranks(x []float64) []float64 {
	n := len(x)
	order := make([]int, n)
	for i := range order {
		order[i] = i
	}
	slices.SortFunc(order, func(a, b int) int { return cmp.Compare(x[a], x[b]) })
	r := make([]float64, n)
	for i := 0; i < n; {
		j := i + 1
		for j < n && x[order[j]] == x[order[i]] {
			j++
		}
		avg := float64(i+j+1) / 2 // the mean of the ranks i+1, …, j
		for m := i; m < j; m++ {
			r[order[m]] = avg
		}
		i = j
	}
	return r
}

// Spearman returns Spearman's rank correlation of x and y: the Pearson
// correlation of their ranks, ties given average ranks (Kruskal (1958)).
// x and y must have the same length, at least 2, hold no NaN, and neither
// be constant (its rank correlation is then undefined); otherwise the
// error wraps ErrBadCorrelation.
func Spearman(x, y []float64) (float64, error) {
	switch {
	case len(x) != len(y):
		return 0, fmt.Errorf("%w: %d values of x but %d of y: give pairs", ErrBadCorrelation, len(x), len(y))
	case len(x) < 2:
		return 0, fmt.Errorf("%w: %d pairs: a correlation needs at least 2", ErrBadCorrelation, len(x))
	}
	for i := range x {
		if math.IsNaN(x[i]) || math.IsNaN(y[i]) {
			return 0, fmt.Errorf("%w: pair %d holds a NaN", ErrBadCorrelation, i)
		}
	}
	rx, ry := ranks(x), ranks(y)
	mean := float64(len(x)+1) / 2
	var sxy, sxx, syy float64
	for i := range rx {
		dx, dy := rx[i]-mean, ry[i]-mean
		sxy += dx * dy
		sxx += dx * dx
		syy += dy * dy
	}
	switch {
	case sxx == 0:
		return 0, fmt.Errorf("%w: x is constant: its rank correlation with anything is undefined", ErrBadCorrelation)
	case syy == 0:
		return 0, fmt.Errorf("%w: y is constant: its rank correlation with anything is undefined", ErrBadCorrelation)
	}
	return sxy / math.Sqrt(sxx*syy), nil
}
