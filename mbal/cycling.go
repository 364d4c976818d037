package mbal

import (
	"errors"
	"fmt"
	"math"
	"time"

	"dewcell/cvd"
	"dewcell/eos"
)

// Gas cycling as a reservoir model of the forecast: the swept part of the
// hydrocarbon pore volume as mixing cells in series from the injectors to
// the producers, the unswept part as one more cell beside them, all at one
// pressure. At each withdrawal the common pressure is the one at which,
// with the injected gas entering the first cell and every cell passing the
// mobile fluid that no longer fits its pore volume downstream (the unswept
// cell into the producers' cell), the last cell gives up exactly the
// withdrawal. The flashes of the cells capture the liquid dropping out and
// the lean injected gas revaporizing it. Cycling returns a share of the
// plant's sales gas to the reservoir; when it ends (a date, or a producing
// CGR) the cells blow down together.
//
// With one cell, no injection and the whole pore volume swept, the model
// is the depletion of Recover by a different integration (the withdrawal
// of each step leaves at the step's end composition, the first-order
// removal of a laboratory CVD): the forecast's substeps keep that error
// small.

// maxPressureRise is how far above the initial pressure injection may
// raise the reservoir's: beyond, the injection is taken for a mistake
// (common practice, no published source: a reservoir is not pumped far
// above its discovery pressure).
const maxPressureRise = 1.2

// CyclingOptions describe a gas-cycling scenario.
type CyclingOptions struct {
	// ReturnFraction is the share of the plant's outlet (sales) gas
	// reinjected while cycling, 0 to 1.
	ReturnFraction float64
	// Sweep is the fraction of the hydrocarbon pore volume the injected
	// gas contacts, (0, 1]; Cells the mixing cells in series in it (1 to
	// 200).
	Sweep float64
	Cells int
	// End is the date cycling stops (zero: no date); StopCGR the producing
	// CGR (stock-tank m³ per standard m³ of separator gas) below which it
	// stops (0: none). After either, the cells blow down.
	End     time.Time
	StopCGR float64
}

// CyclingModel is the reservoir under gas cycling (see CyclingOptions).
type CyclingModel struct {
	fl    *eos.Fluid
	n     int
	cells []*cvd.Cell // the swept cells in order, then the unswept one (when Sweep < 1)
	sep   *cvd.Separator
	proc  GasProcessor
	o     CyclingOptions
	vsc   float64
	pa    float64 // abandonment pressure
	// lastDropout is the largest liquid dropout of a cell at the last
	// pressure the chain was flashed at: the state's, once it converged.
	lastDropout float64
	dew         float64
	init        ReservoirState
	// The last withdrawal from a state: the state, the bought gas, the
	// moles injected in all, the common pressure found with the moles the
	// producers gave there, and the slope its search leaves (0 when none).
	// The plateau advances one state several times with nearly the same
	// withdrawal; the search of each after the first starts from the last
	// one's pressure and slope.
	lastSt                       *cyclingState
	lastInj, lastInjMoles, lastP float64
	lastG, lastSlope             float64
}

// cyclingState is what a ReservoirState of a CyclingModel keeps.
type cyclingState struct {
	moles [][]float64 // per cell, per component
	// inject is the composition of the gas returned to the reservoir, and
	// returnPerMole the moles returned per mole withdrawn: those of the
	// stream the producers gave at the last withdrawal (the plant's sales
	// gas of it, times the return fraction).
	inject        []float64
	returnPerMole float64
	blowdown      bool
	// produced and injected are the cumulative moles of each component
	// that left through the producers and entered through the injectors.
	produced, injected []float64
	// slope is the produced moles per Pa of the last withdrawal's pressure
	// search (negative), the next one's first guess.
	slope float64
	// gas is the composition of each cell's mobile phase at the end of the
	// last withdrawal: with the end composition of the next, the
	// trapezoidal rule for what leaves the cell over it.
	gas [][]float64
	// dropout is the largest liquid dropout of a cell, a fraction of its
	// pore volume.
	dropout float64
}

// NewCyclingModel builds the cycling of fl (feed z) in reservoir r, the
// produced streams through the separator train tr and the gas plant proc
// (which must give the sales gas's composition: the returned gas is
// that).
func NewCyclingModel(fl *eos.Fluid, z []float64, r Reservoir, tr cvd.Train, proc GasProcessor, o CyclingOptions, s *eos.Settings) (*CyclingModel, error) {
	switch {
	case !(o.ReturnFraction >= 0 && o.ReturnFraction <= 1):
		return nil, fmt.Errorf("%w: return fraction %g, want 0 to 1", ErrForecast, o.ReturnFraction)
	case !(o.Sweep > 0 && o.Sweep <= 1):
		return nil, fmt.Errorf("%w: sweep efficiency %g, want (0, 1]", ErrForecast, o.Sweep)
	case o.Cells < 1 || o.Cells > 200:
		return nil, fmt.Errorf("%w: %d cells, want 1 to 200", ErrForecast, o.Cells)
	case o.StopCGR < 0:
		return nil, fmt.Errorf("%w: stop CGR %g, want 0 or more", ErrForecast, o.StopCGR)
	case proc == nil:
		return nil, fmt.Errorf("%w: cycling needs the gas plant, whose sales gas it returns", ErrForecast)
	}
	ip, err := InPlaceEOS(fl, z, r, tr, s)
	if err != nil {
		return nil, err
	}
	if !(r.Abandonment > 0 && r.Abandonment < r.Pi) {
		return nil, fmt.Errorf("%w: abandonment pressure %g Pa, want above 0 and below the initial pressure", ErrBadReservoir, r.Abandonment)
	}
	sat, err := eos.UpperSaturation(fl, r.T, z, s)
	if err != nil && !errors.Is(err, eos.ErrNoSaturation) {
		return nil, err
	}
	sep, err := cvd.NewSeparator(fl, tr, s)
	if err != nil {
		return nil, err
	}
	m := &CyclingModel{fl: fl, n: fl.N(), sep: sep, proc: proc, o: o, vsc: tr.StandardConditions().IdealGasVolume(), pa: r.Abandonment, dew: sat.P}
	ce := r.EffectiveCompressibility()
	shares := make([]float64, o.Cells)
	for i := range shares {
		shares[i] = o.Sweep / float64(o.Cells)
	}
	if o.Sweep < 1 {
		shares = append(shares, 1-o.Sweep)
	}
	st := &cyclingState{produced: make([]float64, fl.N()), injected: make([]float64, fl.N())}
	for _, f := range shares {
		c, err := cvd.NewCell(fl, r.T, f*ip.HCPV, r.Pi, ce, s)
		if err != nil {
			return nil, err
		}
		m.cells = append(m.cells, c)
		nm := make([]float64, m.n)
		for i := range nm {
			nm[i] = f * ip.Moles * z[i]
		}
		st.moles = append(st.moles, nm)
		st.gas = append(st.gas, append([]float64(nil), z...))
	}
	// The returned gas at the start: the plant's sales gas of the feed.
	sr, err := sep.Separate(z)
	if err != nil {
		return nil, err
	}
	pr, err := proc(sr.Gas, sr.GasMoles)
	if err != nil {
		return nil, err
	}
	if pr.SalesComposition == nil {
		return nil, fmt.Errorf("%w: the gas plant does not give the sales gas's composition, which cycling returns", ErrForecast)
	}
	st.inject = append([]float64(nil), pr.SalesComposition...)
	st.returnPerMole = o.ReturnFraction * pr.SalesGas / m.vsc
	m.init = ReservoirState{P: r.Pi, OutletPerWet: pr.SalesGas / m.vsc, x: st}
	return m, nil
}

// Initial is the reservoir before production.
func (m *CyclingModel) Initial() ReservoirState { return m.init }

// DewPressure is the upper dew point of the initial fluid.
func (m *CyclingModel) DewPressure() float64 { return m.dew }

// Advance withdraws without a date: cycling goes on unless its CGR has
// stopped it.
func (m *CyclingModel) Advance(s ReservoirState, withdraw, inject float64) (ReservoirState, error) {
	return m.AdvanceAt(s, withdraw, inject, time.Time{})
}

// AdvanceAt withdraws withdraw standard m³ of wet gas from s at date at,
// returning the plant's gas while cycling lasts, and injecting inject
// standard m³ more (bought gas of the returned gas's composition).
func (m *CyclingModel) AdvanceAt(s ReservoirState, withdraw, inject float64, at time.Time) (ReservoirState, error) {
	return m.advance(s, withdraw, inject, at, true)
}

// advancePressure is AdvanceAt for the pressure alone (pressureModel).
func (m *CyclingModel) advancePressure(s ReservoirState, withdraw, inject float64, at time.Time) (ReservoirState, error) {
	return m.advance(s, withdraw, inject, at, false)
}

// advance is AdvanceAt, with the produced stream taken through the
// separators and the plant when streams is true.
func (m *CyclingModel) advance(s ReservoirState, withdraw, inject float64, at time.Time, streams bool) (ReservoirState, error) {
	st, ok := s.x.(*cyclingState)
	if !ok {
		return ReservoirState{}, fmt.Errorf("%w: a state of another model", ErrForecast)
	}
	if withdraw < 0 || inject < 0 || math.IsNaN(withdraw+inject) {
		return ReservoirState{}, fmt.Errorf("%w: withdrawal %g and injection %g, want 0 or more", ErrForecast, withdraw, inject)
	}
	if s.Exhausted || withdraw == 0 && inject == 0 {
		return s, nil
	}
	blowdown := st.blowdown || !m.o.End.IsZero() && !at.IsZero() && !at.Before(m.o.End)
	dn := withdraw / m.vsc
	injMoles := 0.0 // blowdown: nothing is injected, bought gas neither
	if !blowdown {
		injMoles = inject/m.vsc + st.returnPerMole*dn
	}
	inj := make([]float64, m.n)
	for i := range inj {
		inj[i] = injMoles * st.inject[i]
	}
	// The common pressure at which the producers give dn.
	var gasEnd [][]float64
	run := func(p float64) (float64, [][]float64, []float64, error) {
		g, moles, out, gs, err := m.chain(st.moles, st.gas, inj, p)
		gasEnd = gs
		return g, moles, out, err
	}
	total := 0.0
	for _, c := range st.moles {
		for _, v := range c {
			total += v
		}
	}
	// The start of the search: at the present pressure the cells give out
	// about what is injected; the slope of the produced moles against
	// pressure is the last withdrawal's, or a gas's, −n/p.
	p1, g1 := s.P, injMoles
	slope := st.slope
	known := slope < 0 // the last search's slope, between two pressures it ran
	if !known {
		slope = -total / s.P
	}
	p2 := p1 + (dn-g1)/slope
	switch {
	case known && m.lastSt == st && m.lastInj == inject:
		// The same state again (the plateau's Newton step on the
		// withdrawal): at the last pressure the producers gave lastG, and
		// give about as many moles more as this withdrawal's returned gas
		// adds to the injection.
		if m.lastSlope < 0 {
			slope = m.lastSlope // that search's, from this state
		}
		p2 = m.lastP + (dn-m.lastG-injMoles+m.lastInjMoles)/slope
	}
	if p2 <= 0 {
		p2 = p1 / 2
	}
	var err error
	var moles [][]float64
	var out []float64
	var g2 float64
	exhausted := false
	var runs searchRuns // for the slope the next search starts with
	for it := 0; ; it++ {
		if p2 < m.pa {
			p2 = m.pa
		}
		g2, moles, out, err = run(p2)
		if err != nil {
			return ReservoirState{}, err
		}
		runs.add(p2, g2)
		if p2 == m.pa && g2 < dn {
			exhausted = true // the abandonment pressure before the withdrawal
			break
		}
		// The produced moles are a small difference of large volumes: the
		// flashes' convergence leaves them noisy at about 1e-9 of the
		// withdrawal, or 1e-13 of the moles in place.
		if math.Abs(g2-dn) <= math.Max(1e-7*dn, 1e-13*total) {
			break
		}
		if it == 60 {
			return ReservoirState{}, fmt.Errorf("%w: the common pressure of the cells after withdrawing %g mol did not converge (%g Pa, off by %g mol)", eos.ErrNoConvergence, dn, p2, g2-dn)
		}
		// Secant on the produced moles against pressure; the first step,
		// when the last search's slope is known, takes that slope: the
		// start (p1, g1) was an estimate, not a run.
		if it > 0 || !known {
			slope = (g2 - g1) / (p2 - p1)
		}
		p1, g1 = p2, g2
		if !(slope < 0) || math.IsInf(slope, 0) {
			p2 = p2 * (1 - 1e-3)
			continue
		}
		p2 += (dn - g2) / slope
		if p2 <= 0 {
			p2 = p1 / 2
		}
	}
	if p2 > maxPressureRise*m.init.P {
		return ReservoirState{}, fmt.Errorf("%w: the injection raises the reservoir pressure to %.4g Pa, %.0f %% above the initial: inject less (the bought gas)", ErrForecast, p2, 100*(p2/m.init.P-1))
	}
	m.lastSt, m.lastInj, m.lastInjMoles, m.lastP, m.lastG, m.lastSlope = st, inject, injMoles, p2, g2, 0
	ns, err := m.after(s, st, moles, out, inj, p2, blowdown, exhausted, streams)
	if err == nil {
		if sl, ok := runs.slope(dn, slope); ok { // the next search's
			ns.x.(*cyclingState).slope = sl
			m.lastSlope = sl
		}
		ns.x.(*cyclingState).gas = gasEnd
		ns.x.(*cyclingState).dropout = m.lastDropout
	}
	return ns, err
}

// chain puts the moles n (per cell) and the injection inj at pressure p
// and passes each cell's excess downstream: the unswept cell's and the
// last swept cell's own go to the producers. It returns the moles the
// producers give, the cells' moles after, and the produced stream.
func (m *CyclingModel) chain(n, gas0 [][]float64, inj []float64, p float64) (float64, [][]float64, []float64, [][]float64, error) {
	swept := m.o.Cells
	moles := make([][]float64, len(n))
	for k := range n {
		moles[k] = append([]float64(nil), n[k]...)
	}
	for i := range inj {
		moles[0][i] += inj[i]
	}
	gasEnd := make([][]float64, len(n))
	m.lastDropout = 0
	// excess is what cell k gives up: the moles that no longer fit, of the
	// mean of its mobile phase's composition at the start and at the end of
	// the withdrawal (the trapezoidal rule: removing the gas of a cell at
	// its pressure leaves the phases' compositions as they are, so the end
	// composition is the flash's).
	excess := func(k int) ([]float64, error) {
		ex, fs, err := m.cells[k].Excess(p, moles[k])
		if err != nil {
			return nil, err
		}
		gasEnd[k] = fs.Y
		m.lastDropout = math.Max(m.lastDropout, fs.Dropout)
		total := 0.0
		for _, v := range ex {
			total += v
		}
		for i := range ex {
			ex[i] = math.Min(total*(gas0[k][i]+fs.Y[i])/2, moles[k][i])
		}
		return ex, nil
	}
	toProducer := make([]float64, m.n)
	if len(moles) > swept { // the unswept cell expands into the producers' cell
		ex, err := excess(swept)
		if err != nil {
			return 0, nil, nil, nil, err
		}
		for i := range ex {
			moles[swept][i] -= ex[i]
			toProducer[i] += ex[i]
		}
	}
	var out []float64
	for k := 0; k < swept; k++ {
		if k == swept-1 {
			for i := range toProducer {
				moles[k][i] += toProducer[i]
			}
		}
		ex, err := excess(k)
		if err != nil {
			return 0, nil, nil, nil, err
		}
		for i := range ex {
			moles[k][i] -= ex[i]
		}
		if k+1 < swept {
			for i := range ex {
				moles[k+1][i] += ex[i]
			}
		} else {
			out = ex
		}
	}
	total := 0.0
	for _, v := range out {
		total += v
	}
	return total, moles, out, gasEnd, nil
}

// after is the state once the producers have given out (moles) at p; the
// produced stream goes through the separators and the plant when streams
// is true.
func (m *CyclingModel) after(s ReservoirState, st *cyclingState, moles [][]float64, out, inj []float64, p float64, blowdown, exhausted, streams bool) (ReservoirState, error) {
	dn, injMoles := 0.0, 0.0
	for _, v := range out {
		dn += v
	}
	for _, v := range inj {
		injMoles += v
	}
	next := &cyclingState{moles: moles, inject: st.inject, returnPerMole: st.returnPerMole, blowdown: blowdown, slope: st.slope, gas: st.gas,
		produced: append([]float64(nil), st.produced...), injected: append([]float64(nil), st.injected...)}
	for i := range out {
		next.produced[i] += out[i]
		next.injected[i] += inj[i]
	}
	ns := ReservoirState{P: p, Cum: s.Cum, OutletPerWet: s.OutletPerWet, Exhausted: exhausted, x: next}
	if dn > 0 && streams {
		z := make([]float64, m.n)
		for i, v := range out {
			z[i] = v / dn
		}
		sr, err := m.sep.Separate(z)
		if err != nil {
			return ReservoirState{}, fmt.Errorf("the produced stream through the separators: %w", err)
		}
		gas := dn * sr.GasMoles
		pr, err := m.proc(sr.Gas, gas)
		if err != nil {
			return ReservoirState{}, err
		}
		returned := 0.0
		if !blowdown {
			returned = st.returnPerMole * dn * m.vsc // what this withdrawal sent back
		}
		market := pr.SalesGas - returned
		energy := 0.0
		if pr.SalesGas > 0 {
			energy = pr.SalesEnergy * market / pr.SalesGas
		}
		ns.Cum.WetGas += dn * m.vsc
		ns.Cum.SeparatorGas += gas * m.vsc
		ns.Cum.Condensate += dn * sr.OilVolume
		ns.Cum.SalesGas += market
		ns.Cum.Returned += returned
		ns.Cum.SalesEnergy += energy
		ns.Cum.NGL += pr.NGL
		ns.Cum.Fuel += pr.Fuel
		ns.Cum.Removed += pr.Removed
		if pr.SalesComposition != nil {
			next.inject = append([]float64(nil), pr.SalesComposition...)
		}
		next.returnPerMole = m.o.ReturnFraction * pr.SalesGas / m.vsc / dn
		ns.OutletPerWet = pr.SalesGas / (dn * m.vsc) // sold and returned alike
		if m.o.StopCGR > 0 && gas > 0 && dn*sr.OilVolume/(gas*m.vsc) < m.o.StopCGR {
			next.blowdown = true
		}
	}
	ns.Cum.Injected += injMoles * m.vsc
	ns.at = ns.Cum.WetGas
	return ns, nil
}

// InPlace returns the moles of each component in the reservoir in state
// s, and whether the state is one of this model's.
func (m *CyclingModel) InPlace(s ReservoirState) ([]float64, bool) {
	st, ok := s.x.(*cyclingState)
	if !ok {
		return nil, false
	}
	out := make([]float64, m.n)
	for _, c := range st.moles {
		for i, v := range c {
			out[i] += v
		}
	}
	return out, true
}

// Blowdown reports whether cycling has stopped in state s.
func (m *CyclingModel) Blowdown(s ReservoirState) bool {
	st, ok := s.x.(*cyclingState)
	return ok && st.blowdown
}

// BalanceError is the largest relative error of the component balance of
// s, over the components: |initial + injected − produced − in place| over
// initial + injected.
func (m *CyclingModel) BalanceError(s ReservoirState) float64 {
	st, ok := s.x.(*cyclingState)
	init, ok0 := m.init.x.(*cyclingState)
	if !ok || !ok0 {
		return math.NaN()
	}
	worst := 0.0
	for i := range m.n {
		in0, now := 0.0, 0.0
		for k := range st.moles {
			in0 += init.moles[k][i]
			now += st.moles[k][i]
		}
		scale := in0 + st.injected[i]
		if scale == 0 {
			continue
		}
		worst = math.Max(worst, math.Abs(in0+st.injected[i]-st.produced[i]-now)/scale)
	}
	return worst
}

// Dropout is the largest liquid dropout of a cell in s (the liquid volume
// over the cell's pore volume).
func (m *CyclingModel) Dropout(s ReservoirState) float64 {
	st, ok := s.x.(*cyclingState)
	if !ok {
		return math.NaN()
	}
	return st.dropout
}
