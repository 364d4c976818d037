package uncertain

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"
)

// Z90 is the 0.9 quantile of the standard normal distribution, Φ⁻¹(0.9),
// to float64 precision (tables print 1.28155): the number of standard
// deviations between a normal's P50 and its P10, and between its P90 and
// its P50.
const Z90 = 1.2815515655446004

// minMass is the least probability a truncation may keep of the
// untruncated distribution. Below it the tail functions, erfc of arguments
// beyond about 37 standard deviations, leave the range of float64.
const minMass = 1e-300

// lower returns Φ(z), the standard normal distribution function, as
// erfc(−z/√2)/2 (Johnson, Kotz and Balakrishnan (1994), Chapter 13): to
// full relative precision in the lower tail, where 1 − Φ(−z) would cancel.
func lower(z float64) float64 { return 0.5 * math.Erfc(-z/math.Sqrt2) }

// upper returns 1 − Φ(z), to full relative precision in the upper tail.
func upper(z float64) float64 { return 0.5 * math.Erfc(z/math.Sqrt2) }

// phi returns the standard normal density exp(−z²/2)/√(2π).
func phi(z float64) float64 {
	if math.IsInf(z, 0) {
		return 0
	}
	return math.Exp(-z*z/2) / math.Sqrt(2*math.Pi)
}

// probit returns Φ⁻¹(p) by Wichura's (1988) algorithm AS 241, or NaN for p
// outside [0, 1] (where mathext.NormalQuantile would panic).
func probit(p float64) float64 {
	if badU(p) {
		return math.NaN()
	}
	return mathext.NormalQuantile(p)
}

// massBetween returns Φ(b) − Φ(a) for a ≤ b, from the tail on the side of
// the interval, so that a small probability far out keeps its relative
// precision.
func massBetween(a, b float64) float64 {
	switch {
	case a >= 0:
		return upper(a) - upper(b)
	case b <= 0:
		return lower(b) - lower(a)
	}
	return 1 - lower(a) - upper(b)
}

// truncNormal is the standard normal distribution truncated to [a, b],
// a < b, either bound possibly infinite; mass is Φ(b) − Φ(a).
type truncNormal struct{ a, b, mass float64 }

func newTruncNormal(a, b float64) truncNormal { return truncNormal{a, b, massBetween(a, b)} }

// quantile maps u into [Φ(a), Φ(b)] and inverts Φ there (Johnson, Kotz and
// Balakrishnan (1994), Chapter 13, Section 10.1, from memory):
// z = Φ⁻¹(Φ(a) + u (Φ(b) − Φ(a))). The lower half of u works from a, the
// upper half from b with 1 − u, exact for u ≥ 1/2 (Sterbenz's lemma), and
// an end beyond the median by the upper tail Φ⁻¹(p) = −Φ⁻¹(1 − p), so that
// u = 1e-12 and 1 − 1e-12 keep their precision.
func (t truncNormal) quantile(u float64) float64 {
	switch u {
	case 0:
		return t.a
	case 1:
		return t.b
	}
	var z float64
	switch v := 1 - u; {
	case u <= 0.5 && t.a >= 0:
		z = -probit(upper(t.a) - u*t.mass)
	case u <= 0.5:
		z = probit(lower(t.a) + u*t.mass)
	case t.b <= 0:
		z = probit(lower(t.b) - v*t.mass)
	default:
		z = -probit(upper(t.b) + v*t.mass)
	}
	return within(z, t.a, t.b)
}

// cdf returns (Φ(z) − Φ(a))/(Φ(b) − Φ(a)) within [a, b], from the nearer
// end, so that a value near either keeps its precision.
func (t truncNormal) cdf(z float64) float64 {
	switch {
	case z <= t.a:
		return 0
	case z >= t.b:
		return 1
	}
	if m := massBetween(t.a, z); m < t.mass/2 {
		return m / t.mass
	}
	return 1 - massBetween(z, t.b)/t.mass
}

// narrow says whether the interval [a, b] is so short, against the scale on
// which exp(s z − z²/2) changes there, that Φ(b) − Φ(a) loses digits to
// cancellation; its moments are then integrated numerically.
func (t truncNormal) narrow(s float64) bool {
	w := t.b - t.a
	if !(w > 0) {
		return false // not an interval: Validate rejects it
	}
	scale := math.Max(1, math.Max(math.Abs(t.a-s), math.Abs(t.b-s)))
	return w*scale <= 1
}

// gaussLegendre16 integrates f over [a, b] by 16-point Gauss–Legendre
// quadrature (gonum's quad.Legendre): exact for polynomials of degree 31,
// and to about 1e-15 for exp(s z − z²/2) on an interval that narrow
// accepts.
func gaussLegendre16(f func(float64) float64, a, b float64) float64 {
	return quad.Fixed(f, a, b, 16, quad.Legendre{}, 0)
}

// mean returns E[Z | a < Z < b] = (φ(a) − φ(b))/(Φ(b) − Φ(a)) (Johnson,
// Kotz and Balakrishnan (1994), Chapter 13, Section 10.1, from memory), by
// quadrature of z φ(z) and φ(z) where the interval is narrow.
func (t truncNormal) mean() float64 {
	if t.narrow(0) {
		m := (t.a + t.b) / 2
		num := gaussLegendre16(func(z float64) float64 { return (z - m) * phi(z) }, t.a, t.b)
		den := gaussLegendre16(phi, t.a, t.b)
		return within(m+num/den, t.a, t.b)
	}
	return within((phi(t.a)-phi(t.b))/t.mass, t.a, t.b)
}

// expMean returns E[exp(s Z) | a < Z < b]
// = exp(s²/2) (Φ(b − s) − Φ(a − s))/(Φ(b) − Φ(a)), the moment of a
// truncated lognormal (Johnson, Kotz and Balakrishnan (1994), Chapter 14,
// from memory), by quadrature where the interval is narrow.
func (t truncNormal) expMean(s float64) float64 {
	if t.narrow(s) {
		// exp(s z) φ(z) = exp(s²/2) φ(z − s), relative to its value at
		// the interval's middle so that nothing overflows.
		m := (t.a + t.b) / 2
		num := gaussLegendre16(func(z float64) float64 { return math.Exp(s*(z-m)) * phi(z) }, t.a, t.b)
		den := gaussLegendre16(phi, t.a, t.b)
		return math.Exp(s*m) * num / den
	}
	return math.Exp(s*s/2) * massBetween(t.a-s, t.b-s) / t.mass
}

// Normal is the normal distribution of mean Mu and standard deviation SD,
// truncated to [Min, Max]: its quantile is Mu + SD z with z the quantile
// of the standard normal truncated to [a, b] = [(Min − Mu)/SD, (Max − Mu)/SD],
// which maps u into [Φ(a), Φ(b)]. Min = −Inf and Max = +Inf, as NewNormal
// sets them, mean no truncation; the zero value has Min = Max = 0, which
// Validate rejects. SD 0 is the fixed value Mu.
type Normal struct {
	Mu       float64 // mean before truncation
	SD       float64 // standard deviation before truncation, ≥ 0
	Min, Max float64 // truncation; −Inf and +Inf for none
}

// NewNormal returns the normal distribution of mean mu and standard
// deviation sd, untruncated.
func NewNormal(mu, sd float64) Normal {
	return Normal{Mu: mu, SD: sd, Min: math.Inf(-1), Max: math.Inf(1)}
}

// Truncated returns d truncated to [min, max]; ±Inf leaves a side open.
func (d Normal) Truncated(min, max float64) Normal {
	d.Min, d.Max = min, max
	return d
}

// std returns the truncated standard normal of d, whose SD is positive.
func (d Normal) std() truncNormal {
	return newTruncNormal((d.Min-d.Mu)/d.SD, (d.Max-d.Mu)/d.SD)
}

// Validate reports a mean or standard deviation that is not a finite
// number, a negative standard deviation, bounds out of order, and a
// truncation that keeps no probability (a fixed value outside the bounds,
// or bounds too far in a tail).
func (d Normal) Validate() error {
	const kind = "normal"
	switch {
	case !finite(d.Mu):
		return badDist(kind, "mean %g must be a finite number", d.Mu)
	case !finite(d.SD):
		return badDist(kind, "sd %g must be a finite number", d.SD)
	case d.SD < 0:
		return badDist(kind, "sd %g is negative: it must be positive, or 0 for a fixed value", d.SD)
	case math.IsNaN(d.Min) || math.IsNaN(d.Max):
		return badDist(kind, "min %g and max %g must be numbers (-Inf and +Inf for no truncation)", d.Min, d.Max)
	case d.Min >= d.Max:
		return badDist(kind, "min %g is not below max %g: give min < max, or -Inf and +Inf for no truncation", d.Min, d.Max)
	case d.SD == 0 && (d.Mu < d.Min || d.Mu > d.Max):
		return badDist(kind, "the fixed value %g (sd 0) lies outside [min, max] = [%g, %g]", d.Mu, d.Min, d.Max)
	}
	if d.SD > 0 {
		if m := d.std().mass; !(m >= minMass) {
			return badDist(kind, "[min, max] = [%g, %g] keeps only %.3g of the probability of a normal of mean %g and sd %g: too far in a tail to sample; move the bounds toward the mean", d.Min, d.Max, m, d.Mu, d.SD)
		}
	}
	return nil
}

// Quantile returns Mu + SD z(u), z from the truncated standard normal;
// Mu itself when SD is 0.
func (d Normal) Quantile(u float64) float64 {
	if badU(u) {
		return math.NaN()
	}
	switch {
	case d.SD == 0:
		return d.Mu
	case u == 0:
		return d.Min
	case u == 1:
		return d.Max
	}
	return within(d.Mu+d.SD*d.std().quantile(u), d.Min, d.Max)
}

// CDF returns the probability of a value at or below x.
func (d Normal) CDF(x float64) float64 {
	if d.SD == 0 {
		if x < d.Mu {
			return 0
		}
		return 1
	}
	return d.std().cdf((x - d.Mu) / d.SD)
}

// Mean returns Mu + SD (φ(a) − φ(b))/(Φ(b) − Φ(a)), the mean of the
// truncated normal (Mu without truncation or with SD 0). Where [a, b] is so
// narrow that the differences cancel, the ratio comes from 16-point
// Gauss–Legendre quadrature of z φ(z) and φ(z) instead.
func (d Normal) Mean() float64 {
	if d.SD == 0 || math.IsInf(d.Min, -1) && math.IsInf(d.Max, 1) {
		return d.Mu
	}
	return within(d.Mu+d.SD*d.std().mean(), d.Min, d.Max)
}

// Lognormal is the distribution of a value whose logarithm is normal, of
// mean ln Median and standard deviation Sigma (Johnson, Kotz and
// Balakrishnan (1994), Chapter 14), truncated to [Min, Max]:
// Quantile(u) = Median exp(Sigma z), z the quantile of the standard normal
// truncated to [a, b] = [ln(Min/Median)/Sigma, ln(Max/Median)/Sigma]. Min = 0 and
// Max = +Inf, as the constructors set them, mean no truncation; the zero
// value has Max = 0, which Validate rejects. Sigma 0 is the fixed value
// Median. Median and Sigma describe the distribution before truncation.
type Lognormal struct {
	Median   float64 // median before truncation, > 0
	Sigma    float64 // standard deviation of the logarithm, ≥ 0
	Min, Max float64 // truncation; 0 and +Inf for none
}

// NewLognormal returns the lognormal distribution of the given median whose
// P90, the value exceeded with probability 0.9, is p90Ratio times the
// median: Sigma = −ln(p90Ratio)/Z90. By the symmetry of the logarithm the
// P10 is then the median divided by p90Ratio. The ratio must lie in (0, 1);
// for a fixed value use Sigma 0 or a Uniform with equal bounds.
func NewLognormal(median, p90Ratio float64) (Lognormal, error) {
	if !(p90Ratio > 0 && p90Ratio < 1) {
		return Lognormal{}, badDist("lognormal", "P90 ratio %g must lie between 0 and 1 (the P90 divided by the median, the P90 being below the median)", p90Ratio)
	}
	d := Lognormal{Median: median, Sigma: -math.Log(p90Ratio) / Z90, Min: 0, Max: math.Inf(1)}
	return d, d.Validate()
}

// NewLognormalLog returns the lognormal distribution whose logarithm has
// mean mu and standard deviation sigma, untruncated: Median = exp(mu).
func NewLognormalLog(mu, sigma float64) Lognormal {
	return Lognormal{Median: math.Exp(mu), Sigma: sigma, Min: 0, Max: math.Inf(1)}
}

// Truncated returns d truncated to [min, max]; 0 and +Inf leave a side
// open.
func (d Lognormal) Truncated(min, max float64) Lognormal {
	d.Min, d.Max = min, max
	return d
}

// Mu returns ln Median, the mean of the logarithm before truncation.
func (d Lognormal) Mu() float64 { return math.Log(d.Median) }

// P90Ratio returns exp(−Z90 Sigma), the P90 over the median before
// truncation.
func (d Lognormal) P90Ratio() float64 { return math.Exp(-Z90 * d.Sigma) }

func (d Lognormal) std() truncNormal {
	return newTruncNormal(math.Log(d.Min/d.Median)/d.Sigma, math.Log(d.Max/d.Median)/d.Sigma)
}

// Validate reports a median that is not a positive finite number, a sigma
// that is not finite or negative, bounds out of order or below 0, and a
// truncation that keeps no probability.
func (d Lognormal) Validate() error {
	const kind = "lognormal"
	switch {
	case !(d.Median > 0) || !finite(d.Median):
		return badDist(kind, "median %g must be a positive finite number", d.Median)
	case !finite(d.Sigma):
		return badDist(kind, "sigma %g must be a finite number", d.Sigma)
	case d.Sigma < 0:
		return badDist(kind, "sigma %g is negative: it must be positive, or 0 for a fixed value", d.Sigma)
	case math.IsNaN(d.Min) || math.IsNaN(d.Max):
		return badDist(kind, "min %g and max %g must be numbers (0 and +Inf for no truncation)", d.Min, d.Max)
	case d.Min < 0:
		return badDist(kind, "min %g is negative: a lognormal value is positive; give min 0 or more", d.Min)
	case d.Min >= d.Max:
		return badDist(kind, "min %g is not below max %g: give min < max, or 0 and +Inf for no truncation", d.Min, d.Max)
	case d.Sigma == 0 && (d.Median < d.Min || d.Median > d.Max):
		return badDist(kind, "the fixed value %g (sigma 0) lies outside [min, max] = [%g, %g]", d.Median, d.Min, d.Max)
	}
	if d.Sigma > 0 {
		if m := d.std().mass; !(m >= minMass) {
			return badDist(kind, "[min, max] = [%g, %g] keeps only %.3g of the probability of a lognormal of median %g and sigma %g: too far in a tail to sample; move the bounds toward the median", d.Min, d.Max, m, d.Median, d.Sigma)
		}
	}
	if !finite(d.Mean()) {
		return badDist(kind, "sigma %g is so large that the mean overflows float64", d.Sigma)
	}
	return nil
}

// Quantile returns Median exp(Sigma z(u)), z from the truncated standard
// normal; Median itself when Sigma is 0.
func (d Lognormal) Quantile(u float64) float64 {
	if badU(u) {
		return math.NaN()
	}
	switch {
	case d.Sigma == 0:
		return d.Median
	case u == 0:
		return d.Min
	case u == 1:
		return d.Max
	}
	return within(d.Median*math.Exp(d.Sigma*d.std().quantile(u)), d.Min, d.Max)
}

// CDF returns the probability of a value at or below x.
func (d Lognormal) CDF(x float64) float64 {
	if d.Sigma == 0 {
		if x < d.Median {
			return 0
		}
		return 1
	}
	if x <= 0 {
		return 0
	}
	return d.std().cdf(math.Log(x/d.Median) / d.Sigma)
}

// Mean returns Median exp(Sigma²/2) (Φ(b − Sigma) − Φ(a − Sigma))/(Φ(b) − Φ(a)),
// the mean of the truncated lognormal (Median exp(Sigma²/2) without
// truncation, Median with Sigma 0); by quadrature where [a, b] is narrow,
// as for Normal.
func (d Lognormal) Mean() float64 {
	if d.Sigma == 0 {
		return d.Median
	}
	if d.Min <= 0 && math.IsInf(d.Max, 1) {
		return d.Median * math.Exp(d.Sigma*d.Sigma/2)
	}
	return within(d.Median*d.std().expMean(d.Sigma), d.Min, d.Max)
}
