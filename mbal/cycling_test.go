package mbal

import (
	"math"
	"testing"
	"time"

	"dewcell/cvd"
	"dewcell/eos"
)

// Limiting cases of the mixing-cell model of gas cycling:
//
//   - a gas displaced by another of nearly the same Z at nearly constant
//     pressure, through N well-mixed cells in series of equal volume, leaves
//     at the fraction of the tanks-in-series (Erlang) curve of the pore
//     volumes injected V, e^{−NV} Σ_{k<N} (NV)^k/k! (for one cell e^{−V}):
//     the residence-time distribution of N stirred tanks (Levenspiel,
//     Chemical Reaction Engineering, ch. 14; from memory);
//   - no return, one cell and the whole volume swept is the depletion;
//   - every component's balance closes: initial + injected = produced + in
//     place.

// passThrough is a gas plant that sells the separator gas as it is.
func passThrough(vsc float64) GasProcessor {
	return func(gas []float64, moles float64) (Processed, error) {
		return Processed{SalesGas: moles * vsc, SalesComposition: append([]float64(nil), gas...)}, nil
	}
}

// TestCyclingTanksInSeries displaces methane by nitrogen at 400 K and
// 10 bar (both far above their critical temperatures, Z within 1 % of
// each other) with a plant that returns nitrogen for every mole produced:
// the pressure holds and the methane in the produced stream follows the
// Erlang curve of the cells.
func TestCyclingTanksInSeries(t *testing.T) {
	var comps []eos.Component
	for _, name := range []string{"C1", "N2"} {
		c, ok := eos.LibraryComponent(name)
		if !ok {
			t.Fatalf("no %s in the library", name)
		}
		comps = append(comps, c)
	}
	fl, err := eos.NewFluid(comps, nil, eos.Options{})
	if err != nil {
		t.Fatal(err)
	}
	z := []float64{0.999999, 0.000001}
	tr := cvd.Train{} // straight to the stock tank: all gas
	vsc := tr.StandardConditions().IdealGasVolume()
	nitrogen := func(gas []float64, moles float64) (Processed, error) {
		return Processed{SalesGas: moles * vsc, SalesComposition: []float64{0, 1}}, nil
	}
	res := Reservoir{T: 400, Pi: 10e5, Abandonment: 1e5, PoreVolume: 1e4}
	for _, cells := range []int{1, 4} {
		m, err := NewCyclingModel(fl, z, res, tr, nitrogen, CyclingOptions{ReturnFraction: 1, Sweep: 1, Cells: cells}, nil)
		if err != nil {
			t.Fatal(err)
		}
		s := m.Initial()
		n0 := 0.0
		for _, v := range s.x.(*cyclingState).moles {
			for _, x := range v {
				n0 += x
			}
		}
		const dv = 0.002 // pore volumes a step
		prev := s.x.(*cyclingState).produced[0]
		prevN := 0.0
		worst := 0.0
		for k := 1; k <= 1500; k++ {
			if s, err = m.Advance(s, dv*n0*vsc, 0); err != nil {
				t.Fatal(err)
			}
			st := s.x.(*cyclingState)
			dC1 := st.produced[0] - prev
			dN := (st.produced[0] + st.produced[1]) - prevN
			prev, prevN = st.produced[0], st.produced[0]+st.produced[1]
			v := (st.injected[1]) / n0 // pore volumes injected, at the end of the step
			// The stream of the step against the curve at the step's middle.
			vm := v - dv/2
			nv := float64(cells) * vm
			term, sum := 1.0, 0.0
			for j := range cells {
				if j > 0 {
					term *= nv / float64(j)
				}
				sum += term
			}
			want := math.Exp(-nv) * sum
			if d := math.Abs(dC1/dN - want); d > worst {
				worst = d
			}
			if e := m.BalanceError(s); e > 1e-8 {
				t.Fatalf("%d cells, step %d: component balance off by %.3g", cells, k, e)
			}
			if math.Abs(s.P/res.Pi-1) > 0.01 {
				t.Fatalf("%d cells, step %d: pressure %.4g bar, want it held at 10 bar", cells, k, s.P/1e5)
			}
		}
		t.Logf("%d cells: produced methane fraction within %.4f of the Erlang curve over 3 pore volumes", cells, worst)
		if worst > 0.01 {
			t.Errorf("%d cells: the produced methane fraction departs from the tanks-in-series curve by %.4f", cells, worst)
		}
	}
}

// No return, the whole volume swept and one cell: the depletion. The
// forecast's cumulatives at its end against those of the depletion model
// at the same final pressure, within 0.2 %.
func TestCyclingWithoutReturnIsDepletion(t *testing.T) {
	dm, c, res := forecastModel(t)
	m, err := NewCyclingModel(c.Fluid, c.Z, res, rTrain, passThrough(rTrain.StandardConditions().IdealGasVolume()), CyclingOptions{ReturnFraction: 0, Sweep: 1, Cells: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	o := fcOptions()
	o.Substep = 5 * 24 * time.Hour
	f, err := RunForecast(m, fcWells, o)
	if err != nil {
		t.Fatal(err)
	}
	want := dm.stateAtPressure(t, f.Final.P)
	for _, q := range []struct {
		what      string
		got, want float64
	}{{"wet gas", f.Final.Cum.WetGas, want.Cum.WetGas}, {"condensate", f.Final.Cum.Condensate, want.Cum.Condensate}, {"separator gas", f.Final.Cum.SeparatorGas, want.Cum.SeparatorGas}} {
		if d := q.got/q.want - 1; math.Abs(d) > 0.002 {
			t.Errorf("%s at %.1f psia: %.6g, the depletion %.6g (%.3f %%)", q.what, f.Final.P/psiPa, q.got, q.want, 100*d)
		}
	}
	if e := m.BalanceError(f.Final); e > 1e-8 {
		t.Errorf("component balance off by %.3g", e)
	}
}

// stateAtPressure is the depletion model's state at pressure p, found by
// bisection on the cumulative wet gas.
func (m *DepletionModel) stateAtPressure(t *testing.T, p float64) ReservoirState {
	t.Helper()
	lo, hi := 0.0, m.Limit()
	for range 200 {
		mid := (lo + hi) / 2
		if m.state(mid).P > p {
			lo = mid
		} else {
			hi = mid
		}
	}
	return m.state((lo + hi) / 2)
}

// Cycling the plant's gas holds the pressure up and recovers more
// condensate by the end of blowdown than depletion does: the purpose of
// cycling (Craft and Hawkins, Applied Petroleum Reservoir Engineering,
// ch. 2, cycling of gas-condensate reservoirs; from memory).
func TestCyclingRecoversMoreCondensate(t *testing.T) {
	dm, c, res := forecastModel(t)
	vsc := rTrain.StandardConditions().IdealGasVolume()
	o := fcOptions()
	o.Substep, o.End = 30*24*time.Hour, fcDay(2050, 1, 1) // monthly substeps: the cells are costly
	dep, err := RunForecast(dm, fcWells, o)
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewCyclingModel(c.Fluid, c.Z, res, rTrain, passThrough(vsc),
		CyclingOptions{ReturnFraction: 0.85, Sweep: 0.7, Cells: 5, End: fcWells.Start.AddDate(8, 0, 0)}, nil)
	if err != nil {
		t.Fatal(err)
	}
	cyc, err := RunForecast(m, fcWells, o)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("condensate: depletion %.4g m3, cycling %.4g m3; injected %.4g sm3; stop %s and %s", dep.Final.Cum.Condensate, cyc.Final.Cum.Condensate,
		cyc.Final.Cum.Injected, dep.StopDate.Format(time.DateOnly), cyc.StopDate.Format(time.DateOnly))
	if !(cyc.Final.Cum.Condensate > dep.Final.Cum.Condensate) {
		t.Errorf("cycling recovers %.4g m3 of condensate, depletion %.4g", cyc.Final.Cum.Condensate, dep.Final.Cum.Condensate)
	}
	if !(cyc.Final.Cum.Injected > 0) || !m.Blowdown(cyc.Final) {
		t.Errorf("injected %g sm3, blowdown %v: want gas returned, then blowdown", cyc.Final.Cum.Injected, m.Blowdown(cyc.Final))
	}
	// The pressure after four years of cycling stands above the
	// depletion's at the same date.
	at := fcWells.Start.AddDate(4, 0, 0)
	var pd, pc float64
	for _, s := range dep.Steps {
		if !s.End.After(at) {
			pd = s.State.P
		}
	}
	for _, s := range cyc.Steps {
		if !s.End.After(at) {
			pc = s.State.P
		}
	}
	if !(pc > pd) {
		t.Errorf("pressure after four years %.0f psia cycling, %.0f psia depleting", pc/psiPa, pd/psiPa)
	}
	if e := m.BalanceError(cyc.Final); e > 1e-8 {
		t.Errorf("component balance off by %.3g", e)
	}
}

// A costly model integrated by the midpoint rule on monthly substeps
// stops at the abandonment pressure, not with months of nothing after it.
func TestCyclingStopsAtAbandonment(t *testing.T) {
	_, c, res := forecastModel(t)
	m, err := NewCyclingModel(c.Fluid, c.Z, res, rTrain, passThrough(rTrain.StandardConditions().IdealGasVolume()), CyclingOptions{ReturnFraction: 0.5, Sweep: 0.8, Cells: 3, End: fcDay(2036, 1, 1)}, nil)
	if err != nil {
		t.Fatal(err)
	}
	o := fcOptions()
	o.Minimum, o.End, o.Substep, o.Midpoint = 0, fcDay(2200, 1, 1), 30*24*time.Hour, true
	w := fcWells
	w.MinPwf = 0.5 * res.Abandonment // the wells can flow below the abandonment pressure
	f, err := RunForecast(m, w, o)
	if err != nil {
		t.Fatal(err)
	}
	if f.Stop != StopAbandonment {
		t.Errorf("stop %v on %s, want the abandonment pressure", f.Stop, f.StopDate.Format(time.DateOnly))
	}
	for _, s := range f.Steps[len(f.Steps)-3:] {
		if !(s.Rates.WetGas > 0) {
			t.Errorf("step to %s produces nothing before the stop", s.End.Format(time.DateOnly))
		}
	}
}

// Full-voidage cycling above the dew point: every mole withdrawn is put
// back (the plant's gas and bought gas of its composition), so the
// pressure holds above the dew point and no liquid drops out while the
// lean gas sweeps the rich one; after blowdown the field has recovered more
// condensate than depletion (the purpose of cycling; common practice, no
// published source).
func TestFullVoidageCycling(t *testing.T) {
	dm, c, res := forecastModel(t)
	vsc := rTrain.StandardConditions().IdealGasVolume()
	end := fcDay(2040, 1, 1)
	m, err := NewCyclingModel(c.Fluid, c.Z, res, rTrain, passThrough(vsc), CyclingOptions{ReturnFraction: 1, Sweep: 0.8, Cells: 4, End: end}, nil)
	if err != nil {
		t.Fatal(err)
	}
	s := m.Initial()
	st := s.x.(*cyclingState)
	n0 := 0.0
	for _, cell := range st.moles {
		for _, v := range cell {
			n0 += v
		}
	}
	dew := m.DewPressure()
	if !(dew > 0 && dew < res.Pi) {
		t.Fatalf("dew point %g Pa, want one below the initial pressure %g", dew, res.Pi)
	}
	dn := 0.004 * n0 // moles a month
	at := fcDay(2030, 1, 1)
	for at.Before(end) {
		st := s.x.(*cyclingState)
		returned := st.returnPerMole * dn
		if s, err = m.AdvanceAt(s, dn*vsc, (dn-returned)*vsc, at); err != nil {
			t.Fatal(err)
		}
		if !(s.P > dew) {
			t.Fatalf("%s: pressure %.0f psia, below the dew point %.0f psia, while every mole is replaced", at.Format(time.DateOnly), s.P/psiPa, dew/psiPa)
		}
		if d := m.Dropout(s); d != 0 {
			t.Fatalf("%s: liquid dropout %.3g in a cell at %.0f psia, above the dew point", at.Format(time.DateOnly), d, s.P/psiPa)
		}
		at = at.AddDate(0, 1, 0)
	}
	for k := 0; !s.Exhausted; k++ {
		if k > 5000 {
			t.Fatal("no end to the blowdown")
		}
		if s, err = m.AdvanceAt(s, dn*vsc, 0, at); err != nil {
			t.Fatal(err)
		}
		at = at.AddDate(0, 1, 0)
	}
	dep := dm.state(dm.Limit())
	t.Logf("condensate after blowdown %.4g m3, depletion %.4g m3", s.Cum.Condensate, dep.Cum.Condensate)
	if !(s.Cum.Condensate > dep.Cum.Condensate) {
		t.Errorf("full-voidage cycling recovers %.4g m3 of condensate by the end of blowdown, depletion %.4g", s.Cum.Condensate, dep.Cum.Condensate)
	}
	if e := m.BalanceError(s); e > 1e-8 {
		t.Errorf("component balance off by %.3g", e)
	}
}
