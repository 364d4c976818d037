package cvd

import (
	"errors"
	"fmt"
	"math"

	"dewcell/eos"
)

// DepletionOptions control Deplete. Pressures, when given, are the steps
// below the start, strictly decreasing; otherwise Steps pressures are spaced
// evenly from the dew point down to Abandonment.
type DepletionOptions struct {
	Pressures   []float64 // Pa
	Steps       int       // default steps below the dew point; 0 means 8
	Abandonment float64   // Pa, the last default step
	// Start, when above the dew point, starts the depletion there: the cell
	// volume is that of the single-phase fluid at Start, and the steps above
	// the dew point produce feed-composition gas. Zero, or a Start within
	// 1e-8 of the dew point, starts at the dew point.
	Start    float64
	Train    *Train // when set, each step's produced stream goes through the train
	Settings *eos.Settings

	// PoreCompressibility is the effective compressibility of the cell (the
	// hydrocarbon pore volume), 1/Pa: at pressure p the cell volume is
	// V_start [1 − c (p_start − p)]. For rock and connate water,
	// c = (c_f + c_w S_w)/(1 − S_w) (Havlena and Odeh 1963). Zero keeps the
	// laboratory's constant volume.
	PoreCompressibility float64

	// Adaptive integrates the depletion below the saturation point as the
	// continuous process a reservoir goes through, instead of the
	// laboratory's finite removals: Pressures or Steps then choose only the
	// pressures reported, onto which the integration steps exactly, and the
	// steps between them are chosen to hold the estimated discretisation
	// error within Tolerance (see Deplete).
	Adaptive bool
	// Tolerance is what the adaptive integration allows for the estimated
	// discretisation error over the whole depletion: with a Train, of the
	// cumulative moles produced that end as stock-tank oil and as surface
	// gas, as fractions of those of the feed (the feed's separator split
	// applied to the error of each component); without one, of the moles
	// produced of each component, as a fraction of its initial moles (or of
	// 1e-3 mol per mole of feed for a component below that). 0 means
	// DefaultTolerance.
	Tolerance float64
	// LiquidFlow, when set, lets liquid flow with the gas: it returns the
	// liquid's share of the produced reservoir volume (its fractional flow,
	// from 0 to 1) for a state of the two-phase cell. It must not fall as
	// the liquid fraction rises. Nil produces gas only: the liquid stays in
	// the cell.
	LiquidFlow func(FlowState) float64
	// SkipMaxDropout leaves MaxDropout and MaxDropoutP zero, saving the
	// search for the maximum.
	SkipMaxDropout bool
	// DewOnly refuses a feed whose saturation point is a bubble point:
	// Deplete then returns ErrBubblePoint without depleting.
	DewOnly bool
}

// SurfaceStep is the surface yield of the stream produced down to one
// reported pressure.
type SurfaceStep struct {
	// CGR is stock-tank oil over surface gas of the stream produced since
	// the reported pressure before, standard m³/m³, and GasGravity the
	// specific gravity of its surface gas (air = 1).
	CGR        float64
	GasGravity float64
	CumGas     float64 // cumulative surface (sales) gas, standard m³ per mole of initial fluid
	CumOil     float64 // cumulative stock-tank oil, standard m³ per mole of initial fluid
	// CumWetGas is the cumulative produced well stream as an ideal-gas
	// standard volume, m³ per mole of initial fluid.
	CumWetGas float64
	// CumGasMoles and CumOilMoles are the cumulative surface gas and
	// stock-tank oil, moles per mole of initial fluid.
	CumGasMoles, CumOilMoles float64
	// CumGasError and CumOilError are the estimated discretisation errors
	// of CumGas and CumOil (computed minus exact), standard m³ per mole of
	// initial fluid, from ProducedError with each step's separator split
	// held fixed; zero for laboratory steps.
	CumGasError, CumOilError float64
}

// DepletionStep is the cell at one reported pressure, after the fluid that
// no longer fits has been produced. Amounts are per mole of fluid initially
// in the cell; "this step" is everything since the reported pressure before.
type DepletionStep struct {
	P             float64 // Pa
	TwoPhase      bool    // liquid present (below the dew point)
	LiquidDropout float64 // retrograde liquid volume over the cell volume
	Produced      float64 // cumulative moles removed
	StepProduced  float64 // moles removed at this step
	ZGas          float64 // Z of the equilibrium (produced) gas
	ZTwoPhase     float64 // p V_cell / (n R T) of the cell contents
	Gas           eos.PhaseProps
	Liquid        eos.PhaseProps // zero when single phase
	GasViscosity  float64        // Pa·s, Lohrenz–Bray–Clark
	// LiquidViscosity is the liquid's Lohrenz–Bray–Clark viscosity, Pa·s,
	// when the liquid may flow (LiquidFlow set); zero otherwise.
	LiquidViscosity float64
	// LiquidFlow is the liquid's share of the reservoir volume produced at
	// this pressure (zero without LiquidFlow).
	LiquidFlow  float64
	Y           []float64 // equilibrium gas composition
	X           []float64 // liquid composition (nil when single phase)
	Stream      []float64 // composition of all that was removed at this step (Y unless liquid flowed too)
	LiquidMoles float64   // moles of liquid in the cell
	LiquidOut   float64   // moles of liquid removed at this step
	CellVolume  float64   // cell volume at this pressure, m³ per mole of initial fluid
	Cell        []float64 // moles of each component left in the cell
	Surface     *SurfaceStep
	// Substeps is the number of integration steps taken since the reported
	// pressure before (1 for laboratory steps).
	Substeps int
	// ProducedError is the estimated discretisation error of the cumulative
	// moles produced of each component (computed minus exact), per mole of
	// initial fluid: the sum of the adaptive steps' local error estimates.
	// Nil for laboratory steps.
	ProducedError []float64
}

// Depletion is a simulated constant-volume depletion.
type Depletion struct {
	T          float64        // K
	Dew        eos.Saturation // the upper dew point at T
	CellVolume float64        // m³ per mole of initial fluid
	Steps      []DepletionStep
	// MaxDropout is the largest liquid dropout (fraction of the cell volume)
	// of the continuous depletion below the dew point, down to the last
	// step, and MaxDropoutP its pressure: a one-dimensional search (Brent's)
	// on the adaptively integrated depletion, whatever the steps reported.
	MaxDropout, MaxDropoutP float64
	// Adaptive says the depletion was integrated adaptively; Tolerance is
	// the tolerance used, IntegrationSteps the steps it took below the dew
	// point and RejectedSteps those it took again, shorter.
	Adaptive                        bool
	Tolerance                       float64
	IntegrationSteps, RejectedSteps int
	// Flashes counts the flashes of the cell (not the separator's), the
	// measure of the work done.
	Flashes int
}

// atSaturation is how far, relative, a start pressure may lie above the
// dew point and still count as the dew point itself.
const atSaturation = 1e-8

// Errors of Deplete and Expand, wrapped with the detail.
var (
	ErrBadOptions = errors.New("invalid experiment options")
	ErrNotDew     = errors.New("depletion cannot continue")
	// ErrBubblePoint: the feed has a bubble point, and DewOnly was set.
	ErrBubblePoint = errors.New("the feed has a bubble point, not a dew point")
)

// Deplete simulates a constant-volume depletion of feed z at t (K), the
// laboratory procedure of Whitson and Torp (1983) as an equation-of-state
// calculation (METHODS 8.3). One mole of feed fills the cell at the dew point
// (or at o.Start above it), fixing the cell volume. At each lower pressure the
// cell contents are flashed, and just enough equilibrium gas is removed to
// bring the two phases back to the cell volume; the liquid stays behind
// (with o.LiquidFlow its share flows too). Above the dew point the cell
// holds one phase and the gas removed has the feed's composition. Volumes
// are volume-translated when the fluid is.
//
// Each such removal produces, for the whole step, gas of the composition at
// the step's end pressure, the leanest of the step: a first-order
// approximation of the continuous depletion a reservoir goes through, good
// for emulating the laboratory and biased towards too little condensate for
// a reservoir. With o.Adaptive the depletion below the dew point is instead
// integrated as that continuous process: implicit steps in the moles
// produced (the Adams–Moulton rule of third order, trapezoidal where a
// stretch begins), sized by an estimate of their error (see integrate in
// adaptive.go) and landing exactly on the reported pressures; each step's
// produced stream goes through the train. ProducedError and the surface
// errors carry the estimated discretisation error.
//
// MaxDropout is always that of the continuous depletion: with laboratory
// steps Deplete integrates it too, from the dew point until the dropout has
// passed its maximum, for the search.
//
// Special cases:
//   - no saturation point at t (above the cricondentherm): an error wrapping
//     eos.ErrNoSaturation;
//   - a pressure not below the previous one, not positive, or above the
//     saturation point while Start is not above it; a tolerance not
//     positive and below 0.01: ErrBadOptions;
//   - a flash that fails: its *eos.SolveError, wrapped with the pressure;
//   - a bubble point with DewOnly: ErrBubblePoint, with the Depletion
//     holding only T and Dew.
//
// Deplete also works from the bubble point of an oil; Dew then holds it.
func Deplete(fl *eos.Fluid, z []float64, t float64, o DepletionOptions) (*Depletion, error) {
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	if !(t > 0) || math.IsInf(t, 0) {
		return nil, fmt.Errorf("%w: temperature %g K", ErrBadOptions, t)
	}
	if o.PoreCompressibility < 0 || math.IsNaN(o.PoreCompressibility) || math.IsInf(o.PoreCompressibility, 0) {
		return nil, fmt.Errorf("%w: pore compressibility %g 1/Pa", ErrBadOptions, o.PoreCompressibility)
	}
	tol := o.Tolerance
	if tol == 0 {
		tol = DefaultTolerance
	}
	if !(tol > 0 && tol < 0.01) {
		return nil, fmt.Errorf("%w: tolerance %g, want above 0 and below 0.01", ErrBadOptions, o.Tolerance)
	}
	sat, err := eos.NewSaturator(fl, o.Settings).Upper(t, z)
	if err != nil {
		return nil, &eos.StateError{What: "saturation point", T: t, Err: err}
	}
	pd := sat.P
	if o.DewOnly && sat.Type == eos.Bubble {
		return &Depletion{T: t, Dew: sat}, &eos.StateError{What: "saturation point", T: t, P: pd, Err: ErrBubblePoint}
	}
	if o.Start > pd && o.Start <= pd*(1+atSaturation) {
		o.Start = 0 // the dew point itself
	}
	steps, err := o.pressures(pd)
	if err != nil {
		return nil, err
	}
	d := &Depletion{T: t, Dew: sat, Adaptive: o.Adaptive}
	if o.Adaptive {
		d.Tolerance = tol
	}
	var sep *Separator
	if o.Train != nil {
		if sep, err = NewSeparator(fl, *o.Train, o.Settings); err != nil {
			return nil, err
		}
	}
	c := newCell(fl, t, &o)
	if sep != nil && o.Adaptive {
		sr, err := sep.Separate(z)
		if err != nil {
			return nil, fmt.Errorf("surface yield of the feed: %w", err)
		}
		if sr.OilMoles > 0 && sr.GasMoles > 0 {
			c.toOil = make([]float64, len(z))
			for i := range z {
				if z[i] > 0 {
					c.toOil[i] = math.Min(1, sr.OilMoles*sr.Oil[i]/z[i])
				}
			}
			c.oil0, c.gas0 = sr.OilMoles, sr.GasMoles
		}
	}

	// The cell: one mole of feed at the start pressure.
	c.start = pd
	if o.Start > pd {
		c.start = o.Start
	}
	var first *cellState
	if c.start == pd {
		c.v0 = sat.Feed.V
		if first, err = c.dewState(sat, z, 1); err != nil {
			return nil, err
		}
	} else {
		total, vol, err := c.flash(c.start, z)
		if err != nil {
			return nil, &eos.StateError{What: "the feed at the start", T: t, P: c.start, Err: err}
		}
		if c.res.Phases != 1 {
			return nil, &eos.StateError{What: "the feed at the start", T: t, P: c.start, Err: fmt.Errorf("%w: two phases there, above the saturation pressure", ErrNotDew)}
		}
		c.v0 = vol
		first = &cellState{vCell: vol, n: append([]float64(nil), z...)}
		if err := c.fill(first, c.start, total, vol); err != nil {
			return nil, err
		}
	}
	d.CellVolume = c.v0

	// Above and at the dew point the cell holds one phase and produces the
	// feed: every step is exact.
	hist := []stepRecord{{st: first, report: true}}
	k := 0
	for ; k < len(steps) && steps[k] >= pd; k++ {
		a := hist[len(hist)-1].st
		var b *cellState
		var dn float64
		if steps[k] == pd {
			v, err := c.volume(pd)
			if err != nil {
				return d, err
			}
			if b, err = c.dewState(sat, z, v/sat.Feed.V); err != nil {
				return d, err
			}
			dn = a.total - b.total
		} else if b, dn, err = c.step(a, steps[k]); err != nil {
			return d, err
		}
		if dn < 0 {
			return d, &eos.StateError{What: "the depletion", T: t, P: steps[k], Err: fmt.Errorf("%w: the single-phase cell contents shrink below the cell volume", ErrNotDew)}
		}
		hist = append(hist, stepRecord{st: b, dN: dn, avg: append([]float64(nil), a.s...), report: true})
	}
	below := steps[k:]
	dew := hist[len(hist)-1].st
	var rest []stepRecord
	if o.Adaptive {
		var it integration
		rest, it, err = c.integrate(dew, below, tol, false)
		d.IntegrationSteps, d.RejectedSteps = it.steps, it.rejected
		if err != nil {
			return d, err
		}
		rest = rest[1:]
	} else {
		a := dew
		for _, p := range below {
			b, dn, err := c.step(a, p)
			if err != nil {
				return d, err
			}
			rest = append(rest, stepRecord{st: b, dN: dn, avg: b.s, phiAvg: b.phi, report: true})
			a = b
		}
	}
	hist = append(hist, rest...)
	defer func() { d.Flashes = c.flashes }()
	if err := d.report(c, hist, sep, o.Train); err != nil {
		return d, err
	}
	if !o.SkipMaxDropout {
		cont := hist[len(hist)-len(rest)-1:]
		if !o.Adaptive && len(below) > 0 {
			if cont, _, err = c.integrate(dew, below[len(below)-1:], searchTolerance, true); err != nil {
				return d, fmt.Errorf("search for the maximum liquid dropout: %w", err)
			}
		}
		if d.MaxDropout, d.MaxDropoutP, err = c.maxDropout(cont); err != nil {
			return d, err
		}
		if d.MaxDropout == 0 {
			d.MaxDropoutP = d.Steps[0].P
		}
	}
	return d, nil
}

// report turns the steps of a depletion into d.Steps: one per reported
// pressure, with the sums of the steps since the one before. Every step's
// produced stream goes through sep when there is one.
func (d *Depletion) report(c *cell, hist []stepRecord, sep *Separator, tr *Train) error {
	n := len(c.zc)
	var std Conditions
	if tr != nil {
		std = tr.StandardConditions()
	}
	produced := make([]float64, n) // cumulative moles of each component
	var perr []float64             // their estimated error
	if d.Adaptive {
		perr = make([]float64, n)
	}
	var surf SurfaceStep
	lastProduced := make([]float64, n)
	var stepN, liqOut, gasV, oilV, gasN, gasM float64
	sub := 0
	for _, r := range hist {
		if r.dN > 0 {
			for i := range produced {
				produced[i] += r.dN * r.avg[i]
			}
			stepN += r.dN
			liqOut += r.dN * r.phiAvg
			sub++
			if perr != nil && r.err != nil {
				for i := range perr {
					perr[i] += r.err[i]
				}
			}
			if sep != nil {
				sr, err := sep.Separate(r.avg)
				if err != nil {
					return &eos.StateError{What: "surface yield of the stream produced", P: r.st.p, Err: err}
				}
				surf.CumGas += r.dN * sr.GasVolume
				surf.CumOil += r.dN * sr.OilVolume
				surf.CumWetGas += r.dN * eos.R * std.T / std.P
				surf.CumGasMoles += r.dN * sr.GasMoles
				surf.CumOilMoles += r.dN * sr.OilMoles
				gasV += r.dN * sr.GasVolume
				oilV += r.dN * sr.OilVolume
				gasN += r.dN * sr.GasMoles
				gasM += r.dN * sr.GasMoles * sr.GasM
				if r.err != nil {
					// the error of the step's moles, split as the step's stream was
					vg := eos.R * std.T / std.P
					for i, e := range r.err {
						if r.avg[i] <= 0 {
							continue
						}
						toOil := 0.0
						if sr.OilMoles > 0 {
							toOil = sr.OilMoles * sr.Oil[i] / r.avg[i]
							surf.CumOilError += e * toOil * sr.OilVolume / sr.OilMoles
						}
						surf.CumGasError += e * (1 - toOil) * vg
					}
				}
			}
		}
		if !r.report {
			continue
		}
		s := r.st
		st := DepletionStep{
			P: s.p, TwoPhase: s.phases == 2 && !s.dew, LiquidDropout: s.dropout,
			Produced: 1 - s.total, StepProduced: stepN,
			Gas: s.gas, ZGas: s.gas.Z, ZTwoPhase: s.p * s.vCell / (s.total * eos.R * d.T),
			GasViscosity: s.muG, Y: append([]float64(nil), s.y...),
			LiquidOut: liqOut, CellVolume: s.vCell, Cell: append([]float64(nil), s.n...),
			Substeps: sub,
		}
		if st.TwoPhase {
			st.Liquid, st.X = s.liq, append([]float64(nil), s.x...)
			st.LiquidMoles = s.total * (1 - s.beta)
			st.LiquidViscosity, st.LiquidFlow = s.muL, s.fL
		}
		st.Stream = st.Y
		if stepN > 0 {
			st.Stream = make([]float64, n)
			for i := range st.Stream {
				st.Stream[i] = (produced[i] - lastProduced[i]) / stepN
			}
		}
		if perr != nil {
			st.ProducedError = append([]float64(nil), perr...)
		}
		if sep != nil {
			if gasV > 0 {
				surf.CGR = oilV / gasV
			} else if oilV > 0 {
				surf.CGR = math.Inf(1)
			} else {
				surf.CGR = 0
			}
			surf.GasGravity = 0
			if gasN > 0 {
				surf.GasGravity = gasM / gasN / MolarMassAir
			}
			sf := surf
			st.Surface = &sf
		}
		d.Steps = append(d.Steps, st)
		copy(lastProduced, produced)
		stepN, liqOut, gasV, oilV, gasN, gasM, sub = 0, 0, 0, 0, 0, 0, 0
	}
	return nil
}

// pressures returns the steps below the start: the user's list, checked, or
// the default even steps from the dew point pd to the abandonment pressure.
// A start above pd adds the dew point itself as a step.
func (o DepletionOptions) pressures(pd float64) ([]float64, error) {
	var ps []float64
	if o.Start > pd {
		ps = append(ps, pd)
	}
	if o.Pressures != nil {
		prev := math.Inf(1)
		if o.Start > pd {
			prev = o.Start
		}
		for k, p := range o.Pressures {
			switch {
			case !(p > 0) || math.IsInf(p, 0):
				return nil, fmt.Errorf("%w: pressure %d is %g Pa", ErrBadOptions, k+1, p)
			case p >= prev:
				return nil, fmt.Errorf("%w: pressure %d (%.6g Pa) is not below the one before (%.6g Pa)", ErrBadOptions, k+1, p, prev)
			case p >= pd && o.Start <= pd:
				return nil, fmt.Errorf("%w: pressure %d (%.6g Pa) is not below the saturation pressure %.6g Pa, where the depletion starts", ErrBadOptions, k+1, p, pd)
			}
			prev = p
		}
		// user steps above pd come before the dew point itself
		var above, below []float64
		for _, p := range o.Pressures {
			if p > pd {
				above = append(above, p)
			} else if p < pd {
				below = append(below, p)
			}
		}
		if o.Start > pd {
			ps = append(append(above, pd), below...)
		} else {
			ps = below
		}
		return ps, nil
	}
	steps := o.Steps
	if steps == 0 {
		steps = 8
	}
	if steps < 1 || steps > 1000 {
		return nil, fmt.Errorf("%w: %d steps, want 1 to 1000", ErrBadOptions, o.Steps)
	}
	if !(o.Abandonment > 0 && o.Abandonment < pd) {
		return nil, fmt.Errorf("%w: abandonment pressure %.6g Pa, want above zero and below the saturation pressure %.6g Pa", ErrBadOptions, o.Abandonment, pd)
	}
	for k := 1; k < steps; k++ {
		ps = append(ps, pd-(pd-o.Abandonment)*float64(k)/float64(steps))
	}
	ps = append(ps, o.Abandonment)
	return ps, nil
}
