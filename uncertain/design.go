package uncertain

import (
	"errors"
	"fmt"
)

// ErrBadDesign is wrapped by the errors of MonteCarlo and LatinHypercube.
var ErrBadDesign = errors.New("invalid sampling design")

// MaxDesignValues bounds n × k, the u-values of one design (800 MB of
// float64).
const MaxDesignValues = 100_000_000

// checkSize reports a number of cases or inputs below 1 and a design too
// large to hold.
func checkSize(n, k int) error {
	switch {
	case n < 1:
		return fmt.Errorf("%w: %d cases: ask for at least 1", ErrBadDesign, n)
	case k < 1:
		return fmt.Errorf("%w: %d inputs: a design needs at least 1 uncertain input", ErrBadDesign, k)
	case n > MaxDesignValues/k:
		return fmt.Errorf("%w: %d cases of %d inputs are more than %d values: ask for fewer cases", ErrBadDesign, n, k, MaxDesignValues)
	}
	return nil
}

// matrix returns n rows of k values on one backing array.
func matrix(n, k int) [][]float64 {
	data := make([]float64, n*k)
	m := make([][]float64, n)
	for i := range m {
		m[i] = data[i*k : (i+1)*k : (i+1)*k]
	}
	return m
}

// MonteCarlo returns n cases of k independent uniform u-values in (0, 1),
// the simple random sampling of McKay, Beckman and Conover (1979). Row i
// holds the first k draws (open01) of its own stream, derived from seed
// and the row number: the same seed gives the same design, and a design of
// n cases is the first n rows of a larger one. n and k must be at least 1
// and n × k at most MaxDesignValues; otherwise the error wraps
// ErrBadDesign and the design is nil.
func MonteCarlo(n, k int, seed uint64) ([][]float64, error) {
	if err := checkSize(n, k); err != nil {
		return nil, err
	}
	u := matrix(n, k)
	s := derive(seed, tagMonteCarlo)
	for i, row := range u {
		r := Stream(s, uint64(i))
		for j := range row {
			row[j] = open01(r)
		}
	}
	return u, nil
}

// LatinHypercube returns n cases of k u-values in (0, 1) by Latin
// hypercube sampling (McKay, Beckman and Conover (1979)): each column has
// exactly one value in each of the n strata [i/n, (i+1)/n), i = 0, …, n−1,
// at a uniformly random position within its stratum, and the strata are
// assigned to the rows by an independent random permutation per column, so
// the columns are independent. Column j draws its permutation (a
// Fisher–Yates shuffle) and then its n positions from its own stream,
// derived from seed and j; the same seed gives the same design.
//
// The value of stratum s is (s + v)/n with v uniform in (0, 1). Should
// rounding put it outside [s/n, (s+1)/n) as float64 computes those bounds,
// or give int(u n) ≠ s, v is drawn again: the strata hold exactly one value
// each in floating point as well.
//
// n and k must be at least 1 and n × k at most MaxDesignValues; otherwise
// the error wraps ErrBadDesign and the design is nil.
func LatinHypercube(n, k int, seed uint64) ([][]float64, error) {
	if err := checkSize(n, k); err != nil {
		return nil, err
	}
	u := matrix(n, k)
	s := derive(seed, tagLatin)
	perm := make([]int, n)
	fn := float64(n)
	for j := range k {
		r := Stream(s, uint64(j))
		shuffle(r, perm)
		for i, stratum := range perm {
			lo, hi := float64(stratum)/fn, float64(stratum+1)/fn
			for {
				x := (float64(stratum) + open01(r)) / fn
				if x >= lo && x < hi && x > 0 && x < 1 && int(x*fn) == stratum {
					u[i][j] = x
					break
				}
			}
		}
	}
	return u, nil
}
