package cvd

import (
	"errors"
	"fmt"
	"math"
)

// DefaultTolerance is the tolerance of the adaptive depletion when
// DepletionOptions gives none: 2e-5 of each component's initial moles over
// the whole depletion (0.002 percentage points of its recovery).
const DefaultTolerance = 2e-4

// searchTolerance is the tolerance of the continuous depletion run only to
// find the maximum liquid dropout of a laboratory depletion: the maximum is
// wanted to 0.1 vol%, which it meets with a wide margin (about 0.01 vol% on
// a near-critical condensate whose dropout rises by 30 % within 120 psi).
const searchTolerance = 1e-3

// minScale is the smallest initial mole fraction against which a
// component's error is measured (without a separator train): rarer
// components count as if they made 1e-3 of the feed, so that a trace does
// not set the step.
const minScale = 1e-3

// minSteps sets the smallest error allowance of a step: tol/minSteps.
const minSteps = 32

// stepRecord is one step of a depletion: the state it ended in, what it
// produced and, for the adaptive integration, its estimated error.
type stepRecord struct {
	st     *cellState
	dN     float64   // moles produced by the step
	avg    []float64 // their composition
	phiAvg float64   // liquid share of those moles
	// err is the estimated local error of the moles of each component
	// produced by the step (computed minus exact); nil when not estimated.
	err    []float64
	report bool // a reported pressure

	// for the adaptive integration
	n      float64   // cumulative moles produced since the start of the integration
	dp     float64   // the step's fall in pressure, Pa
	seg    int       // index in the history of the first state of the step's smooth stretch
	order  int       // points of the interpolating polynomial: 2 trapezoidal, 3 Adams–Moulton
	beErr  []float64 // the step's difference from the first-order step
	kinked bool      // the number of phases changed over the step
}

// integration counts the work of an adaptive integration.
type integration struct {
	steps, rejected int
}

// gauss3 are the nodes and weights of three-point Gauss–Legendre
// quadrature on [0, 1], exact for polynomials up to degree 5.
var gauss3 = [3][2]float64{
	{0.5 - 0.3872983346207417, 5.0 / 18},
	{0.5, 8.0 / 18},
	{0.5 + 0.3872983346207417, 5.0 / 18},
}

// estimate returns the error estimate of step j of hist (from state j−1 to
// state j), or false when the points it needs are not there yet. The step
// integrated the polynomial through its order points (j, j−1 and, for
// order 3, j−2); the estimate is the integral over the step of that
// polynomial minus the one through one more point of the same stretch (the
// state before, or else the state after): −D ∫ Π(N − N_u) dN, D the
// divided difference of the stream over all those points.
func estimate(hist []stepRecord, j int) ([]float64, bool) {
	r := hist[j]
	first := j + 1 - r.order // the earliest point used
	var pts []int
	switch {
	case first-1 >= r.seg:
		pts = append(pts, first-1)
	case j+1 < len(hist) && !hist[j+1].kinked:
		pts = append(pts, j+1)
	default:
		return nil, false
	}
	for u := first; u <= j; u++ {
		pts = append(pts, u)
	}
	m := len(pts)
	x := make([]float64, m)
	for k, u := range pts {
		x[k] = hist[u].n
	}
	// the integral over the step of the product over the points used
	a, h := hist[j-1].n, r.n-hist[j-1].n
	in := 0.0
	for _, g := range gauss3 {
		v := a + g[0]*h
		prod := g[1] * h
		for _, xu := range x[1:] {
			prod *= v - xu
		}
		in += prod
	}
	e := make([]float64, len(r.avg))
	f := make([]float64, m)
	for i := range e {
		for k, u := range pts {
			f[k] = hist[u].st.s[i]
		}
		for lev := 1; lev < m; lev++ {
			for k := m - 1; k >= lev; k-- {
				f[k] = (f[k] - f[k-1]) / (x[k] - x[k-lev])
			}
		}
		e[i] = -f[m-1] * in
	}
	return e, true
}

// extrapolate evaluates at p the polynomial in pressure through f of
// states k−q … k of hist.
func extrapolate(hist []stepRecord, k, q int, p float64, f func(*stepRecord) float64) float64 {
	var x, y [3]float64
	for j := 0; j <= q; j++ {
		x[j], y[j] = hist[k-j].st.p, f(&hist[k-j])
	}
	for lev := 1; lev <= q; lev++ {
		for j := q; j >= lev; j-- {
			y[j] = (y[j] - y[j-1]) / (x[j] - x[j-lev])
		}
	}
	v := y[q]
	for j := q - 1; j >= 0; j-- {
		v = v*(p-x[j]) + y[j]
	}
	return v
}

// integrate follows the continuous depletion from the state a0 (the
// saturation point) down through the reported pressures targets (falling,
// below a0.p), choosing each step so that its estimated local error stays
// within its share of tol, and landing exactly on each target. With
// stopAfterMax it stops, short of the last target, once the liquid dropout
// has fallen for two steps after its maximum.
//
// Each step (advance) integrates the produced stream s over the moles
// produced N with the polynomial through the step's end points and, when
// the stretch has one, the state before: the third-order Adams–Moulton
// rule, or the trapezoidal rule at the start of a stretch. Its error is
// estimated with one more point of the same stretch (see estimate), the
// state before or, at the start of a stretch, the state after, in which case
// the step is checked with the next one and taken again, with what followed
// it, if it fails. A step in which the number of phases changes has a kink
// inside: it is checked with its difference from the laboratory's
// first-order step, an upper estimate, and starts a new stretch.
//
// With a separator train the error is measured on the moles that end as
// stock-tank oil and as surface gas (the feed's split), as fractions of
// theirs in the feed; without, on each component against its initial moles
// (at least minScale). A step of dp may spend tol dp/(p0 − p_end) of it, and
// at least tol/minSteps.
func (c *cell) integrate(a0 *cellState, targets []float64, tol float64, stopAfterMax bool) ([]stepRecord, integration, error) {
	var it integration
	hist := []stepRecord{{st: a0}}
	if len(targets) == 0 {
		return hist, it, nil
	}
	final := targets[len(targets)-1]
	span := a0.p - final
	// allow is the error a step of dp may make: its share of tol, but at
	// least tol/minSteps, so that the short, strongly curved stretch below
	// a near-critical dew point does not take hundreds of steps
	allow := func(dp float64) float64 { return tol * math.Max(dp/span, 1/float64(minSteps)) }
	h := span / 100
	hMin := span * 1e-9
	scale := func(i int) float64 { return math.Max(a0.n[i]/a0.total, minScale) }
	// ratio is the error e over its allowance for a step of dp.
	ratio := func(e []float64, dp float64) float64 {
		if c.toOil != nil {
			var eo, eg float64
			for i, v := range e {
				eo += math.Abs(v) * c.toOil[i]
				eg += math.Abs(v) * (1 - c.toOil[i])
			}
			return math.Max(eo/c.oil0, eg/c.gas0) / allow(dp)
		}
		r := 0.0
		for i, v := range e {
			r = math.Max(r, math.Abs(v)/(allow(dp)*scale(i)))
		}
		return r
	}
	grow := func(r float64) float64 {
		if r == 0 {
			return 3
		}
		return math.Min(3, math.Max(0.2, 0.9*math.Pow(r, -1.0/3)))
	}
	shrink := func(r float64) float64 { return math.Min(0.9, math.Max(0.1, 0.9*math.Pow(r, -1.0/3))) }
	seg := 0
	ti := 0
	retry := false
	checked := 1 // hist[:checked] have their error estimates
	// rollBack drops step j and those after it and shortens the next try.
	rollBack := func(j int, r float64) {
		it.rejected += len(hist) - j
		it.steps -= len(hist) - j
		h, retry = hist[j].dp*shrink(r), true
		hist = hist[:j]
		checked = min(checked, j)
		if seg >= j {
			seg = hist[j-1].seg
			if hist[j-1].kinked {
				seg = j - 1
			}
		}
		ti = 0
		for ti < len(targets) && targets[ti] >= hist[j-1].st.p {
			ti++
		}
	}
	for ti < len(targets) {
		last := &hist[len(hist)-1]
		a := last.st
		gap := a.p - targets[ti]
		hh, p := h, a.p-h
		stretch := 1.25 // a step may stretch by this much to land on the target, unless it was just cut
		if retry {
			stretch = 1
		}
		retry = false
		switch {
		case gap <= stretch*h:
			hh, p = gap, targets[ti]
		case gap < 2*h:
			hh, p = gap/2, a.p-gap/2
		}
		var pr *past
		order := 2
		if len(hist)-1 > seg {
			pr, order = &past{s: hist[len(hist)-2].st.s, h1: last.dN}, 3
		}
		var b *cellState
		var dN float64
		var avg []float64
		var err error
		if pr != nil {
			// start from the states before, extrapolated in pressure
			k := len(hist) - 1
			q := 1
			if k-2 >= seg {
				q = 2
			}
			for i := range a.s {
				c.guess[i] = math.Max(0, extrapolate(hist, k, q, p, func(r *stepRecord) float64 { return r.st.s[i] }))
			}
			dnGuess := extrapolate(hist, k, q, p, func(r *stepRecord) float64 { return r.n }) - last.n
			b, dN, avg, err = c.advance(a, pr, c.guess, dnGuess, p)
		} else {
			// start from the laboratory's step
			var be *cellState
			var dnBE float64
			if be, dnBE, err = c.step(a, p); err == nil {
				b, dN, avg, err = c.advance(a, pr, be.s, dnBE, p)
			}
		}
		if errors.Is(err, ErrStepNoConvergence) && hh > hMin {
			h, retry = hh/4, true
			it.rejected++
			continue
		}
		if err != nil {
			return hist, it, err
		}
		rec := stepRecord{st: b, dN: dN, avg: append([]float64(nil), avg...), phiAvg: 0.5 * (a.phi + b.phi),
			n: last.n + dN, dp: hh, seg: seg, order: order, beErr: make([]float64, len(avg)), report: p == targets[ti]}
		for i := range rec.beErr {
			rec.beErr[i] = dN * (avg[i] - b.s[i])
		}
		if b.phases != a.phases {
			rec.kinked, rec.order = true, 2
			if r := ratio(rec.beErr, hh); r > 1 && hh > hMin {
				h, retry = hh*shrink(r), true
				it.rejected++
				continue
			}
			rec.err = rec.beErr
		}
		hist = append(hist, rec)
		it.steps++
		if rec.kinked {
			seg = len(hist) - 1
			if checked == len(hist)-1 {
				checked++
			}
		}
		if rec.report {
			ti++
		}
		// check the steps whose estimates the new state makes possible
		newR, rolled := -1.0, false
		for checked < len(hist) {
			j := checked
			e, ok := estimate(hist, j)
			if !ok && ti == len(targets) {
				e, ok = hist[j].beErr, true // nothing follows: the first-order difference stands in
			}
			if !ok {
				break
			}
			r := ratio(e, hist[j].dp)
			if r > 1 && hist[j].dp > hMin {
				rollBack(j, r)
				rolled = true
				break
			}
			hist[j].err = e
			checked++
			if j == len(hist)-1 {
				newR = r
			}
		}
		if rolled {
			continue
		}
		if newR >= 0 {
			h = hh * grow(newR)
		}
		if n := len(hist) - 1; stopAfterMax && checked == len(hist) && n >= 3 {
			// past the maximum: the dropout fell over the last two steps
			d0, d1, d2 := hist[n-2].st.dropout, hist[n-1].st.dropout, hist[n].st.dropout
			if d2 < d1 && d1 < d0 {
				break
			}
		}
	}
	for j := checked; j < len(hist); j++ {
		if hist[j].err == nil {
			hist[j].err = hist[j].beErr
		}
	}
	return hist, it, nil
}

// dropoutAt is the liquid dropout of the continuous depletion at p, one
// step (advance, of the order the stretch allows) from the last state of
// hist at or above p.
func (c *cell) dropoutAt(hist []stepRecord, p float64) (float64, error) {
	k := 0
	for i, r := range hist {
		if r.st.p >= p {
			k = i
		}
	}
	a := hist[k].st
	if a.p == p {
		return a.dropout, nil
	}
	be, dn, err := c.step(a, p)
	if err != nil {
		return 0, err
	}
	var pr *past
	if k > 0 && !hist[k].kinked && k-1 >= hist[k].seg {
		pr = &past{s: hist[k-1].st.s, h1: hist[k].dN}
	}
	b, _, _, err := c.advance(a, pr, be.s, dn, p)
	if err != nil {
		return 0, err
	}
	return b.dropout, nil
}

// maxDropout locates the largest liquid dropout of the continuous depletion
// in hist: Brent's search (golden section with parabolic interpolation) on
// the dropout as a function of pressure, between the neighbours of the
// state with the largest dropout. At an end of hist that state's dropout
// stands. With no liquid it returns 0 at the first state's pressure.
func (c *cell) maxDropout(hist []stepRecord) (float64, float64, error) {
	j := 0
	for i, r := range hist {
		if r.st.dropout > hist[j].st.dropout {
			j = i
		}
	}
	best := hist[j].st
	if best.dropout == 0 || j == 0 || j == len(hist)-1 {
		return best.dropout, best.p, nil
	}
	lo, hi := hist[j+1].st.p, hist[j-1].st.p
	var ferr error
	f := func(p float64) float64 {
		d, err := c.dropoutAt(hist, p)
		if err != nil && ferr == nil {
			ferr = err
		}
		return -d
	}
	p, d := brentMin(f, lo, hi, best.p, -best.dropout, 1e-2*(hi-lo))
	if ferr != nil {
		return 0, 0, fmt.Errorf("search for the maximum liquid dropout: %w", ferr)
	}
	return -d, p, nil
}

// brentMin returns the minimum of f on [a, b] and where it lies, from the
// interior point x with fx = f(x), to within about tol in x: the method of
// Brent (1973), Algorithms for Minimization without Derivatives,
// Prentice-Hall, ch. 5 (golden-section steps, parabolic ones where they
// behave).
func brentMin(f func(float64) float64, a, b, x, fx, tol float64) (float64, float64) {
	const cgold = 0.3819660112501051 // (3 − √5)/2
	const eps = 1.4901161193847656e-08
	w, v, fw, fv := x, x, fx, fx
	var d, e float64
	for range 100 {
		m := 0.5 * (a + b)
		tol1 := eps*math.Abs(x) + tol/3
		tol2 := 2 * tol1
		if math.Abs(x-m) <= tol2-0.5*(b-a) {
			break
		}
		parabolic := false
		if math.Abs(e) > tol1 {
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			pp := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				pp = -pp
			} else {
				q = -q
			}
			if math.Abs(pp) < math.Abs(0.5*q*e) && pp > q*(a-x) && pp < q*(b-x) {
				e, d = d, pp/q
				u := x + d
				if u-a < tol2 || b-u < tol2 {
					d = math.Copysign(tol1, m-x)
				}
				parabolic = true
			}
		}
		if !parabolic {
			if x < m {
				e = b - x
			} else {
				e = a - x
			}
			d = cgold * e
		}
		u := x + d
		if math.Abs(d) < tol1 {
			u = x + math.Copysign(tol1, d)
		}
		fu := f(u)
		if fu <= fx {
			if u < x {
				b = x
			} else {
				a = x
			}
			v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
		} else {
			if u < x {
				a = u
			} else {
				b = u
			}
			switch {
			case fu <= fw || w == x:
				v, fv, w, fw = w, fw, u, fu
			case fu <= fv || v == x || v == w:
				v, fv = u, fu
			}
		}
	}
	return x, fx
}
