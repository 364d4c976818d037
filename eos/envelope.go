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

// TraceEnvelope traces the phase envelope of feed z. It returns the points in
// the order traced, the critical point when the trace crosses one, and the
// cricondenbar and cricondentherm refined by cubic Hermite interpolation along
// the trace.
//
// Special cases: no dew point at 50 kPa between 20 K and 2000 K, or a corrector
// that fails even after its step is cut 12 times: *SolveError wrapping
// ErrNoConvergence (with the points traced so far still returned).
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
	maxLnP := math.Inf(-1) // highest ln P before the critical point
	var pts []envPoint
	add := func() {
		pts = append(pts, envPoint{x: append([]float64(nil), e.x...), dx: append([]float64(nil), e.dx...), spec: spec, past: e.past})
		env.Points = append(env.Points, e.point())
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
		// close to the critical point with a ln K specified: jump across it
		nearCrit := false
		if !passedCrit && spec < n {
			kmax := 0.0
			for i := 0; i < n; i++ {
				if e.z[i] > 0 {
					kmax = math.Max(kmax, math.Abs(e.x[i]))
				}
			}
			nearCrit = kmax < envCritK
		}
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
				lim = math.Max(envMaxStepK, 0.2*math.Abs(e.x[i]))
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
		accepted := false
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
					step = math.Min(2*math.Abs(ds), 1.0)
				} else if it > 6 {
					step = 0.5 * math.Abs(ds)
				} else {
					step = math.Abs(ds)
				}
				break
			}
			ds *= 0.5
		}
		if accepted && step < envMinStep {
			accepted = false
		}
		if !accepted {
			copy(e.x, prev)
			e.past = passedCrit
			kmax := 0.0
			for i := 0; i < n; i++ {
				if e.z[i] > 0 {
					kmax = math.Max(kmax, math.Abs(e.x[i]))
				}
			}
			if !passedCrit && kmax < envCritK {
				// Every K within 10 % of 1 and no step across: where the
				// trace meets the critical region almost tangentially (a
				// very flat top with the critical point near the
				// cricondenbar) the corrector can neither cross nor follow
				// it. The points so far are converged; the critical point
				// stays unknown.
				env.Truncated, env.NearCritical = true, true
				return e.finish(env, pts), nil
			}
			if passedCrit || e.x[n+1] < math.Log(0.9)+maxLnP {
				// Past the critical point, or past the pressure maximum on the
				// way down to a critical point at low temperature, the
				// envelope can run into a region where no vapour–liquid
				// saturation point continues it (a liquid–liquid split, or the
				// end of the liquid root of the incipient phase).
				env.Truncated = true
				return e.finish(env, pts), nil
			}
			return e.finish(env, pts), &SolveError{Op: "TraceEnvelope", Iter: total, Err: ErrNoConvergence}
		}
		if !e.tangent(spec) {
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
		if !passedCrit && e.crossed(prev) {
			passedCrit = true
			e.past = true
			e.critical(env, prev, prevDx)
		}
		add()
		lnP := e.x[n+1]
		if !passedCrit {
			maxLnP = math.Max(maxLnP, lnP)
		}
		if passedCrit && lnP < math.Log(envPStart) || math.Exp(e.x[n]) < envTMin {
			break
		}
		if lnP > math.Log(satPMaxUp) || passedCrit && lnP > maxLnP+math.Ln2 {
			// At low temperature the bubble branch of an asymmetric mixture
			// can turn up to very high pressure, where it bounds a
			// liquid–liquid region rather than the vapour–liquid envelope.
			env.Truncated = true
			break
		}
	}
	return e.finish(env, pts), nil
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
		res = math.Max(res, math.Abs(e.f[i]))
		for j := 0; j < n; j++ {
			J[i*m+j] = w.pa.dn[i*n+j] * w.W[j] / sumW
		}
		J[i*m+i] += 1
		J[i*m+n] = t * (w.pa.dt[i] - w.feed.dt[i])
		J[i*m+n+1] = p * (w.pa.dp[i] - w.feed.dp[i])
	}
	e.f[n] = sumW - 1
	res = math.Max(res, math.Abs(e.f[n]))
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
			big = math.Max(big, math.Abs(w.rhs[i]))
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

// critical interpolates the critical point between prev and e.x where the
// ln K of largest magnitude passes zero: cubic Hermite in that ln K.
func (e *envTracer) critical(env *Envelope, prev, prevDx []float64) {
	n := e.n
	k := 0
	for i := 0; i < n; i++ {
		if math.Abs(prev[i]-e.x[i]) > math.Abs(prev[k]-e.x[k]) {
			k = i
		}
	}
	if prevDx[k] == 0 || e.dx[k] == 0 {
		return
	}
	s0, s1 := prev[k], e.x[k]
	lnT := hermite(s0, s1, prev[n], e.x[n], prevDx[n]/prevDx[k], e.dx[n]/e.dx[k], 0)
	lnP := hermite(s0, s1, prev[n+1], e.x[n+1], prevDx[n+1]/prevDx[k], e.dx[n+1]/e.dx[k], 0)
	env.HasCritical = true
	env.Critical = [2]float64{math.Exp(lnT), math.Exp(lnP)}
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
	w := e.w
	pt := EnvelopePoint{T: math.Exp(e.x[n]), P: math.Exp(e.x[n+1]), K: make([]float64, n)}
	for i := 0; i < n; i++ {
		pt.K[i] = math.Exp(e.x[i])
	}
	// the last eval was at this point (tangent), so w.feed and w.pa hold it
	mf := w.fl.MolarMass(e.z)
	mw := w.fl.MolarMass(w.wn)
	if mw/w.pa.v > mf/w.feed.v {
		pt.Type = Dew
	} else {
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
			if math.Abs(sb-sa) < 1e-13*math.Max(1, math.Abs(s)) || g == 0 {
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
