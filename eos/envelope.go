package eos

import (
	"math"
)

// Phase-envelope tracing by the continuation method of Michelsen (1980).
// The unknowns are X = (ln K_1 … ln K_n, ln T, ln P) with K_i = w_i/z_i, the
// ratio of the incipient phase w to the feed z, and the equations are
//
//	F_i     = ln K_i + ln φ_i(w, T, P) − ln φ_i(z, T, P) = 0
//	F_{n+1} = Σ_i z_i K_i − 1 = 0
//	F_{n+2} = X_s − S = 0
//
// with one variable X_s specified. After each converged point the
// sensitivities J dX/dS = e_{n+2} give the tangent; the next specified
// variable is the one changing fastest, the step is predicted along the
// tangent and corrected by Newton's method. The trace starts on the dew branch
// at low pressure, passes the cricondentherm, the critical point (where every
// ln K changes sign; the step is placed to jump across it) and the
// cricondenbar, and follows the bubble branch back down to low pressure.

const (
	envPStart   = 0.05e6 // Pa: pressure of the first (dew) point and the end of the bubble branch
	envMaxPts   = 600
	envTMin     = 30.0 // K: the bubble branch stops below this temperature
	envMaxStepK = 0.5  // largest change of a small ln K in one step (20 % of a large one)
	envCritK    = 0.1  // below this max |ln K| the next step jumps across the critical point
	envMinStep  = 1e-4 // a step smaller than this in the specified variable counts as a failure
	envMaxStepT = 0.1  // largest change of ln T in one step
	envMaxStepP = 0.3  // largest change of ln P in one step
)

type envTracer struct {
	w    *work
	z    []float64
	n, m int
	x    []float64 // current X
	dx   []float64 // tangent dX/dS for the current specification
	jac  []float64
	f    []float64
	// past is set once the trace has crossed the critical point: the feed then
	// takes the liquid root of the cubic and the incipient phase the vapour
	// root; before it, the other way round (Michelsen 1980).
	past bool
}

// TraceEnvelope traces the phase envelope of feed z: the dew branch from low
// pressure, through the cricondentherm, the critical point and the
// cricondenbar, and the bubble branch back to low pressure. It returns the
// points in the order traced, with the cricondenbar and cricondentherm
// solved on the envelope (extreme).
//
// The critical point is the feed's vapour–liquid critical point
// (VLCritical), reported when the trace crosses it: where every ln K
// changes sign within a step that brackets it. A change of sign elsewhere
// is the corrector jumping to another solution branch, and ends the trace.
// When the trace stalls within a few per cent of the critical point (a
// very flat top), it is restarted on the far side of the critical point.
//
// The trace stops at the limits of the vapour–liquid envelope, which End
// names (see EnvelopeEnd): where the bubble branch is back at 50 kPa; at a
// second critical point on the bubble branch; where the curve turns into the
// boundary of a region of two dense phases (EndDensePhases), which shows in
// one of two ways: on either branch the pressure, having passed its maximum
// on that branch (the cricondenbar on one of them) and fallen by 2 %, rises
// again by more than 2 % above its lowest value since; or on the dew branch
// the incipient liquid, which
// grows lighter as the trace climbs towards the critical point, grows
// heavier again by more than 2 % in molar mass. The points beyond the lowest
// pressure, or the lightest incipient liquid, are dropped. The trace also
// stops at 400 MPa and below 30 K.
//
// Special cases: no dew point at 50 kPa between 20 K and 2000 K, or a corrector
// that fails on the dew branch before any of those limits: *SolveError
// wrapping ErrNoConvergence (with the points traced so far still returned).
func TraceEnvelope(fl *Fluid, z []float64, s *Settings) (*Envelope, error) {
	fl.checkLen(z)
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	n := fl.n
	m := n + 2
	e := &envTracer{
		w: newWork(fl, s), z: z, n: n, m: m,
		x: make([]float64, m), dx: make([]float64, m),
		jac: make([]float64, m*m), f: make([]float64, m),
	}
	env := &Envelope{}
	cp, hasCP, err := VLCritical(fl, z)
	if err != nil {
		return env, err
	}
	if !e.start() {
		return env, &SolveError{Op: "TraceEnvelope", Err: ErrNoConvergence}
	}
	spec := n + 1 // ln P
	it, ok := e.correct(spec, e.x[spec])
	if !ok {
		return env, &SolveError{Op: "TraceEnvelope", Iter: it, Err: ErrNoConvergence}
	}
	total := it
	prev := make([]float64, m)
	prevDx := make([]float64, m)
	xs := make([]float64, m)
	step := 0.05 // in ln P at the start
	passedCrit := false
	jumped := false                  // the trace was restarted across the critical point
	maxLnP := math.Inf(-1)           // highest ln P so far
	minLnP, iMin := math.Inf(1), -1  // lowest ln P since the pressure fell 2 % below maxLnP
	minMi, iMinMi := math.Inf(1), -1 // lightest incipient liquid on the dew branch
	var pts []envPoint
	add := func() {
		pts = append(pts, envPoint{x: append([]float64(nil), e.x...), dx: append([]float64(nil), e.dx...), spec: spec, past: e.past})
		env.Points = append(env.Points, e.point())
	}
	finish := func(end EnvelopeEnd) (*Envelope, error) {
		env.End = end
		env.Truncated = end != EndClosed
		env.NearCritical = end == EndNearCritical
		env.pts = pts
		return e.finish(env, pts), nil
	}
	// tangent at the first point, specification ln P increasing
	if !e.tangent(spec) {
		return env, &SolveError{Op: "TraceEnvelope", Iter: total, Err: ErrNoConvergence}
	}
	if e.dx[spec] < 0 {
		scale(e.dx, -1)
	}
	add()
	for len(pts) < envMaxPts {
		// choose the specification: the variable changing fastest along the tangent
		best := spec
		for i := 0; i < m; i++ {
			if math.Abs(e.dx[i]) > math.Abs(e.dx[best]) {
				best = i
			}
		}
		if best != spec {
			scale(e.dx, 1/e.dx[best])
			spec = best
		}
		kmax := e.kmax(e.x)
		accepted := false
		if !passedCrit && !jumped && hasCP && kmax < envCritK {
			// Every K within 10 % of 1 next to the critical point: go across
			// it to the mirror image of this point, whatever variable the
			// trace was following (a step of its own could slide along the
			// trivial solution instead, and whether it crossed would hang
			// on the last bits of the composition).
			jumped = true
			copy(prev, e.x)
			copy(prevDx, e.dx)
			k := 0
			for i := 0; i < n; i++ {
				if e.z[i] > 0 && math.Abs(e.x[i]) > math.Abs(e.x[k]) {
					k = i
				}
			}
			if it, ok := e.mirror(prev, k, cp); ok {
				total += it
				accepted, spec, step = true, k, envCritK
			}
		}
		// close to the critical point with a ln K specified: jump across it
		nearCrit := !passedCrit && spec < n && kmax < envCritK
		if !accepted {
			dir := 1.0
			if len(pts) > 1 {
				// direction: continue the way the previous step went
				d := 0.0
				for i := 0; i < m; i++ {
					d += (e.x[i] - prev[i]) * e.dx[i]
				}
				if d < 0 {
					dir = -1
				}
			} else if e.dx[n+1] < 0 {
				dir = -1
			}
			ds := dir * step
			// limit the step so no variable changes more than its cap
			for i := 0; i < m; i++ {
				var lim float64
				switch {
				case i == n:
					lim = envMaxStepT
				case i == n+1:
					lim = envMaxStepP
				default:
					lim = max(envMaxStepK, 0.2*math.Abs(e.x[i]))
				}
				if a := math.Abs(e.dx[i] * ds); a > lim {
					ds *= lim / a
				}
			}
			if nearCrit {
				// jump across the critical point to the mirror value of ln K_spec
				ds = -2 * e.x[spec] / e.dx[spec]
			}
			copy(prev, e.x)
			copy(prevDx, e.dx)
			for cut := 0; cut < 12; cut++ {
				for i := 0; i < m; i++ {
					xs[i] = prev[i] + ds*prevDx[i]
				}
				copy(e.x, xs)
				// a step across the critical point swaps the roots of the two phases
				e.past = passedCrit || e.flips(prev, xs)
				it, ok := e.correct(spec, xs[spec])
				total += it
				// a corrector that lands far from its prediction has jumped to
				// another solution branch
				far := math.Abs(e.x[n]-xs[n]) > envMaxStepT || math.Abs(e.x[n+1]-xs[n+1]) > envMaxStepP
				if ok && !far && !e.trivial() {
					accepted = true
					if it <= 4 {
						step = min(2*math.Abs(ds), 1.0)
					} else if it > 6 {
						step = 0.5 * math.Abs(ds)
					} else {
						step = math.Abs(ds)
					}
					break
				}
				ds *= 0.5
			}
		}
		if accepted && step < envMinStep {
			accepted = false
		}
		if !accepted && !passedCrit && !jumped && hasCP && kmax < envCritK {
			// Every K within 10 % of 1 and no step across: where the trace
			// meets the critical region almost tangentially (a very flat
			// top with the critical point near the cricondenbar) the
			// corrector can neither cross nor follow it. Start again on
			// the far side of the critical point, at the mirror image of
			// this point.
			jumped = true
			if it, ok := e.mirror(prev, spec, cp); ok {
				total += it
				accepted = true
				step = envCritK
			}
		}
		if !accepted {
			copy(e.x, prev)
			e.past = passedCrit
			switch {
			case !passedCrit && kmax < envCritK:
				// The points so far are converged; the critical point
				// could not be crossed.
				return finish(EndNearCritical)
			case passedCrit || e.x[n+1] < math.Log(0.9)+maxLnP:
				// Past the critical point, or past the pressure maximum on
				// the way down to a critical point at low temperature, the
				// envelope can run into a region where no vapour–liquid
				// saturation point continues it (a liquid–liquid split, or
				// the end of the liquid root of the incipient phase).
				return finish(EndNoContinuation)
			}
			env.pts = pts
			return e.finish(env, pts), &SolveError{Op: "TraceEnvelope", Iter: total, Err: ErrNoConvergence}
		}
		if !e.tangent(spec) {
			env.pts = pts
			return e.finish(env, pts), &SolveError{Op: "TraceEnvelope", Iter: total, Err: ErrNoConvergence}
		}
		// orient the new tangent along the direction of travel
		d := 0.0
		for i := 0; i < m; i++ {
			d += (e.x[i] - prev[i]) * e.dx[i]
		}
		if d < 0 {
			scale(e.dx, -1)
		}
		// critical point: every ln K changed sign
		if e.crossed(prev) {
			if passedCrit {
				// a second critical point: beyond it the two phases change
				// roles again, between two dense phases
				return finish(EndSecondCritical)
			}
			if !hasCP || !e.brackets(prev, cp) {
				// the signs changed away from the critical point: the
				// corrector went over to another branch of solutions
				copy(e.x, prev)
				return finish(EndNoContinuation)
			}
			passedCrit = true
			e.past = true
			env.HasCritical = true
			env.Critical = [2]float64{cp.T, cp.P}
			// the bubble branch can climb from the critical point to a
			// maximum of its own before it falls: its pressure is followed
			// afresh
			maxLnP, minLnP, iMin = math.Inf(-1), math.Inf(1), -1
		}
		add()
		cut := -1 // the last point to keep, when a limit is passed
		lnP := e.x[n+1]
		switch {
		case lnP > maxLnP:
			maxLnP = lnP
		case lnP < maxLnP+math.Log(0.98) && lnP < minLnP:
			minLnP, iMin = lnP, len(pts)-1
		case iMin >= 0 && lnP > minLnP+math.Log(1.02):
			cut = iMin // the pressure fell after the cricondenbar and rises again
		}
		if !passedCrit {
			switch mi := e.incipientMolarMass(); {
			case mi < minMi:
				minMi, iMinMi = mi, len(pts)-1
			case mi > 1.02*minMi && (cut < 0 || iMinMi < cut):
				cut = iMinMi // the incipient liquid grows heavier again
			}
		}
		if cut >= 0 {
			pts = pts[:cut+1]
			env.Points = env.Points[:cut+1]
			return finish(EndDensePhases)
		}
		if passedCrit && lnP < math.Log(envPStart) {
			return finish(EndClosed)
		}
		if math.Exp(e.x[n]) < envTMin {
			return finish(EndLowTemperature)
		}
		if lnP > math.Log(satPMaxUp) {
			return finish(EndPressureLimit)
		}
	}
	return finish(EndTooManyPoints)
}

// kmax is the largest |ln K_i| of x over the components present.
func (e *envTracer) kmax(x []float64) float64 {
	k := 0.0
	for i := 0; i < e.n; i++ {
		if e.z[i] > 0 {
			k = max(k, math.Abs(x[i]))
		}
	}
	return k
}

// brackets reports whether the step from a to e.x passes the critical point
// cp: its temperature and pressure lie between those of the two points (to
// 1 % of the step, or 1e-6 relative).
func (e *envTracer) brackets(a []float64, cp CriticalPoint) bool {
	n := e.n
	in := func(lo, hi, v float64) bool {
		if lo > hi {
			lo, hi = hi, lo
		}
		tol := max(0.01*(hi-lo), 1e-6*math.Abs(v))
		return v >= lo-tol && v <= hi+tol
	}
	return in(a[n], e.x[n], math.Log(cp.T)) && in(a[n+1], e.x[n+1], math.Log(cp.P))
}

// incipientMolarMass is the molar mass of the incipient phase at e.x.
func (e *envTracer) incipientMolarMass() float64 {
	fl := e.w.fl
	num, den := 0.0, 0.0
	for i, zi := range e.z {
		wi := zi * math.Exp(e.x[i])
		num += wi * fl.m[i]
		den += wi
	}
	return num / den
}

// mirror restarts the trace across the critical point cp from a, the last
// point before it: ln K and the distance of ln T and ln P from the critical
// point change sign, and the point is converged with ln K_spec specified.
// It leaves the point in e.x, past the critical point.
func (e *envTracer) mirror(a []float64, spec int, cp CriticalPoint) (int, bool) {
	n := e.n
	for i := 0; i < n; i++ {
		e.x[i] = -a[i]
	}
	e.x[n] = 2*math.Log(cp.T) - a[n]
	e.x[n+1] = 2*math.Log(cp.P) - a[n+1]
	e.past = true
	it, ok := e.correct(spec, e.x[spec])
	if !ok || e.trivial() || !e.flips(a, e.x) {
		copy(e.x, a)
		e.past = false
		return it, false
	}
	return it, true
}

type envPoint struct {
	x, dx []float64
	spec  int
	past  bool // beyond the critical point (see envTracer.past)
}

func scale(v []float64, c float64) {
	for i := range v {
		v[i] *= c
	}
}

// start finds a first dew point at envPStart from Wilson K-values: the
// temperature where Σ z_i/K_i^Wilson = 1, found by bisection on ln T.
func (e *envTracer) start() bool {
	n := e.n
	fl := e.w.fl
	p := envPStart
	sum := func(t float64) float64 {
		s := 0.0
		for i, zi := range e.z {
			lnK := math.Log(fl.pc[i]/p) + 5.373*(1+fl.omega[i])*(1-fl.tc[i]/t)
			s += zi * math.Exp(-lnK)
		}
		return s
	}
	lo, hi := 20.0, 2000.0
	if sum(lo) < 1 || sum(hi) > 1 {
		return false
	}
	for k := 0; k < 100; k++ {
		mid := math.Sqrt(lo * hi)
		if sum(mid) > 1 {
			lo = mid
		} else {
			hi = mid
		}
	}
	t := math.Sqrt(lo * hi)
	for i := 0; i < n; i++ {
		e.x[i] = -(math.Log(fl.pc[i]/p) + 5.373*(1+fl.omega[i])*(1-fl.tc[i]/t))
	}
	e.x[n] = math.Log(t)
	e.x[n+1] = math.Log(p)
	return true
}

// eval fills the residuals and the Jacobian at e.x.
func (e *envTracer) eval(spec int, sVal float64) float64 {
	w := e.w
	n, m := e.n, e.m
	fl := w.fl
	t := math.Exp(e.x[n])
	p := math.Exp(e.x[n+1])
	fl.setT(&w.ts, t)
	sumW := 0.0
	for i := 0; i < n; i++ {
		w.W[i] = e.z[i] * math.Exp(e.x[i])
		sumW += w.W[i]
	}
	for i := 0; i < n; i++ {
		w.wn[i] = w.W[i] / sumW
	}
	rf, ri := rootVapour, rootLiquid
	if e.past {
		rf, ri = rootLiquid, rootVapour
	}
	fl.evalPhase(&w.feed, &w.ts, p, e.z, rf, dN|dP|dT)
	fl.evalPhase(&w.pa, &w.ts, p, w.wn, ri, dN|dP|dT)
	res := 0.0
	J := e.jac
	for i := 0; i < n; i++ {
		e.f[i] = e.x[i] + w.pa.lnphi[i] - w.feed.lnphi[i]
		res = max(res, math.Abs(e.f[i]))
		for j := 0; j < n; j++ {
			J[i*m+j] = w.pa.dn[i*n+j] * w.W[j] / sumW
		}
		J[i*m+i] += 1
		J[i*m+n] = t * (w.pa.dt[i] - w.feed.dt[i])
		J[i*m+n+1] = p * (w.pa.dp[i] - w.feed.dp[i])
	}
	e.f[n] = sumW - 1
	res = max(res, math.Abs(e.f[n]))
	for j := 0; j < n; j++ {
		J[n*m+j] = w.W[j]
	}
	J[n*m+n], J[n*m+n+1] = 0, 0
	for j := 0; j < m; j++ {
		J[(n+1)*m+j] = 0
	}
	J[(n+1)*m+spec] = 1
	e.f[n+1] = e.x[spec] - sVal
	return res
}

// correct runs Newton's method at fixed X_spec = sVal from e.x.
func (e *envTracer) correct(spec int, sVal float64) (int, bool) {
	m := e.m
	w := e.w
	for it := 1; it <= 25; it++ {
		res := e.eval(spec, sVal)
		if res < w.tol {
			return it, true
		}
		for i := 0; i < m; i++ {
			w.rhs[i] = -e.f[i]
		}
		if !luSolve(e.jac, m, w.rhs) {
			return it, false
		}
		big := 0.0
		for i := 0; i < m; i++ {
			big = max(big, math.Abs(w.rhs[i]))
		}
		sc := 1.0
		if big > 1 {
			sc = 1 / big
		}
		for i := 0; i < m; i++ {
			e.x[i] += sc * w.rhs[i]
		}
		if math.IsNaN(e.x[e.n]) || math.Exp(e.x[e.n]) < 1 {
			return it, false
		}
	}
	return 25, false
}

// tangent computes dX/dS at the converged e.x for specification spec.
func (e *envTracer) tangent(spec int) bool {
	e.eval(spec, e.x[spec])
	for i := range e.dx {
		e.dx[i] = 0
	}
	e.dx[e.m-1] = 1
	return luSolve(e.jac, e.m, e.dx)
}

func (e *envTracer) trivial() bool {
	s := 0.0
	for i := 0; i < e.n; i++ {
		if e.z[i] > 0 {
			s += e.x[i] * e.x[i]
		}
	}
	return s < 1e-10
}

// crossed reports whether the step from prev to e.x passed the critical
// point.
func (e *envTracer) crossed(prev []float64) bool { return e.flips(prev, e.x) }

// flips reports whether the ln K in a and b lie on opposite sides of the
// critical point: the ln K of largest magnitude at a, which vanishes only
// there, changed sign, and so did most of the others.
func (e *envTracer) flips(a, b []float64) bool {
	k, flipped, present := 0, 0, 0
	for i := 0; i < e.n; i++ {
		if e.z[i] == 0 {
			continue
		}
		present++
		if a[i]*b[i] < 0 {
			flipped++
		}
		if math.Abs(a[i]) > math.Abs(a[k]) {
			k = i
		}
	}
	return a[k]*b[k] < 0 && 2*flipped > present
}

// hermite evaluates at s the cubic through (s0, y0) and (s1, y1) with slopes d0, d1.
func hermite(s0, s1, y0, y1, d0, d1, s float64) float64 {
	h := s1 - s0
	u := (s - s0) / h
	h00 := 2*u*u*u - 3*u*u + 1
	h10 := u*u*u - 2*u*u + u
	h01 := -2*u*u*u + 3*u*u
	h11 := u*u*u - u*u
	return h00*y0 + h10*h*d0 + h01*y1 + h11*h*d1
}

// hermiteMax returns the largest value of that cubic on [s0, s1].
func hermiteMax(s0, s1, y0, y1, d0, d1 float64) (s, y float64) {
	s, y = s0, y0
	if y1 > y {
		s, y = s1, y1
	}
	for k := 1; k < 64; k++ {
		sk := s0 + (s1-s0)*float64(k)/64
		if v := hermite(s0, s1, y0, y1, d0, d1, sk); v > y {
			s, y = sk, v
		}
	}
	// golden-section polish around the best sample
	a, b := s-(s1-s0)/64, s+(s1-s0)/64
	if a > b {
		a, b = b, a
	}
	const gr = 0.6180339887498949
	for k := 0; k < 60; k++ {
		c := b - gr*(b-a)
		d := a + gr*(b-a)
		if hermite(s0, s1, y0, y1, d0, d1, c) > hermite(s0, s1, y0, y1, d0, d1, d) {
			b = d
		} else {
			a = c
		}
	}
	sm := 0.5 * (a + b)
	if v := hermite(s0, s1, y0, y1, d0, d1, sm); v > y {
		s, y = sm, v
	}
	return s, y
}

// point converts e.x into an EnvelopePoint.
func (e *envTracer) point() EnvelopePoint {
	n := e.n
	pt := EnvelopePoint{T: math.Exp(e.x[n]), P: math.Exp(e.x[n+1]), K: make([]float64, n)}
	for i := 0; i < n; i++ {
		pt.K[i] = math.Exp(e.x[i])
	}
	// a dew point before the critical point, a bubble point past it
	if e.past {
		pt.Type = Bubble
	}
	return pt
}

// finish sets the cricondenbar and cricondentherm from the traced points.
func (e *envTracer) finish(env *Envelope, pts []envPoint) *Envelope {
	n := e.n
	if len(pts) == 0 {
		return env
	}
	// The cricondentherm is the highest temperature traced; the cricondenbar
	// the first pressure maximum, which the pressure falls below by 2 %
	// afterwards (where the saturation curve turns up again at low
	// temperature, into a liquid–liquid region, that part is not the top of
	// the vapour–liquid envelope).
	iT, iP := 0, 0
	for i, p := range pts {
		if p.x[n] > pts[iT].x[n] {
			iT = i
		}
	}
	for i, p := range pts {
		if p.x[n+1] > pts[iP].x[n+1] {
			iP = i
		} else if p.x[n+1] < pts[iP].x[n+1]+math.Log(0.98) {
			break
		}
	}
	env.Cricondentherm = [2]float64{math.Exp(pts[iT].x[n]), math.Exp(pts[iT].x[n+1])}
	env.Cricondenbar = [2]float64{math.Exp(pts[iP].x[n]), math.Exp(pts[iP].x[n+1])}
	// refine each on the neighbouring intervals: T as a function of ln P near
	// the cricondentherm, P as a function of ln T near the cricondenbar
	refine := func(i, yv, sv int, dst *[2]float64) {
		bestY := pts[i].x[yv]
		for _, j := range []int{i - 1, i} {
			if j < 0 || j+1 >= len(pts) {
				continue
			}
			a, b := pts[j], pts[j+1]
			if a.dx[sv] == 0 || b.dx[sv] == 0 || a.x[sv] == b.x[sv] {
				continue
			}
			s, y := hermiteMax(a.x[sv], b.x[sv], a.x[yv], b.x[yv], a.dx[yv]/a.dx[sv], b.dx[yv]/b.dx[sv])
			if y > bestY && y < bestY+0.05 {
				bestY = y
				if yv == n {
					*dst = [2]float64{math.Exp(y), math.Exp(s)}
				} else {
					*dst = [2]float64{math.Exp(s), math.Exp(y)}
				}
			}
		}
	}
	refine(iT, n, n+1, &env.Cricondentherm)
	refine(iP, n+1, n, &env.Cricondenbar)
	// then solve for each extreme on the envelope itself
	if x, ok := e.extreme(pts, iT, n, n+1); ok {
		env.Cricondentherm = [2]float64{math.Exp(x[n]), math.Exp(x[n+1])}
	}
	if x, ok := e.extreme(pts, iP, n+1, n); ok {
		env.Cricondenbar = [2]float64{math.Exp(x[n]), math.Exp(x[n+1])}
	}
	return env
}

// extreme solves for the maximum of X_yv along the envelope near traced
// point i, as the zero of the slope dX_yv/dX_sv, by the Illinois variant of
// false position between the two neighbouring traced points whose slopes
// bracket it; each trial point is an envelope point converged at fixed X_sv.
// The interpolated extreme of the trace is off by up to about 0.01 K (or
// the like in pressure), enough to put a temperature just below it outside
// the two-phase region. It reports false, leaving the caller's estimate,
// when no bracket is found or a corrector fails.
func (e *envTracer) extreme(pts []envPoint, i, yv, sv int) ([]float64, bool) {
	slope := func(p envPoint) float64 { return p.dx[yv] / p.dx[sv] }
	for _, j := range []int{i - 1, i} {
		if j < 0 || j+1 >= len(pts) {
			continue
		}
		a, b := pts[j], pts[j+1]
		if a.past != b.past || a.dx[sv] == 0 || b.dx[sv] == 0 || a.x[sv] == b.x[sv] {
			continue
		}
		ga, gb := slope(a), slope(b)
		if !(ga*gb < 0) {
			continue
		}
		sa, sb := a.x[sv], b.x[sv]
		side := 0
		for it := 0; it < 60; it++ {
			s := (sa*gb - sb*ga) / (gb - ga)
			u := (s - a.x[sv]) / (b.x[sv] - a.x[sv])
			for k := range e.x {
				e.x[k] = a.x[k] + u*(b.x[k]-a.x[k])
			}
			e.past = a.past
			if _, ok := e.correct(sv, s); !ok || !e.tangent(sv) {
				return nil, false
			}
			g := e.dx[yv] / e.dx[sv]
			if math.Abs(sb-sa) < 1e-13*max(1, math.Abs(s)) || g == 0 {
				return append([]float64(nil), e.x...), true
			}
			if g*ga > 0 {
				sa, ga = s, g
				if side == -1 {
					gb /= 2
				}
				side = -1
			} else {
				sb, gb = s, g
				if side == 1 {
					ga /= 2
				}
				side = 1
			}
		}
		return append([]float64(nil), e.x...), true
	}
	return nil, false
}
