package mbal

import (
	"errors"
	"math"
	"sort"

	"dewcell/cvd"
	"dewcell/eos"
)

// ProductionRecord is one row of a production history as a field reports
// it: the average reservoir pressure and what was produced since discovery.
// Standard volumes are at the standard conditions of the separator train
// given to HistoryPoints.
type ProductionRecord struct {
	P          float64 // average reservoir pressure, Pa
	SalesGas   float64 // cumulative sales (surface) gas, standard m³
	Condensate float64 // cumulative stock-tank condensate, m³ at standard conditions
	Water      float64 // cumulative water, m³ at standard conditions
}

// HistoryOptions control HistoryPoints. A nil *HistoryOptions means the
// defaults.
type HistoryOptions struct {
	// Bw is the water formation volume factor, reservoir m³ per m³ at
	// standard conditions, of every point; 0 means McCain's (1990)
	// correlation at the reservoir temperature and each point's pressure
	// (WaterFVFMcCain).
	Bw float64
	// GridSteps is the number of even pressure steps from the initial
	// pressure down to the lowest recorded one at which the simulated
	// depletion is reported, and between which Z₂ and the gas equivalent are
	// interpolated; 0 means DefaultHistoryGridSteps. The depletion itself
	// is integrated to convergence whatever the grid.
	GridSteps int
	// Tolerance of the depletion's adaptive integration; 0 means
	// cvd.DefaultTolerance.
	Tolerance float64
	Settings  *eos.Settings
}

// DefaultHistoryGridSteps is the grid of HistoryPoints when the options give
// none: on the bundled example 100 steps (32 psi each) interpolate Z₂ to
// about 1e-5.
const DefaultHistoryGridSteps = 100

// ErrNoStockTankOil: the separator train makes no stock-tank oil from the
// fluid, so its condensate has no gas equivalent.
var ErrNoStockTankOil = errors.New("the separator train makes no stock-tank oil from the fluid")

// WetGasHistory is a production history converted to the wet-gas basis of
// the material balance (HistoryPoints), with what the conversion used.
type WetGasHistory struct {
	// Points are the records as points of FitPZ and HavlenaOdeh, one per
	// record and in its order.
	Points []HistoryPoint
	// GasEquivalent is, per point, the gas equivalent of the condensate
	// produced down to its pressure, standard m³ per m³ of stock-tank oil;
	// InitialGasEquivalent is that of the initial fluid's stock-tank oil.
	GasEquivalent        []float64
	InitialGasEquivalent float64
	// Zi is Z₂ at the initial pressure (that of the single-phase fluid);
	// DewPoint is the fluid's dew point at the reservoir temperature, Pa.
	Zi       float64
	DewPoint float64
	// BwCorrelated says the points' Bw come from WaterFVFMcCain (no
	// HistoryOptions.Bw); BwExtrapolated that the correlation was used
	// beyond its data (WaterFVFMcCainRange) at a point that produced water.
	BwCorrelated, BwExtrapolated bool
	// Recovery is the simulated depletion, with immobile condensate,
	// reported on the grid from the initial pressure down to the lowest
	// record's pressure; Recovery.InPlace is the fluid in place.
	Recovery *Recovery
}

// HistoryPoints puts a production history on the wet-gas basis of the
// two-phase p/Z material balance (METHODS 5.3, 9.1), for FitPZ and
// HavlenaOdeh with pi = r.Pi and zi = Zi. The records follow the initial
// state in time, each at a pressure below r.Pi (a record at zero production
// is the initial state: leave it out).
//
// The cumulative wet gas of a record is the sales gas plus the condensate's
// gas equivalent,
//
//	GE = (ρ_o/M_o) R T_sc/p_sc   per m³ of stock-tank oil,
//
// the ideal-gas volume of the oil's moles. The condensate grows lighter as
// the reservoir depletes, so ρ_o/M_o is that of all the stock-tank oil
// produced down to the record's pressure in a simulated depletion of the
// reservoir (Recover with immobile condensate: cumulative oil moles over
// cumulative oil volume); before any condensate is produced it is that of
// the initial fluid's stock-tank oil. Z₂ comes from the same depletion.
// Both are interpolated linearly in pressure between the depletion's
// reported pressures, GridSteps even steps from r.Pi down to the lowest
// record's pressure (r.Abandonment is not used). Each point's Bw is opt.Bw,
// or McCain's correlation at r.T and the point's pressure.
//
// Special cases: an invalid reservoir: ErrBadReservoir; no records, a pressure that is not positive or not below
// r.Pi, a volume that is negative or not finite, a negative GridSteps or a
// Bw that is negative or not finite: a *HistoryError wrapping
// ErrHistoryShort or ErrHistoryValue, naming the record (Field "P",
// "SalesGas", "Condensate" or "Water") or the option. A train that makes no
// stock-tank oil from the fluid: ErrNoStockTankOil. The depletion's errors
// (as Recover's) are returned as they are.
func HistoryPoints(fl *eos.Fluid, z []float64, r Reservoir, tr cvd.Train, records []ProductionRecord, opt *HistoryOptions) (*WetGasHistory, error) {
	const fn = "HistoryPoints"
	r.Abandonment = 0 // not used: the depletion runs down to the lowest record
	if err := r.Check(); err != nil {
		return nil, err
	}
	var o HistoryOptions
	if opt != nil {
		o = *opt
	}
	bad := func(i int, field string, v float64, why string) error {
		return &HistoryError{Func: fn, Index: i, Field: field, Value: v, Err: ErrHistoryValue, Why: why}
	}
	steps := o.GridSteps
	switch {
	case steps < 0:
		return nil, bad(-1, "GridSteps", float64(steps), "must not be negative (0 means the default)")
	case steps == 0:
		steps = DefaultHistoryGridSteps
	}
	if !(o.Bw >= 0) || math.IsInf(o.Bw, 0) {
		return nil, bad(-1, "Bw", o.Bw, "water formation volume factor must be positive and finite (0 means McCain's correlation)")
	}
	if len(records) == 0 {
		return nil, &HistoryError{Func: fn, Index: -1, Field: "records", Err: ErrHistoryShort,
			Why: "no production history after the initial state"}
	}
	pLow := math.Inf(1)
	for i, rec := range records {
		switch {
		case !(rec.P > 0) || math.IsInf(rec.P, 0):
			return nil, bad(i, "P", rec.P, "pressure must be positive and finite (Pa)")
		case !(rec.P < r.Pi):
			return nil, bad(i, "P", rec.P, "pressure must lie below the initial pressure, where the simulated depletion starts")
		}
		for _, v := range []struct {
			field string
			v     float64
		}{{"SalesGas", rec.SalesGas}, {"Condensate", rec.Condensate}, {"Water", rec.Water}} {
			if !(v.v >= 0) || math.IsInf(v.v, 0) {
				return nil, bad(i, v.field, v.v, "cumulative volume must be non-negative and finite (m³ at standard conditions)")
			}
		}
		pLow = math.Min(pLow, rec.P)
	}

	grid := make([]float64, steps)
	for k := range grid {
		grid[k] = r.Pi - (r.Pi-pLow)*float64(k+1)/float64(steps)
	}
	grid[len(grid)-1] = pLow
	r.Abandonment = pLow
	rec, err := Recover(fl, z, r, tr, RecoverOptions{Pressures: grid, Tolerance: o.Tolerance, Settings: o.Settings})
	if err != nil {
		return nil, err
	}
	ip := rec.InPlace
	if !(ip.Surface.OilMoles > 0) || !(ip.Surface.OilVolume > 0) {
		return nil, ErrNoStockTankOil
	}
	// ρ_o/M_o is the oil's moles per m³: OilMoles/OilVolume per mole of feed.
	vsc := tr.StandardConditions().IdealGasVolume()
	h := &WetGasHistory{
		InitialGasEquivalent: ip.Surface.OilMoles / ip.Surface.OilVolume * vsc,
		Zi:                   rec.Steps[0].Z2,
		DewPoint:             rec.Depletion.Dew.P,
		BwCorrelated:         o.Bw == 0,
		Recovery:             rec,
	}
	geOf := func(s RecoveryStep) float64 {
		if !(s.Condensate > 0) {
			return h.InitialGasEquivalent
		}
		return s.OilMoles / s.Condensate * vsc
	}
	z2Of := func(s RecoveryStep) float64 { return s.Z2 }
	for _, row := range records {
		ge := interpolateSteps(rec.Steps, row.P, geOf)
		bw := o.Bw
		if bw == 0 {
			bw = WaterFVFMcCain(r.T, row.P)
			h.BwExtrapolated = h.BwExtrapolated || row.Water > 0 && !WaterFVFMcCainRange(r.T, row.P)
		}
		h.GasEquivalent = append(h.GasEquivalent, ge)
		h.Points = append(h.Points, HistoryPoint{
			P:         row.P,
			Z2:        interpolateSteps(rec.Steps, row.P, z2Of),
			CumWetGas: row.SalesGas + row.Condensate*ge,
			CumWater:  row.Water,
			Bw:        bw,
		})
	}
	return h, nil
}

// interpolateSteps gives f of the depletion steps (falling in pressure) at
// p, linearly in pressure; beyond the ends it would take the end value,
// which HistoryPoints' grid, from the initial pressure down to the lowest
// record's, does not let happen.
func interpolateSteps(steps []RecoveryStep, p float64, f func(RecoveryStep) float64) float64 {
	n := len(steps)
	// steps[k].P falls with k: find the first step at or below p.
	k := sort.Search(n, func(i int) bool { return steps[i].P <= p })
	switch {
	case k == 0:
		return f(steps[0])
	case k == n:
		return f(steps[n-1])
	}
	a, b := steps[k-1], steps[k]
	if a.P == b.P {
		return f(b)
	}
	return f(b) + (f(a)-f(b))*(p-b.P)/(a.P-b.P)
}
