package mbal

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"

	"gonum.org/v1/gonum/interp"

	"dewcell/cvd"
	"dewcell/eos"
)

// The rate-time forecast of a gas-condensate field: wells with a
// back-pressure deliverability, a plateau of sales gas, and a reservoir
// model that says, for a withdrawal, what the pressure becomes and what the
// produced streams are. The forecast knows nothing of how the model works:
// the depletion of Recover, tabulated, is one model (DepletionModel); a
// model of pressure maintenance is another.
//
// References:
//
//   - Rawlins, E.L. and Schellhardt, M.A. (1936). Back-pressure data on
//     natural-gas wells and their application to production practices. US
//     Bureau of Mines Monograph 7 (the back-pressure equation
//     q = C (p_R² − p_wf²)^n, 0.5 ≤ n ≤ 1).
//   - Fritsch, F.N. and Butland, J. (1984). A method for constructing local
//     monotone piecewise cubic interpolants. SIAM J. Sci. Stat. Comput.
//     5(2), 300–304 (the pressure against the cumulative withdrawal).

// Streams are cumulative produced volumes since the start of production:
// gas in standard m³, liquids in m³ at standard conditions, energy in J of
// gross heating value.
type Streams struct {
	WetGas       float64 // the well stream as an ideal gas
	SeparatorGas float64 // the separator train's gas, the plant's inlet
	Condensate   float64 // stock-tank condensate
	SalesGas     float64 // the plant's sales gas (the separator gas without a plant)
	SalesEnergy  float64 // gross heating value of the sales gas, J
	NGL          float64 // natural-gas liquids recovered by the plant
	Fuel         float64 // gas burnt in the plant
	Removed      float64 // gas taken out by the plant (CO2, H2S, ...)
	Injected     float64 // gas injected (zero for a depletion)
	Water        float64 // water injected, m³
	// Returned is the plant's outlet gas sent back to the reservoir (part
	// of Injected): the plant's outlet is SalesGas + Returned.
	Returned float64
}

// sub returns s − o, field by field.
func (s Streams) sub(o Streams) Streams {
	return Streams{s.WetGas - o.WetGas, s.SeparatorGas - o.SeparatorGas, s.Condensate - o.Condensate, s.SalesGas - o.SalesGas,
		s.SalesEnergy - o.SalesEnergy, s.NGL - o.NGL, s.Fuel - o.Fuel, s.Removed - o.Removed, s.Injected - o.Injected, s.Water - o.Water, s.Returned - o.Returned}
}

// lerp returns s + f (o − s).
func (s Streams) lerp(o Streams, f float64) Streams {
	d := o.sub(s)
	return Streams{s.WetGas + f*d.WetGas, s.SeparatorGas + f*d.SeparatorGas, s.Condensate + f*d.Condensate, s.SalesGas + f*d.SalesGas,
		s.SalesEnergy + f*d.SalesEnergy, s.NGL + f*d.NGL, s.Fuel + f*d.Fuel, s.Removed + f*d.Removed, s.Injected + f*d.Injected, s.Water + f*d.Water, s.Returned + f*d.Returned}
}

// ReservoirState is the reservoir after some production: what a reservoir
// model reports to the forecast. Values of this type do not change; a model
// returns a new one for every withdrawal.
type ReservoirState struct {
	P   float64 // average reservoir pressure, Pa
	Cum Streams // cumulative produced and injected
	// OutletPerWet is the plant's outlet gas (sold, and returned to the
	// reservoir while cycling) per standard m³ of wet gas of the stream
	// produced at this state: what converts the plateau into a withdrawal.
	OutletPerWet float64
	// Exhausted says the model can give no more: the pressure has reached
	// the abandonment pressure.
	Exhausted bool
	// at is the model's own position (for DepletionModel, the cumulative
	// wet gas); x is what else a model keeps (the cells of CyclingModel).
	at float64
	x  any
}

// A ReservoirModel answers the forecast's one question: from a state, what
// follows a further withdrawal of wet gas and injection of gas.
type ReservoirModel interface {
	// Initial is the state before production.
	Initial() ReservoirState
	// Advance returns the state after withdraw standard m³ of wet gas are
	// produced and inject standard m³ of gas injected from s. A withdrawal
	// beyond what the model can give stops at its end, with Exhausted set.
	Advance(s ReservoirState, withdraw, inject float64) (ReservoirState, error)
	// DewPressure is the pressure below which liquid drops out in the
	// reservoir, Pa (0 when none).
	DewPressure() float64
}

// Processed is what the gas plant makes of a quantity of separator gas, in
// the units of Streams, and the sales gas's composition (mole fractions;
// nil when the processor does not give it).
type Processed struct {
	SalesGas, SalesEnergy, NGL, Fuel, Removed float64
	SalesComposition                          []float64
}

// A ProductiveModel is a ReservoirModel that shuts in part of the wells in
// some states (the producers a water front has reached): the field's
// deliverability is multiplied by ProductivityFactor, 0 to 1.
type ProductiveModel interface {
	ReservoirModel
	ProductivityFactor(s ReservoirState) float64
}

// A TimedModel is a ReservoirModel whose response depends on the date (a
// scheduled change of operation, such as the end of gas cycling): the
// forecast calls AdvanceAt with the date the withdrawal starts.
type TimedModel interface {
	ReservoirModel
	AdvanceAt(s ReservoirState, withdraw, inject float64, at time.Time) (ReservoirState, error)
}

// A pressureModel can advance a state for its pressure alone: the state it
// returns has the pressure, the exhaustion and the model's own contents of
// AdvanceAt's, but the cumulative volumes and the outlet per wet gas of s
// (the produced stream is not taken through the separators and the plant).
// The midpoint rule's half step needs no more where the wells, not the
// plateau, set the rate.
type pressureModel interface {
	advancePressure(s ReservoirState, withdraw, inject float64, at time.Time) (ReservoirState, error)
}

// A GasProcessor takes moles of separator gas of composition gas (mole
// fractions over the fluid's components) through the gas plant.
type GasProcessor func(gas []float64, moles float64) (Processed, error)

// DepletionModel is the reservoir as the depletion of Recover: the
// pressure and the cumulative streams tabulated against the cumulative
// wet gas at the recovery's reported pressures, the pressure interpolated
// between them by a monotone cubic (Fritsch–Butland), the streams linearly
// (the stream of each interval is that of its step, so the cumulatives are
// linear in the wet gas between the reported pressures). It injects
// nothing.
type DepletionModel struct {
	balance float64   // the largest relative component-balance error of the depletion
	w, p    []float64 // cumulative wet gas, increasing; pressure, falling
	cum     []Streams // at each node
	pOfW    interp.FritschButland
	dew     float64
}

// ErrForecast reports an invalid forecast setting or model input.
var ErrForecast = errors.New("invalid forecast input")

// NewDepletionModel tabulates the recovery rec of fl through the separator
// train tr and the gas plant proc (nil: the separator gas is sold as it is,
// and its energy is not known). rec should report many pressures (the
// forecast interpolates between them): DepletionGrid gives a grid.
func NewDepletionModel(fl *eos.Fluid, rec *Recovery, tr cvd.Train, proc GasProcessor, s *eos.Settings) (*DepletionModel, error) {
	if rec == nil || rec.Depletion == nil || len(rec.Steps) < 2 || len(rec.Steps) != len(rec.Depletion.Steps) {
		return nil, fmt.Errorf("%w: the recovery reports fewer than two pressures", ErrForecast)
	}
	sep, err := cvd.NewSeparator(fl, tr, s)
	if err != nil {
		return nil, err
	}
	n := rec.InPlace.Moles
	vsc := tr.StandardConditions().IdealGasVolume()
	m := &DepletionModel{dew: rec.Depletion.Dew.P}
	// The component balance of the depletion at every reported pressure:
	// what was in the cell at the start against what was produced and
	// what is left.
	d := rec.Depletion
	init := d.Steps[0].Cell
	produced := make([]float64, len(init))
	for _, ds := range d.Steps[1:] {
		for i := range produced {
			produced[i] += ds.StepProduced * ds.Stream[i]
		}
		for i, v := range init {
			if v > 0 && ds.Cell != nil {
				m.balance = math.Max(m.balance, math.Abs(v-produced[i]-ds.Cell[i])/v)
			}
		}
	}
	var acc Streams
	for k, st := range rec.Steps {
		ds := rec.Depletion.Steps[k]
		if k > 0 && ds.StepProduced > 0 {
			moles := n * ds.StepProduced
			sr, err := sep.Separate(ds.Stream)
			if err != nil {
				return nil, fmt.Errorf("the stream produced down to %.6g Pa through the separators: %w", st.P, err)
			}
			gasMoles := moles * sr.GasMoles
			pr := Processed{SalesGas: gasMoles * vsc}
			if proc != nil && gasMoles > 0 {
				if pr, err = proc(sr.Gas, gasMoles); err != nil {
					return nil, fmt.Errorf("the gas produced down to %.6g Pa through the plant: %w", st.P, err)
				}
			}
			acc.SeparatorGas += gasMoles * vsc
			acc.SalesGas += pr.SalesGas
			acc.SalesEnergy += pr.SalesEnergy
			acc.NGL += pr.NGL
			acc.Fuel += pr.Fuel
			acc.Removed += pr.Removed
		}
		acc.WetGas, acc.Condensate = st.WetGas, st.Condensate
		if k > 0 && !(st.WetGas > m.w[len(m.w)-1]) {
			continue // no production since the pressure before
		}
		m.w, m.p, m.cum = append(m.w, st.WetGas), append(m.p, st.P), append(m.cum, acc)
	}
	if len(m.w) < 2 {
		return nil, fmt.Errorf("%w: the recovery produces nothing", ErrForecast)
	}
	if err := m.pOfW.Fit(m.w, m.p); err != nil {
		return nil, fmt.Errorf("%w: pressure against the cumulative wet gas: %v", ErrForecast, err)
	}
	return m, nil
}

// DepletionGrid is the reported pressures NewDepletionModel wants: steps
// even steps from pi down to the abandonment pressure pa, and the dew
// point pd when it lies between (the reservoir's compressibility changes
// there).
func DepletionGrid(pi, pa, pd float64, steps int) []float64 {
	var ps []float64
	for k := 1; k < steps; k++ {
		ps = append(ps, pi-(pi-pa)*float64(k)/float64(steps))
	}
	ps = append(ps, pa) // exactly, not rounded below it
	if pd < pi && pd > pa {
		ps = append(ps, pd)
		sort.Sort(sort.Reverse(sort.Float64Slice(ps)))
		// A node within 1e-6 of the span of the dew point would make an
		// interval of nothing.
		out := ps[:1]
		for _, p := range ps[1:] {
			if out[len(out)-1]-p > 1e-6*(pi-pa) {
				out = append(out, p)
			}
		}
		ps = out
	}
	return ps
}

// Initial is the reservoir before production.
func (m *DepletionModel) Initial() ReservoirState { return m.state(0) }

// DewPressure is the upper dew point at the reservoir temperature.
func (m *DepletionModel) DewPressure() float64 { return m.dew }

// BalanceError is the largest relative error of the component balance of
// the depletion over its reported pressures: initial = produced + left.
func (m *DepletionModel) BalanceError(ReservoirState) float64 { return m.balance }

// Limit is the cumulative wet gas at the abandonment pressure.
func (m *DepletionModel) Limit() float64 { return m.w[len(m.w)-1] }

// Advance withdraws from s; a depletion injects nothing.
func (m *DepletionModel) Advance(s ReservoirState, withdraw, inject float64) (ReservoirState, error) {
	if inject != 0 {
		return ReservoirState{}, fmt.Errorf("%w: a depletion injects no gas", ErrForecast)
	}
	if withdraw < 0 || math.IsNaN(withdraw) {
		return ReservoirState{}, fmt.Errorf("%w: withdrawal %g, want 0 or more", ErrForecast, withdraw)
	}
	return m.state(s.at + withdraw), nil
}

// state is the reservoir after w standard m³ of wet gas.
func (m *DepletionModel) state(w float64) ReservoirState {
	last := len(m.w) - 1
	if w >= m.w[last] {
		st := ReservoirState{P: m.p[last], Cum: m.cum[last], at: m.w[last], Exhausted: true}
		st.OutletPerWet = m.slope(last - 1)
		return st
	}
	k := sort.SearchFloat64s(m.w, w) // m.w[k-1] < w <= m.w[k]
	if k == 0 {
		k = 1
	}
	f := (w - m.w[k-1]) / (m.w[k] - m.w[k-1])
	st := ReservoirState{P: m.pOfW.Predict(w), Cum: m.cum[k-1].lerp(m.cum[k], f), at: w, OutletPerWet: m.slope(k - 1)}
	if w <= 0 {
		st.P = m.p[0]
	}
	return st
}

// slope is the sales gas per wet gas over interval k (nodes k, k+1).
func (m *DepletionModel) slope(k int) float64 {
	return (m.cum[k+1].SalesGas - m.cum[k].SalesGas) / (m.w[k+1] - m.w[k])
}

// Wells are the producing wells and their deliverability: a back-pressure
// equation q = C (p_R² − p_wf²)^n per well (Rawlins and Schellhardt 1936),
// C from one test, times BankFactor once the reservoir is below its dew
// point (the condensate bank round the wells), at the minimum flowing
// pressure.
type Wells struct {
	Count int
	Start time.Time
	// TestRate is a well's wet-gas rate, standard m³/s, at the reservoir
	// pressure TestPR and the flowing pressure TestPwf (Pa).
	TestRate, TestPR, TestPwf float64
	Exponent                  float64 // n, 0.5 to 1
	MinPwf                    float64 // Pa
	BankFactor                float64 // (0, 1]; 0 means 1
	Add                       []WellAdd
}

// A WellAdd is Count more wells producing from Date.
type WellAdd struct {
	Date  time.Time
	Count int
}

// C is the back-pressure coefficient, standard m³/s per Pa^(2n).
func (w Wells) C() float64 {
	return w.TestRate / math.Pow(w.TestPR*w.TestPR-w.TestPwf*w.TestPwf, w.Exponent)
}

// Deliverability is one well's wet-gas rate at reservoir pressure p,
// standard m³/s, belowDew when the reservoir is below its dew point.
func (w Wells) Deliverability(p float64, belowDew bool) float64 {
	d := p*p - w.MinPwf*w.MinPwf
	if !(d > 0) {
		return 0
	}
	q := w.C() * math.Pow(d, w.Exponent)
	if belowDew && w.BankFactor > 0 {
		q *= w.BankFactor
	}
	return q
}

// CountAt is the number of wells producing at t.
func (w Wells) CountAt(t time.Time) int {
	if t.Before(w.Start) {
		return 0
	}
	n := w.Count
	for _, a := range w.Add {
		if !t.Before(a.Date) {
			n += a.Count
		}
	}
	return n
}

// ForecastOptions set the field's targets and the forecast's horizon.
type ForecastOptions struct {
	// Plateau is the field's target of the plant's outlet gas, standard
	// m³/s: the sales gas, and while cycling the gas returned as well (the
	// plant's capacity).
	Plateau float64
	Uptime  float64 // fraction of the time the wells produce, (0, 1]
	Minimum float64 // the plant's outlet-gas rate below which the field stops, standard m³/s
	End     time.Time
	// StepMonths is the reporting step, in calendar months (1 to 12).
	StepMonths int
	// Inject is gas injected besides what the model returns itself (bought
	// gas of a cycling scenario), standard m³/s.
	Inject float64
	// Midpoint integrates each substep by the explicit midpoint rule (two
	// evaluations of the model) instead of the classical Runge–Kutta
	// method (four): for a costly model on substeps short against the
	// decline.
	Midpoint bool
	// Substep is the integration step; 0 means one day. The rate is
	// integrated with the classical Runge–Kutta method on it, whatever the
	// reporting step.
	Substep time.Duration
}

// StopReason says why a forecast ended.
type StopReason int

const (
	StopHorizon     StopReason = iota // the forecast's end date
	StopMinimumRate                   // the sales-gas rate fell below the minimum
	StopAbandonment                   // the reservoir reached the abandonment pressure
	StopNoWells                       // no well can flow: the pressure is at the minimum flowing pressure
	StopShutIn                        // the model has shut in every producer (the water front has reached them)
)

func (s StopReason) String() string {
	switch s {
	case StopHorizon:
		return "the end of the forecast"
	case StopMinimumRate:
		return "the sales-gas rate fell below the minimum"
	case StopAbandonment:
		return "the reservoir reached the abandonment pressure"
	case StopNoWells:
		return "the wells cannot flow at the minimum flowing pressure"
	case StopShutIn:
		return "the producers are shut in: the water has reached them"
	}
	return fmt.Sprintf("StopReason(%d)", int(s))
}

// ForecastStep is the field over one reporting step: the state at its end
// and the step's average rates (per calendar day of the step, standard m³/s
// and m³/s).
type ForecastStep struct {
	Start, End time.Time
	Wells      int // producing at the end of the step (at its start for the last)
	State      ReservoirState
	// Rates are the step's produced volumes over its length.
	Rates Streams
	// Deliverability is the field's wet-gas deliverability at the end of
	// the step (with uptime), standard m³/s; OnPlateau says the sales-gas
	// target was met throughout the step.
	Deliverability float64
	OnPlateau      bool
	WellYears      float64 // producing well-years in the step
}

// ForecastYear is a calendar year of a forecast: its volumes (the
// substeps never straddle 1 January), the producing time and well-years,
// and the reservoir at its end.
type ForecastYear struct {
	Year              int
	Volumes           Streams
	WellYears         float64
	ProducingFraction float64 // of the calendar year that some well produced
	End               ReservoirState
	Wells             int           // producing at the end of the year
	producing         time.Duration // the time some well produced, exactly
}

// Forecast is a rate-time forecast.
type Forecast struct {
	Steps []ForecastStep
	Years []ForecastYear
	// FirstProduction is the first day a well produced (zero when none
	// did).
	FirstProduction time.Time
	Stop            StopReason
	// StopDate is when production ends; PlateauEnd when the sales-gas
	// target was last met (zero when it never was).
	StopDate, PlateauEnd time.Time
	Final                ReservoirState
}

// RunForecast forecasts the field of wells on the reservoir model m with
// o's targets, from the wells' start to the first of the horizon, the
// minimum rate and the model's exhaustion (abandonment pressure). At every
// instant the wet-gas rate is the lesser of the wells' deliverability at
// the reservoir pressure (times the uptime) and the withdrawal that yields
// the plateau of outlet gas (ForecastOptions.Plateau) at the current stream; the cumulative withdrawal is
// integrated in time by the classical fourth-order Runge–Kutta method on
// substeps of a day, so that the reporting step does not change the result.
func RunForecast(m ReservoirModel, wells Wells, o ForecastOptions) (*Forecast, error) {
	switch {
	case wells.TestRate <= 0 || wells.TestPR <= wells.TestPwf || wells.TestPwf <= 0:
		return nil, fmt.Errorf("%w: the well test needs a rate above 0 at a flowing pressure between 0 and the reservoir pressure", ErrForecast)
	case wells.Exponent < 0.5 || wells.Exponent > 1:
		return nil, fmt.Errorf("%w: deliverability exponent %g, want 0.5 to 1", ErrForecast, wells.Exponent)
	case wells.MinPwf <= 0:
		return nil, fmt.Errorf("%w: minimum flowing pressure %g Pa, want above 0", ErrForecast, wells.MinPwf)
	case wells.BankFactor < 0 || wells.BankFactor > 1:
		return nil, fmt.Errorf("%w: condensate bank factor %g, want (0, 1]", ErrForecast, wells.BankFactor)
	case o.Inject < 0 || math.IsNaN(o.Inject):
		return nil, fmt.Errorf("%w: injection %g, want 0 or more", ErrForecast, o.Inject)
	case !(o.Plateau > 0) || !(o.Uptime > 0 && o.Uptime <= 1) || o.Minimum < 0 || o.Minimum >= o.Plateau:
		return nil, fmt.Errorf("%w: plateau %g, uptime %g, minimum %g: want a plateau above 0, an uptime in (0, 1] and a minimum below the plateau", ErrForecast, o.Plateau, o.Uptime, o.Minimum)
	case o.StepMonths < 1 || o.StepMonths > 12:
		return nil, fmt.Errorf("%w: reporting step of %d months, want 1 to 12", ErrForecast, o.StepMonths)
	case !o.End.After(wells.Start):
		return nil, fmt.Errorf("%w: the forecast ends %s, not after the wells start (%s)", ErrForecast, o.End.Format(time.DateOnly), wells.Start.Format(time.DateOnly))
	}
	h := o.Substep
	if h == 0 {
		h = 24 * time.Hour
	}
	dew := m.DewPressure()
	// rate is the wet-gas rate at state s with n wells, and the field's
	// deliverability.
	fieldDeliverability := func(s ReservoirState, n int) float64 {
		q := float64(n) * wells.Deliverability(s.P, dew > 0 && s.P < dew) * o.Uptime
		if pm, ok := m.(ProductiveModel); ok {
			q *= pm.ProductivityFactor(s)
		}
		return q
	}
	rate := func(s ReservoirState, n int) (q, deliv float64, plateau bool) {
		if s.Exhausted {
			return 0, 0, false
		}
		deliv = fieldDeliverability(s, n)
		target := math.Inf(1)
		if s.OutletPerWet > 0 {
			target = o.Plateau / s.OutletPerWet
		}
		if target <= deliv {
			return target, deliv, true
		}
		return deliv, deliv, false
	}
	f := &Forecast{}
	s := m.Initial()
	t := wells.Start
	stepStart, stepState := t, s
	var wellSeconds float64
	onPlateau := true
	bend := 0.0       // plateauStep's, from one substep to the next
	var now time.Time // the start of the substep, for a TimedModel
	var sub float64   // the substep's length, s, for the injection of a stage
	advanceFor := func(s ReservoirState, dw, sec float64) (ReservoirState, error) {
		inj := o.Inject * sec
		if tm, ok := m.(TimedModel); ok {
			return tm.AdvanceAt(s, math.Max(dw, 0), inj, now)
		}
		return m.Advance(s, math.Max(dw, 0), inj)
	}
	advance := func(s ReservoirState, dw float64) (ReservoirState, error) { return advanceFor(s, dw, sub) }
	// halfStep is the midpoint rule's half of a substep of sec seconds from
	// s at rate q1 with n wells, and the rate there. Where the model can
	// advance for the pressure alone and the wells there deliver less than
	// the plateau's withdrawal could be at any outlet per wet gas up to
	// max(1, 1.1 × the start's) (the plant's outlet is at most its inlet,
	// and the stream's yield does not change by a tenth in half a substep),
	// the wells set the rate without the stream's yield.
	halfStep := func(s ReservoirState, q1, sec float64, n int) (ReservoirState, float64, error) {
		if pm, ok := m.(pressureModel); ok {
			s2, err := pm.advancePressure(s, math.Max(q1*sec/2, 0), o.Inject*sec/2, now)
			if err != nil {
				return s2, 0, err
			}
			if s2.Exhausted {
				return s2, 0, nil
			}
			if deliv := fieldDeliverability(s2, n); deliv < o.Plateau/math.Max(1, 1.1*s.OutletPerWet) {
				return s2, deliv, nil
			}
		}
		s2, err := advanceFor(s, q1*sec/2, sec/2)
		if err != nil {
			return s2, 0, err
		}
		q2, _, _ := rate(s2, n)
		return s2, q2, nil
	}
	year := func(t time.Time) *ForecastYear {
		if n := len(f.Years); n > 0 && f.Years[n-1].Year == t.Year() {
			return &f.Years[n-1]
		}
		f.Years = append(f.Years, ForecastYear{Year: t.Year()})
		return &f.Years[len(f.Years)-1]
	}
	for k, stop := 1, false; !stop; k++ {
		stepEnd := addMonths(wells.Start, k*o.StepMonths)
		if stepEnd.After(o.End) {
			stepEnd = o.End
		}
		for t.Before(stepEnd) && !stop {
			dt := h
			if next := t.Add(h); next.After(stepEnd) {
				dt = stepEnd.Sub(t)
			}
			if jan := time.Date(t.Year()+1, 1, 1, 0, 0, 0, 0, t.Location()); t.Add(dt).After(jan) {
				dt = jan.Sub(t) // a substep ends on 1 January: the years add up exactly
			}
			n := wells.CountAt(t)
			sec := dt.Seconds()
			now, sub = t, sec
			q1, _, p1 := rate(s, n)
			var dw float64
			var next ReservoirState
			held := false
			if p1 {
				// On the plateau the substep delivers the target exactly:
				// the withdrawal that yields it, by Newton's method on the
				// model's cumulative outlet gas (sold and returned), if the
				// wells can still deliver it at the substep's end.
				var err error
				if dw, next, held, err = plateauStep(advance, s, o.Plateau*sec, &bend); err != nil {
					return nil, err
				}
				if held {
					if _, _, ok := rate(next, n); !ok && !next.Exhausted {
						held = false
					}
				}
			}
			if !held && o.Midpoint {
				s2, q2, err := halfStep(s, q1, sec, n)
				if err != nil {
					return nil, err
				}
				dw = sec * q2
				if s2.Exhausted {
					dw = sec * q1 // the model ends within the substep: withdraw up to its end
				}
				if next, err = advance(s, dw); err != nil {
					return nil, err
				}
			} else if !held {
				s2, err := advanceFor(s, q1*sec/2, sec/2)
				if err != nil {
					return nil, err
				}
				q2, _, _ := rate(s2, n)
				s3, err := advanceFor(s, q2*sec/2, sec/2)
				if err != nil {
					return nil, err
				}
				q3, _, _ := rate(s3, n)
				s4, err := advance(s, q3*sec)
				if err != nil {
					return nil, err
				}
				q4, _, _ := rate(s4, n)
				dw = sec * (q1 + 2*q2 + 2*q3 + q4) / 6
				if s2.Exhausted || s3.Exhausted || s4.Exhausted {
					dw = sec * q1 // the model ends within the substep: withdraw up to its end
				}
				if next, err = advance(s, dw); err != nil {
					return nil, err
				}
			}
			if !p1 {
				onPlateau = false
			} else {
				f.PlateauEnd = t.Add(dt)
			}
			frac := 1.0
			switch {
			case next.Exhausted:
				if dw > 0 {
					frac = math.Min(1, (next.Cum.WetGas-s.Cum.WetGas)/dw)
				}
				f.Stop, stop = StopAbandonment, true
			case n > 0 && !s.Exhausted && q1 <= 1e-9*o.Plateau:
				// The wells can no longer flow: the reservoir is at (or
				// within a hair of) their minimum flowing pressure.
				frac, f.Stop, stop = 0, StopNoWells, true
				if pm, ok := m.(ProductiveModel); ok && pm.ProductivityFactor(s) == 0 {
					f.Stop = StopShutIn
				}
			}
			sales0 := q1 * s.OutletPerWet
			if !stop && o.Minimum > 0 && n > 0 {
				// The outlet-gas rate at the end of the substep (the sales
				// gas but while cycling); the field stops where it crosses
				// the minimum, interpolated in time.
				qe, _, _ := rate(next, wells.CountAt(t.Add(dt)))
				sales1 := qe * next.OutletPerWet
				if sales1 < o.Minimum {
					frac = 1
					if sales0 > sales1 {
						frac = math.Max(0, math.Min(1, (sales0-o.Minimum)/(sales0-sales1)))
					}
					if frac < 1 {
						var err error
						if next, err = advanceFor(s, dw*frac, sec*frac); err != nil {
							return nil, err
						}
					}
					f.Stop, stop = StopMinimumRate, true
				}
			}
			part := time.Duration(frac * float64(dt))
			wellSeconds += float64(n) * part.Seconds()
			y := year(t)
			if dv := next.Cum.sub(s.Cum); dv.WetGas > 0 {
				y.Volumes = y.Volumes.add(dv)
				y.WellYears += float64(n) * part.Seconds() / secondsPerYear
				y.producing += part
				if f.FirstProduction.IsZero() {
					f.FirstProduction = t
				}
			}
			t, s = t.Add(part), next
			y.End, y.Wells = s, wells.CountAt(t.Add(-time.Nanosecond))
			y.ProducingFraction = y.producing.Seconds() / YearSeconds(y.Year)
		}
		if t.Equal(o.End) && !stop {
			f.Stop, stop = StopHorizon, true
		}
		end := t
		// The wells producing at the end of the step: those that start on
		// the next step's first day are not yet among them.
		st := ForecastStep{Start: stepStart, End: end, Wells: wells.CountAt(end.Add(-time.Nanosecond)), State: s, OnPlateau: onPlateau, WellYears: wellSeconds / secondsPerYear}
		if d := end.Sub(stepStart).Seconds(); d > 0 {
			dv := s.Cum.sub(stepState.Cum)
			st.Rates = Streams{dv.WetGas / d, dv.SeparatorGas / d, dv.Condensate / d, dv.SalesGas / d, dv.SalesEnergy / d, dv.NGL / d, dv.Fuel / d, dv.Removed / d, dv.Injected / d, dv.Water / d, dv.Returned / d}
		}
		st.Deliverability = fieldDeliverability(s, st.Wells)
		if end.After(stepStart) {
			f.Steps = append(f.Steps, st)
		}
		stepStart, stepState, wellSeconds, onPlateau = end, s, 0, true
	}
	f.StopDate, f.Final = t, s
	if f.PlateauEnd.After(f.StopDate) {
		f.PlateauEnd = f.StopDate
	}
	if f.FirstProduction.IsZero() {
		return nil, fmt.Errorf("%w: the field produces nothing from %s: %s", ErrForecast, wells.Start.Format(time.DateOnly), f.Stop)
	}
	return f, nil
}

// addMonths is t plus m calendar months, on the same day of the month or
// the month's last day when it is shorter (31 January plus a month is 29
// February in a leap year).
func addMonths(t time.Time, m int) time.Time {
	y, mo, d := t.Date()
	first := time.Date(y, mo+time.Month(m), 1, t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), t.Location())
	last := first.AddDate(0, 1, -1).Day()
	return time.Date(first.Year(), first.Month(), min(d, last), t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), t.Location())
}

// YearSeconds is the length of calendar year y, seconds.
func YearSeconds(y int) float64 {
	return time.Date(y+1, 1, 1, 0, 0, 0, 0, time.UTC).Sub(time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC)).Seconds()
}

// add returns s + o, field by field.
func (s Streams) add(o Streams) Streams {
	return Streams{s.WetGas + o.WetGas, s.SeparatorGas + o.SeparatorGas, s.Condensate + o.Condensate, s.SalesGas + o.SalesGas,
		s.SalesEnergy + o.SalesEnergy, s.NGL + o.NGL, s.Fuel + o.Fuel, s.Removed + o.Removed, s.Injected + o.Injected, s.Water + o.Water, s.Returned + o.Returned}
}

// plateauStep finds the withdrawal from s that yields sales standard m³
// of the plant's outlet gas (sold and returned), by Newton's method; ok is
// false when it does not converge to 1e-7 of the target in 20 iterations
// (the caller then integrates the rate instead). The derivative of the
// outlet gas with respect to the withdrawal is not quite the outlet per wet
// gas at the trial's end, as the withdrawal changes the stream over the
// whole substep, by a share that grows with the withdrawal: *bend is that
// share per standard m³, the secant's over the last two trials of the last
// substep that took two or more, kept from one call to the next (9 % fewer
// withdrawals in the example's cycling forecast).
func plateauStep(advance func(ReservoirState, float64) (ReservoirState, error), s ReservoirState, sales float64, bend *float64) (dw float64, next ReservoirState, ok bool, err error) {
	if !(s.OutletPerWet > 0) {
		return 0, s, false, nil
	}
	dw = sales / s.OutletPerWet
	var dw0, miss0, slope0 float64 // the last trial, for the secant
	for it := range 20 {
		if next, err = advance(s, dw); err != nil {
			return 0, s, false, err
		}
		miss := next.Cum.SalesGas + next.Cum.Returned - s.Cum.SalesGas - s.Cum.Returned - sales
		if it > 0 && math.Abs(dw-dw0) > 1e-6*dw {
			// The secant over the last two trials, against the outlet per
			// wet gas the last step took, where it is not the noise of the
			// models' searches (a step of 1e-6 of the withdrawal or more).
			if r := (miss - miss0) / (dw - dw0) / slope0; r > 0.5 && r < 2 {
				*bend = (r - 1) / dw
			}
		}
		// To 1e-7 of the substep's sales: the pressure searches of the cell
		// models meet a withdrawal to 1e-7, and a tighter target only
		// chased that noise (10 % more steps of a gas-cycling forecast).
		if math.Abs(miss) <= 1e-7*sales {
			return dw, next, true, nil
		}
		if next.Exhausted && miss < 0 {
			return dw, next, true, nil // the model ends within the substep
		}
		slope := next.OutletPerWet
		if !(slope > 0) {
			return 0, s, false, nil
		}
		dw0, miss0, slope0 = dw, miss, slope
		dw -= miss / (slope * (1 + *bend*dw))
		if dw < 0 {
			dw = 0
		}
	}
	return 0, s, false, nil
}

// secondsPerYear is the mean Gregorian year, 365.2425 days.
const secondsPerYear = 365.2425 * 86400
