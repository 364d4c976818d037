package cvd

import (
	"errors"
	"fmt"
	"math"
	"strconv"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
)

// Defaults of RegressSettings.
const (
	// DefaultObjectiveTol is the relative change of the objective below
	// which the search stops.
	DefaultObjectiveTol = 1e-6
	// DefaultStepTol is the step, in scaled units (a fraction of each
	// parameter's range), below which the search stops.
	DefaultStepTol = 1e-8
	// DefaultFDStep is the forward-difference step in scaled units. A
	// residual computed by iterative solvers converged to about 1e-10
	// carries noise of that order; a forward difference errs by about
	// h·|r''|/2 from the curvature and 2ε/h from noise ε, so h = 1e-4 keeps
	// the noise term near 1e-6 and the curvature term near 1e-4 of a
	// residual's scale, well enough for steps (Gill, Murray and Wright
	// 1981). The central differences of the standard errors err by h².
	DefaultFDStep = 1e-4
	// DefaultBoundTolerance is the distance from a bound, as a fraction of
	// the parameter's range, within which the parameter counts as at it.
	DefaultBoundTolerance = 1e-6
	// DefaultMaxIterations is the iteration limit.
	DefaultMaxIterations = 100
	// RankTolerance is the smallest singular value of the Jacobian with
	// unit columns, relative to the largest, that counts as nonzero. A
	// finite-difference Jacobian of residuals with noise near 1e-10 and a
	// step of 1e-4 is good to about 1e-6 of its scale at best; directions
	// below that are not resolved by the data and the differences.
	RankTolerance = 1e-6
)

// Errors of Regress.
var (
	// ErrBadRegression: the problem is not well posed (lengths, bounds, the
	// start, the settings).
	ErrBadRegression = errors.New("invalid regression problem")
	// ErrStartNotEvaluated: the residuals cannot be evaluated at the start.
	// The start must evaluate; choose one where the model can be solved.
	ErrStartNotEvaluated = errors.New("the residuals cannot be evaluated at the start")
)

// RegressSettings controls Regress. A nil *RegressSettings, or a zero field,
// means the documented default.
type RegressSettings struct {
	// ObjectiveTol is the relative change of the objective at convergence;
	// 0 means DefaultObjectiveTol (1e-6). Above 0 and below 1.
	ObjectiveTol float64
	// StepTol is the step at convergence, largest component in scaled
	// units; 0 means DefaultStepTol (1e-8). Above 0 and below 1.
	StepTol float64
	// FDStep is the forward-difference step in scaled units; 0 means
	// DefaultFDStep (1e-4). Above 0 and at most 0.1.
	FDStep float64
	// BoundTolerance is the distance from a bound, in scaled units, within
	// which a parameter is at that bound; 0 means DefaultBoundTolerance
	// (1e-6). Above 0 and below 0.1.
	BoundTolerance float64
	// MaxIterations limits the iterations of both methods together (a
	// Levenberg–Marquardt step taken, or a simplex iteration); 0 means
	// DefaultMaxIterations (100).
	MaxIterations int
	// MaxEvaluations limits the evaluations of the residual function during
	// the search; 0 means 100(n+1). The standard errors at the end take at
	// most 2k more (k free parameters), beyond this limit.
	MaxEvaluations int
	// NoFallback keeps the search to Levenberg–Marquardt: where it would fall
	// back on Nelder–Mead it stops with StopNoProgress.
	NoFallback bool
	// Progress, if not nil, is called at the start (iteration 0) and after
	// each iteration with the objective and the parameters there (a copy the
	// callee may keep).
	Progress func(iteration int, objective float64, x []float64)
}

// RegressStop says why Regress stopped.
type RegressStop int

const (
	// StopObjectiveChange: the relative change of the objective, achieved
	// and predicted, is below the tolerance.
	StopObjectiveChange RegressStop = iota + 1
	// StopSmallStep: the step is below the tolerance.
	StopSmallStep
	// StopZeroObjective: every residual is zero.
	StopZeroObjective
	// StopIterationLimit: the iteration limit was reached.
	StopIterationLimit
	// StopEvaluationLimit: the evaluation limit was reached.
	StopEvaluationLimit
	// StopNoProgress: no step reduces the objective although the Jacobian
	// says one should, or the Jacobian cannot be estimated, and the fallback
	// is off (NoFallback).
	StopNoProgress
)

// String says why the search stopped, in plain words.
func (s RegressStop) String() string {
	switch s {
	case StopObjectiveChange:
		return "objective change below tolerance"
	case StopSmallStep:
		return "step below tolerance"
	case StopZeroObjective:
		return "objective is zero"
	case StopIterationLimit:
		return "iteration limit reached"
	case StopEvaluationLimit:
		return "evaluation limit reached"
	case StopNoProgress:
		return "no step reduces the objective"
	}
	return fmt.Sprintf("RegressStop(%d)", int(s))
}

// Converged reports whether the search stopped on a convergence test
// rather than on a limit or for want of progress.
func (s RegressStop) Converged() bool {
	return s == StopObjectiveChange || s == StopSmallStep || s == StopZeroObjective
}

// RegressMethod names a method of Regress.
type RegressMethod int

const (
	// LevenbergMarquardt is the bounded Levenberg–Marquardt method, always
	// first.
	LevenbergMarquardt RegressMethod = iota + 1
	// NelderMead is the simplex fallback.
	NelderMead
)

// String names the method.
func (m RegressMethod) String() string {
	switch m {
	case LevenbergMarquardt:
		return "Levenberg-Marquardt"
	case NelderMead:
		return "Nelder-Mead"
	}
	return fmt.Sprintf("RegressMethod(%d)", int(m))
}

// BoundState says whether a parameter ended at one of its bounds.
type BoundState int

const (
	InsideBounds BoundState = iota // not within the tolerance of either bound
	AtLowerBound                   // within the tolerance of the lower bound
	AtUpperBound                   // within the tolerance of the upper bound
)

// String names the state.
func (b BoundState) String() string {
	switch b {
	case InsideBounds:
		return "inside bounds"
	case AtLowerBound:
		return "at lower bound"
	case AtUpperBound:
		return "at upper bound"
	}
	return fmt.Sprintf("BoundState(%d)", int(b))
}

// RegressResult is the outcome of Regress. No field holds a NaN.
type RegressResult struct {
	X          []float64 // the parameters at the end, the best point found
	Objective0 float64   // Σ r² at the start
	Objective  float64   // Σ r² at X
	Residuals  []float64 // r at X

	// Iterations counts the iterations of both methods; Evaluations every
	// call of the residual function, FailedEvaluations those that failed
	// (included in Evaluations). A point evaluated twice is evaluated once.
	Iterations        int
	Evaluations       int
	FailedEvaluations int
	// History is the objective at the start and after each iteration
	// (Iterations+1 values, not increasing). Objective may be below the
	// last when the search stopped inside a simplex iteration.
	History []float64

	Stop RegressStop // why the search stopped
	// Methods lists the methods used, in order; the last one finished.
	Methods []RegressMethod
	// Fallback says, in plain words, why Levenberg–Marquardt gave up and
	// Nelder–Mead took over (or would have, but for NoFallback or the
	// iteration limit); empty when it did not.
	Fallback string

	AtBound []BoundState // per parameter

	// StdErrKnown reports whether the standard errors and correlations
	// could be estimated (see Regress: not when m ≤ k, no parameter free,
	// the Jacobian failed, or JᵀJ is singular); when false StdErr,
	// Covariance and Correlation are nil.
	StdErrKnown bool
	// StdErr holds the approximate standard error of each parameter, 0 for
	// one held at a bound. Covariance and Correlation are n×n; a parameter
	// held at a bound has a zero row and column, its diagonal included.
	StdErr      []float64
	Covariance  [][]float64
	Correlation [][]float64
	// RCond is the smallest singular value of the final Jacobian over the
	// free parameters, columns scaled to unit length, over the largest: 0
	// when singular or not computed; below RankTolerance the standard
	// errors are unknown.
	RCond float64
	// DegreesOfFreedom is m − k, k the number of free parameters.
	DegreesOfFreedom int
}

// Regress minimises the objective F(x) = Σ rᵢ(x)² over lo ≤ x ≤ hi from x0,
// where f writes the m residuals at x into r (already weighted) and returns
// an error where they cannot be computed; f must not keep x or r. It is
// the regression engine behind the tuning of an equation of state but
// knows nothing of fluids: the caller's residual function does the
// expensive work (a saturation point and the simulated experiments for
// each evaluation), so the method is built to spend few evaluations.
//
// Regress returns an error only for a problem that is not well posed
// (ErrBadRegression): f nil, m < 1, no parameters, lengths of x0, lo, hi
// that differ, a bound that is not finite, lo ≥ hi, x0 outside the bounds,
// settings out of range; or when f fails at x0 (ErrStartNotEvaluated,
// wrapping f's error: the start must evaluate). A search that stops at a
// limit is no error: RegressResult.Stop says so.
//
// # Method
//
// The parameters are scaled to [0, 1] over their bounds, z = (x − lo)/(hi − lo),
// and the search runs in z, so a step, a tolerance and the finite-difference
// step mean the same fraction of every parameter's range.
//
// Levenberg–Marquardt (Marquardt 1963) takes the step δ that solves
//
//	(JᵀJ + μ D) δ = −Jᵀr,   D = diag(JᵀJ),
//
// Marquardt's diagonal scaling. The step comes from the singular value
// decomposition of J with its columns scaled to unit length, which makes
// the damped solve cheap to repeat for a new μ and the step defined even
// when J is rank-deficient: singular values below RankTolerance of the
// largest are treated as zero (the minimum-norm step). The damping follows
// Nielsen (1999), as given by Madsen, Nielsen and Tingleff (2004): with the
// gain ratio ρ = (F(x) − F(x+δ)) / (F(x) − ‖r + Jδ‖²), a step with ρ > 0 is
// taken and μ multiplied by max(1/3, 1 − (2ρ − 1)³), ν set to 2; otherwise
// μ is multiplied by ν and ν doubled. It starts at μ = 1e-3, relative to
// the diagonal as D makes it, the middle one of the values of τ that
// Madsen, Nielsen and Tingleff suggest.
//
// The Jacobian is by forward differences (n evaluations, each point kept
// for reuse) until a convergence test below is met, or the steps stall;
// from then on it is by central differences (n more), whose error is of
// order h² rather than h, and the search goes on until a test is met
// again. So the point found is stationary to the accuracy of central
// differences, and the Jacobian the standard errors need is usually the
// search's own last one, its points already evaluated.
//
// Bounds are kept by projection: a trial point is clipped to the box, and
// a parameter at a bound whose gradient points out of the box is held
// there for the step (a projected Newton step in the manner of Bertsekas
// 1982). The gain ratio uses the step actually taken, after projection.
//
// An evaluation that fails (the residual function returns an error, or a
// residual that is not finite) counts as worse than any point that
// evaluates: a failed trial step is rejected and the damping raised; a
// failed difference point is replaced by one on the other side of the
// parameter.
//
// When Levenberg–Marquardt cannot go on, the search falls back on the
// Nelder–Mead simplex (gonum's optimize.NelderMead), in the same scaled
// parameters, from the best point so far, with the bounds enforced by
// evaluating the projection P(z) of each vertex onto the box and adding
// F₀‖z − P(z)‖² to its objective, F₀ the objective where the fallback
// starts, so that a vertex outside is always worse than its projection.
// The initial simplex steps 0.05 of each range from that point, inward at
// a bound. It falls back when a column of the Jacobian cannot be estimated
// (the evaluations on both sides of a parameter fail), or when, with
// central differences, the linear model still promises a reduction beyond
// the objective tolerance but steps damped below the step tolerance (or
// with μ past 1e30) all fail to give it: the Jacobian is wrong there
// (noise or a kink), and it is not the minimum. A rank-deficient or
// ill-conditioned Jacobian does not by itself switch: the damping keeps
// the step defined, and the result then reports the standard errors as
// unknown. Result.Methods and Result.Fallback say what happened.
//
// # Stopping
//
// Levenberg–Marquardt stops when the relative reduction of the objective
// that the linear model predicts is below ObjectiveTol: either the best
// reduction it allows over the free parameters or, for a step accepted at
// the first try, both the reduction achieved and the one predicted. It also
// stops when the Gauss–Newton (undamped) step, projected onto the box, is
// shorter than StepTol (in scaled units, largest component), when the
// objective is exactly zero, and at the iteration or evaluation limit.
// With ObjectiveTol ε the parameters end within about √(ε(m − n)) standard
// errors of the optimum (0.006 for ε = 1e-6 and m − n = 34): the reduction
// left, δᵀJᵀJδ, is below εF and s² = F/(m − n). Nelder–Mead stops when its
// best objective has not fallen by more than ObjectiveTol (relative) over
// 5(n+1) simplex iterations, or at a limit. A limit reached is not an
// error: the result says so, and Stop.Converged is false.
//
// # Standard errors
//
// At the solution the Jacobian over the free parameters (those not within
// BoundTolerance of a bound: a parameter at a bound is held, not
// estimated) is by central differences (one-sided second-order
// differences, stepping inward, within one step of a bound or where a
// point fails), from points already evaluated where the search's last
// Jacobian was taken there. With k free parameters and m > k residuals,
//
//	covariance = s² (JᵀJ)⁻¹,   s² = Σ r² / (m − k),
//
// the standard errors are the square roots of its diagonal and the
// correlations its entries over the products of those. They are unknown
// (StdErrKnown false, the slices nil) when m ≤ k, when no parameter is
// free, when the Jacobian could not be evaluated there, or when JᵀJ is
// singular to the accuracy of a finite-difference Jacobian: a singular
// value of the column-scaled Jacobian below RankTolerance of the largest
// (RCond says how close it came).
//
// # References
//
//   - Marquardt, D.W. (1963). An algorithm for least-squares estimation of
//     nonlinear parameters. J. Soc. Indust. Appl. Math. 11(2), 431–441.
//   - Nielsen, H.B. (1999). Damping parameter in Marquardt's method.
//     Report IMM-REP-1999-05, Department of Mathematical Modelling,
//     Technical University of Denmark. (Title and number checked; the
//     update as it is widely implemented from it, the report not read.)
//   - Madsen, K., Nielsen, H.B. and Tingleff, O. (2004). Methods for
//     Non-Linear Least Squares Problems, 2nd ed. IMM, Technical University
//     of Denmark, §3.2 (the damping update; τ from 1e-6 for a start near
//     the solution to 1). (From memory.)
//   - Bertsekas, D.P. (1982). Projected Newton methods for optimization
//     problems with simple constraints. SIAM J. Control Optim. 20(2),
//     221–246. (From memory.)
//   - Nelder, J.A. and Mead, R. (1965). A simplex method for function
//     minimization. Computer Journal 7(4), 308–313. (From memory.)
//   - Gill, P.E., Murray, W. and Wright, M.H. (1981). Practical
//     Optimization. Academic Press, §8.6 (the finite-difference interval
//     against the noise of the function). (From memory.)

func Regress(f func(x, r []float64) error, m int, x0, lo, hi []float64, s *RegressSettings) (*RegressResult, error) {
	set, err := regressCheck(f, m, x0, lo, hi, s)
	if err != nil {
		return nil, err
	}
	n := len(x0)
	g := &regression{
		f: f, m: m, n: n, set: set,
		lo: append([]float64(nil), lo...), hi: append([]float64(nil), hi...),
		w:     make([]float64, n),
		cache: make(map[string]*regressPoint),
	}
	for j := range n {
		g.w[j] = hi[j] - lo[j]
	}
	g.res = &RegressResult{Methods: []RegressMethod{LevenbergMarquardt}}
	p0, _ := g.eval(append([]float64(nil), x0...), true)
	if !p0.ok {
		return nil, fmt.Errorf("cvd.Regress: %w at x0 = %v (the start must evaluate): %w", ErrStartNotEvaluated, x0, p0.err)
	}
	g.res.Objective0 = p0.obj
	g.res.History = []float64{p0.obj}
	g.progress(p0)
	end := g.levenbergMarquardt(p0)
	g.finish(end)
	return g.res, nil
}

// regressCheck validates the input and resolves the defaults.
func regressCheck(f func(x, r []float64) error, m int, x0, lo, hi []float64, s *RegressSettings) (RegressSettings, error) {
	bad := func(format string, a ...any) (RegressSettings, error) {
		return RegressSettings{}, fmt.Errorf("cvd.Regress: %w: %s", ErrBadRegression, fmt.Sprintf(format, a...))
	}
	var set RegressSettings
	if s != nil {
		set = *s
	}
	n := len(x0)
	switch {
	case f == nil:
		return bad("no residual function")
	case m < 1:
		return bad("%d residuals, want at least 1", m)
	case n == 0:
		return bad("no parameters")
	case len(lo) != n || len(hi) != n:
		return bad("%d start values, %d lower and %d upper bounds: give one of each per parameter", n, len(lo), len(hi))
	}
	for j := range n {
		switch {
		case math.IsNaN(lo[j]) || math.IsInf(lo[j], 0) || math.IsNaN(hi[j]) || math.IsInf(hi[j], 0):
			return bad("parameter %d has bounds [%g, %g]; both must be finite", j+1, lo[j], hi[j])
		case !(lo[j] < hi[j]):
			return bad("parameter %d has lower bound %g not below its upper bound %g", j+1, lo[j], hi[j])
		case !(x0[j] >= lo[j] && x0[j] <= hi[j]):
			return bad("parameter %d starts at %g, outside its bounds [%g, %g]", j+1, x0[j], lo[j], hi[j])
		}
	}
	inOpen := func(v, max float64) bool { return v > 0 && v < max }
	switch {
	case set.ObjectiveTol == 0:
		set.ObjectiveTol = DefaultObjectiveTol
	case !inOpen(set.ObjectiveTol, 1):
		return bad("objective tolerance %g, want above 0 and below 1", set.ObjectiveTol)
	}
	switch {
	case set.StepTol == 0:
		set.StepTol = DefaultStepTol
	case !inOpen(set.StepTol, 1):
		return bad("step tolerance %g, want above 0 and below 1", set.StepTol)
	}
	switch {
	case set.FDStep == 0:
		set.FDStep = DefaultFDStep
	case !(set.FDStep > 0 && set.FDStep <= 0.1):
		return bad("finite-difference step %g, want above 0 and at most 0.1", set.FDStep)
	}
	switch {
	case set.BoundTolerance == 0:
		set.BoundTolerance = DefaultBoundTolerance
	case !inOpen(set.BoundTolerance, 0.1):
		return bad("bound tolerance %g, want above 0 and below 0.1", set.BoundTolerance)
	}
	switch {
	case set.MaxIterations == 0:
		set.MaxIterations = DefaultMaxIterations
	case set.MaxIterations < 0:
		return bad("iteration limit %d, want at least 1", set.MaxIterations)
	}
	switch {
	case set.MaxEvaluations == 0:
		set.MaxEvaluations = 100 * (n + 1)
	case set.MaxEvaluations < 0:
		return bad("evaluation limit %d, want at least 1", set.MaxEvaluations)
	}
	return set, nil
}

// regressPoint is one evaluated point.
type regressPoint struct {
	x   []float64
	r   []float64 // nil when the evaluation failed
	obj float64   // Σ r², +Inf when failed
	ok  bool
	err error // why it failed
}

// regression is the state of one call of Regress.
type regression struct {
	f         func(x, r []float64) error
	m, n      int
	set       RegressSettings
	lo, hi, w []float64
	cache     map[string]*regressPoint
	res       *RegressResult
}

// regressKey is the cache key of a point: its exact bits.
func regressKey(x []float64) string {
	b := make([]byte, 8*len(x))
	for j, v := range x {
		u := math.Float64bits(v)
		for k := range 8 {
			b[8*j+k] = byte(u >> (8 * k))
		}
	}
	return string(b)
}

// eval evaluates the residuals at x (kept, not copied), reusing an earlier
// evaluation of the same point. Unless unlimited, it refuses (limit true)
// once the evaluation limit is reached.
func (g *regression) eval(x []float64, unlimited bool) (p *regressPoint, limit bool) {
	key := regressKey(x)
	if p, ok := g.cache[key]; ok {
		return p, false
	}
	if !unlimited && g.res.Evaluations >= g.set.MaxEvaluations {
		return nil, true
	}
	p = &regressPoint{x: x, r: make([]float64, g.m)}
	xc := append([]float64(nil), x...) // f may not keep or change ours
	err := g.f(xc, p.r)
	if err == nil {
		for i, v := range p.r {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				err = fmt.Errorf("residual %d is %g", i+1, v)
				break
			}
		}
	}
	if err == nil {
		p.ok = true
		p.obj = floats.Dot(p.r, p.r)
		if math.IsInf(p.obj, 0) {
			p.ok, err = false, errors.New("the sum of squares overflows")
		}
	}
	if !p.ok {
		p.r, p.obj, p.err = nil, math.Inf(1), err
	}
	g.res.Evaluations++
	if !p.ok {
		g.res.FailedEvaluations++
	}
	g.cache[key] = p
	return p, false
}

// progress records an iteration's end (or the start) for the caller.
func (g *regression) progress(p *regressPoint) {
	if g.set.Progress != nil {
		g.set.Progress(g.res.Iterations, p.obj, append([]float64(nil), p.x...))
	}
}

// iterate records an iteration that ended at p.
func (g *regression) iterate(p *regressPoint) {
	g.res.Iterations++
	g.res.History = append(g.res.History, p.obj)
	g.progress(p)
}

// project writes into xt the point x + δ (δ in scaled units) projected
// onto the box, and into dp the step so taken in scaled units; it reports
// whether that step is below the step tolerance.
func (g *regression) project(xt, dp, x, delta []float64) (small bool) {
	small = true
	for j := range x {
		v := x[j] + delta[j]*g.w[j]
		xt[j] = math.Min(math.Max(v, g.lo[j]), g.hi[j])
		dp[j] = (xt[j] - x[j]) / g.w[j]
		if math.Abs(dp[j]) > g.set.StepTol {
			small = false
		}
	}
	return small
}

// atBound says where x[j] is against its bounds.
func (g *regression) atBound(x []float64, j int) BoundState {
	tol := g.set.BoundTolerance * g.w[j]
	switch {
	case x[j]-g.lo[j] <= tol:
		return AtLowerBound
	case g.hi[j]-x[j] <= tol:
		return AtUpperBound
	}
	return InsideBounds
}

// jacobian estimates ∂r/∂z at p, column by column (see column). It
// returns the m×n Jacobian; or nil and the index of the parameter whose
// column could not be estimated; or limit true at the evaluation limit.
func (g *regression) jacobian(p *regressPoint, central bool) (jac *mat.Dense, bad int, limit bool) {
	jac = mat.NewDense(g.m, g.n, nil)
	for j := range g.n {
		col, ok, limit := g.column(p, j, central, false)
		if limit {
			return nil, 0, true
		}
		if !ok {
			return nil, j, false
		}
		jac.SetCol(j, col)
	}
	return jac, -1, false
}

// column estimates ∂r/∂z_j at p with the step h = FDStep (scaled units).
// Forward, and for a parameter within BoundTolerance of a bound always, it
// is the difference to z_j + h, or to z_j − h beyond the upper bound or
// where z_j + h fails. Central, it is the difference between z_j ± h, or
// where one of them lies outside the box or fails, the second-order
// one-sided difference through z_j, z_j ∓ h and z_j ∓ 2h on the other side.
// The steps are those represented in x, not h itself. It reports ok false
// when no difference can be formed, limit true at the evaluation limit
// (ignored when unlimited).
func (g *regression) column(p *regressPoint, j int, central, unlimited bool) (col []float64, ok, limit bool) {
	h := g.set.FDStep
	// at evaluates the point with z_j moved by d; q nil when it lies
	// outside the box or fails, dz the step as represented.
	at := func(d float64) (q *regressPoint, dz float64, limit bool) {
		x := append([]float64(nil), p.x...)
		x[j] = p.x[j] + d*g.w[j]
		if x[j] < g.lo[j] || x[j] > g.hi[j] || x[j] == p.x[j] {
			return nil, 0, false
		}
		q, limit = g.eval(x, unlimited)
		if limit || !q.ok {
			return nil, 0, limit
		}
		return q, (x[j] - p.x[j]) / g.w[j], false
	}
	col = make([]float64, g.m)
	if central && g.atBound(p.x, j) == InsideBounds {
		qp, dp, lim := at(h)
		if lim {
			return nil, false, true
		}
		qm, dm, lim := at(-h)
		if lim {
			return nil, false, true
		}
		if qp != nil && qm != nil {
			for i := range g.m {
				col[i] = (qp.r[i] - qm.r[i]) / (dp - dm)
			}
			return col, true, false
		}
		side := 1.0
		if qp == nil {
			side = -1
		}
		q1, d1, lim := at(side * h)
		if lim {
			return nil, false, true
		}
		q2, d2, lim := at(2 * side * h)
		if lim {
			return nil, false, true
		}
		if q1 != nil && q2 != nil {
			// The slope at 0 of the parabola through (0, r), (d1, r1), (d2, r2).
			for i := range g.m {
				f0, f1, f2 := p.r[i], q1.r[i], q2.r[i]
				col[i] = (f1-f0)*d2/(d1*(d2-d1)) - (f2-f0)*d1/(d2*(d2-d1))
			}
			return col, true, false
		}
		// Fall through to a first-order difference, whichever side works.
	}
	dir := 1.0
	if p.x[j]+h*g.w[j] > g.hi[j] {
		dir = -1
	}
	for range 2 {
		q, dz, lim := at(dir * h)
		if lim {
			return nil, false, true
		}
		if q != nil {
			for i := range g.m {
				col[i] = (q.r[i] - p.r[i]) / dz
			}
			return col, true, false
		}
		dir = -dir
	}
	return nil, false, false
}

// lmModel is the linear model of one Levenberg–Marquardt iteration: the
// SVD of the Jacobian over the parameters free to move, with unit columns.
type lmModel struct {
	free    []int     // indices of the free parameters
	scale   []float64 // column norms of the free columns
	sigma   []float64 // singular values, descending
	u, v    mat.Dense
	utr     []float64 // Uᵀr
	predMax float64   // the largest reduction of Σ r² the model allows
}

// model builds the linear model at p from its Jacobian.
func (g *regression) model(p *regressPoint, jac *mat.Dense) *lmModel {
	grad := make([]float64, g.n) // Jᵀr
	for j := range g.n {
		grad[j] = floats.Dot(mat.Col(nil, j, jac), p.r)
	}
	md := &lmModel{}
	for j := range g.n {
		norm := floats.Norm(mat.Col(nil, j, jac), 2)
		if norm == 0 {
			continue // no effect on the residuals: nothing to solve for
		}
		if (p.x[j] == g.lo[j] && grad[j] > 0) || (p.x[j] == g.hi[j] && grad[j] < 0) {
			continue // at a bound, descent leads out of the box: held
		}
		md.free = append(md.free, j)
		md.scale = append(md.scale, norm)
	}
	if len(md.free) == 0 {
		return md
	}
	a := mat.NewDense(g.m, len(md.free), nil)
	for c, j := range md.free {
		for i := range g.m {
			a.Set(i, c, jac.At(i, j)/md.scale[c])
		}
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThin) {
		md.free = nil // cannot happen for finite input; treat as no model
		return md
	}
	md.sigma = svd.Values(nil)
	svd.UTo(&md.u)
	svd.VTo(&md.v)
	md.utr = make([]float64, len(md.sigma))
	for k := range md.sigma {
		md.utr[k] = floats.Dot(mat.Col(nil, k, &md.u), p.r)
		if md.sigma[k] > RankTolerance*md.sigma[0] {
			md.predMax += md.utr[k] * md.utr[k]
		}
	}
	return md
}

// step writes into delta the damped step for damping mu (scaled units).
func (md *lmModel) step(delta []float64, mu float64) {
	for j := range delta {
		delta[j] = 0
	}
	for k, s := range md.sigma {
		if !(s > RankTolerance*md.sigma[0]) {
			continue
		}
		c := -s / (s*s + mu) * md.utr[k]
		for col, j := range md.free {
			delta[j] += c * md.v.At(col, k)
		}
	}
	for col, j := range md.free {
		delta[j] /= md.scale[col]
	}
}

// levenbergMarquardt runs the bounded Levenberg–Marquardt search from p and
// returns the point where it ended (Stop set), or hands over to the
// fallback.
func (g *regression) levenbergMarquardt(p *regressPoint) *regressPoint {
	if p.obj == 0 {
		g.res.Stop = StopZeroObjective
		return p
	}
	tol := g.set.ObjectiveTol
	mu, nu := 1e-3, 2.0
	delta := make([]float64, g.n)
	dp := make([]float64, g.n)
	jd := make([]float64, g.m)
	// The Jacobian is by forward differences until a convergence test is
	// met; then by central differences, whose error is h² rather than h, so
	// that the point found is stationary to that accuracy and the test is
	// met again before the search stops. The central points at the end are
	// those the standard errors need: they cost nothing more there.
	central := false
	converged := func(why RegressStop) bool {
		if central {
			g.res.Stop = why
			return true
		}
		central = true
		return false
	}
	for {
		if g.res.Iterations >= g.set.MaxIterations {
			g.res.Stop = StopIterationLimit
			return p
		}
		jac, bad, limit := g.jacobian(p, central)
		if limit {
			g.res.Stop = StopEvaluationLimit
			return p
		}
		if jac == nil {
			return g.fallback(p, fmt.Sprintf("the Jacobian could not be estimated: the evaluations on both sides of parameter %d failed", bad+1))
		}
		md := g.model(p, jac)
		if md.predMax <= tol*p.obj {
			if converged(StopObjectiveChange) {
				return p
			}
			continue
		}
		xt := make([]float64, g.n)
		md.step(delta, 0) // the Gauss–Newton step
		if g.project(xt, dp, p.x, delta) {
			if converged(StopSmallStep) {
				return p
			}
			continue
		}
	trials:
		for rejected := 0; ; rejected++ {
			md.step(delta, mu)
			xt = make([]float64, g.n)
			if g.project(xt, dp, p.x, delta) || mu > 1e30 {
				if !central {
					// The forward differences may be too coarse for the
					// reduction left: try central ones before giving up.
					central, mu, nu = true, 1e-3, 2
					break trials
				}
				return g.fallback(p, "Levenberg-Marquardt steps fail to give the reduction of "+shareText(md.predMax/p.obj)+" of the objective that the Jacobian predicts")
			}
			// Predicted reduction of the step taken: F − ‖r + J δp‖².
			copy(jd, p.r)
			for j := range g.n {
				if dp[j] != 0 {
					floats.AddScaled(jd, dp[j], mat.Col(nil, j, jac))
				}
			}
			pred := p.obj - floats.Dot(jd, jd)
			if !(pred > 0) {
				mu, nu = mu*nu, 2*nu
				continue
			}
			q, limit := g.eval(xt, false)
			if limit {
				g.res.Stop = StopEvaluationLimit
				return p
			}
			rho := (p.obj - q.obj) / pred // −Inf for a failed evaluation
			if !(rho > 0) {
				mu, nu = mu*nu, 2*nu
				continue
			}
			old := p.obj
			p = q
			mu *= math.Max(1.0/3, 1-math.Pow(2*rho-1, 3))
			nu = 2
			g.iterate(p)
			if p.obj == 0 {
				g.res.Stop = StopZeroObjective
				return p
			}
			if rejected == 0 && old-p.obj <= tol*old && pred <= tol*old && converged(StopObjectiveChange) {
				return p
			}
			break
		}
	}
}

// shareText writes a fraction as a percentage for people, without
// e-notation.
func shareText(f float64) string {
	switch {
	case !(f >= 0):
		return "an unknown share"
	case f < 1e-4:
		return "less than 0.01 %"
	}
	return strconv.FormatFloat(100*f, 'f', 2, 64) + " %"
}

// fallback runs Nelder–Mead from p, in scaled parameters, and returns the
// best point it found (Stop set).
func (g *regression) fallback(p *regressPoint, why string) *regressPoint {
	g.res.Fallback = why
	if g.set.NoFallback {
		g.res.Stop = StopNoProgress
		return p
	}
	if g.res.Iterations >= g.set.MaxIterations {
		g.res.Stop = StopIterationLimit
		return p
	}
	g.res.Methods = append(g.res.Methods, NelderMead)
	n := g.n
	best := p
	toX := func(z []float64) (x []float64, outside float64) {
		x = make([]float64, n)
		for j := range n {
			zc := math.Min(math.Max(z[j], 0), 1)
			outside += (z[j] - zc) * (z[j] - zc)
			x[j] = math.Min(math.Max(g.lo[j]+zc*g.w[j], g.lo[j]), g.hi[j])
		}
		return x, outside
	}
	z0 := make([]float64, n)
	for j := range n {
		z0[j] = (p.x[j] - g.lo[j]) / g.w[j]
	}
	// The initial simplex: the best point and a step of 0.05 of each range
	// (gonum's default size), inward at a bound.
	const size = 0.05
	verts := [][]float64{z0}
	vals := []float64{p.obj}
	for j := range n {
		v := append([]float64(nil), z0...)
		if v[j]+size <= 1 {
			v[j] += size
		} else {
			v[j] -= size
		}
		x, _ := toX(v)
		q, limit := g.eval(x, false)
		if limit {
			g.res.Stop = StopEvaluationLimit
			return best
		}
		if q.ok && q.obj < best.obj {
			best = q
		}
		verts = append(verts, v)
		vals = append(vals, q.obj)
	}
	f0 := p.obj
	stop := RegressStop(0)
	limitHit := false
	problem := optimize.Problem{
		Func: func(z []float64) float64 {
			x, outside := toX(z)
			q, limit := g.eval(x, false)
			if limit {
				limitHit = true
				return math.Inf(1)
			}
			if q.ok && q.obj < best.obj {
				best = q
			}
			return q.obj + f0*outside
		},
		Status: func() (optimize.Status, error) {
			if limitHit || g.res.Evaluations >= g.set.MaxEvaluations {
				stop = StopEvaluationLimit
				return optimize.FunctionEvaluationLimit, nil
			}
			return optimize.NotTerminated, nil
		},
	}
	conv := &nmConverger{g: g, best: &best, tol: g.set.ObjectiveTol, window: 5 * (n + 1), stop: &stop}
	settings := &optimize.Settings{
		InitValues: &optimize.Location{F: p.obj},
		Converger:  conv,
	}
	method := &optimize.NelderMead{InitialVertices: verts, InitialValues: vals}
	if _, err := optimize.Minimize(problem, z0, settings, method); stop == 0 {
		// gonum stopped for a reason of its own, which it does not do for
		// this method and problem; the best point stands.
		stop = StopNoProgress
		if err != nil {
			g.res.Fallback += "; the simplex search stopped: " + err.Error()
		}
	}
	g.res.Stop = stop
	return best
}

// nmConverger watches the simplex iterations: it records each, applies the
// iteration limit and the test on the best objective.
type nmConverger struct {
	g      *regression
	best   **regressPoint
	tol    float64
	window int
	stop   *RegressStop

	ref   float64 // the best objective when the window began
	count int
	first bool
}

func (c *nmConverger) Init(int) { c.first = true }

func (c *nmConverger) Converged(loc *optimize.Location) optimize.Status {
	bp := *c.best // the best point evaluated, which loc.X projects onto
	c.g.iterate(bp)
	if c.first {
		c.first, c.ref, c.count = false, bp.obj, 0
	} else if c.ref-bp.obj > c.tol*c.ref {
		c.ref, c.count = bp.obj, 0
	} else {
		c.count++
	}
	switch {
	case bp.obj == 0:
		*c.stop = StopZeroObjective
		return optimize.FunctionConvergence
	case c.count >= c.window:
		*c.stop = StopObjectiveChange
		return optimize.FunctionConvergence
	case c.g.res.Iterations >= c.g.set.MaxIterations:
		*c.stop = StopIterationLimit
		return optimize.IterationLimit
	}
	return optimize.NotTerminated
}

// finish fills the result at the final point p: parameters, residuals,
// bounds and standard errors.
func (g *regression) finish(p *regressPoint) {
	res := g.res
	res.X = append([]float64(nil), p.x...)
	res.Objective = p.obj
	res.Residuals = append([]float64(nil), p.r...)
	res.AtBound = make([]BoundState, g.n)
	var free []int
	for j := range g.n {
		res.AtBound[j] = g.atBound(p.x, j)
		if res.AtBound[j] == InsideBounds {
			free = append(free, j)
		}
	}
	k := len(free)
	res.DegreesOfFreedom = g.m - k
	if k == 0 || g.m <= k {
		return
	}
	jac := mat.NewDense(g.m, k, nil) // ∂r/∂x over the free parameters
	for c, j := range free {
		col, ok, _ := g.column(p, j, true, true)
		if !ok {
			return
		}
		floats.Scale(1/g.w[j], col)
		jac.SetCol(c, col)
	}
	// SVD of the Jacobian with unit columns: J = Ĵ C, (JᵀJ)⁻¹ = C⁻¹ V Σ⁻² Vᵀ C⁻¹.
	scale := make([]float64, k)
	for c := range k {
		scale[c] = floats.Norm(mat.Col(nil, c, jac), 2)
		if scale[c] == 0 {
			return // a parameter without effect: singular
		}
	}
	a := mat.NewDense(g.m, k, nil)
	for i := range g.m {
		for c := range k {
			a.Set(i, c, jac.At(i, c)/scale[c])
		}
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThin) {
		return
	}
	sig := svd.Values(nil)
	res.RCond = sig[len(sig)-1] / sig[0]
	if !(res.RCond >= RankTolerance) {
		return
	}
	var v mat.Dense
	svd.VTo(&v)
	inv := make([][]float64, k) // (JᵀJ)⁻¹ over the free parameters
	for a := range k {
		inv[a] = make([]float64, k)
		for b := range k {
			var sum float64
			for l, s := range sig {
				sum += v.At(a, l) * v.At(b, l) / (s * s)
			}
			inv[a][b] = sum / (scale[a] * scale[b])
		}
	}
	s2 := p.obj / float64(g.m-k)
	res.StdErrKnown = true
	res.StdErr = make([]float64, g.n)
	res.Covariance = make([][]float64, g.n)
	res.Correlation = make([][]float64, g.n)
	for j := range g.n {
		res.Covariance[j] = make([]float64, g.n)
		res.Correlation[j] = make([]float64, g.n)
	}
	for a, ja := range free {
		res.StdErr[ja] = math.Sqrt(s2 * inv[a][a])
		for b, jb := range free {
			res.Covariance[ja][jb] = s2 * inv[a][b]
			res.Correlation[ja][jb] = inv[a][b] / math.Sqrt(inv[a][a]*inv[b][b])
		}
		res.Correlation[ja][ja] = 1
	}
}
