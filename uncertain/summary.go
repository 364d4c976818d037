package uncertain

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
)

// ErrBadSample is wrapped by the errors of the summaries of a sample.
var ErrBadSample = errors.New("invalid sample")

// checkSample reports an empty sample and a value that is NaN or infinite
// (a failed case, which the caller leaves out or reports).
func checkSample(x []float64) error {
	if len(x) == 0 {
		return fmt.Errorf("%w: no values", ErrBadSample)
	}
	for i, v := range x {
		if !finite(v) {
			return fmt.Errorf("%w: value %d is %g: leave out the cases that failed, and say how many", ErrBadSample, i, v)
		}
	}
	return nil
}

// sortedCopy returns x sorted in increasing order, x unchanged.
func sortedCopy(x []float64) []float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	return s
}

// type7 returns the p-quantile of the sorted sample s by definition 7 of
// Hyndman and Fan (1996): with h = (n − 1) p, j = ⌊h⌋ and g = h − j,
// s[j] + g (s[j+1] − s[j]) (0-based), linear interpolation between the
// order statistics at the plotting positions (i − 1)/(n − 1). Where the two
// neighbours are equal it returns their value exactly.
func type7(s []float64, p float64) float64 {
	h := float64(len(s)-1) * p
	j := int(math.Floor(h))
	if j >= len(s)-1 {
		return s[len(s)-1]
	}
	g := h - float64(j)
	if g == 0 || s[j] == s[j+1] {
		return s[j]
	}
	return s[j] + g*(s[j+1]-s[j])
}

// SampleQuantile returns the p-quantile of the sample x, p in [0, 1], by
// definition 7 of Hyndman and Fan (1996): linear interpolation between the
// order statistics x₍₁₎ ≤ … ≤ x₍ₙ₎ placed at probabilities (i − 1)/(n − 1),
// so the 0- and 1-quantiles are the minimum and the maximum. x is not
// modified. An empty sample, a value that is not finite, or p outside
// [0, 1] is an error wrapping ErrBadSample.
func SampleQuantile(x []float64, p float64) (float64, error) {
	if err := checkSample(x); err != nil {
		return 0, err
	}
	if !(p >= 0 && p <= 1) {
		return 0, fmt.Errorf("%w: probability %g lies outside [0, 1]", ErrBadSample, p)
	}
	return type7(sortedCopy(x), p), nil
}

// A Summary describes a sample of an output. P90, P50 and P10 follow the
// reserves convention: P90 is the value exceeded with probability 0.9,
// the 10th percentile, and P10 the 90th percentile, so P90 ≤ P50 ≤ P10;
// all three by definition 7 of Hyndman and Fan (1996) (SampleQuantile).
type Summary struct {
	N             int     // number of values
	Mean          float64 // arithmetic mean
	SD            float64 // sample standard deviation, with n − 1; 0 for one value
	Min, Max      float64
	P90, P50, P10 float64 // the 10th, 50th and 90th percentiles
}

// Summarize returns the summary of the sample x, which it does not modify.
// The mean is computed about the first value, m = x₁ + Σ(xᵢ − x₁)/n, so
// that a sample of equal values has exactly that value for mean; the
// standard deviation by the corrected two-pass algorithm of Chan, Golub
// and LeVeque (1983). An empty sample or a value that is not finite is an
// error wrapping ErrBadSample.
func Summarize(x []float64) (Summary, error) {
	if err := checkSample(x); err != nil {
		return Summary{}, err
	}
	n := float64(len(x))
	shift, d := x[0], 0.0
	for _, v := range x {
		d += v - shift
	}
	mean := shift + d/n
	var ss, sd float64
	if len(x) > 1 {
		var s1, s2 float64
		for _, v := range x {
			e := v - mean
			s1 += e
			s2 += e * e
		}
		// Chan, Golub and LeVeque (1983): the second term corrects
		// for the rounding error of the mean.
		ss = s2 - s1*s1/n
		sd = math.Sqrt(math.Max(ss, 0) / (n - 1))
	}
	s := sortedCopy(x)
	return Summary{
		N:    len(x),
		Mean: mean,
		SD:   sd,
		Min:  s[0],
		Max:  s[len(s)-1],
		P90:  type7(s, 0.1),
		P50:  type7(s, 0.5),
		P10:  type7(s, 0.9),
	}, nil
}

// Exceedance returns the fraction of the values of x strictly above
// threshold: the probability of exceeding it that the sample estimates. An
// empty sample, a value that is not finite or a NaN threshold is an error
// wrapping ErrBadSample.
func Exceedance(x []float64, threshold float64) (float64, error) {
	if err := checkSample(x); err != nil {
		return 0, err
	}
	if math.IsNaN(threshold) {
		return 0, fmt.Errorf("%w: the threshold is NaN", ErrBadSample)
	}
	above := 0
	for _, v := range x {
		if v > threshold {
			above++
		}
	}
	return float64(above) / float64(len(x)), nil
}

// MaxBins bounds the number of bins of a histogram.
const MaxBins = 100_000

// Histogram counts the values of x in bins of equal width from the
// sample's minimum to its maximum: bin i holds the values in
// [edges[i], edges[i+1]), the last bin its upper edge too, so the counts
// sum to len(x). edges has bins+1 increasing entries,
// edges[i] = min + (max − min) i/bins, the last exactly max. When all
// values are equal the histogram is one bin of zero width, edges
// {v, v} and counts {len(x)}, whatever bins asks. bins must be 1 to
// MaxBins; that, an empty sample or a value that is not finite is an
// error wrapping ErrBadSample.
func Histogram(x []float64, bins int) (edges []float64, counts []int, err error) {
	if err := checkSample(x); err != nil {
		return nil, nil, err
	}
	if bins < 1 || bins > MaxBins {
		return nil, nil, fmt.Errorf("%w: %d bins: ask for 1 to %d", ErrBadSample, bins, MaxBins)
	}
	lo, hi := slices.Min(x), slices.Max(x)
	if lo == hi {
		return []float64{lo, hi}, []int{len(x)}, nil
	}
	edges = make([]float64, bins+1)
	for i := range edges {
		edges[i] = lo + (hi-lo)*float64(i)/float64(bins)
	}
	edges[bins] = hi
	counts = make([]int, bins)
	for _, v := range x {
		// The last edge at or below v; the maximum goes in the last bin.
		i := sort.Search(len(edges), func(i int) bool { return edges[i] > v }) - 1
		counts[min(i, bins-1)]++
	}
	return edges, counts, nil
}

// Cumulative returns the points of the sample's cumulative curve (an
// S-curve): the values of x sorted in increasing order, and beside each
// the fraction of the sample below it, (i − 1)/(n − 1) for the i-th value,
// the plotting positions of definition 7 of Hyndman and Fan (1996).
// Joined by straight lines the points are that definition's quantile
// function turned on its side, so the P90, P50 and P10 read off the curve
// are those of Summarize; the probability of exceeding a value is 1
// minus its fraction below. A single value gives the two points (v, 0) and
// (v, 1), the vertical step of a fixed result. An empty sample or a value
// that is not finite is an error wrapping ErrBadSample; x is not modified.
func Cumulative(x []float64) (values, below []float64, err error) {
	if err := checkSample(x); err != nil {
		return nil, nil, err
	}
	if len(x) == 1 {
		return []float64{x[0], x[0]}, []float64{0, 1}, nil
	}
	values = sortedCopy(x)
	below = make([]float64, len(values))
	last := float64(len(values) - 1)
	for i := range below {
		below[i] = float64(i) / last
	}
	return values, below, nil
}
