package mbal

import (
	"fmt"
	"math"
	"time"

	"dewcell/cvd"
	"dewcell/eos"
)

// Water injection as a reservoir model of the forecast. The swept part of
// the hydrocarbon pore volume fills with water from the injectors: water
// takes the voidage replacement ratio times the reservoir volume the
// producers withdraw; the hydrocarbons it reaches are pushed to the
// producers but for the residual gas saturation, which stays behind the
// front, trapped at the pressure and composition of the moment (all the
// phases there in proportion: the condensate is trapped with the gas). The
// unswept part depletes. When the water fills the swept volume (flood-out)
// injection stops and the rest of the field blows down: the unswept
// hydrocarbons and the trapped gas as it expands beyond its residual
// saturation.
//
// Cells: the swept hydrocarbons ahead of the front, the trapped ones behind
// it and the unswept ones, all at one pressure. Water is taken as
// incompressible at reservoir conditions (its formation volume factor 1);
// the connate water's expansion is in the pore compressibility.

// WaterOptions describe a water-injection scenario.
type WaterOptions struct {
	// Voidage is the reservoir volume of water injected per reservoir
	// volume produced, (0, 2]; Sgr the gas saturation trapped behind the
	// front, a fraction of the pore volume, [0, 1 − Sw); Sweep the fraction
	// of the hydrocarbon pore volume the water sweeps, (0, 1].
	Voidage, Sgr, Sweep float64
}

// WaterModel is the reservoir under water injection (see WaterOptions).
type WaterModel struct {
	fl                *eos.Fluid
	n                 int
	ahead, behind, un *cvd.Cell
	sep               *cvd.Separator
	proc              GasProcessor
	o                 WaterOptions
	sgr               float64 // residual gas as a fraction of the hydrocarbon pore volume, Sgr/(1 − Sw)
	hcpv0, pi, ce     float64
	vsc, pa, dew      float64
	init              ReservoirState
	// The last withdrawal: the state it was from, the moles withdrawn, the
	// pressure found with the moles the parts gave there, and the slope
	// its search leaves (0 when none). The forecast advances one state
	// several times with nearly the same withdrawal; the search of each
	// after the first starts from the last one's pressure and slope.
	lastSt                          *waterState
	lastDn, lastP, lastG, lastSlope float64
}

// waterState is what a ReservoirState of a WaterModel keeps.
type waterState struct {
	ahead, behind, un []float64 // moles per component
	water             float64   // reservoir m³ injected
	flooded           bool      // the swept volume is full of water: injection has stopped
	produced          []float64
	slope             float64
	vm                float64 // molar volume of the last produced stream at reservoir conditions, m³/mol
}

// NewWaterModel builds water injection into reservoir r of fluid fl (feed
// z), the produced streams through the separator train tr and the gas
// plant proc (nil: the separator gas is sold as it is).
func NewWaterModel(fl *eos.Fluid, z []float64, r Reservoir, tr cvd.Train, proc GasProcessor, o WaterOptions, s *eos.Settings) (*WaterModel, error) {
	switch {
	case !(o.Voidage > 0 && o.Voidage <= 2):
		return nil, fmt.Errorf("%w: voidage replacement %g, want (0, 2]", ErrForecast, o.Voidage)
	case !(o.Sgr >= 0 && o.Sgr < 1-r.Sw):
		return nil, fmt.Errorf("%w: residual gas saturation %g, want 0 to below 1 − Sw = %g", ErrForecast, o.Sgr, 1-r.Sw)
	case !(o.Sweep > 0 && o.Sweep <= 1):
		return nil, fmt.Errorf("%w: sweep efficiency %g, want (0, 1]", ErrForecast, o.Sweep)
	}
	ip, err := InPlaceEOS(fl, z, r, tr, s)
	if err != nil {
		return nil, err
	}
	if !(r.Abandonment > 0 && r.Abandonment < r.Pi) {
		return nil, fmt.Errorf("%w: abandonment pressure %g Pa, want above 0 and below the initial pressure", ErrBadReservoir, r.Abandonment)
	}
	sat, _ := eos.UpperSaturation(fl, r.T, z, s)
	sep, err := cvd.NewSeparator(fl, tr, s)
	if err != nil {
		return nil, err
	}
	m := &WaterModel{fl: fl, n: fl.N(), sep: sep, proc: proc, o: o, sgr: o.Sgr / (1 - r.Sw), hcpv0: ip.HCPV, pi: r.Pi,
		ce: r.EffectiveCompressibility(), vsc: tr.StandardConditions().IdealGasVolume(), pa: r.Abandonment, dew: sat.P}
	for _, c := range []**cvd.Cell{&m.ahead, &m.behind, &m.un} {
		if *c, err = cvd.NewCell(fl, r.T, ip.HCPV, r.Pi, m.ce, s); err != nil {
			return nil, err
		}
	}
	st := &waterState{ahead: make([]float64, m.n), behind: make([]float64, m.n), un: make([]float64, m.n), produced: make([]float64, m.n)}
	for i := range z {
		st.ahead[i] = o.Sweep * ip.Moles * z[i]
		st.un[i] = (1 - o.Sweep) * ip.Moles * z[i]
	}
	st.vm = ip.V
	m.init = ReservoirState{P: r.Pi, x: st}
	m.init.OutletPerWet, err = m.salesPerWet(z)
	if err != nil {
		return nil, err
	}
	return m, nil
}

// salesPerWet is the sales gas per wet gas of a stream of composition z.
func (m *WaterModel) salesPerWet(z []float64) (float64, error) {
	sr, err := m.sep.Separate(z)
	if err != nil {
		return 0, err
	}
	if m.proc == nil {
		return sr.GasMoles, nil
	}
	pr, err := m.proc(sr.Gas, sr.GasMoles)
	if err != nil {
		return 0, err
	}
	return pr.SalesGas / m.vsc, nil
}

// Initial is the reservoir before production.
func (m *WaterModel) Initial() ReservoirState { return m.init }

// DewPressure is the upper dew point of the initial fluid.
func (m *WaterModel) DewPressure() float64 { return m.dew }

// hcpv is the hydrocarbon pore volume at p, m³ (water included).
func (m *WaterModel) hcpv(p float64) float64 { return m.hcpv0 * (1 - m.ce*(m.pi-p)) }

// waterTrial is the reservoir at a trial pressure.
type waterTrial struct {
	ahead, behind, un []float64
	out               []float64 // produced moles
	produced          float64   // their sum
	volume            float64   // their reservoir volume at p, m³
	water             float64   // water in place after the step, m³
	flooded           bool
}

// trial puts the reservoir of st at p with the water of st plus dw (m³)
// and lets every part give up what no longer fits.
func (m *WaterModel) trial(st *waterState, p, dw float64) (waterTrial, error) {
	tr := waterTrial{ahead: append([]float64(nil), st.ahead...), behind: append([]float64(nil), st.behind...), un: append([]float64(nil), st.un...),
		out: make([]float64, m.n), water: st.water + dw, flooded: st.flooded}
	swept := m.o.Sweep * m.hcpv(p)
	// The flooded fraction of the swept volume: water fills 1 − sgr of it.
	phiOld := st.water / (swept * (1 - m.sgr))
	phi := tr.water / (swept * (1 - m.sgr))
	if phi >= 1 {
		// Flood-out: the water fills what it can; none is taken back when
		// the pore volume shrinks with the pressure.
		phi, tr.flooded = 1, true
		tr.water = math.Max(st.water, swept*(1-m.sgr))
	}
	displaced := 0.0 // moles the front pushes to the producers
	if phi > phiOld && phiOld < 1 {
		// The hydrocarbons of the newly flooded volume, all phases alike:
		// their residual share stays behind the front, the rest is pushed
		// to the producers (the front displaces the liquid with the gas, so
		// none piles up ahead of it).
		share := (phi - phiOld) / (1 - phiOld) // of the moles ahead
		for i := range tr.ahead {
			moved := share * tr.ahead[i]
			tr.ahead[i] -= moved
			tr.behind[i] += m.sgr * moved
			tr.out[i] += (1 - m.sgr) * moved
			displaced += (1 - m.sgr) * moved
		}
	}
	parts := []struct {
		c  *cvd.Cell
		n  []float64
		pv float64
	}{
		{m.ahead, tr.ahead, (1 - phi) * swept},
		{m.behind, tr.behind, phi * swept * m.sgr},
		{m.un, tr.un, (1 - m.o.Sweep) * m.hcpv(p)},
	}
	// The displaced moles take their reservoir volume at the contents'
	// molar volume ahead of the front (the last produced stream's when
	// nothing is left ahead).
	vAhead := st.vm
	for k, pt := range parts {
		total := 0.0
		for _, v := range pt.n {
			total += v
		}
		if !(total > 0) || !(pt.pv > 0) {
			// An empty part (nothing flooded yet, all swept) gives nothing;
			// a part with no room left gives all it holds.
			if total > 0 {
				for i, v := range pt.n {
					tr.out[i] += v
					pt.n[i] = 0
				}
			}
			continue
		}
		ex, fs, err := pt.c.ExcessIn(p, pt.n, pt.pv)
		if err != nil {
			return tr, err
		}
		if k == 0 && fs.Total > 0 {
			vAhead = fs.Volume / fs.Total
		}
		for i, v := range ex {
			pt.n[i] -= v
			tr.out[i] += v
			tr.produced += v
			_ = fs
		}
		exMoles := 0.0
		for _, v := range ex {
			exMoles += v
		}
		tr.volume += exMoles * fs.VV
	}
	tr.volume += displaced * vAhead
	tr.produced = 0
	for _, v := range tr.out {
		tr.produced += v
	}
	return tr, nil
}

// Advance withdraws withdraw standard m³ of wet gas from s; a water
// injection takes no gas.
func (m *WaterModel) Advance(s ReservoirState, withdraw, inject float64) (ReservoirState, error) {
	return m.advance(s, withdraw, inject, true)
}

// advancePressure is Advance for the pressure alone (pressureModel).
func (m *WaterModel) advancePressure(s ReservoirState, withdraw, inject float64, _ time.Time) (ReservoirState, error) {
	return m.advance(s, withdraw, inject, false)
}

// advance is Advance, with the produced stream taken through the
// separators and the plant when streams is true.
func (m *WaterModel) advance(s ReservoirState, withdraw, inject float64, streams bool) (ReservoirState, error) {
	st, ok := s.x.(*waterState)
	if !ok {
		return ReservoirState{}, fmt.Errorf("%w: a state of another model", ErrForecast)
	}
	if inject != 0 {
		return ReservoirState{}, fmt.Errorf("%w: a water injection takes no gas", ErrForecast)
	}
	if withdraw < 0 || math.IsNaN(withdraw) {
		return ReservoirState{}, fmt.Errorf("%w: withdrawal %g, want 0 or more", ErrForecast, withdraw)
	}
	if s.Exhausted || withdraw == 0 {
		return s, nil
	}
	dn := withdraw / m.vsc
	total := 0.0
	for _, part := range [][]float64{st.ahead, st.behind, st.un} {
		for _, v := range part {
			total += v
		}
	}
	// The water a step injects is the voidage ratio times the reservoir
	// volume of the withdrawal, dn times the produced stream's molar volume
	// at the step's pressure: a fixed point in that molar volume, which the
	// water itself barely changes.
	vm := st.vm
	run := func(p float64) (waterTrial, error) {
		var tr waterTrial
		var err error
		for range 30 {
			dw := m.o.Voidage * dn * vm
			if st.flooded {
				dw = 0
			}
			if tr, err = m.trial(st, p, dw); err != nil {
				return tr, err
			}
			if st.flooded || !(tr.produced > 0) {
				break
			}
			v := tr.volume / tr.produced
			if math.Abs(v-vm) <= 1e-10*v {
				break
			}
			vm = v
		}
		return tr, nil
	}
	// The start of the search: at the present pressure the parts give out
	// what the injected water displaces, the voidage ratio times the
	// withdrawal (nothing once flooded out); the slope of the produced
	// moles against pressure is the last withdrawal's, or a gas's, −n/p.
	displaced := m.o.Voidage * dn
	if st.flooded {
		displaced = 0
	}
	p1, g1 := s.P, displaced
	// Without injection the start is a point of the curve (at its own
	// pressure a state gives out nothing), so the first secant may take
	// it; with injection it is an estimate, and the first step takes the
	// known slope.
	exact := st.flooded
	slope := st.slope
	known := slope < 0 // the last search's, between two pressures it ran
	if !known {
		slope = -total / s.P
	}
	p2 := p1 + (dn-g1)/slope
	if known && m.lastSt == st {
		// The same state again (the plateau's Newton step on the
		// withdrawal, the midpoint rule's full step after its half): at
		// the last pressure the parts gave lastG for a withdrawal of
		// lastDn, and give about the voidage ratio times the change in
		// the withdrawal more.
		if m.lastSlope < 0 {
			slope = m.lastSlope // that search's, from this state
		}
		p2 = m.lastP + (dn-m.lastG-(displaced/dn)*(dn-m.lastDn))/slope
		exact = false
	}
	var tr waterTrial
	var err error
	exhausted := false
	var runs searchRuns // for the next search's slope
	g2 := 0.0
	for it := 0; ; it++ {
		if p2 < m.pa {
			p2 = m.pa
		}
		if p2 > 2*s.P {
			p2 = 2 * s.P
		}
		if tr, err = run(p2); err != nil {
			return ReservoirState{}, err
		}
		g2 = tr.produced
		runs.add(p2, g2)
		if p2 == m.pa && g2 < dn {
			exhausted = true
			break
		}
		if math.Abs(g2-dn) <= math.Max(1e-7*dn, 1e-13*total) {
			break
		}
		if it == 60 {
			return ReservoirState{}, fmt.Errorf("%w: the pressure of the water injection after withdrawing %g mol did not converge (%g Pa, off by %g mol)", eos.ErrNoConvergence, dn, p2, g2-dn)
		}
		sl := slope
		if it > 0 || exact || !known {
			sl = (g2 - g1) / (p2 - p1)
		}
		p1, g1 = p2, g2
		if !(sl < 0) || math.IsInf(sl, 0) {
			p2 *= 1 - 1e-4
			continue
		}
		slope = sl
		p2 += (dn - g2) / slope
		if p2 <= 0 {
			p2 = p1 / 2
		}
	}
	m.lastSt, m.lastDn, m.lastP, m.lastG, m.lastSlope = st, dn, p2, g2, 0
	if sl, ok := runs.slope(dn, slope); ok { // the next search's
		slope, m.lastSlope = sl, sl
	}
	next := &waterState{ahead: tr.ahead, behind: tr.behind, un: tr.un, water: tr.water, flooded: tr.flooded, produced: append([]float64(nil), st.produced...), slope: slope, vm: vm}
	ns := ReservoirState{P: p2, Cum: s.Cum, OutletPerWet: s.OutletPerWet, Exhausted: exhausted, x: next}
	for i, v := range tr.out {
		next.produced[i] += v
	}
	if tr.produced > 0 && streams {
		z := make([]float64, m.n)
		for i, v := range tr.out {
			z[i] = v / tr.produced
		}
		sr, err := m.sep.Separate(z)
		if err != nil {
			return ReservoirState{}, fmt.Errorf("the produced stream through the separators: %w", err)
		}
		gas := tr.produced * sr.GasMoles
		pr := Processed{SalesGas: gas * m.vsc}
		if m.proc != nil && gas > 0 {
			if pr, err = m.proc(sr.Gas, gas); err != nil {
				return ReservoirState{}, err
			}
		}
		ns.Cum.WetGas += tr.produced * m.vsc
		ns.Cum.SeparatorGas += gas * m.vsc
		ns.Cum.Condensate += tr.produced * sr.OilVolume
		ns.Cum.SalesGas += pr.SalesGas
		ns.Cum.SalesEnergy += pr.SalesEnergy
		ns.Cum.NGL += pr.NGL
		ns.Cum.Fuel += pr.Fuel
		ns.Cum.Removed += pr.Removed
		ns.OutletPerWet = pr.SalesGas / (tr.produced * m.vsc)
	}
	ns.Cum.Water += tr.water - st.water
	ns.at = ns.Cum.WetGas
	return ns, nil
}

// ProductivityFactor is the share of the wells still producing in s: all
// of them until flood-out, then those outside the swept volume, taken as
// the unswept share of it (1 − Sweep) of the wells.
func (m *WaterModel) ProductivityFactor(s ReservoirState) float64 {
	if m.Flooded(s) {
		return 1 - m.o.Sweep
	}
	return 1
}

// TrappedStreams is what the moles trapped behind the front in s would
// give at the surface: their wet-gas volume (standard m³) and stock-tank
// condensate (m³).
func (m *WaterModel) TrappedStreams(s ReservoirState) (wet, condensate float64, err error) {
	tr := m.Trapped(s)
	total := 0.0
	for _, v := range tr {
		total += v
	}
	if !(total > 0) {
		return 0, 0, nil
	}
	z := make([]float64, len(tr))
	for i, v := range tr {
		z[i] = v / total
	}
	sr, err := m.sep.Separate(z)
	if err != nil {
		return 0, 0, err
	}
	return total * m.vsc, total * sr.OilVolume, nil
}

// Flooded reports whether the water has filled the swept volume in s.
func (m *WaterModel) Flooded(s ReservoirState) bool {
	st, ok := s.x.(*waterState)
	return ok && st.flooded
}

// Trapped returns the moles held behind the front in s.
func (m *WaterModel) Trapped(s ReservoirState) []float64 {
	st, ok := s.x.(*waterState)
	if !ok {
		return nil
	}
	return append([]float64(nil), st.behind...)
}

// BalanceError is the largest relative error of the component balance of
// s: |initial − produced − in place| over initial.
func (m *WaterModel) BalanceError(s ReservoirState) float64 {
	st, ok := s.x.(*waterState)
	init := m.init.x.(*waterState)
	if !ok {
		return math.NaN()
	}
	worst := 0.0
	for i := range m.n {
		in0 := init.ahead[i] + init.behind[i] + init.un[i]
		if in0 == 0 {
			continue
		}
		now := st.ahead[i] + st.behind[i] + st.un[i]
		worst = math.Max(worst, math.Abs(in0-st.produced[i]-now)/in0)
	}
	return worst
}
