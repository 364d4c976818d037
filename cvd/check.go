package cvd

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"dewcell/eos"
	"dewcell/internal/phys"
)

// Quality check of a laboratory constant-volume depletion report, before a
// model is tuned to it.
//
// References:
//
//   - Whitson, C.H. and Torp, S.B. (1983). Evaluating constant-volume depletion
//     data. JPT 35(3), 610–620. SPE-10067-PA (the material balance, negative
//     liquid mole fractions as the mark of inconsistent data, the final
//     liquid against the measured residual liquid, smooth K-values).
//   - Hoffman, A.E., Crump, J.S. and Hocott, C.R. (1953). Equilibrium
//     constants for a gas-condensate system. JPT 5(1), 1–10; Trans. AIME 198
//     (the characterization factor F and the plot of log K p against it).

// Verdict is the outcome of the check of one step, or of the whole report.
// The values are ordered: a worse verdict is greater, so the verdict of a
// set of findings is the greatest of theirs.
type Verdict int

const (
	// VerdictOK: everything the step's data allow to check was checked and
	// passed.
	VerdictOK Verdict = iota
	// VerdictNotChecked: nothing wrong was found, but the report lacks what
	// part of the check needs (the step's dropout, produced moles, z_gas
	// or gas composition, or those of an earlier step). Missing data are not
	// inconsistent data.
	VerdictNotChecked
	// VerdictSuspect: a finding that data consistent to the report's
	// rounding seldom show (a rule of thumb was exceeded).
	VerdictSuspect
	// VerdictInconsistent: a finding that data consistent to the report's
	// rounding cannot show, or a rule of thumb exceeded by far.
	VerdictInconsistent
)

func (v Verdict) String() string {
	switch v {
	case VerdictOK:
		return "ok"
	case VerdictNotChecked:
		return "not checked"
	case VerdictSuspect:
		return "suspect"
	case VerdictInconsistent:
		return "inconsistent"
	}
	return fmt.Sprintf("Verdict(%d)", int(v))
}

// MarshalText returns the verdict's word, so that encoders write "ok",
// "not checked", "suspect" or "inconsistent".
func (v Verdict) MarshalText() ([]byte, error) { return []byte(v.String()), nil }

// FindingKind says what a finding is about.
type FindingKind int

const (
	// MissingData: the step lacks what the material balance needs; Message
	// says what. Its verdict is VerdictNotChecked.
	MissingData FindingKind = iota
	// NegativeLiquid: a back-calculated liquid mole fraction below zero by
	// more than the report's rounding allows (Whitson and Torp 1983). Value
	// is x, Limit the most negative x the rounding allows.
	NegativeLiquid
	// NegativeCell: more of a component produced than was charged. Value is
	// the component's moles left in the cell per mole charged, Limit the
	// most negative value the rounding allows.
	NegativeCell
	// NoLiquid: the gas in the cell accounts for all the moles left in it or
	// more. Value is the liquid moles per mole charged, Limit the most
	// negative value the rounding allows.
	NoLiquid
	// LiquidWithoutVolume: liquid moles beyond the rounding at a step whose
	// dropout is zero. Value is the liquid moles, Limit their rounding.
	LiquidWithoutVolume
	// CompositionSum: a reported composition does not sum to 100 mol %
	// within its rounding. Value is the sum (a fraction), Limit the largest
	// departure from 1 allowed. Beyond 1 mol % the composition is
	// normalised before the balance.
	CompositionSum
	// HoffmanScatter: the points of the Hoffman plot are not on a straight
	// line. Value is R², Limit the least R² accepted.
	HoffmanScatter
	// HoffmanOutlier: one component lies off the Hoffman line. Value is its
	// residual, decades of K p, Limit the residual allowed it.
	HoffmanOutlier
	// DensityTrend: the back-calculated liquid density is off the trend of
	// the other steps. Value is the deviation ln(ρ_L/trend), Limit the
	// deviation allowed.
	DensityTrend
	// LiquidLighterThanGas: the back-calculated liquid is less dense than
	// the gas in equilibrium with it, p M_g/(Z R T), by more than the
	// rounding allows: no retrograde liquid is. Value is ρ_L/ρ_g, Limit the
	// least ratio the rounding allows.
	LiquidLighterThanGas
	// TwoPhaseZMismatch: the reported z_two_phase differs from the one the
	// produced moles imply, (p/p_d) Z_d/(1 − n_p). Value is the relative
	// difference, Limit the difference allowed.
	TwoPhaseZMismatch
	// LiquidClosure: the liquid of the last step differs from the measured
	// final liquid. Value is balance minus measured, a mole fraction, Limit
	// the difference allowed.
	LiquidClosure
	// FeedMismatch: the composition the report gives at the saturation
	// pressure differs from the feed the balance starts from. Value is the
	// difference, a mole fraction, Limit the difference allowed.
	FeedMismatch
	// SaturationRow: the row at the saturation pressure reports liquid
	// dropout or produced moles. Value is the value reported, Limit its
	// rounding.
	SaturationRow
)

func (k FindingKind) String() string {
	switch k {
	case MissingData:
		return "missing data"
	case NegativeLiquid:
		return "negative liquid mole fraction"
	case NegativeCell:
		return "more produced than charged"
	case NoLiquid:
		return "no liquid in the cell"
	case LiquidWithoutVolume:
		return "liquid moles without liquid volume"
	case CompositionSum:
		return "composition sum"
	case HoffmanScatter:
		return "Hoffman plot not straight"
	case HoffmanOutlier:
		return "Hoffman plot outlier"
	case DensityTrend:
		return "liquid density off trend"
	case LiquidLighterThanGas:
		return "liquid lighter than gas"
	case TwoPhaseZMismatch:
		return "two-phase Z mismatch"
	case LiquidClosure:
		return "final liquid closure"
	case FeedMismatch:
		return "feed mismatch"
	case SaturationRow:
		return "saturation row"
	}
	return fmt.Sprintf("FindingKind(%d)", int(k))
}

// Finding is one reason for a verdict.
type Finding struct {
	Kind    FindingKind
	Verdict Verdict // VerdictNotChecked, VerdictSuspect or VerdictInconsistent
	// Step is the index in CheckResult.Steps, −1 for a finding about the
	// whole report; Point is the index in LabCVD.Points, −1 when none.
	Step, Point int
	// Component is the name of the report's component concerned, "" when
	// none; for the final liquid, the names of the group compared.
	Component string
	// Value and Limit are the number found and the threshold it passed, as
	// each FindingKind says.
	Value, Limit float64
	// Message says what was found, with the numbers, in words (mole and
	// relative percents; no dimensional values).
	Message string
}

// DewZSource says where the check took the Z-factor at the saturation
// pressure from.
type DewZSource int

const (
	// DewZSaturationRow: z_gas of the report's row at the saturation pressure.
	DewZSaturationRow DewZSource = iota
	// DewZSaturationTwoPhase: z_two_phase of that row (equal to Z_d there,
	// before any production).
	DewZSaturationTwoPhase
	// DewZExpansion: Z of the constant-composition expansion at the
	// saturation pressure.
	DewZExpansion
	// DewZFromTwoPhase: derived from the steps' z_two_phase, as the median of
	// Z2_k (1 − n_p,k) p_d/p_k. The two-phase Z check then tests the steps
	// against each other only.
	DewZFromTwoPhase
	// DewZOptions: CheckOptions.DewZ, given by the caller.
	DewZOptions
)

func (s DewZSource) String() string {
	switch s {
	case DewZSaturationRow:
		return "z_gas at the saturation pressure"
	case DewZSaturationTwoPhase:
		return "z_two_phase at the saturation pressure"
	case DewZExpansion:
		return "CCE Z at the saturation pressure"
	case DewZFromTwoPhase:
		return "derived from the steps' z_two_phase"
	case DewZOptions:
		return "given"
	}
	return fmt.Sprintf("DewZSource(%d)", int(s))
}

// CheckOptions set the report's rounding and the thresholds of Check. A nil
// *CheckOptions, or a zero field, means the default.
type CheckOptions struct {
	// DewZ is the Z-factor at the saturation pressure, used only when the
	// report gives none: neither z_gas nor z_two_phase at the saturation
	// pressure, nor a CCE Z there, nor any z_two_phase of a step with its
	// produced moles. It may come from the model or from another report.
	DewZ float64

	// The resolution the report prints its values to, from which Check
	// derives the rounding uncertainty of every quantity it compares (see
	// Check): compositions (mole fractions; default 1e-4, i.e. 0.01 mol %),
	// dropout (fraction of the cell volume; 1e-4), cumulative produced
	// moles (fraction; 1e-4) and Z-factors (1e-4). A report printed to
	// fewer digits needs larger values, or the check finds its rounding.
	CompositionResolution, DropoutResolution, ProducedResolution, ZResolution float64

	// HoffmanR2 is the least R² of the Hoffman line (default 0.95);
	// HoffmanResidual the residual, in decades of K p, beyond which a
	// component is an outlier once its rounding uncertainty is added
	// (default 0.1), and also the rounding uncertainty beyond which a
	// component is left out of the fit; HoffmanStudentized the externally
	// studentized residual an outlier must also exceed (default 3).
	HoffmanR2, HoffmanResidual, HoffmanStudentized float64
	// TrendSuspect and TrendInconsistent are the relative deviations of a
	// step's back-calculated liquid density from the trend of the other
	// steps, beyond their rounding uncertainty, that make the step suspect
	// (default 0.03) or inconsistent (default 0.10). Compared as ln(1 + ·)
	// with |ln(ρ_L/trend)|.
	TrendSuspect, TrendInconsistent float64
	// TwoPhaseZSuspect and TwoPhaseZInconsistent are the relative
	// differences between the reported and the implied two-phase Z, beyond
	// their rounding, that make a step suspect (default 0.005) or
	// inconsistent (default 0.02).
	TwoPhaseZSuspect, TwoPhaseZInconsistent float64
	// ClosureSuspect and ClosureInconsistent are the differences, in mole
	// fraction, between the last step's back-calculated liquid and the
	// measured final liquid, beyond their rounding, that make the last step
	// suspect (default 0.01) or inconsistent (default 0.05).
	ClosureSuspect, ClosureInconsistent float64
	// FeedTolerance is the difference, in mole fraction, between the
	// report's composition at the saturation pressure and the feed, beyond
	// rounding, that makes the report suspect (default 0.001).
	FeedTolerance float64
}

// Defaults of CheckOptions. The resolutions are the way PVT reports print
// their tables (mole percents and volume percents to two decimals, Z to four);
// the thresholds are rules of thumb.
const (
	DefaultResolution            = 1e-4 // common practice, no published source
	DefaultHoffmanR2             = 0.95 // common practice, no published source
	DefaultHoffmanResidual       = 0.1  // decades (a factor 1.26 in K); common practice, no published source
	DefaultHoffmanStudentized    = 3    // common practice, no published source
	DefaultTrendSuspect          = 0.03 // common practice, no published source
	DefaultTrendInconsistent     = 0.10 // common practice, no published source
	DefaultTwoPhaseZSuspect      = 0.005
	DefaultTwoPhaseZInconsistent = 0.02  // both common practice, no published source
	DefaultClosureSuspect        = 0.01  // 1 mol %; common practice, no published source
	DefaultClosureInconsistent   = 0.05  // 5 mol %; common practice, no published source
	DefaultFeedTolerance         = 0.001 // 0.1 mol %; common practice, no published source
)

// CheckComponent is one component of the report, with the properties the
// check gives it: for a group of model components (a plus fraction), the
// feed mole fraction is the sum, the molar mass the feed-mole-weighted mean,
// and Tc, Pc and Tb the feed-mole-weighted means of the members' (Kay's
// rule, an approximation: a group has no critical point of its own). Tb is
// zero when a member's boiling point is unknown.
type CheckComponent struct {
	Name  string
	Index []int   // the model components it stands for
	Z     float64 // feed mole fraction
	M     float64 // kg/mol
	Tc    float64 // K
	Pc    float64 // Pa
	Tb    float64 // K; 0 when unknown
	// B and F are Hoffman's b (K) and characterization factor at the
	// report's temperature; HasF is false when they cannot be computed (no
	// boiling point, or one not below Tc).
	B, F float64
	HasF bool
}

// HoffmanExclusion says why a component is not among the points of a
// Hoffman fit.
type HoffmanExclusion int

const (
	// UndefinedK: the back-calculated liquid mole fraction is not positive,
	// or the gas holds none of the component: it has no K-value.
	UndefinedK HoffmanExclusion = iota
	// NoFactor: the component has no characterization factor (no boiling
	// point below its critical temperature).
	NoFactor
	// Unresolved: the report's rounding leaves log10(K p) uncertain by more
	// than CheckOptions.HoffmanResidual.
	Unresolved
)

func (e HoffmanExclusion) String() string {
	switch e {
	case UndefinedK:
		return "no K-value"
	case NoFactor:
		return "no characterization factor"
	case Unresolved:
		return "K not resolved by the report's rounding"
	}
	return fmt.Sprintf("HoffmanExclusion(%d)", int(e))
}

// HoffmanPoint is one component on a Hoffman plot.
type HoffmanPoint struct {
	Component int     // index in CheckResult.Components
	F         float64 // characterization factor
	// LogKP is log10(K p/p_sc), p_sc = 1 atm: Hoffman's log K p with p in
	// atmospheres. Another pressure unit shifts every point alike and
	// changes neither the fit's R² nor its residuals.
	LogKP float64
	// Uncertainty is the bound of the error of LogKP that the report's
	// rounding can cause, decades.
	Uncertainty float64
	// Residual is LogKP minus the fitted line, decades; Studentized the
	// externally studentized residual (the residual over the scatter of the
	// other points about their own line), 0 with fewer than four points.
	Residual, Studentized float64
	Outlier               bool
}

// HoffmanFit is the Hoffman plot of one step: log10(K p) against F, and its
// least-squares line.
type HoffmanFit struct {
	Points []HoffmanPoint
	// Excluded lists the components left out, and Why says why, in the
	// same order.
	Excluded []int
	Why      []HoffmanExclusion
	// Fitted is false with fewer than three points or a single F; the line
	// is then zero.
	Fitted           bool
	Slope, Intercept float64
	// R2 is the coefficient of determination, 1 − SSR/SST; 1 when the
	// points lie exactly on a line (SST = 0 included).
	R2 float64
	// ResidualSE is sqrt(SSR/(n − 2)), decades.
	ResidualSE float64
}

// TrendCheck compares a step's back-calculated value with the trend of the
// other steps: the most favourable of the straight lines in pressure through
// two of the nearest steps on either side (up to three each side). Steps
// that fall off the trend are taken out of it one by one, the worst first,
// and the others judged against those that remain.
type TrendCheck struct {
	Value, Predicted float64
	// Deviation is ln(Value/Predicted), about the relative deviation when
	// small, and alike for a value too high or too low.
	Deviation float64
	// Bound is the rounding uncertainty of Deviation: the step's and its
	// neighbours', combined.
	Bound    float64
	OffTrend bool // taken out of the trend
}

// TwoPhaseZCheck compares a step's reported two-phase Z with the one its
// produced moles imply through the cell-volume identity
// Z2 = (p/p_d) Z_d/(1 − n_p) (TwoPhaseZ).
type TwoPhaseZCheck struct {
	Reported, Implied float64
	Deviation         float64 // Reported/Implied − 1
	Bound             float64 // the part of |Deviation| the rounding can cause
}

// StepCheck is the check of one pressure step below the saturation pressure.
type StepCheck struct {
	Point   int     // index in LabCVD.Points
	P       float64 // Pa
	Verdict Verdict
	// Findings are the step's findings, in the order they were made.
	Findings []Finding
	// Balance is the Whitson–Torp material balance at the step, in the
	// report's component space (CheckResult.Components); nil when the step
	// could not be balanced.
	Balance *BackCalcStage
	// XBound bounds the error of each normalised liquid mole fraction
	// Balance.X that the report's rounding can cause (a linearised
	// worst case); nil with Balance or with no liquid.
	XBound []float64
	// Hoffman is the step's Hoffman plot; nil without a liquid composition.
	Hoffman *HoffmanFit
	// Density compares the back-calculated liquid density with the other
	// steps'; nil when fewer than three steps have one.
	Density *TrendCheck
	// TwoPhaseZ is nil when the report gives no z_two_phase or no produced
	// moles at the step.
	TwoPhaseZ *TwoPhaseZCheck
}

// ClosureGroup is one group of components compared at the final liquid: the
// smallest sets of model components that are unions both of the gas
// components and of the reported liquid components.
type ClosureGroup struct {
	Name       string  // the liquid component's name, or the names joined by "+"
	Balance    float64 // back-calculated mole fraction
	Measured   float64 // reported mole fraction
	Difference float64 // Balance − Measured
	Bound      float64 // the part of |Difference| the rounding can cause
}

// Closure is the last step's back-calculated liquid against the measured
// final liquid.
type Closure struct {
	Groups []ClosureGroup
	// AAD is the mean of |Difference| over the groups, and MaxAbs the
	// largest, mole fractions (×100 for mol %).
	AAD, MaxAbs float64
	// NotReported names the groups of the gas components the reported
	// liquid does not cover, left out of the comparison.
	NotReported []string
}

// CheckResult is the quality check of a CVD report.
type CheckResult struct {
	T    float64 // K
	DewP float64 // the saturation pressure, Pa
	// DewZ is the Z-factor at the saturation pressure the balance used,
	// DewZSource where it came from, CellVolume the cell volume per mole
	// charged, Z_d R T/p_d, m³/mol.
	DewZ       float64
	DewZSource DewZSource
	CellVolume float64
	// SaturationPoint is the index in LabCVD.Points of the row at the
	// saturation pressure, −1 when the report has none.
	SaturationPoint int
	Components      []CheckComponent
	Steps           []StepCheck
	// Closure is nil when the report gives no final liquid composition or
	// the last step could not be balanced.
	Closure *Closure
	// Findings are those about the whole report (Step −1).
	Findings []Finding
	// Verdict is the worst of the steps' verdicts and of Findings.
	Verdict Verdict
	// Options are the options used, defaults filled in.
	Options CheckOptions
}

// AllFindings returns the whole-report findings, then each step's in order.
func (r *CheckResult) AllFindings() []Finding {
	all := append([]Finding(nil), r.Findings...)
	for _, s := range r.Steps {
		all = append(all, s.Findings...)
	}
	return all
}

// pSC is the reference pressure of Hoffman's b: one standard atmosphere.
const pSC = phys.PaPerAtm

// atPressure is how close, relative, two reported pressures must be to be the
// same pressure (a report's saturation row and its saturation pressure).
const atPressure = 1e-6

// HoffmanFactor returns the characterization factor of Hoffman, Crump and
// Hocott (1953) at temperature t (K) of a component of normal boiling point
// tb (K), critical temperature tc (K) and critical pressure pc (Pa):
//
//	b = log10(pc/p_sc)/(1/tb − 1/tc),   F = b (1/tb − 1/t),
//
// with p_sc = 1 atm = 101325 Pa. b (in K) is the slope of the straight line
// of log10 p_sat against 1/T through the normal boiling point and the
// critical point, so that F = log10(p_sat(t)/p_sc) along that line, and at
// low pressure, where K = p_sat/p, log10(K p/p_sc) = F: the line of slope 1
// through the origin. ok is false, and f and b zero, unless 0 < tb < tc,
// pc > 0 and t > 0, all finite.
func HoffmanFactor(tb, tc, pc, t float64) (f, b float64, ok bool) {
	fin := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	if !fin(tb) || !fin(tc) || !fin(pc) || !fin(t) || tb >= tc {
		return 0, 0, false
	}
	b = math.Log10(pc/pSC) / (1/tb - 1/tc)
	return b * (1/tb - 1/t), b, true
}

// lineFit is an ordinary least-squares straight line.
type lineFit struct {
	n                       int
	slope, intercept        float64
	r2, se                  float64
	resid, studentized, lev []float64
	ok                      bool
}

// fitLine fits y = a + b x by least squares and returns the residuals, the
// leverages and, with four points or more, the externally studentized
// residuals e_i/(s_(i) sqrt(1 − h_i)), s_(i)² = (SSR − e_i²/(1 − h_i))/(n − 3)
// (the scatter without point i; floored at 1e-9 so that a point off an
// otherwise exact line gives a large finite value).
func fitLine(x, y []float64) lineFit {
	n := len(x)
	f := lineFit{n: n}
	if n < 3 {
		return f
	}
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(n)
	my /= float64(n)
	var sxx, sxy, syy float64
	for i := range x {
		dx, dy := x[i]-mx, y[i]-my
		sxx += dx * dx
		sxy += dx * dy
		syy += dy * dy
	}
	if !(sxx > 0) {
		return f
	}
	f.ok = true
	f.slope = sxy / sxx
	f.intercept = my - f.slope*mx
	f.resid = make([]float64, n)
	f.lev = make([]float64, n)
	f.studentized = make([]float64, n)
	ssr := 0.0
	for i := range x {
		e := y[i] - (f.intercept + f.slope*x[i])
		f.resid[i] = e
		f.lev[i] = 1/float64(n) + (x[i]-mx)*(x[i]-mx)/sxx
		ssr += e * e
	}
	f.r2 = 1
	if syy > 0 {
		f.r2 = math.Max(0, 1-ssr/syy)
	}
	f.se = math.Sqrt(ssr / float64(n-2))
	if n >= 4 {
		for i, e := range f.resid {
			q := 1 - f.lev[i]
			if !(q > 0) {
				continue
			}
			s2 := (ssr - e*e/q) / float64(n-3)
			s := math.Max(math.Sqrt(math.Max(s2, 0)), 1e-9)
			f.studentized[i] = e / (s * math.Sqrt(q))
		}
	}
	return f
}

// withDefaults returns the options with zero fields set to their defaults,
// or an error naming a negative or non-finite field.
func (o *CheckOptions) withDefaults() (CheckOptions, error) {
	var c CheckOptions
	if o != nil {
		c = *o
	}
	fields := []struct {
		name string
		v    *float64
		def  float64
	}{
		{"DewZ", &c.DewZ, 0},
		{"CompositionResolution", &c.CompositionResolution, DefaultResolution},
		{"DropoutResolution", &c.DropoutResolution, DefaultResolution},
		{"ProducedResolution", &c.ProducedResolution, DefaultResolution},
		{"ZResolution", &c.ZResolution, DefaultResolution},
		{"HoffmanR2", &c.HoffmanR2, DefaultHoffmanR2},
		{"HoffmanResidual", &c.HoffmanResidual, DefaultHoffmanResidual},
		{"HoffmanStudentized", &c.HoffmanStudentized, DefaultHoffmanStudentized},
		{"TrendSuspect", &c.TrendSuspect, DefaultTrendSuspect},
		{"TrendInconsistent", &c.TrendInconsistent, DefaultTrendInconsistent},
		{"TwoPhaseZSuspect", &c.TwoPhaseZSuspect, DefaultTwoPhaseZSuspect},
		{"TwoPhaseZInconsistent", &c.TwoPhaseZInconsistent, DefaultTwoPhaseZInconsistent},
		{"ClosureSuspect", &c.ClosureSuspect, DefaultClosureSuspect},
		{"ClosureInconsistent", &c.ClosureInconsistent, DefaultClosureInconsistent},
		{"FeedTolerance", &c.FeedTolerance, DefaultFeedTolerance},
	}
	for _, f := range fields {
		if math.IsNaN(*f.v) || math.IsInf(*f.v, 0) || *f.v < 0 {
			return c, fmt.Errorf("%w: CheckOptions.%s = %g, want a finite value >= 0 (0 for the default)", ErrBadOptions, f.name, *f.v)
		}
		if *f.v == 0 {
			*f.v = f.def
		}
	}
	if c.HoffmanR2 > 1 {
		return c, fmt.Errorf("%w: CheckOptions.HoffmanR2 = %g, want at most 1", ErrBadOptions, c.HoffmanR2)
	}
	if c.TrendInconsistent < c.TrendSuspect || c.TwoPhaseZInconsistent < c.TwoPhaseZSuspect || c.ClosureInconsistent < c.ClosureSuspect {
		return c, fmt.Errorf("%w: CheckOptions: an inconsistent threshold below its suspect threshold", ErrBadOptions)
	}
	return c, nil
}

// stepData is what a step of the report gives, with what it lacks.
type stepData struct {
	point                  int
	p, dropout, produced   float64
	zGas, zTwo             float64
	y                      []float64 // nil when not given in full
	hasDropout, hasProd    bool
	hasZGas, hasZTwo, hasY bool
}

// Check evaluates the constant-volume depletion of a laboratory report for
// consistency, before a model is tuned to it. comps are the model's
// components and z its feed (the fluid charged to the cell), in the model's
// order; the report's components (LabCVD.Gas) are groups of them, and the
// check works in the report's component space: the feed lumped by
// LabComponent.Index, with the group properties of CheckComponent.
//
// # Rounding
//
// A report prints its values to a resolution (CheckOptions), and data
// consistent to that rounding must pass. Each printed value is taken to err
// uniformly within half its resolution h, independently of the others
// (standard uncertainty h/√3); the errors are propagated to first order
// through the balance (balanceBounds), and a quantity's rounding
// uncertainty is three of its standard deviations. Every finding needs a
// departure beyond that uncertainty, and the rules of thumb below are
// margins on top of it.
//
// # Per step
//
// Per step below the saturation pressure (a first row at the saturation
// pressure is the saturation row, not a step):
//
//   - the Whitson–Torp material balance (BackCalculate), with its liquid
//     composition and K-values: a negative liquid mole fraction, more of a
//     component produced than was charged, no liquid left, or a liquid less
//     dense than the gas in equilibrium with it (p M_g/(Z R T)) are
//     inconsistent (Whitson and Torp 1983, for the first); liquid moles at
//     a step with no dropout are suspect; a composition that does not sum
//     to 100 mol % within the rounding of its entries is suspect, beyond
//     1 mol % inconsistent and normalised before the balance;
//   - the Hoffman plot (Hoffman et al. 1953): log10(K p) against F for the
//     components with a K-value, a characterization factor and a K resolved
//     by the rounding (HoffmanFit lists the others), with its least-squares
//     line; suspect when R² < HoffmanR2, and a component suspect as an
//     outlier when its externally studentized residual exceeds
//     HoffmanStudentized and its residual exceeds HoffmanResidual plus its
//     rounding uncertainty. The plus fraction's F comes from its
//     mole-weighted Tc, Pc and Tb, an approximation;
//   - the back-calculated liquid density against the trend of the other
//     steps (TrendCheck): suspect beyond TrendSuspect, inconsistent beyond
//     TrendInconsistent. A wrong dropout, or a gas composition exchanged
//     with another step's, shows here first: the K-values of such a step
//     may still lie on a straight Hoffman line;
//   - the reported z_two_phase against (p/p_d) Z_d/(1 − n_p): suspect beyond
//     TwoPhaseZSuspect, inconsistent beyond TwoPhaseZInconsistent.
//
// At the last step, the back-calculated liquid against the measured final
// liquid (LabCVDPoint.Liquid of the last point, in the components of
// LabCVD.Liquid, compared on the smallest common groups): suspect beyond
// ClosureSuspect, inconsistent beyond ClosureInconsistent in any group. For
// the whole report: the composition at the saturation pressure against the
// feed (suspect beyond FeedTolerance), and dropout or production reported
// at the saturation pressure (suspect).
//
// What the data cannot resolve is not found: in a lean gas the liquid is a
// small difference of large numbers, and at 0.01 mol % most K-values are
// unresolved and the liquid density uncertain by some 10 %; near the
// critical temperature, and late in a depletion where the gas changes
// little from step to step, an exchange of two steps' compositions can
// move the liquid by less than the trend's curvature.
//
// # Z at the saturation pressure
//
// Z_d, which fixes the cell volume, is taken from the report when it gives
// it: z_gas, else z_two_phase, of the saturation row, else the CCE's Z at the
// saturation pressure; else it is derived from the steps' z_two_phase (the
// median of Z2_k (1 − n_p,k) p_d/p_k: the two-phase Z check then tests the
// steps against each other, and one wrong step stands out rather than
// shifting all); else CheckOptions.DewZ. Without any, the balance cannot be
// done: an error.
//
// # Missing data
//
// Missing data (Missing values, a nil or partly missing gas composition) are
// not inconsistent: a step lacking its dropout or z_gas is not balanced, and
// one lacking its produced moles or gas composition is not, nor is any
// step after it (the balance of every later step needs what was removed
// at each earlier one); such steps get a MissingData finding and at least
// VerdictNotChecked. The two-phase Z check needs only the step's own
// produced moles and z_two_phase. The overall verdict is VerdictOK only when
// every step was checked in full.
//
// # Errors
//
// A *ReportError (errors.Is ErrBadReport) names the field of a report that
// cannot be evaluated: no temperature, no saturation pressure, no CVD, no
// gas components or no step with a complete composition; gas components
// that leave model components out (the balance needs every component; the
// error names them), that repeat one or name one that does not exist;
// pressures above the saturation pressure or not falling; values out of
// range (negative mole fractions, dropout or produced moles outside [0, 1),
// produced moles that fall, Z-factors outside 0.01 to 10); a final liquid
// composition on a point other than the last; no Z at the saturation
// pressure. Components or a feed that do not match (lengths, a non-positive
// molar mass, Tc or Pc, a feed not summing to 1) and invalid options
// (ErrBadOptions) are errors too. The result is nil with an error.
func Check(lab LabReport, comps []eos.Component, z []float64, o *CheckOptions) (*CheckResult, error) {
	opt, err := o.withDefaults()
	if err != nil {
		return nil, err
	}
	if err := checkModel(comps, z); err != nil {
		return nil, err
	}
	bad := func(field, format string, args ...any) error {
		return &ReportError{Field: field, Msg: fmt.Sprintf(format, args...)}
	}
	pos := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	switch {
	case !pos(lab.T):
		return nil, bad("T", "= %g, want the temperature of the experiments > 0 K", lab.T)
	case !pos(lab.SaturationP):
		return nil, bad("SaturationP", "= %g, want the measured saturation pressure > 0 Pa: the depletion starts there", lab.SaturationP)
	case lab.CVD == nil:
		return nil, bad("CVD", "is missing: the report has no constant-volume depletion to check")
	}
	cv := lab.CVD
	if len(cv.Gas) == 0 {
		return nil, bad("CVD.Gas", "is empty: the report gives no produced-gas compositions, which the material balance needs")
	}
	if err := checkGroups("CVD.Gas", cv.Gas, len(comps), true, comps); err != nil {
		return nil, err
	}
	if cv.Liquid != nil {
		if err := checkGroups("CVD.Liquid", cv.Liquid, len(comps), false, comps); err != nil {
			return nil, err
		}
	}
	res := &CheckResult{T: lab.T, DewP: lab.SaturationP, SaturationPoint: -1, Options: opt}
	res.Components = lumpComponents(cv.Gas, comps, z, lab.T)
	nc := len(res.Components)

	steps, err := readSteps(lab, nc)
	if err != nil {
		return nil, err
	}
	if len(cv.Points) > 0 && cv.Points[0].P >= lab.SaturationP*(1-atPressure) {
		res.SaturationPoint = 0
	}
	anyY := false
	for _, s := range steps {
		anyY = anyY || s.hasY
	}
	if !anyY {
		return nil, bad("CVD.Points", "give no complete gas composition below the saturation pressure: nothing to balance")
	}
	h := halfRes{y: opt.CompositionResolution / 2, s: opt.DropoutResolution / 2, p: opt.ProducedResolution / 2, z: opt.ZResolution / 2}

	// Z at the saturation pressure.
	if err := res.dewZ(lab, steps, opt); err != nil {
		return nil, err
	}
	res.CellVolume = res.DewZ * eos.R * lab.T / lab.SaturationP

	res.Steps = make([]StepCheck, len(steps))
	for k, s := range steps {
		res.Steps[k] = StepCheck{Point: s.point, P: s.p}
	}
	add := func(f Finding) {
		if f.Step < 0 {
			res.Findings = append(res.Findings, f)
			return
		}
		res.Steps[f.Step].Findings = append(res.Steps[f.Step].Findings, f)
	}
	names := make([]string, nc)
	for i, c := range res.Components {
		names[i] = c.Name
	}

	// Composition sums, and the saturation row.
	sumLimit := float64(nc)*h.y + 1e-12
	for k := range steps {
		s := &steps[k]
		if !s.hasY {
			continue
		}
		if f, ok := sumFinding(s.y, sumLimit, "gas composition"); ok {
			f.Step, f.Point = k, s.point
			add(f)
			if f.Verdict == VerdictInconsistent {
				sum := 0.0
				for _, v := range s.y {
					sum += v
				}
				for i := range s.y {
					s.y[i] /= sum
				}
			}
		}
	}
	if res.SaturationPoint == 0 {
		res.checkSaturationRow(cv.Points[0], h, sumLimit, opt, add)
	}

	// The balance: the steps before the first one lacking its produced
	// moles or gas composition.
	prefix := len(steps)
	for k, s := range steps {
		if !s.hasProd || !s.hasY {
			prefix = k
			break
		}
	}
	for k, s := range steps {
		var what []string
		switch {
		case k > prefix:
			what = append(what, fmt.Sprintf("the step at point %d lacks the %s that the balance of every later step needs",
				steps[prefix].point, missingChain(steps[prefix])))
		default:
			if !s.hasProd {
				what = append(what, "produced moles")
			}
			if !s.hasY {
				what = append(what, "gas composition")
			}
			if !s.hasDropout {
				what = append(what, "dropout")
			}
			if !s.hasZGas {
				what = append(what, "z_gas")
			}
		}
		if len(what) > 0 {
			msg := "material balance not checked: " + strings.Join(what, ", ") + " missing"
			if k > prefix {
				msg = "material balance not checked: " + what[0]
			}
			add(Finding{Kind: MissingData, Verdict: VerdictNotChecked, Step: k, Point: s.point, Message: msg})
		}
	}
	var bc *BackCalc
	var rep CVDReport
	molar := make([]float64, nc)
	for i, c := range res.Components {
		molar[i] = c.M
	}
	if prefix > 0 {
		rep = CVDReport{T: lab.T, DewP: lab.SaturationP, DewZ: res.DewZ, Z: componentZ(res.Components)}
		for _, s := range steps[:prefix] {
			st := CVDStage{P: s.p, Produced: s.produced, ZGas: s.zGas, Dropout: s.dropout, Y: s.y}
			// A step without dropout or z_gas still removes its gas from
			// the cell; its own n_g and x are not used, so placeholders
			// keep the later steps' balance exact.
			if !s.hasZGas {
				st.ZGas = 1
			}
			if !s.hasDropout {
				st.Dropout = 0
			}
			rep.Stages = append(rep.Stages, st)
		}
		if bc, err = BackCalculate(rep, molar); err != nil {
			return nil, fmt.Errorf("the material balance of the report: %w", err)
		}
	}

	// Per balanced step: the flags, the bounds, the Hoffman plot.
	var trendK []int
	for k := 0; k < prefix; k++ {
		s := steps[k]
		if !s.hasDropout || !s.hasZGas {
			continue
		}
		b := bc.Stages[k]
		sc := &res.Steps[k]
		sc.Balance = &b
		bd := balanceBounds(rep, bc, molar, k, res.DewZ, h)
		for _, i := range b.NegativeCell {
			cell := b.Cell[i] * b.Remaining
			if cell < -bd.cell[i] {
				add(Finding{Kind: NegativeCell, Verdict: VerdictInconsistent, Step: k, Point: s.point, Component: names[i],
					Value: cell, Limit: -bd.cell[i],
					Message: fmt.Sprintf("more %s produced than charged: %.3g mol %% of the moles charged left in the cell, beyond the %.2g mol %% the rounding allows", names[i], 100*cell, -100*bd.cell[i])})
			}
		}
		if b.NoLiquid {
			v := VerdictSuspect
			if b.LiquidMoles < -bd.nL {
				v = VerdictInconsistent
			}
			add(Finding{Kind: NoLiquid, Verdict: v, Step: k, Point: s.point, Value: b.LiquidMoles, Limit: -bd.nL,
				Message: fmt.Sprintf("no liquid in the cell: the gas accounts for all the moles left and %.3g %% of the moles charged more (rounding allows %.2g %%)", -100*b.LiquidMoles, 100*bd.nL)})
			continue
		}
		if s.dropout == 0 && b.LiquidMoles > bd.nL {
			add(Finding{Kind: LiquidWithoutVolume, Verdict: VerdictSuspect, Step: k, Point: s.point, Value: b.LiquidMoles, Limit: bd.nL,
				Message: fmt.Sprintf("%.3g %% of the moles charged are liquid, but the dropout is zero", 100*b.LiquidMoles)})
		}
		sc.XBound = bd.x
		for _, i := range b.NegativeX {
			if b.X[i] < -bd.x[i] {
				add(Finding{Kind: NegativeLiquid, Verdict: VerdictInconsistent, Step: k, Point: s.point, Component: names[i],
					Value: b.X[i], Limit: -bd.x[i],
					Message: fmt.Sprintf("negative liquid mole fraction of %s: %.3g mol %%, beyond the %.2g mol %% the rounding allows", names[i], 100*b.X[i], -100*bd.x[i])})
			}
		}
		sc.Hoffman = res.hoffman(b, s.y, bd.x, h, opt)
		if hf := sc.Hoffman; hf.Fitted {
			if hf.R2 < opt.HoffmanR2 {
				add(Finding{Kind: HoffmanScatter, Verdict: VerdictSuspect, Step: k, Point: s.point, Value: hf.R2, Limit: opt.HoffmanR2,
					Message: fmt.Sprintf("Hoffman plot not straight: R² = %.4f, below %.4g", hf.R2, opt.HoffmanR2)})
			}
			for _, pt := range hf.Points {
				if pt.Outlier {
					add(Finding{Kind: HoffmanOutlier, Verdict: VerdictSuspect, Step: k, Point: s.point, Component: names[pt.Component],
						Value: pt.Residual, Limit: opt.HoffmanResidual + pt.Uncertainty,
						Message: fmt.Sprintf("%s off the Hoffman line by %.3g decades of K p (studentized residual %.3g), beyond %.2g", names[pt.Component], pt.Residual, pt.Studentized, opt.HoffmanResidual+pt.Uncertainty)})
				}
			}
		}
		if s.dropout > 0 && bd.rhoG > 0 {
			if r, lim := b.LiquidDensity/bd.rhoG, math.Exp(-math.Hypot(bd.rho, bd.gas)); r < lim {
				add(Finding{Kind: LiquidLighterThanGas, Verdict: VerdictInconsistent, Step: k, Point: s.point,
					Value: r, Limit: lim,
					Message: fmt.Sprintf("back-calculated liquid density %.4g kg/m³, below that of the gas in the cell, %.4g kg/m³", b.LiquidDensity, bd.rhoG)})
			}
		}
		if b.LiquidDensity > 0 && b.LiquidM > 0 {
			trendK = append(trendK, k)
			sc.Density = &TrendCheck{Value: b.LiquidDensity, Bound: bd.rho}
		}
	}
	res.trends(trendK, opt, add)

	// Two-phase Z.
	for k, s := range steps {
		if !s.hasZTwo || !s.hasProd {
			continue
		}
		implied := TwoPhaseZ(lab.SaturationP, res.DewZ, s.p, s.produced)
		c := &TwoPhaseZCheck{Reported: s.zTwo, Implied: implied, Deviation: s.zTwo/implied - 1,
			Bound: math.Sqrt(3) * math.Hypot(math.Hypot(h.z/s.zTwo, h.z/res.DewZ), h.p/(1-s.produced))} // 3 sqrt(Σ (h/·)²/3)
		res.Steps[k].TwoPhaseZ = c
		ex := math.Abs(c.Deviation) - c.Bound
		if ex > opt.TwoPhaseZSuspect {
			v, lim := VerdictSuspect, opt.TwoPhaseZSuspect
			if ex > opt.TwoPhaseZInconsistent {
				v, lim = VerdictInconsistent, opt.TwoPhaseZInconsistent
			}
			add(Finding{Kind: TwoPhaseZMismatch, Verdict: v, Step: k, Point: s.point, Value: c.Deviation, Limit: lim + c.Bound,
				Message: fmt.Sprintf("z_two_phase %.4f, but the produced moles imply %.4f: %+.2f %%, beyond %.2g %%", c.Reported, c.Implied, 100*c.Deviation, 100*(lim+c.Bound))})
		}
	}

	// The final liquid.
	if last := len(cv.Points) - 1; cv.Liquid != nil && cv.Points[last].Liquid != nil {
		k := len(steps) - 1
		sc := &res.Steps[k]
		switch {
		case sc.Balance == nil || sc.Balance.X == nil:
			add(Finding{Kind: MissingData, Verdict: VerdictNotChecked, Step: k, Point: last,
				Message: "final liquid closure not checked: the last step has no back-calculated liquid"})
		default:
			res.closure(cv, k, names, h, sumLimit, opt, add)
		}
	}

	for k := range res.Steps {
		for _, f := range res.Steps[k].Findings {
			res.Steps[k].Verdict = max(res.Steps[k].Verdict, f.Verdict)
		}
		res.Verdict = max(res.Verdict, res.Steps[k].Verdict)
	}
	for _, f := range res.Findings {
		res.Verdict = max(res.Verdict, f.Verdict)
	}
	return res, nil
}

// missingChain says what a step lacks that breaks the balance of later steps.
func missingChain(s stepData) string {
	switch {
	case !s.hasProd && !s.hasY:
		return "produced moles and gas composition"
	case !s.hasProd:
		return "produced moles"
	}
	return "gas composition"
}

// halfRes holds half the report's resolutions: the largest rounding errors.
type halfRes struct{ y, s, p, z float64 }

// checkModel validates the model's components and feed.
func checkModel(comps []eos.Component, z []float64) error {
	if len(comps) == 0 {
		return fmt.Errorf("cvd.Check: no model components")
	}
	if len(z) != len(comps) {
		return fmt.Errorf("cvd.Check: %d feed mole fractions for %d model components", len(z), len(comps))
	}
	pos := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	for i, c := range comps {
		if !pos(c.M) || !pos(c.Tc) || !pos(c.Pc) {
			return fmt.Errorf("cvd.Check: model component %d (%s) has M %g kg/mol, Tc %g K, Pc %g Pa; want all > 0", i, c.Name, c.M, c.Tc, c.Pc)
		}
		if math.IsNaN(c.Tb) || math.IsInf(c.Tb, 0) || c.Tb < 0 {
			return fmt.Errorf("cvd.Check: model component %d (%s) has Tb %g K, want >= 0 (0 for unknown)", i, c.Name, c.Tb)
		}
	}
	if err := checkComposition("feed", z); err != nil {
		return fmt.Errorf("cvd.Check: %w", err)
	}
	return nil
}

// checkGroups validates a list of report components: every index names a
// model component, none twice; with all, every model component is covered.
func checkGroups(field string, gs []LabComponent, n int, all bool, comps []eos.Component) error {
	owner := make([]int, n)
	for i := range owner {
		owner[i] = -1
	}
	for g, lc := range gs {
		f := fmt.Sprintf("%s[%d]", field, g)
		if len(lc.Index) == 0 {
			return &ReportError{Field: f + ".Index", Msg: fmt.Sprintf("is empty: %q stands for no model component", lc.Name)}
		}
		for _, i := range lc.Index {
			if i < 0 || i >= n {
				return &ReportError{Field: f + ".Index", Msg: fmt.Sprintf("names model component %d, want 0 to %d", i, n-1)}
			}
			if owner[i] >= 0 {
				return &ReportError{Field: f + ".Index", Msg: fmt.Sprintf("names model component %s, already in %q", comps[i].Name, gs[owner[i]].Name)}
			}
			owner[i] = g
		}
	}
	if all {
		var miss []string
		for i, g := range owner {
			if g < 0 {
				miss = append(miss, comps[i].Name)
			}
		}
		if len(miss) > 0 {
			return &ReportError{Field: field, Msg: fmt.Sprintf("leaves out the model components %s: the material balance needs every component; add them to a reported component (a plus fraction's group, say)", strings.Join(miss, ", "))}
		}
	}
	return nil
}

// lumpComponents builds the report's components from the model's.
func lumpComponents(gs []LabComponent, comps []eos.Component, z []float64, t float64) []CheckComponent {
	out := make([]CheckComponent, len(gs))
	for g, lc := range gs {
		c := CheckComponent{Name: lc.Name, Index: append([]int(nil), lc.Index...)}
		for _, i := range lc.Index {
			c.Z += z[i]
		}
		tbKnown := true
		for _, i := range lc.Index {
			w := 1 / float64(len(lc.Index)) // a group absent from the feed: plain means
			if c.Z > 0 {
				w = z[i] / c.Z
			}
			m := comps[i]
			c.M += w * m.M
			c.Tc += w * m.Tc
			c.Pc += w * m.Pc
			c.Tb += w * m.Tb
			tbKnown = tbKnown && m.Tb > 0
		}
		if !tbKnown {
			c.Tb = 0
		}
		c.F, c.B, c.HasF = HoffmanFactor(c.Tb, c.Tc, c.Pc, t)
		out[g] = c
	}
	return out
}

func componentZ(cs []CheckComponent) []float64 {
	z := make([]float64, len(cs))
	for i, c := range cs {
		z[i] = c.Z
	}
	return z
}

// minZ and maxZ bound the Z-factors Check accepts: far wider than any
// reservoir fluid's (about 0.2 to 2.5), to catch values typed in another
// unit or scale, not to judge them (common practice, no published source).
const (
	minZ = 0.01
	maxZ = 10.0
)

func zRange(z float64) bool { return z >= minZ && z <= maxZ }

// readSteps validates the points of the report and returns those below the
// saturation pressure.
func readSteps(lab LabReport, nc int) ([]stepData, error) {
	cv := lab.CVD
	if len(cv.Points) == 0 {
		return nil, &ReportError{Field: "CVD.Points", Msg: "is empty: the depletion has no pressure steps"}
	}
	var steps []stepData
	pPrev, npPrev := math.Inf(1), 0.0
	finite := func(v float64) bool { return !math.IsInf(v, 0) }
	for k, pt := range cv.Points {
		f := func(name string) string { return fmt.Sprintf("CVD.Points[%d].%s", k, name) }
		bad := func(name, format string, args ...any) error {
			return &ReportError{Field: f(name), Msg: fmt.Sprintf(format, args...)}
		}
		switch {
		case !(pt.P > 0) || !finite(pt.P):
			return nil, bad("P", "= %g, want > 0 Pa", pt.P)
		case pt.P > lab.SaturationP*(1+atPressure):
			return nil, bad("P", "= %.6g Pa, above the saturation pressure %.6g Pa: a CVD starts at the saturation pressure", pt.P, lab.SaturationP)
		case k > 0 && pt.P >= pPrev:
			return nil, bad("P", "= %.6g Pa, want below the previous point's %.6g Pa", pt.P, pPrev)
		case !IsMissing(pt.Dropout) && (!finite(pt.Dropout) || pt.Dropout < 0 || pt.Dropout >= 1):
			return nil, bad("Dropout", "= %g, want a fraction of the cell volume, 0 to 1", pt.Dropout)
		case !IsMissing(pt.Produced) && (!finite(pt.Produced) || pt.Produced < 0 || pt.Produced >= 1):
			return nil, bad("Produced", "= %g, want a fraction of the moles charged, 0 to 1", pt.Produced)
		case !IsMissing(pt.ZGas) && !zRange(pt.ZGas):
			return nil, bad("ZGas", "= %g, want a Z-factor from %g to %g", pt.ZGas, minZ, maxZ)
		case !IsMissing(pt.ZTwoPhase) && !zRange(pt.ZTwoPhase):
			return nil, bad("ZTwoPhase", "= %g, want a Z-factor from %g to %g", pt.ZTwoPhase, minZ, maxZ)
		case pt.Gas != nil && len(pt.Gas) != nc:
			return nil, bad("Gas", "has %d entries for the %d components of CVD.Gas", len(pt.Gas), nc)
		case pt.Liquid != nil && k != len(cv.Points)-1:
			return nil, bad("Liquid", "is given, but the final liquid composition belongs on the last point")
		case pt.Liquid != nil && len(pt.Liquid) != len(cv.Liquid):
			return nil, bad("Liquid", "has %d entries for the %d components of CVD.Liquid", len(pt.Liquid), len(cv.Liquid))
		}
		if !IsMissing(pt.Produced) {
			if pt.Produced < npPrev {
				return nil, bad("Produced", "= %g, less than the %g of a point before: cumulative production cannot fall", pt.Produced, npPrev)
			}
			npPrev = pt.Produced
		}
		complete := pt.Gas != nil
		for i, v := range pt.Gas {
			if IsMissing(v) {
				complete = false
				continue
			}
			if v < 0 || !finite(v) {
				return nil, &ReportError{Field: fmt.Sprintf("%s[%d]", f("Gas"), i), Msg: fmt.Sprintf("= %g, want a mole fraction >= 0", v)}
			}
		}
		for i, v := range pt.Liquid {
			if !IsMissing(v) && (v < 0 || !finite(v)) {
				return nil, &ReportError{Field: fmt.Sprintf("%s[%d]", f("Liquid"), i), Msg: fmt.Sprintf("= %g, want a mole fraction >= 0", v)}
			}
		}
		pPrev = pt.P
		if k == 0 && pt.P >= lab.SaturationP*(1-atPressure) {
			continue // the saturation row
		}
		s := stepData{point: k, p: pt.P, dropout: pt.Dropout, produced: pt.Produced, zGas: pt.ZGas, zTwo: pt.ZTwoPhase,
			hasDropout: !IsMissing(pt.Dropout), hasProd: !IsMissing(pt.Produced),
			hasZGas: !IsMissing(pt.ZGas), hasZTwo: !IsMissing(pt.ZTwoPhase), hasY: complete}
		if complete {
			s.y = append([]float64(nil), pt.Gas...)
		}
		steps = append(steps, s)
	}
	if len(steps) == 0 {
		return nil, &ReportError{Field: "CVD.Points", Msg: "have no pressure below the saturation pressure"}
	}
	return steps, nil
}

// dewZ sets res.DewZ and its source.
func (res *CheckResult) dewZ(lab LabReport, steps []stepData, opt CheckOptions) error {
	if res.SaturationPoint == 0 {
		pt := lab.CVD.Points[0]
		switch {
		case !IsMissing(pt.ZGas):
			res.DewZ, res.DewZSource = pt.ZGas, DewZSaturationRow
			return nil
		case !IsMissing(pt.ZTwoPhase):
			res.DewZ, res.DewZSource = pt.ZTwoPhase, DewZSaturationTwoPhase
			return nil
		}
	}
	if lab.CCE != nil {
		for _, pt := range lab.CCE.Points {
			if math.Abs(pt.P-lab.SaturationP) <= atPressure*lab.SaturationP && zRange(pt.Z) {
				res.DewZ, res.DewZSource = pt.Z, DewZExpansion
				return nil
			}
		}
	}
	var zd []float64
	for _, s := range steps {
		if s.hasZTwo && s.hasProd {
			zd = append(zd, s.zTwo*(1-s.produced)*lab.SaturationP/s.p)
		}
	}
	if len(zd) > 0 {
		sort.Float64s(zd)
		m := len(zd) / 2
		res.DewZ = zd[m]
		if len(zd)%2 == 0 {
			res.DewZ = (zd[m-1] + zd[m]) / 2
		}
		res.DewZSource = DewZFromTwoPhase
		return nil
	}
	if opt.DewZ > 0 {
		if !zRange(opt.DewZ) {
			return fmt.Errorf("%w: CheckOptions.DewZ = %g, want a Z-factor from %g to %g", ErrBadOptions, opt.DewZ, minZ, maxZ)
		}
		res.DewZ, res.DewZSource = opt.DewZ, DewZOptions
		return nil
	}
	return &ReportError{Field: "CVD", Msg: "gives no Z-factor at the saturation pressure (z_gas or z_two_phase of its row, a CCE Z there) and no z_two_phase of a step: the cell volume is unknown; give CheckOptions.DewZ"}
}

// sumFinding checks that a composition sums to 1 within limit (suspect), and
// within compositionTol (beyond it inconsistent).
func sumFinding(y []float64, limit float64, what string) (Finding, bool) {
	sum := 0.0
	for _, v := range y {
		sum += v
	}
	d := math.Abs(sum - 1)
	if d <= limit {
		return Finding{}, false
	}
	f := Finding{Kind: CompositionSum, Verdict: VerdictSuspect, Value: sum, Limit: limit,
		Message: fmt.Sprintf("%s sums to %.4g mol %%, more than the rounding allows (%.2g mol %%)", what, 100*sum, 100*limit)}
	if d > compositionTol {
		f.Verdict, f.Limit = VerdictInconsistent, compositionTol
		f.Message = fmt.Sprintf("%s sums to %.4g mol %%, more than %g mol %% from 100; normalised for the balance", what, 100*sum, 100*compositionTol)
	}
	return f, true
}

// checkSaturationRow compares the saturation row with the feed.
func (res *CheckResult) checkSaturationRow(pt LabCVDPoint, h halfRes, sumLimit float64, opt CheckOptions, add func(Finding)) {
	if !IsMissing(pt.Dropout) && pt.Dropout > h.s {
		add(Finding{Kind: SaturationRow, Verdict: VerdictSuspect, Step: -1, Point: 0, Value: pt.Dropout, Limit: h.s,
			Message: fmt.Sprintf("the row at the saturation pressure reports %.3g %% dropout, want none", 100*pt.Dropout)})
	}
	if !IsMissing(pt.Produced) && pt.Produced > h.p {
		add(Finding{Kind: SaturationRow, Verdict: VerdictSuspect, Step: -1, Point: 0, Value: pt.Produced, Limit: h.p,
			Message: fmt.Sprintf("the row at the saturation pressure reports %.3g %% produced, want none", 100*pt.Produced)})
	}
	if pt.Gas == nil {
		return
	}
	for _, v := range pt.Gas {
		if IsMissing(v) {
			return
		}
	}
	if f, ok := sumFinding(pt.Gas, sumLimit, "the composition at the saturation pressure"); ok {
		f.Step, f.Point = -1, 0
		add(f)
	}
	lim := opt.FeedTolerance + h.y
	for i, c := range res.Components {
		if d := pt.Gas[i] - c.Z; math.Abs(d) > lim {
			add(Finding{Kind: FeedMismatch, Verdict: VerdictSuspect, Step: -1, Point: 0, Component: c.Name, Value: d, Limit: lim,
				Message: fmt.Sprintf("%s at the saturation pressure is %.4g mol %%, the feed %.4g mol %%: the balance starts from the feed", c.Name, 100*pt.Gas[i], 100*c.Z)})
		}
	}
}

// bounds are the rounding uncertainties of the balance at one step: three
// standard deviations of the error the report's rounding causes.
type bounds struct {
	cell []float64 // of each component's moles in the cell, per mole charged
	x    []float64 // of each normalised liquid mole fraction
	nL   float64   // of the liquid moles
	rho  float64   // of ln ρ_L
	gas  float64   // of ln ρ_g, the density of the gas in the cell
	rhoG float64   // ρ_g = p M_g/(Z R T), kg/m³
}

// balanceBounds propagates the rounding of the report's values to the
// balance at stage k of r, to first order. Each printed value carries an
// error uniform within half its resolution h, of variance h²/3 (a
// rectangular distribution, as in the GUM, JCGM 100:2008 §4.3.7; from
// memory), independent of the others; a quantity's uncertainty is three
// times the square root of the sum of its squared sensitivities times those
// variances. With u_i = z_i,0 − Σ_j≤k Δn_j y_ij − n_g y_ik the liquid moles
// of component i, Δn_j = n_p,j − n_p,j−1, n_g = (p/p_d)(Z_d/Z_k)(1 − S_k),
// x_i = u_i/Σu and the liquid mass m_L = Σ u_i M_i:
//
//	∂u_i/∂y_mj = −c_j δ_im,  c_j = Δn_j (j < k), Δn_k + n_g (j = k)
//	∂u_i/∂n_p,j = −(y_ij − y_i,j+1)  (y_i,k+1 = 0)
//	∂u_i/∂n_g = −y_ik;  ∂n_g/∂Z_d = n_g/Z_d, ∂n_g/∂Z_k = −n_g/Z_k, ∂n_g/∂S_k = −n_g/(1 − S_k)
//	δx_i = (δu_i − x_i Σ_m δu_m)/Σu
//	ln ρ_L = ln m_L − ln S_k − ln V_d,  V_d ∝ Z_d
func balanceBounds(r CVDReport, bc *BackCalc, m []float64, k int, zd float64, h halfRes) bounds {
	st, b := r.Stages[k], bc.Stages[k]
	n := len(r.Z)
	// standard uncertainties of the printed values, h/√3; sums of squares
	// are taken as repeated hypotenuses, which cannot overflow
	sy, sp, sz, ss := h.y/math.Sqrt(3), h.p/math.Sqrt(3), h.z/math.Sqrt(3), h.s/math.Sqrt(3)
	ng := b.GasMoles
	gZd, gZk, gS := ng/zd, -ng/st.ZGas, -ng/(1-st.Dropout)
	sNg := math.Hypot(math.Hypot(sz*gZd, sz*gZk), ss*gS)
	c := make([]float64, k+1)
	var normC, normDn, prev float64
	for j := 0; j <= k; j++ {
		c[j] = r.Stages[j].Produced - prev
		prev = r.Stages[j].Produced
		normDn = math.Hypot(normDn, c[j])
	}
	c[k] += ng
	for _, cj := range c {
		normC = math.Hypot(normC, cj)
	}
	next := func(j, i int) float64 {
		if j < k {
			return r.Stages[j+1].Y[i]
		}
		return 0
	}
	bd := bounds{cell: make([]float64, n), nL: 3 * math.Hypot(sp, sNg)}
	sumY := make([]float64, k+2) // Σ_m y_mj, with the zero row k+1
	mg := make([]float64, k+2)   // M_g,j = Σ_m y_mj M_m
	var normM float64
	for i := range m {
		normM = math.Hypot(normM, m[i])
	}
	for j := 0; j <= k; j++ {
		for i, y := range r.Stages[j].Y {
			sumY[j] += y
			mg[j] += y * m[i]
		}
	}
	for i := range bd.cell {
		u := sy * normDn
		for j := 0; j <= k; j++ {
			u = math.Hypot(u, sp*(r.Stages[j].Y[i]-next(j, i)))
		}
		bd.cell[i] = 3 * u
	}
	bd.rhoG = st.P * mg[k] / (st.ZGas * eos.R * r.T)
	bd.gas = 3 * math.Hypot(sy*normM/mg[k], sz/st.ZGas)
	if b.X == nil {
		return bd
	}
	U := b.SumX * b.LiquidMoles
	bd.x = make([]float64, n)
	for i := range bd.x {
		x := b.X[i]
		u := sy * normC * math.Hypot(1-x, math.Sqrt(float64(n-1))*x)
		for j := 0; j <= k; j++ {
			u = math.Hypot(u, sp*(-(r.Stages[j].Y[i]-next(j, i))+x*(sumY[j]-sumY[j+1])))
		}
		u = math.Hypot(u, sNg*(-st.Y[i]+x*sumY[k]))
		bd.x[i] = 3 * u / math.Abs(U)
	}
	mL := b.LiquidM * b.LiquidMoles
	if st.Dropout > 0 && mL > 0 {
		u := sy * normC * normM / mL
		for j := 0; j <= k; j++ {
			u = math.Hypot(u, sp*(mg[j]-mg[j+1])/mL)
		}
		dZd := -mg[k]*gZd/mL - 1/zd
		dZk := -mg[k] * gZk / mL
		dS := -mg[k]*gS/mL - 1/st.Dropout
		u = math.Hypot(u, math.Hypot(math.Hypot(sz*dZd, sz*dZk), ss*dS))
		bd.rho = 3 * u
	}
	return bd
}

// hoffman builds the Hoffman plot of a balanced step with liquid.
func (res *CheckResult) hoffman(b BackCalcStage, y, dx []float64, h halfRes, opt CheckOptions) *HoffmanFit {
	hf := &HoffmanFit{}
	var fs, ls []float64
	for i, c := range res.Components {
		switch {
		case !(b.X[i] > 0) || !(y[i] > 0) || !(b.K[i] > 0):
			hf.Excluded, hf.Why = append(hf.Excluded, i), append(hf.Why, UndefinedK)
			continue
		case !c.HasF:
			hf.Excluded, hf.Why = append(hf.Excluded, i), append(hf.Why, NoFactor)
			continue
		}
		sx := dx[i] / 3 / b.X[i] // standard uncertainties, relative
		u := 3 * math.Sqrt(sx*sx+h.y*h.y/3/(y[i]*y[i])) / math.Ln10
		if dx[i] >= b.X[i] || u > opt.HoffmanResidual {
			hf.Excluded, hf.Why = append(hf.Excluded, i), append(hf.Why, Unresolved)
			continue
		}
		pt := HoffmanPoint{Component: i, F: c.F, LogKP: math.Log10(b.K[i] * b.P / pSC), Uncertainty: u}
		hf.Points = append(hf.Points, pt)
		fs, ls = append(fs, pt.F), append(ls, pt.LogKP)
	}
	lf := fitLine(fs, ls)
	if !lf.ok {
		return hf
	}
	hf.Fitted, hf.Slope, hf.Intercept, hf.R2, hf.ResidualSE = true, lf.slope, lf.intercept, lf.r2, lf.se
	for j := range hf.Points {
		pt := &hf.Points[j]
		pt.Residual, pt.Studentized = lf.resid[j], lf.studentized[j]
		pt.Outlier = math.Abs(pt.Studentized) > opt.HoffmanStudentized && math.Abs(pt.Residual) > opt.HoffmanResidual+pt.Uncertainty
	}
	return hf
}

// trends judges the liquid density of the steps ks against the trend of
// the others. The liquid molar mass is not judged so: it curves too much
// with pressure for a straight line through neighbouring steps (a few
// percent at the ends of a depletion generated by an equation of state),
// while the density, which a wrong composition or dropout shifts as much,
// stays within a fraction of a percent of it.
func (res *CheckResult) trends(ks []int, opt CheckOptions, add func(Finding)) {
	n := len(ks)
	p, v, b := make([]float64, n), make([]float64, n), make([]float64, n)
	for j, k := range ks {
		tc := res.Steps[k].Density
		p[j], v[j], b[j] = res.Steps[k].P, tc.Value, tc.Bound
	}
	out := trend(p, v, b, opt.TrendSuspect)
	for j, k := range ks {
		sc := &res.Steps[k]
		sc.Density = out[j]
		tc := out[j]
		if tc == nil || !tc.OffTrend {
			continue
		}
		ex := math.Abs(tc.Deviation) - tc.Bound
		vd, lim := VerdictSuspect, math.Log1p(opt.TrendSuspect)
		if ex > math.Log1p(opt.TrendInconsistent) {
			vd, lim = VerdictInconsistent, math.Log1p(opt.TrendInconsistent)
		}
		add(Finding{Kind: DensityTrend, Verdict: vd, Step: k, Point: sc.Point, Value: tc.Deviation, Limit: lim + tc.Bound,
			Message: fmt.Sprintf("back-calculated liquid density %.4g kg/m³ is %+.1f %% off the trend of the other steps (%.4g kg/m³), beyond %.2g %%",
				tc.Value, 100*math.Expm1(tc.Deviation), tc.Predicted, 100*math.Expm1(lim+tc.Bound))})
	}
}

// trendReach is how many steps on either side of a step, among those still
// on the trend, may carry the lines it is compared with.
const trendReach = 3

// trend compares each value v_k at pressure p_k (falling with k) with the
// straight lines in pressure through pairs of the steps near it (up to
// trendReach on either side, among those still on the trend), and keeps the
// most favourable: the least deviation |ln(v/line)| beyond the rounding
// uncertainty (b, relative, the step's combined with the pair's). A step
// next to a wrong one so still has a line through good steps, and curvature
// matters least. Then, one at a time, the value whose deviation beyond its
// uncertainty is largest and above ln(1 + limit) is taken off the trend, and
// the others judged again without it, while three values or more remain.
// It returns each value's comparison, nil where fewer than two other values
// remain to compare it with.
func trend(p, v, b []float64, limit float64) []*TrendCheck {
	n := len(p)
	out := make([]*TrendCheck, n)
	on := make([]bool, n)
	for k := range on {
		on[k] = true
	}
	predict := func(k int) *TrendCheck {
		var near []int
		for j, c := k-1, 0; j >= 0 && c < trendReach; j-- {
			if on[j] {
				near, c = append(near, j), c+1
			}
		}
		for j, c := k+1, 0; j < n && c < trendReach; j++ {
			if on[j] {
				near, c = append(near, j), c+1
			}
		}
		var best *TrendCheck
		bestEx := math.Inf(1)
		for x, a := range near {
			for _, c := range near[x+1:] {
				wa := (p[k] - p[c]) / (p[a] - p[c])
				wc := 1 - wa
				pred := wa*v[a] + wc*v[c]
				if !(pred > 0) {
					continue
				}
				ba, bc := wa*b[a]*(v[a]/pred), wc*b[c]*(v[c]/pred)
				tc := &TrendCheck{Value: v[k], Predicted: pred, Deviation: math.Log(v[k] / pred),
					Bound: math.Hypot(math.Hypot(b[k], ba), bc)}
				if math.IsInf(tc.Bound, 0) || math.IsNaN(tc.Bound) || math.IsInf(tc.Deviation, 0) {
					continue
				}
				if ex := math.Abs(tc.Deviation) - tc.Bound; ex < bestEx {
					best, bestEx = tc, ex
				}
			}
		}
		return best
	}
	left := n
	for left >= 3 {
		worst, worstEx := -1, math.Log1p(limit)
		var wt *TrendCheck
		for k := range on {
			if !on[k] {
				continue
			}
			tc := predict(k)
			if tc == nil {
				continue
			}
			if ex := math.Abs(tc.Deviation) - tc.Bound; ex > worstEx {
				worst, worstEx, wt = k, ex, tc
			}
		}
		if worst < 0 {
			break
		}
		wt.OffTrend = true
		out[worst] = wt
		on[worst] = false
		left--
	}
	for k := range on {
		if on[k] {
			out[k] = predict(k)
		}
	}
	return out
}

// closure compares the last step's liquid with the measured final liquid, on
// the smallest groups that are unions both of gas and of liquid components.
func (res *CheckResult) closure(cv *LabCVD, k int, names []string, h halfRes, sumLimit float64, opt CheckOptions, add func(Finding)) {
	sc := &res.Steps[k]
	meas := cv.Points[len(cv.Points)-1].Liquid
	n := 0
	for _, c := range res.Components {
		for _, i := range c.Index {
			n = max(n, i+1)
		}
	}
	// union-find over the model components
	parent := make([]int, n)
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		if parent[i] != i {
			parent[i] = find(parent[i])
		}
		return parent[i]
	}
	join := func(ix []int) {
		for _, i := range ix[1:] {
			parent[find(i)] = find(ix[0])
		}
	}
	for _, c := range res.Components {
		join(c.Index)
	}
	for _, lc := range cv.Liquid {
		join(lc.Index)
	}
	type class struct {
		gas, liq []int
	}
	classes := map[int]*class{}
	var order []int
	for g, c := range res.Components {
		r := find(c.Index[0])
		if classes[r] == nil {
			classes[r] = &class{}
			order = append(order, r)
		}
		classes[r].gas = append(classes[r].gas, g)
	}
	for l, lc := range cv.Liquid {
		r := find(lc.Index[0])
		classes[r].liq = append(classes[r].liq, l)
	}
	cl := &Closure{}
	covered := true
	allGiven := true
	for _, r := range order {
		c := classes[r]
		var gn, ln []string
		for _, g := range c.gas {
			gn = append(gn, names[g])
		}
		for _, l := range c.liq {
			ln = append(ln, cv.Liquid[l].Name)
		}
		if len(c.liq) == 0 {
			cl.NotReported = append(cl.NotReported, strings.Join(gn, "+"))
			covered = false
			continue
		}
		grp := ClosureGroup{Name: strings.Join(ln, "+")}
		given := true
		for _, l := range c.liq {
			if IsMissing(meas[l]) {
				given = false
			}
			grp.Measured += meas[l]
			grp.Bound += 3 * h.y * h.y // (3σ)² of a rounded value, h²/3 each
		}
		if !given {
			cl.NotReported = append(cl.NotReported, grp.Name)
			allGiven = false
			continue
		}
		for _, g := range c.gas {
			grp.Balance += sc.Balance.X[g]
			grp.Bound += sc.XBound[g] * sc.XBound[g]
		}
		grp.Bound = math.Sqrt(grp.Bound)
		grp.Difference = grp.Balance - grp.Measured
		cl.Groups = append(cl.Groups, grp)
	}
	if len(cl.Groups) == 0 {
		add(Finding{Kind: MissingData, Verdict: VerdictNotChecked, Step: k, Point: sc.Point,
			Message: "final liquid closure not checked: the final liquid composition gives no component the balance can compare"})
		return
	}
	if covered && allGiven {
		if f, ok := sumFinding(meas, float64(len(meas))*h.y+1e-12, "the final liquid composition"); ok {
			f.Step, f.Point = k, sc.Point
			add(f)
		}
	}
	for _, g := range cl.Groups {
		a := math.Abs(g.Difference)
		cl.AAD += a
		cl.MaxAbs = math.Max(cl.MaxAbs, a)
		if ex := a - g.Bound; ex > opt.ClosureSuspect {
			v, lim := VerdictSuspect, opt.ClosureSuspect
			if ex > opt.ClosureInconsistent {
				v, lim = VerdictInconsistent, opt.ClosureInconsistent
			}
			add(Finding{Kind: LiquidClosure, Verdict: v, Step: k, Point: sc.Point, Component: g.Name, Value: g.Difference, Limit: lim + g.Bound,
				Message: fmt.Sprintf("final liquid %s: balance %.3g mol %%, measured %.3g mol %%, %+.3g mol %% apart, beyond %.2g mol %%", g.Name, 100*g.Balance, 100*g.Measured, 100*g.Difference, 100*(lim+g.Bound))})
		}
	}
	cl.AAD /= float64(len(cl.Groups))
	res.Closure = cl
}
