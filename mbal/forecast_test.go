package mbal

import (
	"math"
	"sync"
	"testing"
	"time"

	"dewcell/internal/testfluid"
)

// The forecast's reservoir is the depletion of Recover; its wells follow
// the back-pressure equation (Rawlins and Schellhardt 1936). The checks:
// a hand-worked deliverability; the cumulative at the forecast's final
// pressure against Recover's own at that pressure (the forecast adds time,
// not volumes); the plateau met exactly while the wells can deliver it and
// the rate equal to the deliverability after; and the result independent of
// the step (a trade requirement: halving the step changes the ultimate
// recovery by under 0.1 %).

// fcDay is a date of the test's calendar.
func fcDay(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }

const mmscfd = 1e6 * 0.028316846592 / 86400 // 1 MMscf/d in standard m³/s (NIST SP 811 ft³; 86400 s/d)

// fcWells are invented wells for the rich condensate of testfluid.
var fcWells = Wells{Count: 4, Start: fcDay(2030, 1, 1), TestRate: 12 * mmscfd, TestPR: 5000 * psiPa, TestPwf: 4000 * psiPa,
	Exponent: 0.8, MinPwf: 600 * psiPa, BankFactor: 0.7, Add: []WellAdd{{Date: fcDay(2032, 7, 1), Count: 2}}}

const psiPa = 6894.757293168361 // Pa per psi (NIST SP 811)

var (
	fcOnce  sync.Once
	fcModel *DepletionModel
	fcCase  testfluid.Case
	fcRes   Reservoir
	fcErr   error
)

// forecastModel is the tabulated depletion of testfluid's rich condensate
// in an invented reservoir.
func forecastModel(t *testing.T) (*DepletionModel, testfluid.Case, Reservoir) {
	t.Helper()
	fcOnce.Do(func() {
		fcCase, fcErr = testfluid.Rich()
		if fcErr != nil {
			return
		}
		fcRes = Reservoir{T: fcCase.T, Pi: fcCase.Pi, Abandonment: fcCase.Abandonment, PoreVolume: 5e7, Sw: 0.22, Cf: 4e-6 / psiPa, Cw: 3e-6 / psiPa}
		rec, err := Recover(fcCase.Fluid, fcCase.Z, fcRes, rTrain, RecoverOptions{Steps: 10, SkipMaxSaturation: true})
		if err != nil {
			fcErr = err
			return
		}
		grid := DepletionGrid(fcRes.Pi, fcRes.Abandonment, rec.Depletion.Dew.P, 120)
		rec, fcErr = Recover(fcCase.Fluid, fcCase.Z, fcRes, rTrain, RecoverOptions{Pressures: grid, SkipMaxSaturation: true})
		if fcErr != nil {
			return
		}
		fcModel, fcErr = NewDepletionModel(fcCase.Fluid, rec, rTrain, nil, nil)
	})
	if fcErr != nil {
		t.Fatal(fcErr)
	}
	return fcModel, fcCase, fcRes
}

// A hand-worked deliverability (our numbers): the test gives
// C = 12 MMscf/d / (5000² − 4000²)^0.8 = 12/(9e6)^0.8 MMscf/d per psi^1.6;
// (9e6)^0.8 = exp(0.8 ln 9e6) = exp(0.8 × 16.0127) = exp(12.8102) = 3.6589e5,
// so C = 3.2797e-5. At 3000 psia and 600 psia flowing:
// (3000² − 600²)^0.8 = (8.64e6)^0.8 = exp(0.8 × 15.9719) = exp(12.7775) = 3.5413e5,
// q = 3.2797e-5 × 3.5413e5 = 11.614 MMscf/d; below the dew point, × 0.7
// = 8.130 MMscf/d.
func TestDeliverabilityHandWorked(t *testing.T) {
	w := fcWells
	if q := w.Deliverability(3000*psiPa, false) / mmscfd; math.Abs(q-11.614) > 0.002 {
		t.Errorf("deliverability %.4f MMscf/d, want 11.614 by hand", q)
	}
	if q := w.Deliverability(3000*psiPa, true) / mmscfd; math.Abs(q-8.130) > 0.002 {
		t.Errorf("deliverability below the dew point %.4f MMscf/d, want 8.130 by hand", q)
	}
	if q, want := w.Deliverability(w.TestPR, false)/w.TestRate, math.Pow((5000*5000-600*600)/(5000*5000-4000*4000.0), 0.8); math.Abs(q-want) > 1e-12 {
		t.Errorf("deliverability at the test's reservoir pressure %g test rates, want ((pR²−pmin²)/(pR²−pwf²))^n = %g", q, want)
	}
	if q := w.Deliverability(500*psiPa, false); q != 0 {
		t.Errorf("deliverability %g below the minimum flowing pressure, want 0", q)
	}
	for _, c := range []struct {
		at   time.Time
		want int
	}{{fcDay(2029, 12, 31), 0}, {fcDay(2030, 1, 1), 4}, {fcDay(2032, 6, 30), 4}, {fcDay(2032, 7, 1), 6}} {
		if n := w.CountAt(c.at); n != c.want {
			t.Errorf("%s: %d wells, want %d", c.at.Format(time.DateOnly), n, c.want)
		}
	}
}

func fcOptions() ForecastOptions {
	return ForecastOptions{Plateau: 40 * mmscfd, Uptime: 0.95, Minimum: 2 * mmscfd, End: fcDay(2070, 1, 1), StepMonths: 1}
}

func TestForecastAgainstRecover(t *testing.T) {
	m, c, res := forecastModel(t)
	f, err := RunForecast(m, fcWells, fcOptions())
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("plateau to %s, stop %s (%s) at %.0f psia, %d steps", f.PlateauEnd.Format(time.DateOnly), f.StopDate.Format(time.DateOnly), f.Stop, f.Final.P/psiPa, len(f.Steps))
	if f.PlateauEnd.IsZero() || !f.PlateauEnd.After(fcWells.Start.AddDate(1, 0, 0)) {
		t.Errorf("plateau ends %s: the test wants one of more than a year", f.PlateauEnd)
	}
	// The cumulative wet gas at the final pressure is Recover's at that
	// pressure, within 0.2 %.
	rec, err := Recover(c.Fluid, c.Z, res, rTrain, RecoverOptions{Pressures: []float64{f.Final.P}, SkipMaxSaturation: true})
	if err != nil {
		t.Fatal(err)
	}
	want := rec.Steps[len(rec.Steps)-1]
	if d := f.Final.Cum.WetGas/want.WetGas - 1; math.Abs(d) > 0.002 {
		t.Errorf("cumulative wet gas %.6g sm3 at %.1f psia, recover gives %.6g (%.3f %%)", f.Final.Cum.WetGas, f.Final.P/psiPa, want.WetGas, 100*d)
	}
	if d := f.Final.Cum.Condensate/want.Condensate - 1; math.Abs(d) > 0.002 {
		t.Errorf("cumulative condensate %.6g m3, recover gives %.6g (%.3f %%)", f.Final.Cum.Condensate, want.Condensate, 100*d)
	}
	// On the plateau the sales gas is the target; after it, the wet-gas
	// rate is the deliverability (the average over a month of a rate that
	// falls smoothly, against the mean of its ends: within 0.5 %).
	var prev ReservoirState = m.Initial()
	prevWells := fcWells.Count
	plateau, decline := 0, 0
	for i, s := range f.Steps {
		last := i == len(f.Steps)-1
		switch {
		case s.OnPlateau:
			plateau++
			if d := s.Rates.SalesGas/fcOptions().Plateau - 1; math.Abs(d) > 1e-6 {
				t.Errorf("step to %s on the plateau: sales gas %.6g MMscf/d, want the plateau", s.End.Format(time.DateOnly), s.Rates.SalesGas/mmscfd)
			}
		case !last && s.State.P < m.DewPressure() && prev.P < m.DewPressure() && s.Wells == prevWells && i > 0 && !f.Steps[i-1].OnPlateau:
			decline++
			d0 := float64(prevWells) * fcWells.Deliverability(prev.P, true) * 0.95
			d1 := s.Deliverability
			if d := s.Rates.WetGas/((d0+d1)/2) - 1; math.Abs(d) > 0.005 {
				t.Errorf("step to %s: wet gas %.5g MMscf/d, the deliverability %.5g to %.5g", s.End.Format(time.DateOnly), s.Rates.WetGas/mmscfd, d0/mmscfd, d1/mmscfd)
			}
		}
		prev, prevWells = s.State, s.Wells
	}
	if plateau == 0 || decline < 12 {
		t.Errorf("%d steps on the plateau and %d in decline checked, want both", plateau, decline)
	}
}

// Halving the reporting step, or the integration substep, changes the
// ultimate recovery by under 0.1 %.
func TestForecastStepIndependent(t *testing.T) {
	m, _, _ := forecastModel(t)
	run := func(months int, sub time.Duration) *Forecast {
		o := fcOptions()
		o.StepMonths, o.Substep = months, sub
		f, err := RunForecast(m, fcWells, o)
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	base := run(12, 0)
	for _, c := range []struct {
		name   string
		months int
		sub    time.Duration
	}{{"6-month steps", 6, 0}, {"1-month steps", 1, 0}, {"half-day substeps", 12, 12 * time.Hour}} {
		f := run(c.months, c.sub)
		for _, q := range []struct {
			what string
			a, b float64
		}{{"wet gas", base.Final.Cum.WetGas, f.Final.Cum.WetGas}, {"condensate", base.Final.Cum.Condensate, f.Final.Cum.Condensate}} {
			if d := q.b/q.a - 1; math.Abs(d) > 0.001 {
				t.Errorf("%s: ultimate %s changes by %.4f %% from yearly steps", c.name, q.what, 100*d)
			}
		}
		if dt := f.StopDate.Sub(base.StopDate); dt > 48*time.Hour || dt < -48*time.Hour {
			t.Errorf("%s: production ends %s, with yearly steps %s", c.name, f.StopDate.Format(time.DateOnly), base.StopDate.Format(time.DateOnly))
		}
	}
}

// The forecast stops at the first of its ends and says which.
func TestForecastStops(t *testing.T) {
	m, _, _ := forecastModel(t)
	o := fcOptions()
	o.End = fcDay(2035, 1, 1)
	f, err := RunForecast(m, fcWells, o)
	if err != nil {
		t.Fatal(err)
	}
	if f.Stop != StopHorizon || !f.StopDate.Equal(o.End) {
		t.Errorf("stop %v on %s, want the horizon %s", f.Stop, f.StopDate, o.End)
	}
	o = fcOptions()
	o.Minimum, o.End = 0, fcDay(2200, 1, 1)
	if f, err = RunForecast(m, fcWells, o); err != nil {
		t.Fatal(err)
	}
	if f.Stop != StopAbandonment && f.Stop != StopNoWells {
		t.Errorf("without a minimum rate: stop %v, want the abandonment pressure or the wells' limit", f.Stop)
	}
	o.Minimum = 15 * mmscfd
	if f, err = RunForecast(m, fcWells, o); err != nil {
		t.Fatal(err)
	}
	lastRate := f.Steps[len(f.Steps)-2].Rates.SalesGas
	if f.Stop != StopMinimumRate || lastRate < o.Minimum {
		t.Errorf("stop %v with the step before the last at %.3f MMscf/d, want the minimum rate of 15 MMscf/d", f.Stop, lastRate/mmscfd)
	}
}

func TestForecastBadInput(t *testing.T) {
	m, _, _ := forecastModel(t)
	bad := []struct {
		name string
		w    func(*Wells)
		o    func(*ForecastOptions)
	}{
		{"exponent above 1", func(w *Wells) { w.Exponent = 1.2 }, nil},
		{"test flowing pressure above the reservoir's", func(w *Wells) { w.TestPwf = w.TestPR + 1 }, nil},
		{"no minimum flowing pressure", func(w *Wells) { w.MinPwf = 0 }, nil},
		{"minimum at the plateau", nil, func(o *ForecastOptions) { o.Minimum = o.Plateau }},
		{"end before start", nil, func(o *ForecastOptions) { o.End = fcWells.Start }},
		{"13-month steps", nil, func(o *ForecastOptions) { o.StepMonths = 13 }},
	}
	for _, c := range bad {
		w, o := fcWells, fcOptions()
		if c.w != nil {
			c.w(&w)
		}
		if c.o != nil {
			c.o(&o)
		}
		if _, err := RunForecast(m, w, o); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
	if _, err := m.Advance(m.Initial(), 1, 1); err == nil {
		t.Error("a depletion accepted an injection")
	}
}

// The calendar years add up whatever the reporting step, a start in
// mid-year included: the substeps end on 1 January.
func TestForecastYearsStepIndependent(t *testing.T) {
	m, _, _ := forecastModel(t)
	w := fcWells
	w.Start = fcDay(2030, 7, 15)
	var runs []*Forecast
	for _, months := range []int{1, 12} {
		o := fcOptions()
		o.StepMonths = months
		f, err := RunForecast(m, w, o)
		if err != nil {
			t.Fatal(err)
		}
		runs = append(runs, f)
	}
	a, b := runs[0], runs[1]
	if len(a.Years) != len(b.Years) {
		t.Fatalf("%d and %d years", len(a.Years), len(b.Years))
	}
	for i := range a.Years {
		ya, yb := a.Years[i], b.Years[i]
		if ya.Year != yb.Year || math.Abs(ya.Volumes.Condensate-yb.Volumes.Condensate) > 1e-6*math.Max(ya.Volumes.Condensate, 1) ||
			math.Abs(ya.End.P-yb.End.P) > 1e-6*ya.End.P || ya.Wells != yb.Wells || math.Abs(ya.ProducingFraction-yb.ProducingFraction) > 1e-12 {
			t.Errorf("year %d: monthly steps give %+v, yearly %+v", ya.Year, ya, yb)
		}
	}
	if y := a.Years[0]; math.Abs(y.ProducingFraction-(365-195)/365.0) > 1e-9 { // 15 July to 31 December 2030: 170 of 365 days
		t.Errorf("2030 produced %.6f of the year, want 170/365", y.ProducingFraction)
	}
	var sum float64
	for _, y := range a.Years {
		sum += y.Volumes.WetGas
	}
	if math.Abs(sum/a.Final.Cum.WetGas-1) > 1e-12 {
		t.Errorf("the years add up to %.9g sm3 of wet gas, the forecast to %.9g", sum, a.Final.Cum.WetGas)
	}
}

// No well yet: nothing produces, and the first production is the day the
// first wells start.
func TestForecastLateWells(t *testing.T) {
	m, _, _ := forecastModel(t)
	w := fcWells
	w.Count = 0
	f, err := RunForecast(m, w, fcOptions())
	if err != nil {
		t.Fatal(err)
	}
	if !f.FirstProduction.Equal(w.Add[0].Date) {
		t.Errorf("first production %s, want %s", f.FirstProduction, w.Add[0].Date)
	}
	for _, y := range f.Years {
		if y.Year < 2032 && (y.ProducingFraction != 0 || y.WellYears != 0 || y.Volumes.WetGas != 0) {
			t.Errorf("%d: %+v before any well", y.Year, y)
		}
	}
	w.Add = nil
	w.Count, w.MinPwf = 4, 0.999*m.Initial().P
	if _, err := RunForecast(m, w, fcOptions()); err == nil {
		t.Error("wells that cannot flow produced a forecast")
	}
}

// Steps end on the same day of the month, or on its last day: a start on
// 31 January has steps to 29 February (2032 is a leap year), 31 March, 30
// April.
func TestAddMonths(t *testing.T) {
	s := fcDay(2032, 1, 31)
	for k, want := range []time.Time{fcDay(2032, 2, 29), fcDay(2032, 3, 31), fcDay(2032, 4, 30)} {
		if got := addMonths(s, k+1); !got.Equal(want) {
			t.Errorf("31 January + %d months = %s, want %s", k+1, got.Format(time.DateOnly), want.Format(time.DateOnly))
		}
	}
}

// fullOnly hides a model's advance for the pressure alone: the forecast
// then takes every half step through the separators and the plant.
type fullOnly struct{ ReservoirModel }

func (m fullOnly) AdvanceAt(s ReservoirState, withdraw, inject float64, at time.Time) (ReservoirState, error) {
	if tm, ok := m.ReservoirModel.(TimedModel); ok {
		return tm.AdvanceAt(s, withdraw, inject, at)
	}
	return m.Advance(s, withdraw, inject)
}

func (m fullOnly) ProductivityFactor(s ReservoirState) float64 {
	if pm, ok := m.ReservoirModel.(ProductiveModel); ok {
		return pm.ProductivityFactor(s)
	}
	return 1
}

// The midpoint rule's half step for the pressure alone, where the wells
// set the rate, gives the forecast of the full half step: the rate there
// is the wells' either way (the plateau's withdrawal at any outlet per wet
// gas up to one is above it). Only the separators' starting K-values
// differ, so the pressure searches, which meet each withdrawal to 1e-7 of
// it, may stop elsewhere within that: the states agree to 1e-8.
func TestHalfStepForPressureAlone(t *testing.T) {
	_, c, res := forecastModel(t)
	vsc := rTrain.StandardConditions().IdealGasVolume()
	o := fcOptions()
	o.Substep, o.Midpoint, o.End = 30*24*time.Hour, true, fcDay(2045, 1, 1)
	cm, err := NewCyclingModel(c.Fluid, c.Z, res, rTrain, passThrough(vsc),
		CyclingOptions{ReturnFraction: 0.85, Sweep: 0.7, Cells: 3, End: fcWells.Start.AddDate(6, 0, 0)}, nil)
	if err != nil {
		t.Fatal(err)
	}
	wm, err := NewWaterModel(c.Fluid, c.Z, res, rTrain, nil, WaterOptions{Voidage: 1, Sgr: 0.25, Sweep: 0.6}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range []ReservoirModel{cm, wm} {
		lean, err := RunForecast(m, fcWells, o)
		if err != nil {
			t.Fatal(err)
		}
		full, err := RunForecast(fullOnly{m}, fcWells, o)
		if err != nil {
			t.Fatal(err)
		}
		if !lean.StopDate.Equal(full.StopDate) || len(lean.Steps) != len(full.Steps) || !lean.PlateauEnd.Equal(full.PlateauEnd) {
			t.Fatalf("%T: stop %s and %s, %d and %d steps, plateau to %s and %s", m, lean.StopDate, full.StopDate, len(lean.Steps), len(full.Steps), lean.PlateauEnd, full.PlateauEnd)
		}
		if full.PlateauEnd.After(full.StopDate.AddDate(-3, 0, 0)) {
			t.Fatalf("%T: plateau to %s, stop %s: the test wants years of decline", m, full.PlateauEnd, full.StopDate)
		}
		for i := range lean.Steps {
			a, b := lean.Steps[i].State, full.Steps[i].State
			for _, v := range [][2]float64{{a.P, b.P}, {a.Cum.WetGas, b.Cum.WetGas}, {a.Cum.Condensate, b.Cum.Condensate}, {a.Cum.SalesGas, b.Cum.SalesGas}} {
				if d := math.Abs(v[0] - v[1]); d > 1e-8*math.Abs(v[1]) {
					t.Fatalf("%T: step %d: %.15g and %.15g", m, i, v[0], v[1])
				}
			}
		}
	}
}
