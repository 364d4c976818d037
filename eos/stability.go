package eos

import "math"

// Michelsen (1982a) tangent-plane-distance stability analysis. For a trial
// phase of mole numbers W the modified tangent plane distance is
//
//	tm(W) = 1 + Σ_i W_i [ln W_i + ln φ_i(w) − d_i − 1],  d_i = ln z_i + ln φ_i(z)
//
// and the feed is unstable when some W gives tm < 0. Each trial starts from
// Wilson K-values (vapour-like W = z K, liquid-like W = z/K), takes a few
// successive-substitution steps ln W_i ← d_i − ln φ_i(w), then Newton steps in
// α_i = 2√W_i with the Hessian δ_ij + √(W_i W_j) ∂ln φ_i/∂W_j (Michelsen 1982a).

// tmUnstable is the tangent-plane distance below which a stationary point
// proves instability; it sits well above the round-off of tm (about 1e-13) and
// well below the tm of a feed 1 ppm inside the two-phase region (about 1e-7).
const tmUnstable = -1e-9

// tmUnstableSat is the stricter threshold of the saturation-point search.
// Close to a critical point the tangent-plane distance just inside the
// two-phase region is tiny (about −1e-10 at 1e-5 relative below a bubble
// point 1.5 °F from the critical temperature), and the edge of stability
// must be resolved there; it stays two orders of magnitude above the
// round-off of tm.
const tmUnstableSat = -1e-11

// flashTrivialNear: in a flash and in the saturation search's scan (not its
// refinement, which resolves the edge of stability next to critical
// points), a trial in its Newton stage
// within this squared distance in ln W of the feed, with positive tm, is
// taken to converge onto it: there tm is the quadratic form of a positive
// definite Hessian (the feed a local minimum), and the Newton steps that
// would follow only polish the trivial solution.
const flashTrivialNear = 1e-3

type trialResult struct {
	tm       float64
	unstable bool
	trivial  bool
	iter     int
	ok       bool // converged (or proved unstable early)
}

// prepareFeed evaluates the feed at p (temperature already set) and fills d
// and w.lnZ (ln z_i, which the stability test's starts and its trials'
// distance to the feed take).
func (w *work) prepareFeed(p float64, z []float64) {
	w.fl.evalPhase(&w.feed, &w.ts, p, z, rootMinG, 0)
	for i, zi := range z {
		if zi > 0 {
			w.lnZ[i] = math.Log(zi)
			w.d[i] = w.lnZ[i] + w.feed.lnphi[i]
		} else {
			w.d[i] = math.Inf(-1)
		}
	}
}

// stability runs the liquid-like and then the vapour-like trial on feed z at
// pressure p, after prepareFeed. With early set it stops at the first trial
// point that proves instability. It leaves the trial mole numbers W (not
// normalised: Σ W > 1 at an unstable stationary point) in w.wLiq and w.wVap
// and returns whether each trial showed instability. With w.thorough set, a
// feed stable from both Wilson starts is tried from pure components too
// (pureTrials), and an instability found so is reported as the liquid-like
// trial's.
func (w *work) stability(p float64, z []float64, early bool) (liq, vap trialResult) {
	t := w.ts.t
	w.wilson(t, p) // the trials leave w.lnK alone: once for both starts
	lnz := w.lnZ   // set by prepareFeed
	for i, zi := range z {
		if zi > 0 {
			w.lnW[i] = lnz[i] - w.lnK[i]
		}
	}
	liq = w.trial(p, z, lnz, early)
	copy(w.wLiq, w.W)
	if early && liq.unstable {
		return liq, trialResult{}
	}
	for i, zi := range z {
		if zi > 0 {
			w.lnW[i] = lnz[i] + w.lnK[i]
		}
	}
	vap = w.trial(p, z, lnz, early)
	copy(w.wVap, w.W)
	if w.thorough && !liq.unstable && !vap.unstable {
		if pt, ok := w.pureTrials(p, z); ok {
			liq = pt
			copy(w.wLiq, w.W)
		}
	}
	return liq, vap
}

// pureTrials runs, after stability has found feed z stable from the Wilson
// starts (and after prepareFeed, whose w.lnZ its trials take), up to three
// more trials from nearly pure components: the heaviest present (by
// critical temperature), the lightest and the one of median critical
// temperature. A dense feed can be unstable towards a liquid that the Wilson
// starts, both close to the feed at high pressure, never reach (a
// liquid–liquid split); pure-component trial phases are a common choice for
// such splits. It returns the first trial that shows instability, its mole
// numbers left in w.W.
func (w *work) pureTrials(p float64, z []float64) (trialResult, bool) {
	hi, lo := -1, -1
	for i, zi := range z {
		if zi == 0 {
			continue
		}
		if hi < 0 || w.fl.tc[i] > w.fl.tc[hi] {
			hi = i
		}
		if lo < 0 || w.fl.tc[i] < w.fl.tc[lo] {
			lo = i
		}
	}
	var last trialResult
	for j, k := range [3]int{hi, lo, w.rankTc(z, -1)} {
		if k < 0 || j > 0 && k == hi || j > 1 && k == lo {
			continue
		}
		for i, zi := range z {
			if zi > 0 {
				w.lnW[i] = math.Log(1e-6 * zi)
			}
		}
		w.lnW[k] = 0
		last = w.trial(p, z, w.lnZ, true)
		if last.unstable {
			return last, true
		}
	}
	return last, false
}

// trial minimises tm from the start in w.lnW against the tangent plane in
// w.d and leaves the normalised trial composition in w.wn. The trial has
// collapsed onto the trivial solution when it reaches ref (the feed, or the
// phase of a split it started from), given as lnRef, its ln ref_i; z marks
// the components present.
func (w *work) trial(p float64, z, lnRef []float64, early bool) trialResult {
	n := w.n
	fl := w.fl
	ph := &w.pa
	var res trialResult
	tmPrev := math.Inf(1)
	newton := false
	for it := 1; it <= w.max; it++ {
		res.iter = it
		sumW := 0.0
		for i := 0; i < n; i++ {
			if z[i] > 0 {
				w.W[i] = math.Exp(w.lnW[i])
			} else {
				w.W[i] = 0
			}
			sumW += w.W[i]
		}
		if !(sumW > 0) || math.IsInf(sumW, 0) {
			return res
		}
		dist, near := 0.0, math.Inf(1)
		lnSum := math.Log(sumW)
		for i := 0; i < n; i++ {
			w.wn[i] = w.W[i] / sumW
		}
		if w.nearRef > 0 {
			// testing a split: the distance to the nearer of its phases,
			// whose logarithms splitUnstable keeps
			da, db := 0.0, 0.0
			for i := 0; i < n; i++ {
				if z[i] > 0 {
					a, b := w.lnW[i]-lnSum-w.lnBX[i], w.lnW[i]-lnSum-w.lnBY[i]
					da += a * a
					db += b * b
				}
			}
			near = min(da, db)
		}
		for i := 0; i < n; i++ {
			if z[i] > 0 {
				dd := w.lnW[i] - lnSum - lnRef[i]
				dist += dd * dd
			}
		}
		// The derivatives only where a Newton step is taken (below): the
		// trial ends, or falls back to substitution, on most evaluations
		// that would otherwise compute them for nothing.
		fl.evalPhase(ph, &w.ts, p, w.wn, rootMinG, 0)
		tm := 1.0
		rmax := 0.0
		for i := 0; i < n; i++ {
			if z[i] == 0 {
				w.r[i] = 0
				continue
			}
			w.r[i] = w.lnW[i] + ph.lnphi[i] - w.d[i]
			tm += w.W[i] * (w.r[i] - 1)
			rmax = max(rmax, math.Abs(w.r[i]))
		}
		res.tm = tm
		if early && tm < w.tmCut && dist > 1e-6 {
			res.unstable, res.ok = true, true
			return res
		}
		if rmax < 1e-10 {
			res.ok = true
			res.trivial = dist < 1e-8
			res.unstable = !res.trivial && tm < w.tmCut
			return res
		}
		if dist < 1e-10 && it > 2 || near < w.nearRef && tm > 0 && it > 1 ||
			newton && tm > 0 && dist < flashTrivialNear && w.earlyTrivial {
			// collapsed onto the feed: the trivial solution (or, testing a
			// split, well inside the basin of one of its phases)
			res.ok, res.trivial = true, true
			return res
		}
		if newton && tm > tmPrev+1e-12*math.Abs(tmPrev)+1e-15 {
			// the Newton step went uphill: fall back to a substitution step
			newton = false
		}
		tmPrev = tm
		if !newton || it < 4 {
			for i := 0; i < n; i++ {
				if z[i] > 0 {
					w.lnW[i] -= w.r[i]
				}
			}
			if it >= 3 {
				newton = true
			}
			continue
		}
		// Newton step in α = 2√W.
		fl.derivs(ph, &w.ts, w.wn, dN)
		H := w.H[n*n : 2*n*n]
		sq := w.sqW // √W_j once per step instead of once per element
		for j := 0; j < n; j++ {
			sq[j] = math.Sqrt(w.W[j])
		}
		isum := 1 / sumW
		for i := 0; i < n; i++ { // symmetric: the lower triangle, mirrored
			si := sq[i]
			w.g[i] = -si * w.r[i]
			sw := si * isum
			dn := ph.dn[i*n : i*n+i+1]
			for j := range dn {
				h := sw * sq[j] * dn[j]
				H[i*n+j], H[j*n+i] = h, h
			}
		}
		for i := 0; i < n; i++ {
			H[i*n+i] += 1
			if z[i] == 0 {
				for j := 0; j < n; j++ {
					H[i*n+j], H[j*n+i] = 0, 0
				}
				H[i*n+i], w.g[i] = 1, 0
			}
		}
		if !w.shiftedSolve(H, n) {
			for i := 0; i < n; i++ {
				if z[i] > 0 {
					w.lnW[i] -= w.r[i]
				}
			}
			newton = false
			continue
		}
		for i := 0; i < n; i++ {
			if z[i] == 0 {
				continue
			}
			a := 2*sq[i] + w.g[i]
			if a <= 0 {
				a = 1e-3 * 2 * sq[i]
			}
			w.lnW[i] = 2 * math.Log(a/2)
		}
	}
	return res
}

// shiftedSolve solves (H + μD) Δ = g for a Newton step, with D the diagonal
// of H (at w.H[n*n:2*n*n]): μ = 0 when H is positive definite and otherwise
// the smallest of 1e-6, 1e-5, … 1e3 that makes it so (a Marquardt shift:
// close to a critical point the Hessian is nearly singular or indefinite).
// The step replaces w.g.
func (w *work) shiftedSolve(H []float64, n int) bool {
	return w.newtonStep(H, n, false)
}

// newtonStep is shiftedSolve; with descent set, an H that is not positive
// definite first gets the plain Newton step by LU, kept when it points
// downhill (−g·Δ < 0 for the right-hand side g = −gradient). Next to a
// critical point H has an eigenvalue near zero that round-off can make
// negative, and the shift would cut the step along that direction, the flat
// valley the solution lies along, by orders of magnitude.
func (w *work) newtonStep(H []float64, n int, descent bool) bool {
	a := w.H[:n*n]
	copy(w.s, w.g)
	copy(a, H)
	w.factored = cholSolve(a, n, w.g)
	if w.factored {
		return true
	}
	if descent {
		copy(a, H)
		copy(w.g, w.s)
		if luSolve(a, n, w.g) {
			dot := 0.0
			for i := 0; i < n; i++ {
				dot += w.s[i] * w.g[i]
			}
			if dot > 0 && !math.IsInf(dot, 0) {
				return true
			}
		}
	}
	for mu := 1e-6; mu <= 1e3; mu *= 10 {
		copy(a, H)
		for i := 0; i < n; i++ {
			a[i*n+i] += mu * math.Abs(H[i*n+i])
		}
		copy(w.g, w.s)
		if cholSolve(a, n, w.g) {
			return true
		}
	}
	return false
}
