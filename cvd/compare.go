package cvd

import (
	"errors"
	"fmt"
	"math"

	"dewcell/eos"
)

// The names of the quantities Compare compares, as the laboratory tables
// name their columns. A produced-gas composition is "gas_" followed by the
// component's name in the report (GasQuantity).
const (
	QSaturationPressure = "saturation_pressure"
	QLiquidDropout      = "liquid_dropout"
	QProduced           = "produced"
	QZGas               = "z_gas"
	QZTwoPhase          = "z_two_phase"
	QGasViscosity       = "gas_viscosity"
	QCGR                = "cgr"
	QRelativeVolume     = "relative_volume"
	QLiquidVolume       = "liquid_volume"
	QZ                  = "z"
	QDensity            = "density"
)

// GasQuantity is the name of the quantity that compares the mole fraction
// of component name in the produced gas.
func GasQuantity(name string) string { return "gas_" + name }

// Experiment names the laboratory experiment a quantity was measured in.
type Experiment int

const (
	Saturation Experiment = iota // the saturation point
	CVD                          // constant-volume depletion
	CCE                          // constant-composition expansion
)

func (e Experiment) String() string {
	switch e {
	case CVD:
		return "CVD"
	case CCE:
		return "CCE"
	}
	return "saturation"
}

// DeviationKind says how the deviation of a quantity is measured when the
// model is tuned to it (Tune's objective, Comparison.Residuals).
type DeviationKind int

const (
	// Relative deviations, 100 (model − lab)/lab, in percent: pressures,
	// Z-factors, relative volumes, densities, viscosities, CGR.
	Relative DeviationKind = iota
	// Absolute deviations, 100 (model − lab) of a fraction, in percentage
	// points: liquid dropout and liquid volume (volume %), produced moles
	// (% of the initial moles), compositions (mol %).
	Absolute
)

// PointComparison is one measurement beside the model's value at the same
// pressure, in SI (fractions for volumes, moles and compositions).
type PointComparison struct {
	P          float64 // Pa
	Lab, Model float64
}

// Difference is Model − Lab.
func (p PointComparison) Difference() float64 { return p.Model - p.Lab }

// RelativeDifference is (Model − Lab)/|Lab| as a fraction, and false when
// Lab is 0 (no relative difference).
func (p PointComparison) RelativeDifference() (float64, bool) {
	if p.Lab == 0 {
		return 0, false
	}
	return (p.Model - p.Lab) / math.Abs(p.Lab), true
}

// QuantityComparison is one quantity of a laboratory report against the
// model: its points and their statistics.
type QuantityComparison struct {
	Name       string // the laboratory column's name: QLiquidDropout, GasQuantity("C1"), ...
	Experiment Experiment
	Kind       DeviationKind // how Tune measures its deviations
	Points     []PointComparison
	Stats      Stats
}

// Stats are the statistics of the deviations of one quantity, in the
// quantity's own unit (SI; fractions for volumes, moles and compositions).
type Stats struct {
	Count int
	// AAD is the average absolute deviation, mean |model − lab|; Bias the
	// mean deviation, mean (model − lab); MaxDeviation the deviation of
	// largest magnitude, with its sign, and MaxAt its pressure.
	AAD, Bias, MaxDeviation, MaxAt float64
	// AARD is the average absolute relative deviation, mean |model − lab|/|lab|,
	// a fraction, over the RelativeCount points whose lab value is not 0.
	AARD          float64
	RelativeCount int
}

// StatsOf computes the statistics of points.
func StatsOf(points []PointComparison) Stats {
	var s Stats
	for _, p := range points {
		d := p.Difference()
		s.Count++
		s.AAD += math.Abs(d)
		s.Bias += d
		if math.Abs(d) > math.Abs(s.MaxDeviation) || s.Count == 1 {
			s.MaxDeviation, s.MaxAt = d, p.P
		}
		if rd, ok := p.RelativeDifference(); ok {
			s.AARD += math.Abs(rd)
			s.RelativeCount++
		}
	}
	if s.Count > 0 {
		s.AAD /= float64(s.Count)
		s.Bias /= float64(s.Count)
	}
	if s.RelativeCount > 0 {
		s.AARD /= float64(s.RelativeCount)
	}
	return s
}

// Comparison is a fluid model against one laboratory report.
type Comparison struct {
	T float64 // K
	// Saturation is the model's saturation point at T; LabSaturationP the
	// measured one, Pa (0 when the report gives none), and
	// SaturationDeviation (model − lab)/lab, a fraction (0 without one).
	Saturation          eos.Saturation
	LabSaturationP      float64
	SaturationDeviation float64
	// Start is the pressure at which the model's CVD cell was charged: the
	// measured saturation pressure when it lies above the model's, so that
	// both cells hold the same fluid at the same pressure, else the model's
	// saturation pressure. Zero without a CVD.
	Start float64
	// Quantities lists every quantity the report measured, the saturation
	// pressure first, then the CVD's and the CCE's in the order of
	// CVDQuantities and CCEQuantities, the compositions in the report's
	// component order after the CVD's other quantities.
	Quantities []QuantityComparison
	// Depletion and Expansion are the model's experiments at the report's
	// pressures; nil without the experiment.
	Depletion *Depletion
	Expansion *Expansion
}

// Quantity returns the comparison of the quantity called name, or nil.
func (c *Comparison) Quantity(name string) *QuantityComparison {
	for i := range c.Quantities {
		if c.Quantities[i].Name == name {
			return &c.Quantities[i]
		}
	}
	return nil
}

// CompareOptions control Compare.
type CompareOptions struct {
	// Train, when set, lets Compare compute the model's CGR of each CVD step
	// (a report's cgr column is not compared without it).
	Train    *Train
	Settings *eos.Settings
}

// ErrNoLabData: the laboratory report holds nothing to compare.
var ErrNoLabData = errors.New("the laboratory report holds no measurement")

// Compare sets the model (fluid fl, feed z) against the laboratory report:
// the saturation pressure at the report's temperature, and a simulated CVD
// (Deplete, the laboratory's steps) and CCE (Expand) at the report's
// pressures, quantity by quantity for every quantity the report measured.
//
// The model's CVD cell is charged at Start (see Comparison). At a reported
// pressure at or above it the model's cell is the charged fluid: dropout
// and produced moles 0, the gas its feed. A liquid volume reported as a
// fraction of the total volume is compared with the model's liquid volume
// over its total volume. The CCE density is the single-phase density, total
// mass over total volume. A cgr column is compared only with a Train.
//
// Errors: a report with no measurement (ErrNoLabData); the model's
// saturation point not found at T, or a failing flash (wrapped *eos.SolveError
// or eos.ErrNoSaturation): Tune counts these as failed evaluations.
func Compare(fl *eos.Fluid, z []float64, lab LabReport, o CompareOptions) (*Comparison, error) {
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	if lab.SaturationP <= 0 && lab.CVD == nil && lab.CCE == nil {
		return nil, ErrNoLabData
	}
	if !(lab.T > 0) {
		return nil, fmt.Errorf("%w: temperature %g K", ErrBadOptions, lab.T)
	}
	sat, err := eos.NewSaturator(fl, o.Settings).Upper(lab.T, z)
	if err != nil {
		return nil, &eos.StateError{What: "saturation point", T: lab.T, Err: err}
	}
	c := &Comparison{T: lab.T, Saturation: sat, LabSaturationP: lab.SaturationP}
	if lab.SaturationP > 0 {
		c.SaturationDeviation = (sat.P - lab.SaturationP) / lab.SaturationP
		q := QuantityComparison{Name: QSaturationPressure, Experiment: Saturation, Kind: Relative,
			Points: []PointComparison{{P: lab.SaturationP, Lab: lab.SaturationP, Model: sat.P}}}
		q.Stats = StatsOf(q.Points)
		c.Quantities = append(c.Quantities, q)
	}
	if lab.CVD != nil && len(lab.CVD.Points) > 0 {
		if err := c.compareCVD(fl, z, lab, o); err != nil {
			return nil, err
		}
	}
	if lab.CCE != nil && len(lab.CCE.Points) > 0 {
		if err := c.compareCCE(fl, z, lab, o); err != nil {
			return nil, err
		}
	}
	for i := range c.Quantities {
		c.Quantities[i].Stats = StatsOf(c.Quantities[i].Points)
	}
	return c, nil
}

// CVDQuantities and CCEQuantities are the quantities of each experiment in
// the order Compare reports them.
var (
	CVDQuantities = []string{QLiquidDropout, QProduced, QZGas, QZTwoPhase, QGasViscosity, QCGR}
	CCEQuantities = []string{QRelativeVolume, QLiquidVolume, QZ, QDensity}
)

func (c *Comparison) compareCVD(fl *eos.Fluid, z []float64, lab LabReport, o CompareOptions) error {
	rep := lab.CVD
	start := c.Saturation.P
	if lab.SaturationP > start {
		start = lab.SaturationP
	}
	c.Start = start
	var below []float64
	for _, pt := range rep.Points {
		if pt.P < start*(1-1e-9) {
			below = append(below, pt.P)
		}
	}
	opt := DepletionOptions{Pressures: below, Settings: o.Settings, SkipMaxDropout: true}
	if start > c.Saturation.P {
		opt.Start = start
	}
	if o.Train != nil && hasCGR(rep) {
		opt.Train = o.Train
	}
	var d *Depletion
	if len(below) > 0 {
		var err error
		if d, err = Deplete(fl, z, lab.T, opt); err != nil {
			return err
		}
		c.Depletion = d
	}
	// The charged cell, for reported pressures at or above Start.
	zStart := c.Saturation.Feed.Z
	if d != nil {
		zStart = start * d.CellVolume / (eos.R * lab.T)
	} else if start > c.Saturation.P {
		ph, _, _ := eos.NewFlasher(fl, o.Settings).Phase(lab.T, start, z)
		zStart = ph.Z
	}

	byName := map[string]*QuantityComparison{}
	var order []string
	add := func(name string, kind DeviationKind, p, labV, model float64) {
		if IsMissing(labV) {
			return
		}
		q := byName[name]
		if q == nil {
			q = &QuantityComparison{Name: name, Experiment: CVD, Kind: kind}
			byName[name] = q
			order = append(order, name)
		}
		q.Points = append(q.Points, PointComparison{P: p, Lab: labV, Model: model})
	}
	k := 0 // the next step of d to look at
	for _, pt := range rep.Points {
		if pt.P >= start*(1-1e-9) {
			add(QLiquidDropout, Absolute, pt.P, pt.Dropout, 0)
			add(QProduced, Absolute, pt.P, pt.Produced, 0)
			add(QZGas, Relative, pt.P, pt.ZGas, zStart)
			add(QZTwoPhase, Relative, pt.P, pt.ZTwoPhase, zStart)
			for j, lc := range rep.Gas {
				if pt.Gas != nil {
					add(GasQuantity(lc.Name), Absolute, pt.P, pt.Gas[j], lump(z, lc.Index))
				}
			}
			continue
		}
		// The steps are the reported pressures, and the model's dew point
		// when the cell was charged above it.
		for k < len(d.Steps) && d.Steps[k].P != pt.P {
			k++
		}
		if k == len(d.Steps) {
			return fmt.Errorf("model CVD: no step at %.6g Pa", pt.P)
		}
		st := d.Steps[k]
		add(QLiquidDropout, Absolute, pt.P, pt.Dropout, st.LiquidDropout)
		add(QProduced, Absolute, pt.P, pt.Produced, st.Produced)
		add(QZGas, Relative, pt.P, pt.ZGas, st.ZGas)
		add(QZTwoPhase, Relative, pt.P, pt.ZTwoPhase, st.ZTwoPhase)
		add(QGasViscosity, Relative, pt.P, pt.GasViscosity, st.GasViscosity)
		if st.Surface != nil {
			add(QCGR, Relative, pt.P, pt.CGR, st.Surface.CGR)
		}
		for j, lc := range rep.Gas {
			if pt.Gas != nil {
				add(GasQuantity(lc.Name), Absolute, pt.P, pt.Gas[j], lump(st.Y, lc.Index))
			}
		}
	}
	for _, name := range CVDQuantities {
		if q := byName[name]; q != nil {
			c.Quantities = append(c.Quantities, *q)
		}
	}
	for _, name := range order {
		if q := byName[name]; q.Experiment == CVD && isGas(name, rep) {
			c.Quantities = append(c.Quantities, *q)
		}
	}
	return nil
}

func isGas(name string, rep *LabCVD) bool {
	for _, lc := range rep.Gas {
		if GasQuantity(lc.Name) == name {
			return true
		}
	}
	return false
}

func hasCGR(rep *LabCVD) bool {
	for _, pt := range rep.Points {
		if !IsMissing(pt.CGR) {
			return true
		}
	}
	return false
}

// lump sums the mole fractions x of the components index.
func lump(x []float64, index []int) float64 {
	s := 0.0
	for _, i := range index {
		s += x[i]
	}
	return s
}

func (c *Comparison) compareCCE(fl *eos.Fluid, z []float64, lab LabReport, o CompareOptions) error {
	rep := lab.CCE
	ps := make([]float64, len(rep.Points))
	for i, pt := range rep.Points {
		ps[i] = pt.P
	}
	e, err := Expand(fl, z, lab.T, ps, o.Settings)
	if err != nil {
		return err
	}
	c.Expansion = e
	m := fl.MolarMass(z)
	qs := make([]QuantityComparison, len(CCEQuantities))
	for i, name := range CCEQuantities {
		qs[i] = QuantityComparison{Name: name, Experiment: CCE, Kind: Relative}
	}
	qs[1].Kind = Absolute
	add := func(i int, p, labV, model float64) {
		if !IsMissing(labV) {
			qs[i].Points = append(qs[i].Points, PointComparison{P: p, Lab: labV, Model: model})
		}
	}
	for i, pt := range rep.Points {
		st := e.Steps[i]
		liquid := st.LiquidVolume
		if rep.LiquidBasis == OfTotalVolume {
			liquid /= st.RelativeVolume
		}
		add(0, pt.P, pt.RelativeVolume, st.RelativeVolume)
		add(1, pt.P, pt.LiquidVolume, liquid)
		add(2, pt.P, pt.Z, st.Z)
		add(3, pt.P, pt.Density, m/(st.RelativeVolume*e.VSat))
	}
	for _, q := range qs {
		if len(q.Points) > 0 {
			c.Quantities = append(c.Quantities, q)
		}
	}
	return nil
}

// QGasComposition is the weight key that stands for every produced-gas
// composition quantity (GasQuantity) at once.
const QGasComposition = "gas_composition"

// DefaultWeights are the weights of the quantities in Tune's objective when
// the caller gives none: the saturation pressure weighs most, since every
// other prediction below it hangs on it; the volumetric quantities the
// reservoir depletion depends on next; the compositions, which add many
// points that move together, and the CGR little; the gas viscosity not at
// all, because the critical properties tuned here are not its parameters.
// Common practice, no published source.
var DefaultWeights = map[string]float64{
	QSaturationPressure: 10,
	QLiquidDropout:      1,
	QProduced:           1,
	QZGas:               1,
	QZTwoPhase:          1,
	QRelativeVolume:     1,
	QLiquidVolume:       1,
	QZ:                  1,
	QDensity:            1,
	QGasComposition:     0.1,
	QCGR:                0.5,
	QGasViscosity:       0,
}

// Weight returns the weight of quantity name in w: its own entry, for a
// composition quantity the QGasComposition entry, else that of
// DefaultWeights.
func Weight(w map[string]float64, name string) float64 {
	if v, ok := w[name]; ok {
		return v
	}
	if len(name) > 4 && name[:4] == "gas_" && name != QGasViscosity {
		if v, ok := w[QGasComposition]; ok {
			return v
		}
		return DefaultWeights[QGasComposition]
	}
	return DefaultWeights[name]
}

// Deviation is the deviation of a point as Tune measures it for a quantity
// of kind k: 100 (model − lab)/|lab|, in percent, for Relative (0 when lab is
// 0); 100 (model − lab), in percentage points, for Absolute.
func Deviation(k DeviationKind, p PointComparison) float64 {
	if k == Absolute {
		return 100 * p.Difference()
	}
	rd, _ := p.RelativeDifference()
	return 100 * rd
}

// Residuals appends to dst the weighted deviations of every point of c,
// √w Deviation, quantity by quantity, and returns it: Tune's objective is
// the sum of their squares. The weights w are looked up with Weight.
func (c *Comparison) Residuals(dst []float64, w map[string]float64) []float64 {
	for _, q := range c.Quantities {
		sw := math.Sqrt(Weight(w, q.Name))
		for _, p := range q.Points {
			dst = append(dst, sw*Deviation(q.Kind, p))
		}
	}
	return dst
}

// Objective is the sum of the squared residuals of c with the weights w.
func (c *Comparison) Objective(w map[string]float64) float64 {
	s := 0.0
	for _, r := range c.Residuals(nil, w) {
		s += r * r
	}
	return s
}
