package mbal

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"dewcell/cvd"
)

// This file holds the material balance on production history: the two-phase
// p/Z straight line (METHODS 9.1) and its Havlena–Odeh form (METHODS 9.2),
// each with the statistics of its least-squares fit.
//
// References (from memory, not checked against the originals; METHODS 9.2
// marks the Havlena–Odeh citation unverified too):
//
//   - Havlena, D. and Odeh, A.S. (1963). The material balance as an equation
//     of a straight line. J. Pet. Technol. 15(8), 896–900.
//   - Ramagost, B.P. and Farshad, F.F. (1981). P/Z abnormally pressured gas
//     reservoirs. SPE 10125 (the p/Z line corrected for rock and water
//     expansion, identical to the Havlena–Odeh form without influx).
//   - Draper, N.R. and Smith, H. (1998). Applied Regression Analysis, 3rd ed.
//     Wiley (least squares, standard errors, t tests on coefficients).
//   - Casella, G. and Berger, R.L. (2002). Statistical Inference, 2nd ed.
//     Duxbury, §5.5.4 (the delta method).

// HistoryPoint is one row of production history, after the caller has put it
// on a wet-gas basis. Standard volumes are at the standard conditions the
// caller uses throughout (HavlenaOdehParams.Std).
type HistoryPoint struct {
	P float64 // average reservoir pressure, Pa
	// Z2 is the two-phase Z of the reservoir contents at P (from the
	// equation-of-state depletion; the single-phase gas Z above the dew
	// point).
	Z2 float64
	// CumWetGas is the cumulative wet gas produced, standard m³: sales gas
	// plus the gas equivalent of the condensate (METHODS 5.3), plus water
	// produced as vapour if it is counted.
	CumWetGas float64
	// CumWater is the cumulative liquid water produced, m³ at standard
	// conditions (used by HavlenaOdeh only).
	CumWater float64
	// Bw is the water formation volume factor at P, reservoir m³ per m³ at
	// standard conditions, for HavlenaOdeh; 0 means HavlenaOdehParams.Bw.
	Bw float64
}

// HistoryFromSeries builds history points from parallel slices of pressure
// (Pa), two-phase Z, cumulative wet gas (standard m³) and cumulative water
// (m³ at standard conditions; nil means none produced), for instance the
// steps of a simulated depletion. The values are checked by FitPZ and
// HavlenaOdeh, not here.
//
// Special cases: slices of different lengths: a *HistoryError wrapping
// ErrHistoryValue.
func HistoryFromSeries(p, z2, cumWetGas, cumWater []float64) ([]HistoryPoint, error) {
	n := len(p)
	if len(z2) != n || len(cumWetGas) != n || (cumWater != nil && len(cumWater) != n) {
		return nil, &HistoryError{Func: "HistoryFromSeries", Index: -1, Field: "length", Value: float64(n),
			Err: ErrHistoryValue, Why: fmt.Sprintf("pressure, Z2, wet gas and water series have %d, %d, %d and %d values",
				n, len(z2), len(cumWetGas), len(cumWater))}
	}
	pts := make([]HistoryPoint, n)
	for i := range pts {
		pts[i] = HistoryPoint{P: p[i], Z2: z2[i], CumWetGas: cumWetGas[i]}
		if cumWater != nil {
			pts[i].CumWater = cumWater[i]
		}
	}
	return pts, nil
}

// Errors of the history material balance; a *HistoryError wraps one of them.
var (
	// ErrHistoryShort: fewer than MinHistoryPoints points after the initial state.
	ErrHistoryShort = errors.New("too few history points")
	// ErrHistoryValue: a value that is not finite, out of range or out of order.
	ErrHistoryValue = errors.New("invalid history value")
	// ErrPZNotFalling: the fitted p/Z does not fall as gas is produced, so
	// the line has no zero crossing and no gas in place.
	ErrPZNotFalling = errors.New("p/Z does not fall with production")
)

// MinHistoryPoints is the fewest history points, not counting the initial
// state, that FitPZ and HavlenaOdeh accept: with them the straight line keeps
// two degrees of freedom for its scatter and the curvature test one.
const MinHistoryPoints = 3

// HistoryError says which value of the history, or which setting, is wrong.
type HistoryError struct {
	Func  string  // "FitPZ", "HavlenaOdeh", "HistoryFromSeries"
	Index int     // history point, from 0; -1 for the initial state, a setting or the whole table
	Field string  // "P", "Z2", "CumWetGas", "CumWater"; a setting's name otherwise
	Value float64 // the offending value
	Err   error   // ErrHistoryShort, ErrHistoryValue or ErrPZNotFalling
	Why   string  // what is wrong with it
}

func (e *HistoryError) Error() string {
	where := ""
	if e.Index >= 0 {
		where = fmt.Sprintf("point %d: ", e.Index)
	}
	return fmt.Sprintf("%s: %s%s = %g: %s (%v)", e.Func, where, e.Field, e.Value, e.Why, e.Err)
}

// Unwrap makes errors.Is(err, ErrHistoryValue) and the like work.
func (e *HistoryError) Unwrap() error { return e.Err }

// PZOptions control the straight-line fits. A nil *PZOptions means the
// defaults.
type PZOptions struct {
	// FixIntercept forces the line through the initial point (0, p_i/Z_i).
	// By default the initial point is one more data point, weighted like the
	// others, and the intercept is fitted.
	FixIntercept bool
	// Confidence is the two-sided level of the interval on G and of the
	// significance tests, between 0 and 1; 0 means 0.95.
	Confidence float64
}

// DefaultConfidence is the confidence level used when PZOptions gives none.
const DefaultConfidence = 0.95

// histRoundoff is the relative scatter below which the significance tests
// treat a fit as exact: residuals smaller than histRoundoff × max|y| are
// rounding, not data, and must not make a slope or curvature "significant".
const histRoundoff = 1e-9

// PZFit is a least-squares straight line y = Intercept − Slope·x through
// production history, where y is p/Z (Pa) and x the cumulative wet gas
// (standard m³), or their corrected forms in HavlenaOdeh. G = Intercept/Slope
// is where the line reaches y = 0: the original wet gas in place.
type PZFit struct {
	N              int  // points fitted, counting the initial point when the intercept is free
	DOF            int  // degrees of freedom of the straight line, N − parameters
	FixedIntercept bool // the line was forced through (0, p_i/Z_i)

	Intercept   float64 // y at zero production, Pa
	Slope       float64 // fall of y per standard m³ produced, Pa/m³ (positive)
	InterceptSE float64 // standard error of Intercept, Pa (0 when fixed)
	SlopeSE     float64 // standard error of Slope, Pa/m³
	Covariance  float64 // covariance of Intercept and Slope, Pa²/m³ (0 when fixed)

	R2         float64   // coefficient of determination, 1 − SS_res/SS_tot
	ResidualSE float64   // standard error of the residuals, Pa
	Residuals  []float64 // observed − fitted y at each history point (not the initial point), Pa

	G          float64 // original wet gas in place, standard m³
	GSE        float64 // standard error of G by the delta method, standard m³
	GLow       float64 // lower end of the confidence interval on G, standard m³
	GHigh      float64 // upper end, standard m³
	Confidence float64 // level of the interval and of the curvature test

	// Curvature is c of the quadratic y = a − b·x + c·x² fitted to the same
	// points, Pa/m⁶, with its standard error and the two-sided p-value of
	// the t test of c = 0. Positive c (the line flattens) is pressure
	// support growing with time, as from an active aquifer; negative c (the
	// line steepens) is support fading, as from a small aquifer or rock and
	// water expansion that the line leaves out.
	Curvature   float64
	CurvatureSE float64
	CurvatureP  float64
	// CurvatureT is the t statistic of that test, |c| over its standard
	// error (the residual scatter floored at rounding), with CurvatureDOF
	// degrees of freedom.
	CurvatureT   float64
	CurvatureDOF int
	// CurvatureSignificant says CurvatureP < 1 − Confidence.
	CurvatureSignificant bool
}

// PZAt is the fitted y at cumulative production gp (standard m³), Pa.
func (f *PZFit) PZAt(gp float64) float64 { return f.Intercept - f.Slope*gp }

// VolumetricComparison sets the history's gas in place beside a volumetric
// (or equation-of-state) figure.
type VolumetricComparison struct {
	Volumetric float64 // the figure compared with, standard m³
	Difference float64 // G − Volumetric, standard m³
	Ratio      float64 // G / Volumetric
	// Inside says Volumetric lies within the confidence interval on G.
	Inside bool
}

// CompareVolumetric compares the fitted gas in place with a volumetric
// figure g (standard m³, same standard conditions).
//
// Special cases: g not positive and finite: a *HistoryError wrapping
// ErrHistoryValue.
func (f *PZFit) CompareVolumetric(g float64) (VolumetricComparison, error) {
	if !(g > 0) || math.IsInf(g, 0) {
		return VolumetricComparison{}, &HistoryError{Func: "CompareVolumetric", Index: -1, Field: "volumetric G",
			Value: g, Err: ErrHistoryValue, Why: "must be positive and finite"}
	}
	return VolumetricComparison{
		Volumetric: g,
		Difference: f.G - g,
		Ratio:      f.G / g,
		Inside:     g >= f.GLow && g <= f.GHigh,
	}, nil
}

// FitPZ fits the two-phase p/Z straight line of a gas or gas-condensate
// reservoir (METHODS 9.1),
//
//	p/Z₂ = (p_i/Z_i)(1 − G_p/G),
//
// by ordinary least squares of p/Z₂ against the cumulative wet gas G_p, and
// returns the original wet gas in place G where the line reaches zero. pi
// (Pa) and zi are the initial pressure and Z; the points follow the initial
// state in time, with strictly increasing CumWetGas (a row at zero
// production is the initial state: pass it as pi, zi instead). CumWater is
// not used: a volumetric p/Z line has no water term (see HavlenaOdeh).
//
// With the intercept free (the default) the initial point is fitted as one
// more data point; with opt.FixIntercept the line passes through it exactly
// and only the slope is fitted.
//
// The interval on G is G ± t·SE(G), t the two-sided Student t quantile at
// opt.Confidence with the line's degrees of freedom, and SE(G) from the delta
// method (first-order propagation of the intercept a and slope b, with their
// covariance, through G = a/b):
//
//	Var G = Var a / b² + a² Var b / b⁴ − 2 a Cov(a,b) / b³.
//
// It is symmetric about G and, when the slope is poorly determined, can reach
// below zero; it is reported as computed.
//
// The curvature test fits a quadratic to the same points and tests its
// second-order coefficient (Draper and Smith 1998); see PZFit.Curvature.
//
// Special cases: fewer than MinHistoryPoints points: ErrHistoryShort; a
// non-positive or non-finite pressure or Z, cumulative production not
// increasing, a confidence outside (0, 1): ErrHistoryValue; a fitted slope
// that is not negative: ErrPZNotFalling. Each comes in a *HistoryError, and
// the *PZFit is nil.
func FitPZ(points []HistoryPoint, pi, zi float64, opt *PZOptions) (*PZFit, error) {
	const fn = "FitPZ"
	conf, fixed, err := pzOptions(fn, opt)
	if err != nil {
		return nil, err
	}
	if err := checkHistory(fn, points, pi, zi); err != nil {
		return nil, err
	}
	x := make([]float64, len(points))
	y := make([]float64, len(points))
	for i, pt := range points {
		x[i] = pt.CumWetGas
		y[i] = pt.P / pt.Z2
	}
	return fitPZLine(fn, x, y, pi/zi, conf, fixed)
}

// HavlenaOdehParams describe the reservoir for HavlenaOdeh. Compressibilities
// in 1/Pa, as in Reservoir.
type HavlenaOdehParams struct {
	T  float64 // reservoir temperature, K
	Sw float64 // initial water saturation, fraction of pore volume, 0 ≤ Sw < 1
	Cw float64 // water compressibility, 1/Pa
	Cf float64 // pore (rock) compressibility, 1/Pa
	// Bw is the water formation volume factor, reservoir m³ per m³ at
	// standard conditions, of the points that give none; 0 means 1 (water
	// whose volume does not change from the reservoir to the surface: give
	// it, for instance from WaterFVFMcCain, whenever water is produced).
	Bw float64
	// Std are the standard conditions of the standard volumes; the zero
	// value means cvd.StandardField.
	Std cvd.Conditions
}

// HavlenaOdehPoint is the material balance at one history point. Reservoir
// volumes in m³, standard volumes in standard m³.
type HavlenaOdehPoint struct {
	P   float64 // Pa
	Bg  float64 // gas formation volume factor Z₂ T p_sc/(p T_sc), reservoir m³ per standard m³
	Bw  float64 // water formation volume factor used, reservoir m³ per standard m³
	F   float64 // underground withdrawal G_p B_g + W_p B_w, reservoir m³
	Eg  float64 // gas expansion B_g − B_gi, reservoir m³ per standard m³
	Efw float64 // rock and connate-water expansion B_gi c_e (p_i − p), reservoir m³ per standard m³
	// FOverE is F/(E_g + E_fw), standard m³: the gas in place each point
	// implies if there is no influx. Constant for a volumetric reservoir.
	FOverE float64
	// Abscissa is G_p + W_p B_w/B_g, standard m³, and CorrectedPZ is
	// (p/Z₂)(1 − c_e(p_i − p)), Pa: the point as HavlenaOdehResult.Line
	// fits it.
	Abscissa    float64
	CorrectedPZ float64
}

// HavlenaOdehResult is the Havlena–Odeh analysis of a production history.
type HavlenaOdehResult struct {
	Points []HavlenaOdehPoint
	// Ce is the effective expansion coefficient (c_w S_w + c_f)/(1 − S_w), 1/Pa.
	Ce float64
	// Line is the straight line (p/Z₂)(1 − c_e(p_i − p)) against
	// G_p + W_p B_w/B_g, the Havlena–Odeh balance without influx written as a
	// corrected p/Z line; Line.G is the wet gas in place with its interval.
	Line *PZFit
	// TrendSlope is the weighted least-squares slope of F/(E_g+E_fw) against
	// G_p (dimensionless), with its standard error and two-sided p-value.
	TrendSlope, TrendSE, TrendP float64
	// TrendChange is the change of F/(E_g+E_fw) along that slope over the
	// span of G_p in the history, as a fraction of Line.G.
	TrendChange float64
	// CurvatureChange is how far the quadratic of Line departs from a
	// straight line at the middle of the span of production, as a fraction
	// of the intercept p_i/Z_i.
	CurvatureChange float64
	// WaterInfluxSuspected is set when the trend or the curvature of Line
	// is both significant and material (TrendChange or CurvatureChange of
	// at least InfluxMateriality): Influx.Outcome is not NoInflux.
	WaterInfluxSuspected bool
	// Influx is the verdict of the two tests: their statistics, which of
	// them found a departure, and what it suggests.
	Influx InfluxVerdict
}

// InfluxOutcome is what the two influx tests of HavlenaOdeh suggest.
type InfluxOutcome int

const (
	// NoInflux: neither test finds a departure that is both significant
	// and material; the history is consistent with a volumetric reservoir.
	NoInflux InfluxOutcome = iota
	// GrowingInflux: F/(E_g+E_fw) rises with production, or the corrected
	// p/Z line flattens: water influx growing with time, as from an active
	// aquifer.
	GrowingInflux
	// FadingSupport: F/(E_g+E_fw) falls, or the line steepens: pressure
	// support that fades as pressure falls, as from a small (pot) aquifer,
	// or more rock and water expansion than c_w and c_f give.
	FadingSupport
	// ConflictingTests: both tests find a departure, in opposite
	// directions; the history is not volumetric, and the data and Z₂
	// deserve a check.
	ConflictingTests
)

func (o InfluxOutcome) String() string {
	switch o {
	case NoInflux:
		return "no influx"
	case GrowingInflux:
		return "growing influx"
	case FadingSupport:
		return "fading support"
	case ConflictingTests:
		return "conflicting tests"
	}
	return fmt.Sprintf("InfluxOutcome(%d)", int(o))
}

// InfluxTests is a set of the two influx tests, as flags.
type InfluxTests uint8

const (
	// TrendTest is the test of the slope of F/(E_g+E_fw) against G_p.
	TrendTest InfluxTests = 1 << iota
	// CurvatureTest is the test of the quadratic term of the corrected p/Z line.
	CurvatureTest
)

// InfluxTest is one of the two influx tests of HavlenaOdeh: a t test of a
// fitted coefficient against zero, and the departure from a volumetric
// balance that the coefficient implies over the history.
type InfluxTest struct {
	// Estimate is the coefficient tested: the slope of F/(E_g+E_fw) against
	// G_p (dimensionless), or the curvature c of Line (Pa/m⁶).
	Estimate float64
	// T is the t statistic |Estimate|/SE, the standard error taken with
	// the residual scatter floored at rounding (0 when that error is zero),
	// with DOF degrees of freedom; P is its two-sided p-value.
	T   float64
	DOF int
	P   float64
	// Change is the departure the coefficient implies, signed: the change
	// of F/(E_g+E_fw) over the history as a fraction of G (TrendChange),
	// or the departure of Line from straight at mid-history as a fraction
	// of its intercept (CurvatureChange).
	Change float64
	// Significant says P < InfluxVerdict.Alpha; Material says |Change| ≥
	// InfluxVerdict.Materiality.
	Significant, Material bool
}

// Rising says the departure is support growing with production:
// F/(E_g+E_fw) rising, or the corrected p/Z line flattening (Estimate > 0).
func (t InfluxTest) Rising() bool { return t.Estimate > 0 }

// Triggered says the test finds a departure that is both significant and
// material.
func (t InfluxTest) Triggered() bool { return t.Significant && t.Material }

// InfluxVerdict is the outcome of the two influx tests of HavlenaOdeh.
type InfluxVerdict struct {
	Outcome InfluxOutcome
	// Triggered holds the tests that found a departure both significant
	// and material.
	Triggered InfluxTests
	// Trend is the test of the slope of F/(E_g+E_fw) against G_p;
	// Curvature that of the quadratic term of the corrected p/Z line.
	Trend, Curvature InfluxTest
	// Alpha is the level of each test, (1 − Confidence)/2 (Bonferroni).
	Alpha float64
	// Materiality is InfluxMateriality, the smallest departure reported.
	Materiality float64
}

// influxVerdict decides between the outcomes from the two tests.
func influxVerdict(trend, curve InfluxTest, alpha float64) InfluxVerdict {
	v := InfluxVerdict{Trend: trend, Curvature: curve, Alpha: alpha, Materiality: InfluxMateriality}
	if trend.Triggered() {
		v.Triggered |= TrendTest
	}
	if curve.Triggered() {
		v.Triggered |= CurvatureTest
	}
	switch {
	case v.Triggered == 0:
		v.Outcome = NoInflux
	case v.Triggered == TrendTest|CurvatureTest && trend.Rising() != curve.Rising():
		v.Outcome = ConflictingTests
	case v.Triggered&TrendTest != 0 && trend.Rising(), v.Triggered == CurvatureTest && curve.Rising():
		v.Outcome = GrowingInflux
	default:
		v.Outcome = FadingSupport
	}
	return v
}

// InfluxMateriality is the smallest departure from a volumetric balance,
// as a fraction of the gas in place (or of p_i/Z_i), that the influx tests
// report: 1 % (common practice, no published source). Precise, smooth data
// can make a departure far smaller statistically significant, for instance
// the slight dependence of a simulated Z₂ on its pressure steps; that is not
// evidence of an aquifer.
const InfluxMateriality = 0.01

// HavlenaOdeh writes the gas material balance as Havlena and Odeh (1963) do
// (METHODS 9.2),
//
//	F = G (E_g + E_fw) + W_e,   F = G_p B_g + W_p B_w,
//	E_g = B_g − B_gi,   E_fw = B_gi c_e (p_i − p),   c_e = (c_w S_w + c_f)/(1 − S_w),
//
// with B_g = Z₂ T p_sc/(p T_sc) from each point's two-phase Z, and looks for
// water influx W_e in two ways:
//
//   - F/(E_g+E_fw) = G + W_e/(E_g+E_fw) is constant without influx. Its slope
//     against G_p is fitted by weighted least squares, weights (E_g+E_fw)²
//     (an error in pressure moves F/(E_g+E_fw) about in inverse proportion to
//     the expansion, so the first points, where it is small, scatter most),
//     and tested against zero with a t test.
//   - Without influx the balance is also the straight line
//     (p/Z₂)(1 − c_e(p_i − p)) = (p_i/Z_i)(1 − (G_p + W_p B_w/B_g)/G)
//     (Ramagost and Farshad 1981 when W_p = 0), fitted as in FitPZ (Line);
//     its quadratic term is tested against zero.
//
// A rising F/(E_g+E_fw), or a corrected p/Z line that flattens, is influx
// growing with time (an active aquifer). A falling one, or a line that
// steepens, is support that fades as pressure falls: a small (pot) aquifer,
// W_e = (c_w + c_f) W_i (p_i − p) (METHODS 9.3), or more rock and water
// expansion than c_w and c_f say. Either sets WaterInfluxSuspected when it
// is also material: F/(E_g+E_fw) changing by at least InfluxMateriality of G
// over the history, or the line departing from straight by that fraction of
// p_i/Z_i at mid-history. Each test is made at level (1 − Confidence)/2
// (Bonferroni), so that a volumetric reservoir with independent normal
// errors is flagged with probability at most 1 − Confidence. A scatter below 1e-9 of the data's magnitude is taken
// as rounding: exact volumetric data are not flagged. Influx holds the
// verdict: both tests with their statistics, the ones that found a
// departure, and the outcome (an InfluxOutcome); when the two find
// departures in opposite directions it is ConflictingTests.
//
// Special cases: as FitPZ, and ErrHistoryValue (in a *HistoryError) for a
// non-positive temperature or standard condition, Sw outside [0, 1), a
// negative or non-finite compressibility or Bw, a point with no expansion
// (E_g + E_fw ≤ 0, typically a pressure at or above p_i), or c_e(p_i − p) ≥ 1.
// ErrPZNotFalling refers to the corrected line.
func HavlenaOdeh(points []HistoryPoint, pi, zi float64, par HavlenaOdehParams, opt *PZOptions) (*HavlenaOdehResult, error) {
	const fn = "HavlenaOdeh"
	conf, fixed, err := pzOptions(fn, opt)
	if err != nil {
		return nil, err
	}
	if err := checkHistory(fn, points, pi, zi); err != nil {
		return nil, err
	}
	std := par.Std
	if std == (cvd.Conditions{}) {
		std = cvd.StandardField
	}
	bw := par.Bw
	if bw == 0 {
		bw = 1
	}
	bad := func(field string, v float64, why string) error {
		return &HistoryError{Func: fn, Index: -1, Field: field, Value: v, Err: ErrHistoryValue, Why: why}
	}
	switch {
	case !(par.T > 0) || math.IsInf(par.T, 0):
		return nil, bad("T", par.T, "reservoir temperature must be positive and finite (K)")
	case !(std.T > 0) || math.IsInf(std.T, 0):
		return nil, bad("Std.T", std.T, "standard temperature must be positive and finite (K)")
	case !(std.P > 0) || math.IsInf(std.P, 0):
		return nil, bad("Std.P", std.P, "standard pressure must be positive and finite (Pa)")
	case !(par.Sw >= 0 && par.Sw < 1):
		return nil, bad("Sw", par.Sw, "water saturation must be at least 0 and below 1")
	case !(par.Cw >= 0) || math.IsInf(par.Cw, 0):
		return nil, bad("Cw", par.Cw, "water compressibility must be non-negative and finite (1/Pa)")
	case !(par.Cf >= 0) || math.IsInf(par.Cf, 0):
		return nil, bad("Cf", par.Cf, "pore compressibility must be non-negative and finite (1/Pa)")
	case !(bw > 0) || math.IsInf(bw, 0):
		return nil, bad("Bw", par.Bw, "water formation volume factor must be positive and finite (0 means 1)")
	}

	ce := (par.Cw*par.Sw + par.Cf) / (1 - par.Sw)
	bgOf := func(p, z float64) float64 { return z * par.T * std.P / (p * std.T) }
	bgi := bgOf(pi, zi)
	n := len(points)
	res := &HavlenaOdehResult{Points: make([]HavlenaOdehPoint, n), Ce: ce}
	gp := make([]float64, n)
	foe := make([]float64, n)
	w := make([]float64, n)
	xl := make([]float64, n)
	yl := make([]float64, n)
	for i, pt := range points {
		dp := pi - pt.P
		if ce*dp >= 1 {
			return nil, &HistoryError{Func: fn, Index: i, Field: "P", Value: pt.P, Err: ErrHistoryValue,
				Why: fmt.Sprintf("c_e (p_i − p) = %.4g: the pore volume would vanish; check Cw, Cf and Sw", ce*dp)}
		}
		bg := bgOf(pt.P, pt.Z2)
		bw := bw
		if pt.Bw != 0 {
			bw = pt.Bw
		}
		if !(bw > 0) || math.IsInf(bw, 0) {
			return nil, &HistoryError{Func: fn, Index: i, Field: "Bw", Value: pt.Bw, Err: ErrHistoryValue,
				Why: "water formation volume factor must be positive and finite"}
		}
		hp := HavlenaOdehPoint{P: pt.P, Bg: bg, Bw: bw, F: pt.CumWetGas*bg + pt.CumWater*bw, Eg: bg - bgi, Efw: bgi * ce * dp}
		e := hp.Eg + hp.Efw
		if !(e > 0) {
			return nil, &HistoryError{Func: fn, Index: i, Field: "P", Value: pt.P, Err: ErrHistoryValue,
				Why: fmt.Sprintf("no expansion since the initial state (E_g + E_fw = %.4g m³/m³): p/Z is not below p_i/Z_i", e)}
		}
		hp.FOverE = hp.F / e
		hp.Abscissa = pt.CumWetGas + pt.CumWater*bw/bg
		hp.CorrectedPZ = pt.P / pt.Z2 * (1 - ce*dp)
		res.Points[i] = hp
		gp[i], foe[i], w[i] = pt.CumWetGas, hp.FOverE, e*e
		xl[i], yl[i] = hp.Abscissa, hp.CorrectedPZ
	}

	line, err := fitPZLine(fn, xl, yl, pi/zi, conf, fixed)
	if err != nil {
		return nil, err
	}
	res.Line = line

	tr, err := histPolyFit(gp, foe, w, 1, false, 0)
	if err != nil {
		return nil, &HistoryError{Func: fn, Index: -1, Field: "points", Value: float64(n), Err: ErrHistoryValue, Why: err.Error()}
	}
	res.TrendSlope = tr.coef[1]
	res.TrendSE = math.Sqrt(tr.cov[1][1])
	trendT, trendP := tr.tTest(1)
	res.TrendP = trendP

	span := func(v []float64) float64 {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, x := range v {
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
		return math.Max(hi, 0) - math.Min(lo, 0) // the initial state has no production
	}
	res.TrendChange = res.TrendSlope * span(gp) / line.G
	half := span(xl) / 2
	res.CurvatureChange = line.Curvature * half * half / line.Intercept

	alpha := (1 - conf) / 2
	res.Influx = influxVerdict(
		InfluxTest{Estimate: res.TrendSlope, T: trendT, DOF: tr.dof, P: res.TrendP, Change: res.TrendChange,
			Significant: res.TrendP < alpha, Material: math.Abs(res.TrendChange) >= InfluxMateriality},
		InfluxTest{Estimate: line.Curvature, T: line.CurvatureT, DOF: line.CurvatureDOF, P: line.CurvatureP, Change: res.CurvatureChange,
			Significant: line.CurvatureP < alpha, Material: math.Abs(res.CurvatureChange) >= InfluxMateriality},
		alpha)
	res.WaterInfluxSuspected = res.Influx.Outcome != NoInflux
	return res, nil
}

// pzOptions reads opt, checking its confidence level.
func pzOptions(fn string, opt *PZOptions) (conf float64, fixed bool, err error) {
	conf = DefaultConfidence
	if opt == nil {
		return conf, false, nil
	}
	if opt.Confidence != 0 {
		conf = opt.Confidence
	}
	if !(conf > 0 && conf < 1) {
		return 0, false, &HistoryError{Func: fn, Index: -1, Field: "Confidence", Value: opt.Confidence,
			Err: ErrHistoryValue, Why: "must lie between 0 and 1 (0 means 0.95)"}
	}
	return conf, opt.FixIntercept, nil
}

// checkHistory validates the initial state and the points.
func checkHistory(fn string, pts []HistoryPoint, pi, zi float64) error {
	bad := func(i int, field string, v float64, why string) error {
		return &HistoryError{Func: fn, Index: i, Field: field, Value: v, Err: ErrHistoryValue, Why: why}
	}
	if len(pts) < MinHistoryPoints {
		return &HistoryError{Func: fn, Index: -1, Field: "points", Value: float64(len(pts)), Err: ErrHistoryShort,
			Why: fmt.Sprintf("need at least %d points after the initial state", MinHistoryPoints)}
	}
	posFinite := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	if !posFinite(pi) {
		return bad(-1, "pi", pi, "initial pressure must be positive and finite (Pa)")
	}
	if !posFinite(zi) {
		return bad(-1, "zi", zi, "initial Z must be positive and finite")
	}
	prevG, prevW := 0.0, 0.0
	for i, pt := range pts {
		switch {
		case !posFinite(pt.P):
			return bad(i, "P", pt.P, "pressure must be positive and finite (Pa)")
		case !posFinite(pt.Z2):
			return bad(i, "Z2", pt.Z2, "two-phase Z must be positive and finite")
		case math.IsNaN(pt.CumWetGas) || math.IsInf(pt.CumWetGas, 0):
			return bad(i, "CumWetGas", pt.CumWetGas, "cumulative wet gas must be finite (standard m³)")
		case i == 0 && !(pt.CumWetGas > 0):
			return bad(i, "CumWetGas", pt.CumWetGas,
				"cumulative wet gas must exceed zero (the initial state at zero production is given separately as pi, zi)")
		case i > 0 && !(pt.CumWetGas > prevG):
			return bad(i, "CumWetGas", pt.CumWetGas,
				fmt.Sprintf("cumulative wet gas must increase from point to point (previous %g)", prevG))
		case !(pt.CumWater >= 0) || math.IsInf(pt.CumWater, 0):
			return bad(i, "CumWater", pt.CumWater, "cumulative water must be non-negative and finite (m³)")
		case pt.CumWater < prevW:
			return bad(i, "CumWater", pt.CumWater,
				fmt.Sprintf("cumulative water must not decrease (previous %g)", prevW))
		}
		prevG, prevW = pt.CumWetGas, pt.CumWater
	}
	return nil
}

// fitPZLine fits y = a − b x through the history points (x, y) and the
// initial point (0, y0), free or fixed, then the quadratic for the curvature
// test, and fills a PZFit.
func fitPZLine(fn string, x, y []float64, y0, conf float64, fixed bool) (*PZFit, error) {
	xs, ys := x, y
	if !fixed {
		xs = append([]float64{0}, x...)
		ys = append([]float64{y0}, y...)
	}
	lin, err := histPolyFit(xs, ys, nil, 1, fixed, y0)
	if err != nil {
		return nil, &HistoryError{Func: fn, Index: -1, Field: "points", Value: float64(len(x)), Err: ErrHistoryValue, Why: err.Error()}
	}
	a, b := lin.coef[0], -lin.coef[1]
	if !(b > 0) {
		return nil, &HistoryError{Func: fn, Index: -1, Field: "slope", Value: -b, Err: ErrPZNotFalling,
			Why: "the fitted p/Z rises or stays level as gas is produced; no gas in place can be read"}
	}
	varA, varB, covAB := lin.cov[0][0], lin.cov[1][1], -lin.cov[0][1]
	f := &PZFit{
		N:              len(xs),
		DOF:            lin.dof,
		FixedIntercept: fixed,
		Intercept:      a,
		Slope:          b,
		InterceptSE:    math.Sqrt(varA),
		SlopeSE:        math.Sqrt(varB),
		Covariance:     covAB,
		R2:             lin.r2,
		ResidualSE:     lin.s,
		G:              a / b,
		Confidence:     conf,
	}
	f.Residuals = make([]float64, len(x))
	for i := range x {
		f.Residuals[i] = y[i] - f.PZAt(x[i])
	}
	// Delta method (Casella and Berger 2002, §5.5.4): ∂G/∂a = 1/b, ∂G/∂b = −a/b².
	varG := varA/(b*b) + a*a*varB/(b*b*b*b) - 2*a*covAB/(b*b*b)
	f.GSE = math.Sqrt(math.Max(varG, 0))
	t := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(lin.dof)}.Quantile(0.5 + conf/2)
	f.GLow, f.GHigh = f.G-t*f.GSE, f.G+t*f.GSE

	quad, err := histPolyFit(xs, ys, nil, 2, fixed, y0)
	if err != nil {
		return nil, &HistoryError{Func: fn, Index: -1, Field: "points", Value: float64(len(x)), Err: ErrHistoryValue, Why: err.Error()}
	}
	f.Curvature = quad.coef[2]
	f.CurvatureSE = math.Sqrt(quad.cov[2][2])
	f.CurvatureT, f.CurvatureP = quad.tTest(2)
	f.CurvatureDOF = quad.dof
	f.CurvatureSignificant = f.CurvatureP < 1-conf
	return f, nil
}

// histLSQ is a weighted polynomial least-squares fit y ≈ Σ coef[j] x^j.
type histLSQ struct {
	coef  []float64   // coef[0] is the fixed intercept when one was given
	cov   [][]float64 // covariance of coef (row and column 0 zero when fixed)
	unit  [][]float64 // cov / s²: (XᵀWX)⁻¹
	s     float64     // residual standard error for unit weight (weights normalised to mean 1)
	floor float64     // histRoundoff × max|y|
	dof   int
	r2    float64
}

// tTest is the t statistic |coef[j]|/SE and the two-sided p-value of the t
// test of coef[j] = 0, with the residual standard error floored at the
// rounding level; 0 and 1 when that error is zero.
func (l histLSQ) tTest(j int) (t, p float64) {
	se := math.Max(l.s, l.floor) * math.Sqrt(l.unit[j][j])
	if se == 0 {
		return 0, 1
	}
	t = math.Abs(l.coef[j]) / se
	return t, 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(l.dof)}.Survival(t)
}

// histPolyFit fits y = c0 + c1 x + … + c_d x^d by weighted least squares
// (w nil: equal weights), or y − y0 = c1 x + … with c0 = y0 when fixed. The
// abscissa is scaled to [−1, 1] and the system solved by Householder QR;
// the covariance is s² R⁻¹R⁻ᵀ, scaled back.
func histPolyFit(x, y, w []float64, degree int, fixed bool, y0 float64) (histLSQ, error) {
	n := len(x)
	start := 0
	if fixed {
		start = 1
	}
	k := degree + 1 - start
	if n-k < 1 {
		return histLSQ{}, fmt.Errorf("%d points leave no degree of freedom for %d parameters", n, k)
	}
	xmax, ymax, wsum := 0.0, 0.0, 0.0
	for i := range x {
		xmax = math.Max(xmax, math.Abs(x[i]))
		ymax = math.Max(ymax, math.Abs(y[i]))
		if w != nil {
			wsum += w[i]
		}
	}
	if xmax == 0 {
		return histLSQ{}, errors.New("all abscissae are zero")
	}
	wt := func(i int) float64 {
		if w == nil {
			return 1
		}
		return w[i] * float64(n) / wsum
	}
	A := mat.NewDense(n, k, nil)
	bv := mat.NewVecDense(n, nil)
	off := 0.0
	if fixed {
		off = y0
	}
	for i := 0; i < n; i++ {
		sw := math.Sqrt(wt(i))
		xs := x[i] / xmax
		for j := 0; j < k; j++ {
			A.Set(i, j, sw*math.Pow(xs, float64(j+start)))
		}
		bv.SetVec(i, sw*(y[i]-off))
	}
	var qr mat.QR
	qr.Factorize(A)
	var beta mat.VecDense
	if err := qr.SolveVecTo(&beta, false, bv); err != nil {
		return histLSQ{}, fmt.Errorf("least squares: %v (abscissae too close together)", err)
	}
	var r mat.Dense
	qr.RTo(&r)
	rt := mat.NewTriDense(k, mat.Upper, nil)
	for i := 0; i < k; i++ {
		for j := i; j < k; j++ {
			rt.SetTri(i, j, r.At(i, j))
		}
	}
	var rinv mat.TriDense
	if err := rinv.InverseTri(rt); err != nil {
		return histLSQ{}, fmt.Errorf("least squares: %v (abscissae too close together)", err)
	}
	var unitS mat.Dense
	unitS.Mul(&rinv, rinv.T())

	m := degree + 1
	l := histLSQ{coef: make([]float64, m), cov: make([][]float64, m), unit: make([][]float64, m),
		floor: histRoundoff * ymax, dof: n - k}
	for i := range l.cov {
		l.cov[i] = make([]float64, m)
		l.unit[i] = make([]float64, m)
	}
	if fixed {
		l.coef[0] = y0
	}
	for j := 0; j < k; j++ {
		l.coef[j+start] = beta.AtVec(j) / math.Pow(xmax, float64(j+start))
	}
	ss, ybar := 0.0, 0.0
	for i := 0; i < n; i++ {
		ybar += wt(i) * y[i]
	}
	ybar /= float64(n)
	sst := 0.0
	for i := 0; i < n; i++ {
		fit := 0.0
		for j := m - 1; j >= 0; j-- {
			fit = fit*x[i] + l.coef[j]
		}
		ss += wt(i) * (y[i] - fit) * (y[i] - fit)
		sst += wt(i) * (y[i] - ybar) * (y[i] - ybar)
	}
	l.s = math.Sqrt(ss / float64(l.dof))
	if sst > 0 {
		l.r2 = 1 - ss/sst
	}
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			u := unitS.At(i, j) / (math.Pow(xmax, float64(i+start)) * math.Pow(xmax, float64(j+start)))
			l.unit[i+start][j+start] = u
			l.cov[i+start][j+start] = l.s * l.s * u
		}
	}
	return l, nil
}
