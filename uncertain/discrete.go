package uncertain

import "math"

// probTolerance is how far the probabilities of a Discrete may sum from 1.
const probTolerance = 1e-9

// Discrete is a distribution of finitely many values, Values[i] having
// probability Probs[i]. The values must increase strictly and the
// probabilities be positive and sum to 1 within 1e-9; they are used divided
// by their sum. Quantile(u) is the first value whose cumulative probability
// reaches u, the inverse of the step CDF. One value is a fixed value.
type Discrete struct {
	Values []float64
	Probs  []float64
}

// Validate reports empty or unequal lists, a value that is not finite or
// out of order, a probability that is not positive, and probabilities
// whose sum is not 1.
func (d Discrete) Validate() error {
	const kind = "discrete"
	if len(d.Values) == 0 {
		return badDist(kind, "no values: give at least one value and its probability")
	}
	if len(d.Probs) != len(d.Values) {
		return badDist(kind, "%d values but %d probabilities: give one probability per value", len(d.Values), len(d.Probs))
	}
	sum := 0.0
	for i, v := range d.Values {
		if !finite(v) {
			return badDist(kind, "value %d is %g: it must be a finite number", i+1, v)
		}
		if i > 0 && !(v > d.Values[i-1]) {
			return badDist(kind, "value %d (%g) is not above value %d (%g): list the values in increasing order, each once", i+1, v, i, d.Values[i-1])
		}
		p := d.Probs[i]
		if !(p > 0) || !finite(p) {
			return badDist(kind, "probability %d is %g: it must be positive (leave out a value that cannot occur)", i+1, p)
		}
		sum += p
	}
	if math.Abs(sum-1) > probTolerance {
		return badDist(kind, "the probabilities sum to %.12g, not 1", sum)
	}
	return nil
}

// n returns the number of (value, probability) pairs that both lists hold.
func (d Discrete) n() int { return min(len(d.Values), len(d.Probs)) }

// total returns the sum of the probabilities.
func (d Discrete) total() float64 {
	s := 0.0
	for _, p := range d.Probs[:d.n()] {
		s += p
	}
	return s
}

// Quantile returns the first value whose cumulative probability, divided by
// the sum of all, reaches u; the last value if rounding leaves u above
// every cumulative probability.
func (d Discrete) Quantile(u float64) float64 {
	n := d.n()
	if badU(u) || n == 0 {
		return math.NaN()
	}
	target, cum := u*d.total(), 0.0
	for i, p := range d.Probs[:n-1] {
		cum += p
		if cum >= target {
			return d.Values[i]
		}
	}
	return d.Values[n-1]
}

// CDF returns the sum of the probabilities of the values at or below x,
// divided by the sum of all.
func (d Discrete) CDF(x float64) float64 {
	n := d.n()
	if n == 0 {
		return math.NaN()
	}
	if x >= d.Values[n-1] {
		return 1
	}
	cum := 0.0
	for i, v := range d.Values[:n] {
		if v > x {
			break
		}
		cum += d.Probs[i]
	}
	return cum / d.total()
}

// Mean returns Σ Values[i] Probs[i] / Σ Probs[i]; the value itself when
// there is one.
func (d Discrete) Mean() float64 {
	n := d.n()
	switch n {
	case 0:
		return math.NaN()
	case 1:
		return d.Values[0]
	}
	s := 0.0
	for i, v := range d.Values[:n] {
		s += v * d.Probs[i]
	}
	return s / d.total()
}
