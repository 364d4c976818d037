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
	// the dew point produce feed-composition gas. Zero starts at the dew point.
	Start    float64
	Train    *Train // when set, each step's produced stream goes through the train
	Settings *eos.Settings

	// PoreCompressibility is the effective compressibility of the cell (the
	// hydrocarbon pore volume), 1/Pa: at pressure p the cell volume is
	// V_start [1 − c (p_start − p)]. For rock and connate water,
	// c = (c_f + c_w S_w)/(1 − S_w) (Havlena and Odeh 1963). Zero keeps the
	// laboratory's constant volume.
	PoreCompressibility float64
	// MobileLiquid produces, with the gas, the liquid above
	// CriticalLiquid (a fraction of the cell volume): the modified depletion
	// in which condensate beyond its critical saturation flows.
	MobileLiquid   bool
	CriticalLiquid float64
}

// SurfaceStep is the surface yield of one depletion step's produced gas.
type SurfaceStep struct {
	CGR        float64 // stock-tank oil over surface gas of this step, standard m³/m³
	GasGravity float64 // surface gas specific gravity (air = 1)
	CumGas     float64 // cumulative surface (sales) gas, standard m³ per mole of initial fluid
	CumOil     float64 // cumulative stock-tank oil, standard m³ per mole of initial fluid
	// CumWetGas is the cumulative produced well stream as an ideal-gas
	// standard volume, m³ per mole of initial fluid.
	CumWetGas float64
	// CumGasMoles and CumOilMoles are the cumulative surface gas and
	// stock-tank oil, moles per mole of initial fluid.
	CumGasMoles, CumOilMoles float64
}

// DepletionStep is the cell after the gas removal at one pressure. Amounts are
// per mole of fluid initially in the cell.
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
	Y             []float64      // equilibrium gas composition
	X             []float64      // liquid composition (nil when single phase)
	Stream        []float64      // composition of all that was removed (Y unless liquid flowed too)
	LiquidMoles   float64        // moles of liquid in the cell
	LiquidOut     float64        // moles of liquid removed at this step (MobileLiquid only)
	CellVolume    float64        // cell volume at this pressure, m³ per mole of initial fluid
	Cell          []float64      // moles of each component left in the cell
	Surface       *SurfaceStep   // nil without a Train
}

// Depletion is a simulated constant-volume depletion.
type Depletion struct {
	T          float64        // K
	Dew        eos.Saturation // the upper dew point at T
	CellVolume float64        // m³ per mole of initial fluid
	Steps      []DepletionStep
	// MaxDropout is the largest liquid dropout (fraction of the cell volume)
	// and MaxDropoutP its pressure, from a parabola through the largest
	// reported step and its neighbours (the step itself at an end).
	MaxDropout, MaxDropoutP float64
}

// Errors of Deplete and Expand, wrapped with the detail.
var (
	ErrBadOptions = errors.New("cvd: invalid experiment options")
	ErrNotDew     = errors.New("cvd: depletion cannot continue")
)

// Deplete simulates a constant-volume depletion of feed z at t (K), the
// laboratory procedure of Whitson and Torp (1983) as an equation-of-state
// calculation (METHODS 8.3). One mole of feed fills the cell at the dew point
// (or at o.Start above it), fixing the cell volume. At each lower pressure the
// cell contents are flashed, and just enough equilibrium gas is removed to
// bring the two phases back to the cell volume; the liquid stays behind.
// Above the dew point the cell holds one phase and the gas removed has the
// feed's composition. Volumes are volume-translated when the fluid is.
//
// Special cases:
//   - no saturation point at t (above the cricondentherm): an error wrapping
//     eos.ErrNoSaturation;
//   - a pressure not below the previous one, not positive, or above the
//     saturation point while Start is not above it: ErrBadOptions;
//   - a flash that fails: its *eos.SolveError, wrapped with the pressure.
//
// Deplete also works from the bubble point of an oil; Dew then holds it.
func Deplete(fl *eos.Fluid, z []float64, t float64, o DepletionOptions) (*Depletion, error) {
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	if !(t > 0) || math.IsInf(t, 0) {
		return nil, fmt.Errorf("%w: temperature %g K", ErrBadOptions, t)
	}
	sat, err := eos.NewSaturator(fl, o.Settings).Upper(t, z)
	if err != nil {
		return nil, fmt.Errorf("cvd: saturation point at %.6g K: %w", t, err)
	}
	pd := sat.P
	steps, err := o.pressures(pd)
	if err != nil {
		return nil, err
	}
	n := fl.N()
	d := &Depletion{T: t, Dew: sat}
	f := eos.NewFlasher(fl, o.Settings)
	var sep *Separator
	var std Conditions
	if o.Train != nil {
		if sep, err = NewSeparator(fl, *o.Train, o.Settings); err != nil {
			return nil, err
		}
		std = o.Train.standard()
	}

	// The cell: one mole of feed at the start pressure.
	start := pd
	if o.Start > pd {
		start = o.Start
	}
	var res eos.FlashResult
	if err := f.Flash(&res, t, start, z); err != nil {
		return nil, fmt.Errorf("cvd: feed at %.6g Pa: %w", start, err)
	}
	if o.PoreCompressibility < 0 || math.IsNaN(o.PoreCompressibility) || o.CriticalLiquid < 0 || o.CriticalLiquid >= 1 {
		return nil, fmt.Errorf("%w: pore compressibility %g 1/Pa and critical liquid fraction %g", ErrBadOptions, o.PoreCompressibility, o.CriticalLiquid)
	}
	if start == pd {
		d.CellVolume = sat.Feed.V
	} else if res.Phases == 1 {
		d.CellVolume = res.V.V
	} else {
		return nil, fmt.Errorf("%w: the feed is two-phase at the start pressure %.6g Pa above the saturation pressure %.6g Pa", ErrNotDew, start, pd)
	}
	cell := append([]float64(nil), z...) // component moles in the cell
	total := 1.0
	var surf SurfaceStep
	first := DepletionStep{
		P: start, Gas: sat.Feed, ZGas: sat.Feed.Z, ZTwoPhase: sat.Feed.Z,
		Y: append([]float64(nil), z...), Cell: append([]float64(nil), z...),
	}
	first.Stream = first.Y
	if start != pd {
		first.Gas, first.ZGas, first.ZTwoPhase = res.V, res.V.Z, res.V.Z
	}
	first.GasViscosity = fl.ViscosityLBC(t, z, first.Gas.V)
	if sep != nil {
		s := surf
		first.Surface = &s
	}
	first.CellVolume = d.CellVolume
	d.Steps = append(d.Steps, first)

	zc := make([]float64, n) // cell composition
	for _, p := range steps {
		for i := range zc {
			zc[i] = cell[i] / total
		}
		if err := f.Flash(&res, t, p, zc); err != nil {
			return d, fmt.Errorf("cvd: flash of the cell at %.6g Pa: %w", p, err)
		}
		vCell := d.CellVolume * (1 - o.PoreCompressibility*(start-p))
		if !(vCell > 0) {
			return d, fmt.Errorf("%w: pore compressibility %g 1/Pa shrinks the cell to nothing at %.6g Pa", ErrBadOptions, o.PoreCompressibility, p)
		}
		st := DepletionStep{P: p, CellVolume: vCell}
		var removed float64
		if res.Phases == 2 {
			// Remove vapour (and, with MobileLiquid, the liquid beyond its
			// critical volume) so that what stays fills the cell again.
			nV, nL := total*res.Beta, total*(1-res.Beta)
			vV, vL := res.V.V, res.L.V
			excess := nV*vV + nL*vL - vCell // volume to remove
			if excess < 0 {
				return d, fmt.Errorf("%w: at %.6g Pa the cell contents fill %.6g of the cell volume; no gas can be removed", ErrNotDew, p, (excess+vCell)/vCell)
			}
			outL := 0.0
			if o.MobileLiquid {
				if lim := o.CriticalLiquid * vCell; nL*vL > lim {
					outL = math.Min(nL*vL-lim, excess) / vL
				}
			}
			outV := (excess - outL*vL) / vV
			if outV > nV {
				return d, fmt.Errorf("%w: at %.6g Pa removing the excess volume would take more vapour than the cell holds", ErrNotDew, p)
			}
			nV -= outV
			nL -= outL
			removed = outV + outL
			for i := range cell {
				cell[i] = nL*res.X[i] + nV*res.Y[i]
			}
			st.TwoPhase = true
			st.LiquidMoles = nL
			st.LiquidOut = outL
			st.LiquidDropout = nL * vL / vCell
			st.Liquid = res.L
			st.X = append([]float64(nil), res.X...)
			st.Gas = res.V
			st.Y = append([]float64(nil), res.Y...)
			st.Stream = make([]float64, n)
			for i := range st.Stream {
				st.Stream[i] = (outV*res.Y[i] + outL*res.X[i]) / removed
			}
		} else {
			// one phase fills the cell: remove it at its own composition
			v := res.V.V
			if res.Single == eos.Liquid {
				v = res.L.V
			}
			after := vCell / v
			removed = total - after
			if removed < 0 {
				return d, fmt.Errorf("%w: at %.6g Pa the single-phase cell contents shrink below the cell volume", ErrNotDew, p)
			}
			for i := range cell {
				cell[i] = after * zc[i]
			}
			st.Gas = res.V
			st.Y = append([]float64(nil), zc...)
			st.Stream = st.Y
		}
		total -= removed
		st.StepProduced = removed
		st.Produced = 1 - total
		st.ZGas = st.Gas.Z
		st.ZTwoPhase = p * vCell / (total * eos.R * t)
		st.GasViscosity = fl.ViscosityLBC(t, st.Y, st.Gas.V)
		st.Cell = append([]float64(nil), cell...)
		if sep != nil {
			sr, err := sep.Separate(st.Stream)
			if err != nil {
				return d, fmt.Errorf("cvd: surface yield of the stream produced at %.6g Pa: %w", p, err)
			}
			surf.CGR = sr.CGR
			surf.GasGravity = sr.GasGravity
			surf.CumGas += removed * sr.GasVolume
			surf.CumOil += removed * sr.OilVolume
			surf.CumWetGas += removed * eos.R * std.T / std.P
			surf.CumGasMoles += removed * sr.GasMoles
			surf.CumOilMoles += removed * sr.OilMoles
			s := surf
			st.Surface = &s
		}
		d.Steps = append(d.Steps, st)
	}
	d.MaxDropout, d.MaxDropoutP = maxDropout(d.Steps)
	return d, nil
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

// maxDropout locates the largest liquid dropout: a parabola in pressure
// through the largest step and its neighbours, or that step at an end of the
// list or where the parabola does not peak between the neighbours.
func maxDropout(steps []DepletionStep) (float64, float64) {
	k := 0
	for i, s := range steps {
		if s.LiquidDropout > steps[k].LiquidDropout {
			k = i
		}
	}
	best, bestP := steps[k].LiquidDropout, steps[k].P
	if k == 0 || k == len(steps)-1 {
		return best, bestP
	}
	x0, x1, x2 := steps[k-1].P, steps[k].P, steps[k+1].P
	y0, y1, y2 := steps[k-1].LiquidDropout, steps[k].LiquidDropout, steps[k+1].LiquidDropout
	// Lagrange parabola through the three points; vertex where its slope vanishes
	d01, d12 := (y1-y0)/(x1-x0), (y2-y1)/(x2-x1)
	a := (d12 - d01) / (x2 - x0)
	if a >= 0 {
		return best, bestP
	}
	b := d01 - a*(x0+x1)
	xv := -b / (2 * a)
	if xv <= math.Min(x0, x2) || xv >= math.Max(x0, x2) {
		return best, bestP
	}
	yv := y1 + (xv-x1)*(d01+a*(xv-x0))
	if yv < best {
		return best, bestP
	}
	return yv, xv
}
