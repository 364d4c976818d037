package eos

import "math"

// work is the scratch space shared by the flash, stability and saturation
// solvers of one fluid: every slice is sized once, so the iterations allocate
// nothing.
type work struct {
	fl      *Fluid
	n       int
	tol     float64
	max     int
	noLabel bool // single phases are not named (Flasher.NameSinglePhases)
	noPure  bool // a feed stable from the Wilson starts is one phase (Flasher.PureTrials)
	// earlyTrivial: a trial converging onto the feed ends at
	// flashTrivialNear (the flash and the saturation search's scan), not
	// only when polished (the saturation search's refinement).
	earlyTrivial bool
	// splitG is the Gibbs energy of the split that Newton's method last
	// converged (splitSums), NaN after a split that ended otherwise.
	splitG float64
	ts     tstate

	feed, pa, pb phase // feed; liquid (or trial) and vapour phases

	d, lnW, W, wn []float64 // stability: ln z + ln φ(z), trial ln W, W, W normalised
	wLiq, wVap    []float64 // trial mole numbers W where the trials stopped
	bx, by, tw    []float64 // flash: the best split so far (liquid, vapour), a trial phase against it
	lnBX, lnBY    []float64 // their logarithms, while the split is tested
	inc           []float64 // saturation: the incipient phase Newton starts from
	sqW           []float64 // trial's scratch: √W_i of a Newton step
	lnZ           []float64 // ln z_i of the feed prepareFeed evaluated
	// The last stability test that found the feed unstable (stableAt,
	// stableEarly): its pressure, composition and the trial phase of lower
	// tm, so that refine need not run a test again at the bracket's unstable
	// end.
	lastUnP          float64
	lastUnT          float64
	lastUnZ          []float64
	lastUnW          []float64
	lnK, lnK1, lnK2  []float64 // current and two previous ln K (GDEM)
	lnKss            []float64 // the plain substitution step before a GDEM jump
	K, x, y, r, g, s []float64
	v, l             []float64 // flash Newton: vapour and liquid mole numbers
	sgn              []float64 // flash Newton: +1 where v_i is the unknown, −1 where l_i is
	H                []float64 // (n+2)×(n+2) matrix storage
	// factored is whether newtonStep's last step came from the Cholesky
	// factor of its Hessian as it was, left in H[:n*n].
	factored bool
	rhs      []float64 // n+2

	crit critCache // for naming single phases

	// tmCut is the tangent-plane distance below which a stationary point
	// proves instability: tmUnstable, or tmUnstableSat in the saturation
	// solvers.
	tmCut float64
	// nearRef, when above zero, ends a trial as trivial once it is within
	// this squared distance in ln W of its reference phase with tm > 0
	// (the test of a converged split, verifySplit).
	nearRef float64
	evals   int // split evaluations of the current flash (flashEvals)
	// thorough adds the pure-component trials to every stability test (the
	// saturation search, when they find a phase its Wilson starts missed).
	thorough bool
}

func newWork(fl *Fluid, s *Settings) *work {
	n := fl.n
	vec := func() []float64 { return make([]float64, n) }
	return &work{
		fl: fl, n: n, tol: s.tol(), max: s.maxIter(), tmCut: tmUnstable, earlyTrivial: true,
		ts:   newTState(n),
		feed: newPhase(n), pa: newPhase(n), pb: newPhase(n),
		d: vec(), lnW: vec(), W: vec(), wn: vec(), wLiq: vec(), wVap: vec(), inc: vec(),
		bx: vec(), by: vec(), tw: vec(), lnBX: vec(), lnBY: vec(),
		lnK: vec(), lnK1: vec(), lnK2: vec(), lnKss: vec(),
		K: vec(), x: vec(), y: vec(), r: vec(), g: vec(), s: vec(),
		v: vec(), l: vec(), sgn: vec(), sqW: vec(), lnZ: vec(),
		H:   make([]float64, max((n+2)*(n+2), 2*n*n)),
		rhs: make([]float64, n+2),
	}
}

// wilson sets lnK to the Wilson (1969) estimate ln(Pc/P) + 5.373 (1 + ω)(1 − Tc/T).
func (w *work) wilson(t, p float64) {
	f := w.fl
	for i := 0; i < w.n; i++ {
		w.lnK[i] = math.Log(f.pc[i]/p) + 5.373*(1+f.omega[i])*(1-f.tc[i]/t)
	}
}

func validState(t, p float64) bool {
	return t > 0 && p > 0 && !math.IsInf(t, 0) && !math.IsInf(p, 0)
}
