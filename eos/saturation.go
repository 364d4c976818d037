package eos

import "math"

// Saturation pressures at fixed temperature (METHODS 7.6, 7.7): the pressure
// axis is scanned downward with the stability test until the feed first turns
// unstable, and Newton's method on (ln K_1 … ln K_n, ln P) solves for the
// point from the converged trial phase at the bracket's unstable end, the
// bracket narrowed by bisection on stability where Newton fails,
//
//	F_i     = ln K_i + ln φ_i(w) − ln φ_i(z) = 0,   w_i = z_i K_i (incipient phase)
//	F_{n+1} = Σ_i z_i K_i − 1 = 0
//
// The incipient phase w is whichever phase appears; the point is a dew point
// when it is denser than the feed and a bubble point when it is lighter.

const (
	satPStart = 60e6  // Pa: first pressure of the downward scan (about 8700 psia)
	satPMaxUp = 400e6 // Pa: highest pressure tried when the feed is unstable at satPStart
	satPMin   = 1e3   // Pa: lowest pressure searched
	satScan   = 0.85  // ratio of successive scan pressures
	// satLowCoarse: ratio of successive pressures of the scan below an
	// upper dew point (the feed stays two-phase all the way from the upper
	// to the lower dew point of a gas condensate).
	satLowCoarse = 0.4
	// satNewtonBracket: Newton's method on the saturation equations is first
	// tried from the unstable end of a bracket no wider than this ratio (the
	// scans' brackets, 1/satScan and 1/satLowCoarse), before any bisection;
	// a root it finds is accepted only as the edge of stability (refine).
	satNewtonBracket = 3.0
	satBracket       = 1.01 // bisect on stability until the bracket ratio is below this
	// satNearCritical: within this many kelvin of the feed's critical
	// temperature the upper saturation point is first sought along the
	// envelope through the critical point (Saturator.nearCritical).
	satNearCritical = 2.0
	// satInterpResid: the largest residual of the saturation equations
	// accepted for a near-critical point interpolated on the envelope.
	satInterpResid = 1e-7
	// satTrivialK: an incipient phase with every |ln K_i| below this (0.01 %
	// from the feed) cannot be told from the feed.
	satTrivialK = 1e-4
	// satFarK: an incipient phase with some |ln K_i| at or above this (a
	// K-value of e or 1/e) is far from the feed. A root of the saturation
	// equations inside the two-phase region is caught by refine's test just
	// beyond it (1e-5 further out), unless it lies closer than that to the
	// edge of stability: that happens next to a critical point, where the
	// incipient phase of such a root (a saddle of tm) hardly differs from the
	// feed. Only there is the feed also tested at the root itself. (The
	// 3000-state random campaign has one root inside the region with a far
	// incipient phase, 3 % below the edge; the test beyond it rejects it and
	// Newton from there gives the same point, to 3e-13, as the test at the
	// root did.)
	satFarK = 1.0
)

// A Saturator keeps the scratch space for repeated saturation-point solves of
// one Fluid. Not safe for concurrent use.
type Saturator struct {
	w *work
}

// NewSaturator returns a Saturator for fl. A nil s means default settings.
func NewSaturator(fl *Fluid, s *Settings) *Saturator {
	w := newWork(fl, s)
	w.tmCut = tmUnstableSat
	w.earlyTrivial = false // but in the scan of Upper
	return &Saturator{w: w}
}

// UpperSaturation finds the saturation point of feed z at t met first when the
// pressure falls from high values: the upper dew point of a gas condensate, the
// bubble point of an oil. See Saturator.Upper.
func UpperSaturation(fl *Fluid, t float64, z []float64, s *Settings) (Saturation, error) {
	return NewSaturator(fl, s).Upper(t, z)
}

// LowerDewPoint finds the lower dew point of z at t below the upper saturation
// pressure pUpper. See Saturator.Lower.
func LowerDewPoint(fl *Fluid, t float64, z []float64, pUpper float64, s *Settings) (Saturation, error) {
	return NewSaturator(fl, s).Lower(t, z, pUpper)
}

// Upper finds the saturation point of feed z at t (K) met first when the
// pressure falls from high values. The scan starts at 60 MPa (raised up to
// 400 MPa if the feed is unstable there) and goes down to 1 kPa. Within 2 K
// of the feed's critical temperature the point is first converged from the
// traced envelope (nearCritical). It is a bubble point below the critical
// temperature and a dew point above it (named).
//
// Special cases:
//   - the feed is stable at every scanned pressure: ErrNoSaturation;
//   - unstable at every pressure tried up to 400 MPa: ErrTwoPhaseToLimit;
//   - the incipient phase found cannot be told from the feed (every K_i
//     within 1e-4 of 1: the temperature is at the critical point to within
//     the solver's resolution): *NearCriticalError;
//   - Newton fails at every bracket (within a fraction of a degree of a
//     critical point): the edge of stability, bisected to 1e-12 relative, with
//     the trial phase there as the incipient phase; Resid is then the
//     residual of the saturation equations at that point (about 1e-9), not
//     below the solver tolerance.
func (s *Saturator) Upper(t float64, z []float64) (Saturation, error) {
	sat, err := s.upper(t, z)
	w := s.w
	if err != nil || w.thorough {
		return sat, err
	}
	// The stability tests of the search start from Wilson K-values. Where
	// the flash's pure-component trial phases find the feed unstable just
	// above the point (a dense phase at higher pressure), the search is run
	// again with those trials in every test.
	w.fl.setT(&w.ts, t)
	above := sat.P * (1 + 1e-4)
	w.prepareFeed(above, z)
	if _, missed := w.pureTrials(above, z); !missed {
		return sat, nil
	}
	w.thorough = true
	defer func() { w.thorough = false }()
	iter := sat.Iter
	sat, err = s.upper(t, z)
	sat.Iter += iter
	return sat, err
}

func (s *Saturator) upper(t float64, z []float64) (Saturation, error) {
	w := s.w
	w.fl.checkLen(z)
	if !validState(t, 1) {
		return Saturation{}, &SolveError{Op: "UpperSaturation", Err: ErrBadState}
	}
	iter := 0
	if tc, _ := w.critical(z); w.crit.has && math.Abs(t-tc) < satNearCritical {
		if sat, ok := s.nearCritical(t, z, &iter); ok {
			return w.named(sat, z, "UpperSaturation")
		}
	}
	w.fl.setT(&w.ts, t)
	hi := satPStart
	w.earlyTrivial = true
	defer func() { w.earlyTrivial = false }()
	for !w.stableAt(hi, z, &iter) {
		if hi == satPMaxUp {
			return Saturation{}, &SolveError{Op: "UpperSaturation", Iter: iter, Err: ErrTwoPhaseToLimit}
		}
		hi = min(2*hi, satPMaxUp)
	}
	lo := hi
	for {
		lo *= satScan
		if lo < satPMin {
			w.earlyTrivial = false
			return s.fromEnvelope(t, z, iter)
		}
		if !w.stableAt(lo, z, &iter) {
			break
		}
		hi = lo
	}
	w.earlyTrivial = false
	return w.refine(t, z, lo, hi, iter, "UpperSaturation")
}

// fromEnvelope is the fall-back of Upper when the pressure scan found the
// feed stable everywhere: near the cricondentherm the two-phase region at t
// can be narrower than one scan step. The traced envelope says where t meets
// the saturation curve; a stability test just inside the highest crossing
// then gives the bracket for refine.
func (s *Saturator) fromEnvelope(t float64, z []float64, iter int) (Saturation, error) {
	w := s.w
	none := &SolveError{Op: "UpperSaturation", Iter: iter, Err: ErrNoSaturation}
	env, err := TraceEnvelope(w.fl, z, nil)
	if err != nil || env.Cricondentherm[0] <= t {
		return Saturation{}, none
	}
	w.fl.setT(&w.ts, t) // the trace changed the cached temperature
	var cross []float64
	for k := 1; k < len(env.Points); k++ {
		a, b := env.Points[k-1], env.Points[k]
		if (a.T-t)*(b.T-t) <= 0 && a.T != b.T {
			u := (t - a.T) / (b.T - a.T)
			cross = append(cross, math.Exp(math.Log(a.P)+u*(math.Log(b.P)-math.Log(a.P))))
		}
	}
	var inside, top float64
	if len(cross) == 0 {
		// t lies between the hottest traced point and the cricondentherm
		// (solved on the envelope): the two-phase window at t surrounds the
		// cricondentherm's pressure, within a fraction of a per cent.
		inside = w.unstableNear(env.Cricondentherm[1], z, &iter)
		top = inside
	} else {
		next := 0.0
		for _, p := range cross {
			if p > top {
				top, next = p, top
			} else if p > next {
				next = p
			}
		}
		inside = top * 0.99
		if next > 0 {
			inside = math.Sqrt(top * next)
		}
		if w.stableAt(inside, z, &iter) {
			inside = w.unstableNear(inside, z, &iter)
		}
	}
	if inside == 0 {
		return Saturation{}, none
	}
	// the first stable pressure above the window, in steps of 1 % from
	// the highest crossing
	above := top
	for k := 0; ; k++ {
		if k == 60 {
			return Saturation{}, none
		}
		above *= 1.01
		if w.stableAt(above, z, &iter) {
			break
		}
	}
	return w.refine(t, z, inside, above, iter, "UpperSaturation")
}

// nearCritical finds the saturation point at t close to the feed's
// critical point. At fixed temperature the saturation equations have, besides
// the saturation point, the trivial solution K = 1, and the two meet at the
// critical point; near it Newton's method converges to the saturation point
// only from a start much closer to it than to K = 1. The traced envelope
// gives such a start: the interval of highest pressure that passes t is
// interpolated (cubic Hermite in the interval's specified variable, with the
// traced tangents) at t, and satNewton converges from there (or, where the
// residual cannot be brought below the tolerance, the interpolated point is
// kept if its residual is below satInterpResid). The point is accepted when
// the feed is stable just above it and not unstable at it; it reports false
// otherwise, and the caller falls back to refine.
func (s *Saturator) nearCritical(t float64, z []float64, iter *int) (Saturation, bool) {
	w := s.w
	fl := w.fl
	n := fl.n
	env, err := TraceEnvelope(fl, z, nil)
	if env == nil || len(env.pts) < 2 || err != nil && len(env.pts) < 2 {
		return Saturation{}, false
	}
	lnT := math.Log(t)
	var start []float64
	bestP := math.Inf(-1)
	for j := 0; j+1 < len(env.pts); j++ {
		a, b := env.pts[j], env.pts[j+1]
		if (a.x[n]-lnT)*(b.x[n]-lnT) > 0 {
			continue
		}
		x, ok := hermiteAt(a, b, n, lnT)
		if ok && x[n+1] > bestP {
			bestP, start = x[n+1], x
		}
	}
	if start == nil {
		return Saturation{}, false
	}
	fl.setT(&w.ts, t)
	for i := 0; i < n; i++ {
		w.inc[i] = z[i] * math.Exp(start[i])
	}
	p0 := math.Exp(start[n+1])
	sat, it, ok := w.satNewton(t, z, p0, w.inc, true)
	*iter += it
	if !ok {
		// Within a small fraction of a kelvin of the critical point the
		// residual of the equations stops falling near 1e-9 (the round-off
		// of ln φ of two nearly identical phases), above the tolerance; the
		// interpolated point is then the answer, with its residual.
		for i := 0; i < n; i++ {
			w.inc[i] = z[i] * math.Exp(start[i])
		}
		sat = w.fromBracket(t, z, p0, w.inc, *iter)
		if !(sat.Resid < satInterpResid) {
			return Saturation{}, false
		}
	}
	if !w.stableAt(sat.P*(1+1e-5), z, iter) || !w.stableAt(sat.P, z, iter) {
		return Saturation{}, false
	}
	return sat, true
}

// hermiteAt interpolates the envelope between traced points a and b at
// X_k = v, with S = X_spec of a as the parameter: each X_i is the cubic
// Hermite in S through both points with the tangents dX_i/dS; S is found by
// bisection on the cubic of X_k.
func hermiteAt(a, b envPoint, k int, v float64) ([]float64, bool) {
	sv := a.spec
	if a.dx[sv] == 0 || b.dx[sv] == 0 || a.x[sv] == b.x[sv] {
		return nil, false
	}
	at := func(i int, s float64) float64 {
		return hermite(a.x[sv], b.x[sv], a.x[i], b.x[i], a.dx[i]/a.dx[sv], b.dx[i]/b.dx[sv], s)
	}
	lo, hi := a.x[sv], b.x[sv]
	flo := at(k, lo) - v
	if flo*(at(k, hi)-v) > 0 {
		return nil, false
	}
	for it := 0; it < 200; it++ {
		mid := 0.5 * (lo + hi)
		fm := at(k, mid) - v
		if fm*flo > 0 {
			lo, flo = mid, fm
		} else {
			hi = mid
		}
	}
	s := 0.5 * (lo + hi)
	x := make([]float64, len(a.x))
	for i := range x {
		x[i] = at(i, s)
	}
	return x, true
}

// unstableNear returns a pressure within 10 % of p0 at which the feed is
// unstable, trying p0 and then pressures ever further from it in steps of
// 0.2 %; 0 when there is none.
func (w *work) unstableNear(p0 float64, z []float64, iter *int) float64 {
	for j := 0; j <= 50; j++ {
		for _, sgn := range []float64{1, -1} {
			p := p0 * math.Exp(sgn*0.002*float64(j))
			if !w.stableAt(p, z, iter) {
				return p
			}
			if j == 0 {
				break
			}
		}
	}
	return 0
}

// Lower finds the lower dew point of z at t (K): the pressure below pUpper (an
// upper saturation pressure, Pa) at which the feed becomes a single phase
// again, scanning down to 1 kPa. None above 1 kPa: ErrNoSaturation.
func (s *Saturator) Lower(t float64, z []float64, pUpper float64) (Saturation, error) {
	w := s.w
	w.fl.checkLen(z)
	if !validState(t, pUpper) {
		return Saturation{}, &SolveError{Op: "LowerDewPoint", Err: ErrBadState}
	}
	w.fl.setT(&w.ts, t)
	iter := 0
	// A gas condensate is two-phase far below its upper dew point: the scan
	// starts one coarse step below it. Where the feed is stable there, the
	// region is narrow (close to the cricondentherm): the search comes
	// closer to the upper point until the feed is unstable, and the first
	// pressure is the bracket's stable end.
	hi, lo := 0.0, 0.0
	if first := pUpper * satLowCoarse; first >= satPMin {
		if w.stableEarly(first, z, &iter) {
			lo = first
		} else {
			hi = first
		}
	}
	if hi == 0 {
		for _, f := range []float64{0.995, 0.999, 0.9999, 0.99999, 0.999999} {
			if !w.stableEarly(pUpper*f, z, &iter) {
				hi = pUpper * f
				break
			}
		}
		if hi == 0 {
			return Saturation{}, &SolveError{Op: "LowerDewPoint", Iter: iter, Err: ErrNoSaturation}
		}
	}
	// Down in coarse steps to the first stable pressure; refine goes on
	// from that bracket.
	for lo == 0 {
		lo = hi * satLowCoarse
		if lo < satPMin {
			lo = satPMin
			if !w.stableEarly(lo, z, &iter) {
				return Saturation{}, &SolveError{Op: "LowerDewPoint", Iter: iter, Err: ErrNoSaturation}
			}
			break
		}
		if !w.stableEarly(lo, z, &iter) {
			hi, lo = lo, 0
		}
	}
	// Here hi is unstable and lo stable: the mirror image of the upper search.
	return w.refine(t, z, hi, lo, iter, "LowerDewPoint")
}

// stableEarly is stableAt for a scan through the two-phase region: the test
// stops at the first trial point of negative tangent-plane distance, which
// proves instability as well as a converged one does, so the verdict is the
// same and the test much shorter. Where the feed is unstable it keeps the
// trial phase where the test stopped, as stableAt does its converged one:
// refine starts Newton from it, which needs no converged start (from the
// lower dew point's scan, one coarse step of 0.4 away in pressure, Newton
// takes as many iterations from either).
func (w *work) stableEarly(p float64, z []float64, iter *int) bool {
	w.prepareFeed(p, z)
	liq, vap := w.stability(p, z, true)
	*iter += liq.iter + vap.iter
	stable := !liq.unstable && !vap.unstable
	if !stable {
		w.keepUnstable(p, z, liq, vap)
	}
	return stable
}

// keepUnstable keeps the trial phase of lower tm of the stability test at p
// that found z unstable, for refine to start Newton from.
func (w *work) keepUnstable(p float64, z []float64, liq, vap trialResult) {
	w.lastUnP, w.lastUnT = p, w.ts.t
	w.lastUnZ = append(w.lastUnZ[:0], z...)
	if liq.unstable && (!vap.unstable || liq.tm <= vap.tm) {
		w.lastUnW = append(w.lastUnW[:0], w.wLiq...)
	} else {
		w.lastUnW = append(w.lastUnW[:0], w.wVap...)
	}
}

// stableAt runs a full stability test of z at p, temperature already set.
func (w *work) stableAt(p float64, z []float64, iter *int) bool {
	w.prepareFeed(p, z)
	liq, vap := w.stability(p, z, false)
	*iter += liq.iter + vap.iter
	stable := !liq.unstable && !vap.unstable
	if !stable {
		w.keepUnstable(p, z, liq, vap) // for refine
	}
	return stable
}

// refine converges a saturation point between pUn, where the feed is
// unstable, and pSt, where it is stable. It runs Newton from the trial phase
// found at pUn: at once where the bracket is no wider than satNewtonBracket,
// otherwise after a first bisection on stability. A Newton solution is
// accepted only when the feed is stable just beyond it (1e-5 relative,
// towards pSt) and, where the incipient phase is close to the feed (not
// farFromFeed), at the root itself: the saturation equations also hold at
// points inside the two-phase region close to a critical point, where the
// incipient phase hardly differs from the feed. A Newton solve that fails,
// leaves the bracket or lands inside the region narrows the bracket and tries
// again.
func (w *work) refine(t float64, z []float64, pUn, pSt float64, iter int, op string) (Saturation, error) {
	// the trial phase at pUn: re-run it so w.wLiq/w.wVap belong to pUn. It
	// is kept in its own buffer: the stability tests of the bisection and
	// Newton's iterations both overwrite w.wn.
	inc := w.inc
	// unstableAt runs the stability test at p and, when the feed is
	// unstable there, keeps the trial phase of lower tm in inc.
	unstableAt := func(p float64) bool {
		w.prepareFeed(p, z)
		liq, vap := w.stability(p, z, false)
		iter += liq.iter + vap.iter
		switch {
		case liq.unstable && (!vap.unstable || liq.tm <= vap.tm):
			copy(inc, w.wLiq)
		case vap.unstable:
			copy(inc, w.wVap)
		default:
			return false
		}
		return true
	}
	// The stability test at pUn is the search's last unstable one, whose
	// trial phase stableAt or stableEarly kept (the tests start from
	// Wilson's K-values every time, so running stableAt's again gives the
	// same phase; stableEarly's stopped short of convergence, which Newton
	// does not need).
	if w.lastUnP == pUn && w.lastUnT == w.ts.t && len(w.lastUnZ) == len(z) && sameVector(w.lastUnZ, z) {
		copy(inc, w.lastUnW)
	} else {
		unstableAt(pUn)
	}
	for attempt := 0; attempt < 60; attempt++ {
		if max(pUn, pSt)/min(pUn, pSt) < satNewtonBracket || attempt > 0 {
			sat, it, ok := w.satNewton(t, z, pUn, inc, false)
			iter += it
			lo, hi := min(pUn, pSt), max(pUn, pSt)
			if ok && sat.P >= lo*(1-1e-9) && sat.P <= hi*(1+1e-9) && !farFromFeed(sat.Incipient, z) && unstableAt(sat.P) {
				// the feed is unstable at the root itself: it lies inside
				// the two-phase region, next to the limit of stability,
				// where the saturation equations also hold close to a
				// critical point with a phase (a saddle of tm) hardly
				// different from the feed
				pUn = sat.P
				ok = false
			}
			if ok && sat.P >= lo*(1-1e-9) && sat.P <= hi*(1+1e-9) {
				beyond := sat.P * (1 + 1e-5)
				if pSt < pUn {
					beyond = sat.P * (1 - 1e-5)
				}
				if (beyond-pSt)*(beyond-pUn) >= 0 || !unstableAt(beyond) {
					// stable there (or the stable end of the bracket is nearer)
					sat.Iter = iter
					return w.named(sat, z, op)
				}
				pUn = beyond // inside the two-phase region: a spurious root
			}
		}
		if math.Abs(pUn-pSt) <= 1e-12*pSt {
			// Newton's method failed at every bracket (close to a critical
			// point the equations are nearly singular and it slides towards
			// the trivial solution), but the bisection has located the edge of
			// stability to 1e-12: that is the saturation point, the
			// incipient phase the trial phase found just inside it. Resid
			// reports how nearly it satisfies the saturation equations.
			return w.named(w.fromBracket(t, z, math.Sqrt(pUn*pSt), inc, iter), z, op)
		}
		mid := math.Sqrt(pUn * pSt)
		if unstableAt(mid) {
			pUn = mid
		} else {
			pSt = mid
		}
	}
	return Saturation{}, &SolveError{Op: op, Iter: iter, Err: ErrNoConvergence}
}

// farFromFeed reports whether incipient phase x differs from feed z by a
// K-value of satFarK or more in the logarithm.
func farFromFeed(x, z []float64) bool {
	for i, zi := range z {
		if zi > 0 && math.Abs(math.Log(x[i]/zi)) >= satFarK {
			return true
		}
	}
	return false
}

// fromBracket returns the saturation point at p (Pa) with incipient phase
// w0 (mole numbers, not normalised), as located by bisection on stability.
func (w *work) fromBracket(t float64, z []float64, p float64, w0 []float64, iter int) Saturation {
	n := w.n
	fl := w.fl
	sumW := 0.0
	for i := 0; i < n; i++ {
		sumW += w0[i]
	}
	for i := 0; i < n; i++ {
		w.wn[i] = w0[i] / sumW
	}
	fl.evalPhase(&w.feed, &w.ts, p, z, rootMinG, 0)
	fl.evalPhase(&w.pa, &w.ts, p, w.wn, rootMinG, 0)
	res := 0.0
	for i := 0; i < n; i++ {
		if z[i] > 0 {
			res = max(res, math.Abs(math.Log(w.wn[i]/z[i])+w.pa.lnphi[i]-w.feed.lnphi[i]))
		}
	}
	return w.saturation(t, p, z, iter, res)
}

// saturation returns the saturation point at t and p of feed z, evaluated in
// w.feed, with incipient phase w.wn, evaluated in w.pa. Its type is set by
// named.
func (w *work) saturation(t, p float64, z []float64, iter int, res float64) Saturation {
	sat := Saturation{T: t, P: p, Incipient: append([]float64(nil), w.wn...), Iter: iter, Resid: res}
	sat.Feed = w.fl.props(&w.feed, t, p, z)
	sat.Inc = w.fl.props(&w.pa, t, p, w.wn)
	if sat.Inc.M/w.pa.vEOS < sat.Feed.M/w.feed.vEOS {
		sat.Type = Bubble // a less dense incipient phase, until named decides
	}
	return sat
}

// named finishes a saturation point found by refine for op: it names its
// type and refuses an incipient phase that cannot be told from the feed.
//
// A lower dew point is a dew point. An upper saturation point is a bubble
// point below the feed's vapour–liquid critical temperature and a dew point
// above it, the side of the critical point on which it lies; a feed with no
// critical point keeps the local test of saturation, a dew point when the
// incipient phase is the denser (by the untranslated volumes of the
// equation of state: the Peneloux shift can reverse the order of two nearly
// equal densities).
func (w *work) named(sat Saturation, z []float64, op string) (Saturation, error) {
	kmax := 0.0
	for i, zi := range z {
		if zi > 0 {
			kmax = max(kmax, math.Abs(math.Log(sat.Incipient[i]/zi)))
		}
	}
	tc, _ := w.critical(z)
	if kmax < satTrivialK {
		ne := &NearCriticalError{Op: op, T: sat.T, P: sat.P, Iter: sat.Iter}
		if w.crit.has {
			ne.Tc, ne.Pc = w.crit.cp.T, w.crit.cp.P
		}
		return Saturation{}, ne
	}
	switch {
	case op == "LowerDewPoint":
		sat.Type = Dew
	case w.crit.has && sat.T < tc:
		sat.Type = Bubble
	case w.crit.has:
		sat.Type = Dew
	}
	return sat, nil
}

// trialMinimum reports whether the incipient phase held in w.W (mole
// numbers summing to sumW) and evaluated with composition derivatives in
// w.pa is a minimum of the tangent-plane distance, which the incipient phase
// of a saturation point is: the Hessian δ_ij + √(W_i W_j) ∂ln φ_i/∂n_j in
// α_i = 2√W_i (Michelsen 1982a) is positive definite. Close to a critical
// point the saturation equations are also met by a saddle of tm, inside the
// two-phase region, whose phase hardly differs from the feed.
func (w *work) trialMinimum(z []float64, sumW float64) bool {
	n := w.n
	H := w.H[:n*n]
	sq := w.sqW
	for j := 0; j < n; j++ {
		sq[j] = math.Sqrt(w.W[j])
	}
	for i := 0; i < n; i++ {
		si := sq[i]
		for j := 0; j < n; j++ {
			H[i*n+j] = si * sq[j] * w.pa.dn[i*n+j] / sumW
		}
		H[i*n+i]++
		w.g[i] = 0
		if z[i] == 0 {
			for j := 0; j < n; j++ {
				H[i*n+j], H[j*n+i] = 0, 0
			}
			H[i*n+i] = 1
		}
	}
	return cholSolve(H, n, w.g)
}

// satNewton solves the saturation equations at fixed t from pressure p0 and
// incipient composition w0. guarded halves a step that raises the residual
// (up to ten times), for a start already close to the solution. It reports the point and whether Newton converged
// to a non-trivial solution.
func (w *work) satNewton(t float64, z []float64, p0 float64, w0 []float64, guarded bool) (Saturation, int, bool) {
	n := w.n
	fl := w.fl
	lnP := math.Log(p0)
	for i, zi := range z {
		if zi > 0 {
			w.lnK[i] = math.Log(w0[i] / zi)
		} else {
			w.lnK[i] = 0
		}
	}
	m := n + 1
	// the last accepted point (ln K in w.lnK1), its step (ln K in w.lnK2)
	// and residual, and the fraction lam of the step being tried
	prevRes, prevLnP, stepP, lam, cuts := math.Inf(1), lnP, 0.0, 1.0, 0
	for it := 1; it <= 50; it++ {
		p := math.Exp(lnP)
		sumW := 0.0
		for i := 0; i < n; i++ {
			w.W[i] = z[i] * math.Exp(w.lnK[i])
			sumW += w.W[i]
		}
		for i := 0; i < n; i++ {
			w.wn[i] = w.W[i] / sumW
		}
		// The derivatives (the feed's in pressure alone, the incipient
		// phase's in pressure and composition) only once the point is known
		// to take a Newton step from (below).
		fl.evalPhase(&w.feed, &w.ts, p, z, rootMinG, 0)
		fl.evalPhase(&w.pa, &w.ts, p, w.wn, rootMinG, 0)
		res := 0.0
		triv := 0.0
		for i := 0; i < n; i++ {
			F := w.lnK[i] + w.pa.lnphi[i] - w.feed.lnphi[i]
			if z[i] == 0 {
				F = 0
			}
			w.rhs[i] = -F
			res = max(res, math.Abs(F))
			triv += w.lnK[i] * w.lnK[i]
		}
		Fs := sumW - 1
		w.rhs[n] = -Fs
		res = max(res, math.Abs(Fs))
		if guarded && res > prevRes && cuts < 10 {
			// the step raised the residual: take half of it instead
			// (close to a critical point the equations are nearly singular
			// and a full step from a good start can leave for another root)
			cuts++
			lam *= 0.5
			for i := 0; i < n; i++ {
				w.lnK[i] = w.lnK1[i] + lam*w.lnK2[i]
			}
			lnP = prevLnP + lam*stepP
			continue
		}
		cuts, lam, prevRes = 0, 1, res
		if triv < 1e-8 {
			return Saturation{}, it, false
		}
		if res < w.tol {
			fl.derivs(&w.pa, &w.ts, w.wn, dN) // for the test of the minimum
			if !w.trialMinimum(z, sumW) {
				return Saturation{}, it, false // a saddle of tm, not the incipient phase
			}
			return w.saturation(t, p, z, it, res), it, true
		}
		fl.derivs(&w.feed, &w.ts, z, dP)
		fl.derivs(&w.pa, &w.ts, w.wn, dN|dP)
		H := w.H[:m*m]
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				H[i*m+j] = w.pa.dn[i*n+j] * w.W[j] / sumW
			}
			H[i*m+i] += 1
			H[i*m+n] = p * (w.pa.dp[i] - w.feed.dp[i])
			if z[i] == 0 {
				for j := 0; j < m; j++ {
					H[i*m+j] = 0
				}
				H[i*m+i] = 1
			}
		}
		for j := 0; j < n; j++ {
			H[n*m+j] = w.W[j]
		}
		H[n*m+n] = 0
		if !luSolve(H, m, w.rhs) {
			return Saturation{}, it, false
		}
		// Damp large steps: ln P by at most 0.2, ln K by at most 1.
		sc := 1.0
		if a := math.Abs(w.rhs[n]); a > 0.2 {
			sc = 0.2 / a
		}
		for i := 0; i < n; i++ {
			if a := math.Abs(w.rhs[i]); a*sc > 1 {
				sc = 1 / a
			}
		}
		copy(w.lnK1, w.lnK)
		prevLnP = lnP
		for i := 0; i < n; i++ {
			w.lnK2[i] = sc * w.rhs[i]
			w.lnK[i] += w.lnK2[i]
		}
		stepP = sc * w.rhs[n]
		lnP += stepP
	}
	return Saturation{}, 50, false
}
