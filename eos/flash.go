package eos

import "math"

// A Flasher keeps the scratch space for repeated flashes of one Fluid.
// Not safe for concurrent use: one per goroutine.
type Flasher struct {
	w *work
}

// NewFlasher returns a Flasher for fl. A nil s means default settings.
func NewFlasher(fl *Fluid, s *Settings) *Flasher { return &Flasher{w: newWork(fl, s)} }

// Fluid returns the fluid the Flasher was made for.
func (f *Flasher) Fluid() *Fluid { return f.w.fl }

// NameSinglePhases sets whether a single-phase result is named liquid or
// vapour (the default, on). Naming a phase needs the critical point of its
// composition (label.go), about a millisecond for each new composition; a
// caller that only wants the phase's volume, such as a reservoir cell whose
// contents change at every step, turns it off: Single is then Vapour and
// Beta 1 for every single phase, whose properties are the same either way.
func (f *Flasher) NameSinglePhases(on bool) { f.w.noLabel = !on }

// PureTrials sets whether a feed that the stability test finds stable from
// both Wilson starts is tried from nearly pure components too (the default,
// on). Those trials look for a dense liquid–liquid split that the Wilson
// starts, both close to such a feed, do not reach, and cost three stability
// tests of every single phase; a caller that flashes gases it knows, a
// reservoir cell of a gas condensate and the lean gas injected into it,
// thousands of times, turns them off.
func (f *Flasher) PureTrials(on bool) { f.w.noPure = !on }

// Flash writes into dst the equilibrium of feed z (mole fractions summing to 1)
// at t (K) and p (Pa), following Michelsen (1982a, 1982b):
//
//  1. the tangent-plane stability test from Wilson K-values with liquid-like and
//     vapour-like trial phases and, when both find the feed stable, from the
//     nearly pure heaviest, lightest and median components (pureTrials); a
//     stable feed is returned as one phase, named by the rule of label.go;
//  2. successive substitution on ln K from the unstable trial phase, with
//     Rachford–Rice for the split and a dominant-eigenvalue (GDEM) jump every
//     third step (Crowe and Nishio 1975);
//  3. Newton steps on the Gibbs energy in the mole numbers with the analytic
//     Hessian, guarded by a line search, until every |ln f_i^L − ln f_i^V| is
//     below the tolerance;
//  4. the test of the split against its own tangent plane (verifySplit): a
//     phase that would lower the Gibbs energy gives new splits, the one of
//     lowest Gibbs energy is kept, and ThreePhase is set when it stays
//     unstable.
//
// The vapour is the phase of lower mass density. The work is bounded
// (flashEvals). Special cases:
//   - t or p not finite and positive: *SolveError wrapping ErrBadState;
//   - no convergence: *SolveError wrapping ErrNoConvergence, dst holds the last iterate.
//
// len(z) must equal the number of components.
func (f *Flasher) Flash(dst *FlashResult, t, p float64, z []float64) error {
	w := f.w
	if err := f.begin(dst, t, p, z); err != nil {
		return err
	}
	w.fl.setT(&w.ts, t)
	w.prepareFeed(p, z)
	w.evals = 0
	liq, vap := w.stability(p, z, true)
	iter := liq.iter + vap.iter
	if !liq.unstable && !vap.unstable {
		if !liq.ok || !vap.ok {
			return &SolveError{Op: "Flash", Iter: iter, Residual: math.NaN(), Err: ErrNoConvergence}
		}
		unstable := false
		if !w.noPure {
			var pt trialResult
			pt, unstable = w.pureTrials(p, z)
			iter += pt.iter
		}
		if !unstable {
			w.single(dst, t, p, z, iter)
			return nil
		}
		// split from the trial phase against the feed
		sw := 0.0
		for _, v := range w.W {
			sw += v
		}
		for i, zi := range z {
			w.lnK[i] = 0
			if zi > 0 {
				w.lnK[i] = math.Log(zi / (w.W[i] / sw))
			}
		}
	} else {
		w.trialK(z, liq, vap)
	}
	beta, it, res, ok := w.split(t, p, z, true)
	iter += it
	if !ok || !(beta > 0 && beta < 1) {
		// Safety net: the trial phase where the stability test stopped
		// early can be a poor start (the split then collapses onto the
		// trivial solution). Converge the stability test to its stationary
		// points and start again, first accelerated, then with plain
		// substitution, which cannot overshoot the way an extrapolation or
		// a Newton step far from the solution can.
		liq, vap = w.stability(p, z, false)
		iter += liq.iter + vap.iter
		for _, accel := range []bool{true, false} {
			if !liq.unstable && !vap.unstable {
				break
			}
			w.trialK(z, liq, vap)
			beta, it, res, ok = w.split(t, p, z, accel)
			iter += it
			if ok && beta > 0 && beta < 1 {
				break
			}
		}
	}
	if !ok || !(beta > 0 && beta < 1) {
		dst.Iter, dst.Resid = iter, res
		return &SolveError{Op: "Flash", Iter: iter, Residual: res, Err: ErrNoConvergence}
	}
	beta, it, res, three := w.verifySplit(t, p, z, beta, res)
	iter += it
	w.twoPhase(dst, t, p, z, beta, iter, res)
	dst.ThreePhase = three
	return nil
}

// OnePhase writes into dst feed z at t (K) and p (Pa) as one phase, as
// Flash does for a feed it finds stable, without the stability test: for a
// caller that knows the feed stable, such as a reservoir cell flashed again
// next to a state just found stable (cvd.Cell). Iter is 0.
func (f *Flasher) OnePhase(dst *FlashResult, t, p float64, z []float64) error {
	w := f.w
	if err := f.begin(dst, t, p, z); err != nil {
		return err
	}
	w.fl.setT(&w.ts, t)
	w.prepareFeed(p, z)
	w.single(dst, t, p, z, 0)
	return nil
}

// begin checks the arguments of a flash and sizes dst.
func (f *Flasher) begin(dst *FlashResult, t, p float64, z []float64) error {
	w := f.w
	w.fl.checkLen(z)
	if len(dst.X) != w.n {
		dst.X = make([]float64, w.n)
		dst.Y = make([]float64, w.n)
	}
	if !validState(t, p) {
		return &SolveError{Op: "Flash", Err: ErrBadState}
	}
	return nil
}

// FlashFrom is Flash started from the K-values k (K_i = y_i/x_i, as of a
// two-phase flash at nearby conditions): the split is converged from them
// without the stability test and without the test of the split, for a path
// of flashes along which the phases change slowly (the steps of a
// depletion, a separator train run again on a similar stream). It is
// accepted when it converges to a vapour fraction inside (0, 1) with a
// Gibbs energy below the feed's; otherwise, or when k is not positive for a
// component present, FlashFrom does the full Flash. A split accepted so is
// not tested for a third phase: ThreePhase is false.
func (f *Flasher) FlashFrom(dst *FlashResult, t, p float64, z, k []float64) error {
	w := f.w
	w.fl.checkLen(k)
	if err := f.begin(dst, t, p, z); err != nil {
		return err
	}
	for i, zi := range z {
		w.lnK[i] = 0
		if zi > 0 {
			if !(k[i] > 0) || math.IsInf(k[i], 0) {
				return f.Flash(dst, t, p, z)
			}
			w.lnK[i] = math.Log(k[i])
		}
	}
	w.fl.setT(&w.ts, t)
	w.evals = 0
	beta, iter, res, ok := w.split(t, p, z, true)
	if ok && beta > 0 && beta < 1 {
		g := w.splitG // Newton's, when it converged the split
		if math.IsNaN(g) {
			g = w.splitGibbs(z, beta)
		}
		w.fl.evalPhase(&w.feed, &w.ts, p, z, rootMinG, 0)
		gz := 0.0
		for i, zi := range z {
			if zi > 0 {
				gz += zi * (math.Log(zi) + w.feed.lnphi[i])
			}
		}
		if g < gz-1e-12*(1+math.Abs(gz)) {
			w.twoPhase(dst, t, p, z, beta, iter, res)
			dst.ThreePhase = false
			return nil
		}
	}
	return f.Flash(dst, t, p, z)
}

// verifySplit tests the converged split in w.x and w.y (vapour fraction
// beta, residual res) for stability against its own tangent plane, the
// test by which Michelsen (1982b) accepts a phase split: a trial phase of
// negative tangent-plane distance there proves that the split is not the
// equilibrium, either because another two-phase split has a lower Gibbs
// energy or because a third phase would form. Splits of that trial phase
// with each phase of the current one are converged and the one of lowest
// Gibbs energy is kept, up to three times. It leaves the best split in w.x
// and w.y, evaluated in w.pa and w.pb, and reports whether that split is
// still unstable (a three-phase region: the split is not the equilibrium).
func (w *work) verifySplit(t, p float64, z []float64, beta, res float64) (float64, int, float64, bool) {
	iter := 0
	copy(w.bx, w.x)
	copy(w.by, w.y)
	bestG := w.splitGibbs(z, beta)
	unstable := false
	for round := 0; ; round++ {
		found, it := w.splitUnstable(t, p, z)
		iter += it
		if !found || round == 3 {
			unstable = found
			break
		}
		improved := false
		sw := 0.0
		for _, v := range w.tw {
			sw += v
		}
		for k := 0; k < 2; k++ {
			other := w.bx
			if k == 1 {
				other = w.by
			}
			for i, zi := range z {
				w.lnK[i] = 0
				if zi > 0 {
					w.lnK[i] = math.Log(w.tw[i]/sw) - math.Log(other[i])
				}
			}
			b, it, r, ok := w.split(t, p, z, true)
			iter += it
			if !ok || !(b > 0 && b < 1) {
				continue
			}
			if g := w.splitGibbs(z, b); g < bestG-1e-12*(1+math.Abs(bestG)) {
				bestG, beta, res = g, b, r
				copy(w.bx, w.x)
				copy(w.by, w.y)
				improved = true
			}
		}
		if !improved {
			unstable = true
			break
		}
	}
	copy(w.x, w.bx)
	copy(w.y, w.by)
	w.fl.evalPhase(&w.pa, &w.ts, p, w.x, rootMinG, 0)
	w.fl.evalPhase(&w.pb, &w.ts, p, w.y, rootMinG, 0)
	return beta, iter, res, unstable
}

// splitGibbs is G/RT of the split of vapour fraction beta held in w.x and
// w.y, evaluated in w.pa and w.pb (less the ideal-gas reference).
func (w *work) splitGibbs(z []float64, beta float64) float64 {
	gl, gv := 0.0, 0.0
	for i, zi := range z {
		if zi == 0 {
			continue
		}
		gl += w.x[i] * (math.Log(w.x[i]) + w.pa.lnphi[i])
		gv += w.y[i] * (math.Log(w.y[i]) + w.pb.lnphi[i])
	}
	return beta*gv + (1-beta)*gl
}

// splitUnstable runs the tangent-plane test against the plane of the split
// in w.bx and w.by: first the trial phases of the feed's own test (w.wLiq,
// w.wVap), then a vapour-like trial from the lighter phase and a
// liquid-like one from the denser, both from Wilson K-values. It reports
// whether a trial phase of negative tm was found, its mole numbers left in
// w.tw.
func (w *work) splitUnstable(t, p float64, z []float64) (bool, int) {
	fl := w.fl
	fl.evalPhase(&w.pb, &w.ts, p, w.bx, rootMinG, 0)
	for i, zi := range z {
		w.d[i] = math.Inf(-1)
		if zi > 0 {
			w.lnBX[i] = math.Log(w.bx[i])
			w.d[i] = w.lnBX[i] + w.pb.lnphi[i]
		}
	}
	// the feed's trial phases, where they stopped: tm < 0 at any
	// composition proves instability
	for _, tr := range [2][]float64{w.wLiq, w.wVap} {
		if w.tmAt(p, z, tr) < w.tmCut && !sameTrial(z, tr, w.bx) && !sameTrial(z, tr, w.by) {
			copy(w.tw, tr)
			return true, 1
		}
	}
	iter := 0
	for i, zi := range z {
		if zi > 0 {
			w.lnBY[i] = math.Log(w.by[i])
		}
	}
	w.nearRef = splitNearRef
	defer func() { w.nearRef = 0 }()
	w.wilson(t, p) // the trials leave w.lnK alone: once for both starts
	for k := 0; k < 2; k++ {
		lnRef, sgn := w.lnBY, 1.0
		if k == 1 {
			lnRef, sgn = w.lnBX, -1
		}
		for i, zi := range z {
			if zi > 0 {
				w.lnW[i] = lnRef[i] + sgn*w.lnK[i]
			}
		}
		r := w.trial(p, z, lnRef, true)
		iter += r.iter
		if r.unstable && !sameTrial(z, w.W, w.bx) && !sameTrial(z, w.W, w.by) {
			copy(w.tw, w.W)
			return true, iter
		}
	}
	// a third phase between the two: from the nearly pure component of
	// median critical temperature, and from the second heaviest (a liquid
	// rich in an intermediate pseudo-component beside a heavier one)
	for _, k := range [2]int{w.rankTc(z, -1), w.rankTc(z, -2)} {
		if k < 0 {
			continue
		}
		for i, zi := range z {
			if zi > 0 {
				w.lnW[i] = math.Log(1e-6 * zi)
			}
		}
		w.lnW[k] = 0
		r := w.trial(p, z, w.lnZ, true) // ln z_i from the flash's prepareFeed
		iter += r.iter
		if r.unstable && !sameTrial(z, w.W, w.bx) && !sameTrial(z, w.W, w.by) {
			copy(w.tw, w.W)
			return true, iter
		}
	}
	return false, iter
}

// rankTc returns a component present in z by the rank of its critical
// temperature among those present: rank −1 the median, −2 the second
// highest; −1 (none) when fewer than three components are present.
func (w *work) rankTc(z []float64, rank int) int {
	np := 0
	for _, zi := range z {
		if zi > 0 {
			np++
		}
	}
	if np < 3 {
		return -1
	}
	want := np / 2 // components below the median
	if rank == -2 {
		want = np - 2
	}
	for i, zi := range z {
		if zi == 0 {
			continue
		}
		below := 0
		for j, zj := range z {
			if zj > 0 && (w.fl.tc[j] < w.fl.tc[i] || w.fl.tc[j] == w.fl.tc[i] && j < i) {
				below++
			}
		}
		if below == want {
			return i
		}
	}
	return -1
}

// flashLooseTol: a split that reaches the work bound with every
// |ln f_i^L − ln f_i^V| below this is accepted (close to a critical point the
// Gibbs energy is so flat that the last digits come slowly), its residual
// reported in FlashResult.Resid.
const flashLooseTol = 1e-8

// splitAtBound ends a split at the work bound: the last split evaluated,
// in w.x and w.y with w.pa and w.pb, is accepted if its residual is below
// flashLooseTol.
func (w *work) splitAtBound(z []float64, iter int) (float64, int, float64, bool) {
	res, num, den := 0.0, 0.0, 0.0
	for i, zi := range z {
		if zi == 0 {
			continue
		}
		res = max(res, math.Abs(math.Log(w.x[i])+w.pa.lnphi[i]-math.Log(w.y[i])-w.pb.lnphi[i]))
		// z = β y + (1 − β) x, β by least squares
		d := w.y[i] - w.x[i]
		num += (zi - w.x[i]) * d
		den += d * d
	}
	beta := num / den
	return beta, iter, res, res < flashLooseTol && beta > 0 && beta < 1
}

// splitNearRef: a trial phase testing a split that comes within this squared
// distance in ln W of one of the split's phases, with tm > 0, is taken to
// fall back onto it: the phases of a converged split are minima of tm. At
// 1e-2 (a few per cent in each mole fraction) rather than 1e-3 the test of
// the split takes 4 % to 15 % fewer instructions; the random-state checks
// (3000 states, the near-critical ones among them) find nothing it misses.
const splitNearRef = 1e-2

// tmAt is the tangent-plane distance against w.d of the trial phase of mole
// numbers W (normalised here).
func (w *work) tmAt(p float64, z, W []float64) float64 {
	sw := 0.0
	for i, zi := range z {
		if zi > 0 {
			sw += W[i]
		}
	}
	if !(sw > 0) || math.IsInf(sw, 0) {
		return math.Inf(1)
	}
	for i := range z {
		w.wn[i] = W[i] / sw
	}
	w.fl.evalPhase(&w.pb, &w.ts, p, w.wn, rootMinG, 0)
	tm := 1.0
	for i, zi := range z {
		if zi > 0 {
			wi := w.wn[i]
			tm += wi * (math.Log(wi) + w.pb.lnphi[i] - w.d[i] - 1)
		}
	}
	return tm
}

// trialK sets w.lnK from the trial phase(s) of the last stability test that
// showed instability: K = z/W_liquid, W_vapour/z, or W_vapour/W_liquid.
//
// Both trials can end on the same stationary point (deep inside the two-phase
// region a feed can have a single, liquid, root, and the liquid-like trial
// then also finds the vapour). W_vapour/W_liquid would then be the trivial
// K = 1, so the point of lower tm is taken against the feed instead.
func (w *work) trialK(z []float64, liq, vap trialResult) {
	both := liq.unstable && vap.unstable
	if both && sameTrial(z, w.wLiq, w.wVap) {
		both = false
		if liq.tm < vap.tm {
			vap.unstable = false
		} else {
			liq.unstable = false
		}
	}
	for i, zi := range z {
		switch {
		case zi == 0:
			w.lnK[i] = 0
		case both:
			w.lnK[i] = math.Log(w.wVap[i] / w.wLiq[i])
		case liq.unstable:
			w.lnK[i] = math.Log(zi / w.wLiq[i])
		default:
			w.lnK[i] = math.Log(w.wVap[i] / zi)
		}
	}
}

// sameTrial reports whether two trial phases (mole numbers, not normalised)
// have the same composition to 1e-6 in every ln x_i.
func sameTrial(z, a, b []float64) bool {
	sa, sb := 0.0, 0.0
	for i := range z {
		sa += a[i]
		sb += b[i]
	}
	for i, zi := range z {
		if zi > 0 && math.Abs(math.Log(a[i]/sa)-math.Log(b[i]/sb)) > 1e-6 {
			return false
		}
	}
	return true
}

// split converges the two-phase split from w.lnK. It returns β, the
// iterations, the final residual and whether it converged; on success the
// liquid and vapour compositions are in w.x and w.y and evaluated in w.pa, w.pb.
//
// With accel set, substitution is accelerated by GDEM and hands over to
// Newton once it is close; without, it substitutes until the residual is
// below 1e-6 before Newton takes over.
func (w *work) split(t, p float64, z []float64, accel bool) (beta float64, iter int, res float64, ok bool) {
	n := w.n
	fl := w.fl
	beta, res = 0.5, math.Inf(1)
	ssMax := 12 // substitution steps before Newton takes over
	if !accel {
		ssMax = w.max
	}
	resJump := math.Inf(1) // residual before the last GDEM jump
	w.splitG = math.NaN()
	for it := 1; it <= w.max; it++ {
		iter = it
		if w.evals++; w.evals > flashEvals {
			return w.splitAtBound(z, iter)
		}
		for i := 0; i < n; i++ {
			w.K[i] = math.Exp(w.lnK[i])
		}
		// β to 1e-4 of the last residual (at least 1e-14 relative)
		beta = rachfordRiceTol(z, w.K, beta, max(1e-14, min(1e-6, 1e-4*res)))
		if math.IsInf(beta, 0) {
			return beta, iter, math.NaN(), false
		}
		rrPhases(z, w.K, beta, w.x, w.y)
		normalise(w.x)
		normalise(w.y)
		fl.evalPhase(&w.pa, &w.ts, p, w.x, rootMinG, 0)
		fl.evalPhase(&w.pb, &w.ts, p, w.y, rootMinG, 0)
		res = 0
		triv := 0.0
		for i := 0; i < n; i++ {
			if z[i] == 0 {
				w.r[i] = 0
				continue
			}
			w.r[i] = w.pa.lnphi[i] - w.pb.lnphi[i] - w.lnK[i]
			res = max(res, math.Abs(w.r[i]))
			triv += w.lnK[i] * w.lnK[i]
		}
		if res < w.tol && beta > 0 && beta < 1 {
			return beta, iter, res, true
		}
		if res > resJump {
			// the extrapolation made things worse: take the plain step instead
			copy(w.lnK, w.lnKss)
			resJump = math.Inf(1)
			continue
		}
		resJump = math.Inf(1)
		if triv < 1e-10 {
			return beta, iter, res, false // collapsed onto the trivial solution
		}
		// Newton takes over after three substitution steps once the
		// residual is below 1e-2, or at once below 1e-5: a hot start from
		// the K-values of a state next to this one (a reservoir cell
		// flashed again) is then well inside its quadratic basin, where
		// substitution would take several steps per decade.
		near := accel && (it >= 3 && res < 1e-2 || res < 1e-5) || !accel && res < 1e-6 || it >= ssMax
		if near && beta > 0 && beta < 1 {
			bn, itn, resn, okn := w.newtonSplit(t, p, z, beta)
			iter += itn
			if okn {
				return bn, iter, resn, true
			}
			// Newton failed: carry on substituting from where it stopped,
			// which is no worse than where it started (it only takes steps
			// that lower the Gibbs energy).
			for i := 0; i < w.n; i++ {
				if z[i] > 0 {
					w.lnK[i] = math.Log(w.y[i] / w.x[i])
				}
			}
			continue
		}
		copy(w.lnK2, w.lnK1)
		copy(w.lnK1, w.lnK)
		for i := 0; i < n; i++ {
			w.lnK[i] += w.r[i]
		}
		if accel && it%3 == 0 {
			copy(w.lnKss, w.lnK)
			if w.gdem() {
				resJump = res
			}
		}
	}
	return beta, iter, res, false
}

// flashEvals bounds the work of one flash: the evaluations of the two
// phases of a split, by substitution and in Newton's line search, over all
// its splits (about 1 ms for 15 components). A Newton stage that fails
// hands back to substitution, which calls it again: without a bound some
// states spent 0.1–0.5 s so. At the bound a split within flashLooseTol is
// accepted; otherwise the flash reports that it did not converge.
const flashEvals = 800

// gdem applies the one-eigenvalue dominant-eigenvalue extrapolation to ln K
// (Crowe and Nishio 1975, as used by Michelsen 1982b): with Δ_k the last two
// changes, λ = Δ_k·Δ_k / Δ_{k−1}·Δ_k and ln K += Δ_k λ/(1 − λ).
//
// The jump is capped at ten times the last step, and split reverts it when the
// next residual is larger. It reports whether it jumped.
func (w *work) gdem() bool {
	num, den := 0.0, 0.0
	for i := range w.lnK {
		d1 := w.lnK[i] - w.lnK1[i]
		d0 := w.lnK1[i] - w.lnK2[i]
		num += d1 * d1
		den += d0 * d1
	}
	if den == 0 {
		return false
	}
	lam := num / den
	if !(lam > 0 && lam < 1) {
		return false
	}
	c := min(lam/(1-lam), 10)
	for i := range w.lnK {
		w.lnK[i] += c * (w.lnK[i] - w.lnK1[i])
	}
	return true
}

// newtonSplit minimises the Gibbs energy of the split in the mole numbers of
// the smaller phase (vapour v_i or liquid l_i = z_i − v_i). Gradient in v:
// g_i = ln f_i^V − ln f_i^L;
// Hessian (δ_ij z_i/(x_i y_i) − 1)/(β(1−β)) + Φ^V_ij/β + Φ^L_ij/(1−β), with Φ
// the composition derivatives n ∂ln φ_i/∂n_j of each phase. Where the
// Hessian is not positive definite (near a critical point) a Levenberg shift
// is added, and each step is cut back until the Gibbs energy falls (Armijo).
func (w *work) newtonSplit(t, p float64, z []float64, beta float64) (float64, int, float64, bool) {
	n := w.n
	// For each component the unknown is its amount in the phase that holds
	// less of it (sign +1: vapour, −1: liquid), the other phase taking the
	// rest: z_i − u_i then loses no digits, whereas a trace of a heavy
	// component in the vapour computed as z − l would.
	sg := w.sgn
	for i := 0; i < n; i++ {
		v, l := beta*w.y[i], (1-beta)*w.x[i]
		if v <= l {
			sg[i] = 1
			w.v[i], w.l[i] = v, z[i]-v
		} else {
			sg[i] = -1
			w.v[i], w.l[i] = z[i]-l, l
		}
	}
	// The phases at the start are those the substitution evaluated last
	// (w.x, w.y in w.pa, w.pb): the split's Gibbs energy and gradient from
	// them, without evaluating them again.
	G, res, V, L := w.splitGradient(z)
	best, stalled := res, 0 // lowest residual so far, iterations without progress on it
	chord := false          // whether the next step takes the last Hessian's factor
	for it := 1; it <= 50; it++ {
		if res < w.tol {
			for i := 0; i < n; i++ {
				if z[i] > 0 {
					w.lnK[i] = math.Log(w.y[i] / w.x[i])
				}
			}
			w.splitG = G
			return V, it, res, true
		}
		// Where the residual lies in a trace component whose share of G is
		// below its round-off, the line search can only creep: after six
		// steps that do not cut the residual by a tenth, substitution takes
		// over.
		if res < 0.9*best {
			best, stalled = res, 0
		} else if stalled++; stalled == 6 {
			return V, it, res, false
		}
		for i := 0; i < n; i++ { // the right-hand side, −S g
			w.g[i] = -sg[i] * w.r[i]
		}
		if chord {
			// The chord step: the last Hessian's factor, kept, on the new
			// gradient (see below).
			cholSubst(w.H[:n*n], n, w.g)
		} else if !w.newtonHessian(z, V, L) {
			return V, it, res, false
		}
		fresh := !chord
		chord = false
		slope := 0.0 // directional derivative of G along the step
		for i := 0; i < n; i++ {
			slope += sg[i] * w.r[i] * w.g[i]
		}
		if !(slope < 0) {
			return V, it, res, false
		}
		for i := 0; i < n; i++ { // the unknowns before the step
			if sg[i] > 0 {
				w.s[i] = w.v[i]
			} else {
				w.s[i] = w.l[i]
			}
		}
		// Keep every mole number strictly inside (0, z_i): stepMax is the
		// longest step that does, at 0.9 of the way to the nearest bound.
		stepMax := math.Inf(1)
		for i := 0; i < n; i++ {
			switch {
			case z[i] == 0 || w.g[i] == 0:
			case w.g[i] < 0:
				stepMax = min(stepMax, 0.9*w.s[i]/-w.g[i])
			default:
				stepMax = min(stepMax, 0.9*(z[i]-w.s[i])/w.g[i])
			}
		}
		step := min(1, stepMax)
		accepted := false
		for cut := 0; cut < 30; cut++ {
			w.setStep(z, step)
			if w.evals++; w.evals > flashEvals {
				return V, it, res, false
			}
			Gn, resn, Vn, Ln := w.splitState(p, z)
			// Close to the solution, or where the residual lies in a trace
			// component, the change in G is below its round-off: there a
			// step is taken that lowers the residual without raising G
			// beyond round-off (and near the solution the full step).
			flat := Gn <= G+1e-13*(1+math.Abs(G))
			if Gn <= G+1e-4*step*slope || flat && (res < 1e-6 || resn < res) {
				slow := resn > 0.5*res
				// A full Newton step from the Cholesky factor that cut the
				// residual below 1e-6 and by a thousand or more is in the
				// quadratic basin: the next step takes the same factor
				// (the chord method), whose error is the product of the
				// last two residuals instead of the square of the last,
				// without the derivatives and the factorisation.
				chord = cut == 0 && step == 1 && resn < 1e-6 && (fresh && w.factored && resn < 1e-3*res || !fresh && resn < 1e-2*res)
				G, res, V, L = Gn, resn, Vn, Ln
				accepted = true
				if cut == 0 && step == 1 && slow && res > w.tol {
					// A full step that hardly lowers the residual: where the
					// Hessian is indefinite or nearly singular (a flat valley
					// of G next to a critical point) the shifted step is short.
					// Go on along it, doubling, while G keeps falling.
					G, res, V, L = w.splitExtend(p, z, step, stepMax, G, res, V, L)
				}
				break
			}
			step *= 0.5
		}
		if !accepted {
			return V, it, res, false
		}
	}
	return V, 50, res, false
}

// newtonHessian is a full Newton step of newtonSplit from the split in w.v,
// w.l (phases w.y, w.x evaluated in w.pb, w.pa, totals V and L): the
// right-hand side in w.g becomes the step, false when none is found.
func (w *work) newtonHessian(z []float64, V, L float64) bool {
	n := w.n
	sg := w.sgn
	w.fl.derivs(&w.pb, &w.ts, w.y, dN)
	w.fl.derivs(&w.pa, &w.ts, w.x, dN)
	// The Hessian in the unknowns, S H S with S = diag(sg), symmetric:
	// the lower triangle, mirrored.
	H := w.H[n*n : 2*n*n]
	c, iV, iL := 1/(V*L), 1/V, 1/L
	for i := 0; i < n; i++ {
		dv, dl := w.pb.dn[i*n:i*n+i+1], w.pa.dn[i*n:i*n+i+1]
		si := sg[i]
		for j := range dv {
			h := (-c + dv[j]*iV + dl[j]*iL) * (si * sg[j])
			H[i*n+j], H[j*n+i] = h, h
		}
		if z[i] > 0 {
			H[i*n+i] += c * z[i] / (w.x[i] * w.y[i])
		}
	}
	for i := 0; i < n; i++ { // an absent component: an identity row and column
		if z[i] == 0 {
			for j := 0; j < n; j++ {
				H[i*n+j], H[j*n+i] = 0, 0
			}
			H[i*n+i] = 1
		}
	}
	return w.newtonStep(H, n, true)
}

// splitExtend goes on from the accepted step along the Newton direction
// (unknowns w.s, direction w.g, signs w.sgn) with steps doubled up to
// stepMax, while the Gibbs energy falls by more than its round-off; it
// leaves the last point that lowered G in w.v and w.l, evaluated, and
// returns it as splitState does. G, res, V and L describe the accepted step.
func (w *work) splitExtend(p float64, z []float64, step, stepMax, G, res, V, L float64) (float64, float64, float64, float64) {
	best := step
	for k := 0; k < 30 && 2*best <= stepMax; k++ {
		if w.evals++; w.evals > flashEvals {
			break
		}
		w.setStep(z, 2*best)
		Gn, resn, Vn, Ln := w.splitState(p, z)
		if !(Gn < G-1e-14*(1+math.Abs(G))) {
			break
		}
		best, G, res, V, L = 2*best, Gn, resn, Vn, Ln
	}
	w.setStep(z, best)
	return w.splitState(p, z)
}

// setStep puts into w.v and w.l the split at step along the Newton
// direction w.g from the unknowns w.s: u_i = s_i + step g_i is the vapour
// amount where w.sgn_i is +1, the liquid amount where it is −1, the other
// phase taking the rest of z_i.
func (w *work) setStep(z []float64, step float64) {
	for i := 0; i < w.n; i++ {
		u := w.s[i] + step*w.g[i]
		if w.sgn[i] > 0 {
			w.v[i], w.l[i] = u, z[i]-u
		} else {
			w.v[i], w.l[i] = z[i]-u, u
		}
	}
}

// splitState evaluates both phases of the split held in w.v and w.l: it sets
// w.x, w.y and the gradient w.r_i = ln f_i^V − ln f_i^L, and returns the
// Gibbs energy G/RT (less the ideal-gas reference), the largest |w.r_i| and
// the phase amounts.
func (w *work) splitState(p float64, z []float64) (G, res, V, L float64) {
	n := w.n
	for i := 0; i < n; i++ {
		V += w.v[i]
		L += w.l[i]
	}
	for i := 0; i < n; i++ {
		w.y[i] = w.v[i] / V
		w.x[i] = w.l[i] / L
	}
	w.fl.evalPhase(&w.pb, &w.ts, p, w.y, rootMinG, 0)
	w.fl.evalPhase(&w.pa, &w.ts, p, w.x, rootMinG, 0)
	G, res = w.splitSums(z)
	return G, res, V, L
}

// splitGradient is splitState for mole numbers w.v and w.l whose phases
// w.x and w.y are already evaluated in w.pb and w.pa.
func (w *work) splitGradient(z []float64) (G, res, V, L float64) {
	for i := 0; i < w.n; i++ {
		V += w.v[i]
		L += w.l[i]
	}
	G, res = w.splitSums(z)
	return G, res, V, L
}

// splitSums sets the gradient w.r_i = ln f_i^V − ln f_i^L of the split in
// w.v, w.l (phases w.y, w.x evaluated in w.pb, w.pa) and returns its Gibbs
// energy and the largest |w.r_i|.
func (w *work) splitSums(z []float64) (G, res float64) {
	for i := 0; i < w.n; i++ {
		if z[i] == 0 {
			w.r[i] = 0
			continue
		}
		lfv := math.Log(w.y[i]) + w.pb.lnphi[i]
		lfl := math.Log(w.x[i]) + w.pa.lnphi[i]
		G += w.v[i]*lfv + w.l[i]*lfl
		w.r[i] = lfv - lfl
		res = max(res, math.Abs(w.r[i]))
	}
	return G, res
}

func normalise(x []float64) {
	s := 0.0
	for _, v := range x {
		s += v
	}
	for i := range x {
		x[i] /= s
	}
}

func (w *work) single(dst *FlashResult, t, p float64, z []float64, iter int) {
	copy(dst.X, z)
	copy(dst.Y, z)
	pp := w.fl.props(&w.feed, t, p, z)
	dst.Phases, dst.Iter, dst.Resid, dst.ThreePhase = 1, iter, 0, false
	if w.noLabel {
		dst.Single = Vapour
	} else {
		dst.Single = w.singleLabel(t, w.feed.vEOS, z)
	}
	dst.L, dst.V = pp, pp
	if dst.Single == Liquid {
		dst.Beta = 0
	} else {
		dst.Beta = 1
	}
}

func (w *work) twoPhase(dst *FlashResult, t, p float64, z []float64, beta float64, iter int, res float64) {
	lp := w.fl.props(&w.pa, t, p, w.x)
	vp := w.fl.props(&w.pb, t, p, w.y)
	if vp.Rho > lp.Rho { // label the lighter phase vapour
		lp, vp = vp, lp
		beta = 1 - beta
		copy(dst.X, w.y)
		copy(dst.Y, w.x)
	} else {
		copy(dst.X, w.x)
		copy(dst.Y, w.y)
	}
	dst.Phases, dst.Beta, dst.Iter, dst.Resid = 2, beta, iter, res
	dst.L, dst.V = lp, vp
	dst.Single = Vapour
}

// Phase returns the single-phase properties of composition x at t (K) and p
// (Pa) on the cubic root of lowest Gibbs energy, its name by the rule of
// label.go and the isothermal compressibility −(1/v) ∂v/∂p (1/Pa), from
//
//	∂p/∂v = −R T/(v − b)² + a (2v + (δ1 + δ2) b)/((v + δ1 b)(v + δ2 b))²
//
// of the cubic (a volume shift does not change ∂v/∂p). No
// stability test is made: the caller knows the phase is single.
func (f *Flasher) Phase(t, p float64, x []float64) (PhaseProps, Phase, float64) {
	w := f.w
	w.fl.checkLen(x)
	w.fl.setT(&w.ts, t)
	ph := &w.pa
	w.fl.evalPhase(ph, &w.ts, p, x, rootMinG, 0)
	v, a, b := ph.vEOS, ph.am, ph.bm
	cb := &w.fl.cubic
	q := v*v + cb.u*b*v + cb.w*b*b
	dpdv := -R*t/((v-b)*(v-b)) + a*(2*v+cb.u*b)/(q*q)
	return w.fl.props(ph, t, p, x), w.singleLabel(t, v, x), -1 / (ph.v * dpdv)
}
