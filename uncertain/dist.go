package uncertain

import (
	"errors"
	"fmt"
	"math"
)

// ErrBadDistribution is wrapped by every error of a distribution's Validate
// and of the constructors, so callers can test for it with errors.Is.
var ErrBadDistribution = errors.New("invalid distribution")

// A Distribution is the probability distribution of one uncertain input.
//
// Quantile is the inverse of the cumulative distribution function: the
// smallest x with CDF(x) ≥ u, for u in (0, 1). At u = 0 and u = 1 it gives
// the ends of the support (which may be infinite); for u outside [0, 1], or
// NaN, it returns NaN, as the math package does outside a function's
// domain. CDF is the probability of a value at or below x, and Mean the
// mean of the values Quantile gives, that is of the distribution after any
// truncation. Quantile, CDF and Mean assume that Validate returned nil; on
// a distribution it rejects they return unspecified values, but they never
// panic.
type Distribution interface {
	Quantile(u float64) float64
	CDF(x float64) float64
	Mean() float64
	// Validate says, in an error wrapping ErrBadDistribution, what is
	// wrong with the parameters and what to do; nil if nothing is.
	Validate() error
}

var (
	_ Distribution = Uniform{}
	_ Distribution = Triangular{}
	_ Distribution = Normal{}
	_ Distribution = Lognormal{}
	_ Distribution = Discrete{}
)

// badDist returns an error wrapping ErrBadDistribution, its message
// starting with the kind of distribution.
func badDist(kind, format string, args ...any) error {
	return fmt.Errorf("%w: %s: %s", ErrBadDistribution, kind, fmt.Sprintf(format, args...))
}

// finite says whether x is neither infinite nor NaN.
func finite(x float64) bool { return !math.IsInf(x, 0) && !math.IsNaN(x) }

// badU says whether u lies outside the domain [0, 1] of a quantile
// function (NaN included).
func badU(u float64) bool { return !(u >= 0 && u <= 1) }

// within returns x moved into [lo, hi]. The quantile functions use it only
// against rounding: in exact arithmetic their values lie in the support
// already, but a formula's last bit can step over a bound.
func within(x, lo, hi float64) float64 {
	if x < lo {
		return lo
	}
	if x > hi {
		return hi
	}
	return x
}

// Uniform is the continuous uniform distribution on [Min, Max] (Johnson,
// Kotz and Balakrishnan (1995), Continuous Univariate Distributions, Vol. 2,
// 2nd ed., Chapter 26, from memory): Quantile(u) = Min + u (Max − Min). Min
// equal to Max is a fixed value.
type Uniform struct {
	Min, Max float64
}

// Validate reports a bound that is not finite or a Min above Max.
func (d Uniform) Validate() error {
	if !finite(d.Min) || !finite(d.Max) {
		return badDist("uniform", "min %g and max %g must both be finite numbers", d.Min, d.Max)
	}
	if d.Min > d.Max {
		return badDist("uniform", "min %g is above max %g: swap them (equal bounds give a fixed value)", d.Min, d.Max)
	}
	if !finite(d.Max - d.Min) {
		return badDist("uniform", "the range from min %g to max %g overflows float64", d.Min, d.Max)
	}
	return nil
}

// Quantile returns Min + u (Max − Min); Min itself when Min equals Max.
func (d Uniform) Quantile(u float64) float64 {
	if badU(u) {
		return math.NaN()
	}
	if d.Min == d.Max {
		return d.Min
	}
	return within(d.Min+u*(d.Max-d.Min), d.Min, d.Max)
}

// CDF returns (x − Min)/(Max − Min) within [Min, Max]; for a fixed value, 0
// below it and 1 from it on.
func (d Uniform) CDF(x float64) float64 {
	switch {
	case x < d.Min:
		return 0
	case x >= d.Max:
		return 1
	}
	return (x - d.Min) / (d.Max - d.Min)
}

// Mean returns (Min + Max)/2; Min itself when Min equals Max.
func (d Uniform) Mean() float64 {
	if d.Min == d.Max {
		return d.Min
	}
	return d.Min/2 + d.Max/2
}

// Triangular is the triangular distribution on [Min, Max] with its peak at
// Mode (Kotz and van Dorp (2004), Chapter 1). With a = Min, c = Mode,
// b = Max and F_c = (c − a)/(b − a), its quantile is
//
//	a + √(u (b − a)(c − a))        for u < F_c,
//	b − √((1 − u)(b − a)(b − c))   otherwise,
//
// and its mean (a + b + c)/3. All three equal is a fixed value.
type Triangular struct {
	Min, Mode, Max float64
}

// Validate reports a point that is not finite or points out of order.
func (d Triangular) Validate() error {
	if !finite(d.Min) || !finite(d.Mode) || !finite(d.Max) {
		return badDist("triangular", "min %g, mode %g and max %g must all be finite numbers", d.Min, d.Mode, d.Max)
	}
	if d.Min > d.Max {
		return badDist("triangular", "min %g is above max %g: swap them", d.Min, d.Max)
	}
	if d.Mode < d.Min || d.Mode > d.Max {
		return badDist("triangular", "mode %g lies outside [min, max] = [%g, %g]: the mode must be within the range", d.Mode, d.Min, d.Max)
	}
	if !finite(d.Max - d.Min) {
		return badDist("triangular", "the range from min %g to max %g overflows float64", d.Min, d.Max)
	}
	return nil
}

// Quantile returns the inverse of the CDF (the formula in the type's
// comment); Min itself when the distribution has zero width.
func (d Triangular) Quantile(u float64) float64 {
	if badU(u) {
		return math.NaN()
	}
	a, c, b := d.Min, d.Mode, d.Max
	if a == b {
		return a
	}
	var x float64
	if u < (c-a)/(b-a) {
		x = a + math.Sqrt(u*(b-a)*(c-a))
	} else {
		x = b - math.Sqrt((1-u)*(b-a)*(b-c))
	}
	return within(x, a, b)
}

// CDF returns (x − a)²/((b − a)(c − a)) up to the mode and
// 1 − (b − x)²/((b − a)(b − c)) beyond it.
func (d Triangular) CDF(x float64) float64 {
	a, c, b := d.Min, d.Mode, d.Max
	switch {
	case x < a:
		return 0
	case x >= b:
		return 1
	case x < c:
		return (x - a) * (x - a) / ((b - a) * (c - a))
	}
	return 1 - (b-x)*(b-x)/((b-a)*(b-c))
}

// Mean returns (Min + Mode + Max)/3; Min itself when the distribution has
// zero width.
func (d Triangular) Mean() float64 {
	if d.Min == d.Max {
		return d.Min
	}
	return (d.Min + d.Mode + d.Max) / 3
}
