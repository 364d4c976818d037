package mbal

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
)

// hpReservoir is field640 (250 °F, 5200 psia, no rock or water
// compressibility) with its volumetric depletion reported on the grid that
// HistoryPoints builds with GridSteps 10 down to 1500 psia, and the
// production records of that depletion.
func hpReservoir(t *testing.T) (*eos.Fluid, []float64, Reservoir, *Recovery, []ProductionRecord) {
	t.Helper()
	fl, z := rCondensate(t)
	r := field640
	pLow := 1500 * rPsi
	grid := make([]float64, 10)
	for k := range grid {
		grid[k] = r.Pi - (r.Pi-pLow)*float64(k+1)/10
	}
	grid[9] = pLow
	r.Abandonment = pLow
	ref, err := Recover(fl, z, r, rTrain, RecoverOptions{Pressures: grid})
	if err != nil {
		t.Fatal(err)
	}
	var recs []ProductionRecord
	for _, s := range ref.Steps[1:] {
		recs = append(recs, ProductionRecord{P: s.P, SalesGas: s.SalesGas, Condensate: s.Condensate})
	}
	r.Abandonment = field640.Abandonment
	return fl, z, r, ref, recs
}

// TestHistoryPointsIdentities feeds HistoryPoints the depletion it
// simulates itself, at its own grid's pressures, and checks what must hold
// exactly: the produced moles are the surface gas's plus the stock-tank
// oil's, so sales gas plus condensate × gas equivalent is the wet gas
// produced (METHODS 5.3); Z₂ at a grid pressure is the depletion's; and,
// without rock or water compressibility, the two-phase p/Z₂ falls on a
// straight line that meets zero at the wet gas in place (METHODS 9.1), since
// p/Z₂ = n R T/V with the cell's volume V fixed.
func TestHistoryPointsIdentities(t *testing.T) {
	fl, z, r, ref, recs := hpReservoir(t)
	h, err := HistoryPoints(fl, z, r, rTrain, recs, &HistoryOptions{GridSteps: 10})
	if err != nil {
		t.Fatal(err)
	}
	if len(h.Points) != len(recs) || len(h.GasEquivalent) != len(recs) {
		t.Fatalf("%d points, %d gas equivalents for %d records", len(h.Points), len(h.GasEquivalent), len(recs))
	}
	for i, pt := range h.Points {
		s := ref.Steps[i+1]
		at := fmt.Sprintf("point %d (%.0f psia)", i+1, pt.P/rPsi)
		if pt.P != s.P || pt.Z2 != s.Z2 {
			t.Errorf("%s: P, Z2 = %g, %g; want the depletion's %g, %g", at, pt.P, pt.Z2, s.P, s.Z2)
		}
		if hRel(pt.CumWetGas, s.WetGas) > 1e-12 {
			t.Errorf("%s: sales gas + condensate × GE = %.15g m³, want the wet gas produced %.15g m³ (mole balance)", at, pt.CumWetGas, s.WetGas)
		}
		if pt.Bw != WaterFVFMcCain(r.T, pt.P) {
			t.Errorf("%s: Bw %g, want McCain's %g without HistoryOptions.Bw", at, pt.Bw, WaterFVFMcCain(r.T, pt.P))
		}
	}
	ip := h.Recovery.InPlace
	if h.Zi != ref.Steps[0].Z2 || hRel(h.Zi, r.Pi*ip.V/(eos.R*r.T)) > 1e-12 {
		t.Errorf("Zi = %.15g, want the depletion's %.15g = p_i v/(R T) = %.15g", h.Zi, ref.Steps[0].Z2, r.Pi*ip.V/(eos.R*r.T))
	}
	if h.DewPoint != ref.Depletion.Dew.P || !(h.DewPoint < r.Pi) {
		t.Errorf("dew point %g Pa, want the depletion's %g, below p_i", h.DewPoint, ref.Depletion.Dew.P)
	}
	if !h.BwCorrelated || h.BwExtrapolated {
		t.Errorf("Bw correlated %v, extrapolated %v; want true, false (no water produced)", h.BwCorrelated, h.BwExtrapolated)
	}
	f, err := FitPZ(h.Points, r.Pi, h.Zi, nil)
	if err != nil {
		t.Fatal(err)
	}
	if hRel(f.G, ip.WetGas) > 1e-9 || f.R2 < 1-1e-12 {
		t.Errorf("p/Z line: G = %.12g m³, R² = %.15g; want the wet gas in place %.12g m³ and a straight line", f.G, f.R2, ip.WetGas)
	}
}

// TestHistoryPointsGasEquivalent checks the gas equivalent of the initial
// fluid's condensate against the trade's formula, GE = 132,880 γ_o/M_o
// scf/STB at 60 °F and 14.696 psia (METHODS 5.3, printed to 5 digits, so
// 4e-5), with γ_o the stock-tank oil's specific gravity and M_o its molar
// mass in g/mol, and the gas equivalent per point against the produced oil's
// moles per volume at each grid pressure.
func TestHistoryPointsGasEquivalent(t *testing.T) {
	fl, z, r, ref, recs := hpReservoir(t)
	h, err := HistoryPoints(fl, z, r, rTrain, recs, &HistoryOptions{GridSteps: 10})
	if err != nil {
		t.Fatal(err)
	}
	sr := h.Recovery.InPlace.Surface
	scfPerSTB := rFt3 / 0.158987294928 // m³/m³ per scf/STB (1 bbl = 0.158987294928 m³, NIST SP 811)
	want := 132880 * sr.OilSG / (sr.OilM * 1000)
	if got := h.InitialGasEquivalent / scfPerSTB; hRel(got, want) > 4e-5 {
		t.Errorf("initial gas equivalent %.6g scf/STB, want 132,880 γo/Mo = %.6g (METHODS 5.3)", got, want)
	}
	vsc := eos.R * cvd.StandardField.T / cvd.StandardField.P
	for i, ge := range h.GasEquivalent {
		s := ref.Steps[i+1]
		if w := s.OilMoles / s.Condensate * vsc; hRel(ge, w) > 1e-14 {
			t.Errorf("point %d: gas equivalent %.15g, want the produced oil's moles per m³ × R T_sc/p_sc = %.15g", i+1, ge, w)
		}
	}
}

// TestHistoryPointsBetween: between the grid's pressures Z₂ and the gas
// equivalent are interpolated linearly in pressure (documented): at the
// middle of two grid pressures, the mean of their values.
func TestHistoryPointsBetween(t *testing.T) {
	fl, z, r, ref, recs := hpReservoir(t)
	mid := make([]ProductionRecord, 0, len(recs))
	var lo, hi []RecoveryStep
	for k := 2; k < len(ref.Steps); k++ {
		a, b := ref.Steps[k-1], ref.Steps[k]
		mid = append(mid, ProductionRecord{P: (a.P + b.P) / 2, SalesGas: (a.SalesGas + b.SalesGas) / 2, Condensate: (a.Condensate + b.Condensate) / 2})
		hi, lo = append(hi, a), append(lo, b)
	}
	// The lowest record fixes the grid's end: keep the last grid pressure.
	last := ref.Steps[len(ref.Steps)-1]
	mid = append(mid, ProductionRecord{P: last.P, SalesGas: last.SalesGas, Condensate: last.Condensate})
	h, err := HistoryPoints(fl, z, r, rTrain, mid, &HistoryOptions{GridSteps: 10})
	if err != nil {
		t.Fatal(err)
	}
	vsc := eos.R * cvd.StandardField.T / cvd.StandardField.P
	geOf := func(s RecoveryStep) float64 { return s.OilMoles / s.Condensate * vsc }
	for i := range lo {
		if w := (hi[i].Z2 + lo[i].Z2) / 2; math.Abs(h.Points[i].Z2-w) > 1e-14 {
			t.Errorf("point %d: Z2 %.15g, want the mean of its neighbours %.15g", i+1, h.Points[i].Z2, w)
		}
		// Above the dew point no condensate has been produced: the gas
		// equivalent is the initial fluid's.
		ga, gb := h.InitialGasEquivalent, geOf(lo[i])
		if hi[i].Condensate > 0 {
			ga = geOf(hi[i])
		}
		if w := (ga + gb) / 2; hRel(h.GasEquivalent[i], w) > 1e-14 {
			t.Errorf("point %d: gas equivalent %.15g, want the mean of its neighbours %.15g", i+1, h.GasEquivalent[i], w)
		}
	}
}

// TestHistoryPointsWater: a given Bw is used as given; McCain's correlation
// beyond its data (above 5000 psia, McCain 1990) is reported where water is
// produced there, and only there.
func TestHistoryPointsWater(t *testing.T) {
	fl, z := rCondensate(t)
	r := field640 // 5200 psia
	recs := []ProductionRecord{
		{P: 5100 * rPsi, SalesGas: 1e7, Condensate: 1e3},
		{P: 4800 * rPsi, SalesGas: 4e7, Condensate: 4e3, Water: 100},
		{P: 4500 * rPsi, SalesGas: 7e7, Condensate: 7e3, Water: 300},
	}
	h, err := HistoryPoints(fl, z, r, rTrain, recs, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !h.BwCorrelated || h.BwExtrapolated {
		t.Errorf("no water above 5000 psia: correlated %v, extrapolated %v; want true, false", h.BwCorrelated, h.BwExtrapolated)
	}
	recs[0].Water = 10
	if h, err = HistoryPoints(fl, z, r, rTrain, recs, nil); err != nil {
		t.Fatal(err)
	}
	if !h.BwExtrapolated {
		t.Error("water produced at 5100 psia: want McCain's correlation reported beyond its data (to 5000 psia)")
	}
	if h, err = HistoryPoints(fl, z, r, rTrain, recs, &HistoryOptions{Bw: 1.2}); err != nil {
		t.Fatal(err)
	}
	for i, pt := range h.Points {
		if pt.Bw != 1.2 || pt.CumWater != recs[i].Water {
			t.Errorf("point %d: Bw %g, water %g; want 1.2 as given and %g", i+1, pt.Bw, pt.CumWater, recs[i].Water)
		}
	}
	if h.BwCorrelated || h.BwExtrapolated {
		t.Errorf("Bw given: correlated %v, extrapolated %v; want false, false", h.BwCorrelated, h.BwExtrapolated)
	}
}

func TestHistoryPointsBadInput(t *testing.T) {
	fl, z := rCondensate(t)
	good := []ProductionRecord{{P: 4800 * rPsi, SalesGas: 4e7, Condensate: 4e3}, {P: 4500 * rPsi, SalesGas: 7e7, Condensate: 7e3}}
	mod := func(i int, f func(*ProductionRecord)) []ProductionRecord {
		r := append([]ProductionRecord(nil), good...)
		f(&r[i])
		return r
	}
	for _, c := range []struct {
		name  string
		r     Reservoir
		recs  []ProductionRecord
		opt   *HistoryOptions
		err   error
		index int
		field string
	}{
		{"no records", field640, nil, nil, ErrHistoryShort, -1, "records"},
		{"pressure at p_i", field640, mod(1, func(r *ProductionRecord) { r.P = field640.Pi }), nil, ErrHistoryValue, 1, "P"},
		{"pressure above p_i", field640, mod(0, func(r *ProductionRecord) { r.P = 6000 * rPsi }), nil, ErrHistoryValue, 0, "P"},
		{"negative pressure", field640, mod(0, func(r *ProductionRecord) { r.P = -1 }), nil, ErrHistoryValue, 0, "P"},
		{"NaN pressure", field640, mod(1, func(r *ProductionRecord) { r.P = math.NaN() }), nil, ErrHistoryValue, 1, "P"},
		{"negative sales gas", field640, mod(0, func(r *ProductionRecord) { r.SalesGas = -1 }), nil, ErrHistoryValue, 0, "SalesGas"},
		{"negative condensate", field640, mod(1, func(r *ProductionRecord) { r.Condensate = -1 }), nil, ErrHistoryValue, 1, "Condensate"},
		{"infinite water", field640, mod(1, func(r *ProductionRecord) { r.Water = math.Inf(1) }), nil, ErrHistoryValue, 1, "Water"},
		{"negative grid", field640, good, &HistoryOptions{GridSteps: -1}, ErrHistoryValue, -1, "GridSteps"},
		{"negative Bw", field640, good, &HistoryOptions{Bw: -1}, ErrHistoryValue, -1, "Bw"},
		{"NaN Bw", field640, good, &HistoryOptions{Bw: math.NaN()}, ErrHistoryValue, -1, "Bw"},
		{"bad reservoir", Reservoir{T: field640.T, Pi: 0, PoreVolume: 1e6}, good, nil, ErrBadReservoir, 0, ""},
	} {
		h, err := HistoryPoints(fl, z, c.r, rTrain, c.recs, c.opt)
		if h != nil || !errors.Is(err, c.err) {
			t.Errorf("%s: result %v, error %v; want nil and %v", c.name, h, err, c.err)
			continue
		}
		var he *HistoryError
		if c.field == "" {
			continue
		}
		if !errors.As(err, &he) || he.Index != c.index || he.Field != c.field || he.Func != "HistoryPoints" {
			t.Errorf("%s: error %v, want a *HistoryError of HistoryPoints at index %d, field %s", c.name, err, c.index, c.field)
		}
	}
}

// TestHistoryPointsNoOil: a stock tank so hot that no liquid is left in it
// (800 K at one atmosphere: every component of the test condensate, up to
// its heaviest pseudo-component, boils below that; common practice, no
// published source) gives the condensate no gas equivalent.
func TestHistoryPointsNoOil(t *testing.T) {
	fl, z := rCondensate(t)
	tr := cvd.Train{Tank: cvd.Conditions{T: 800, P: 101325}}
	good := []ProductionRecord{{P: 4800 * rPsi, SalesGas: 4e7}, {P: 4500 * rPsi, SalesGas: 7e7}}
	if h, err := HistoryPoints(fl, z, field640, tr, good, nil); h != nil || !errors.Is(err, ErrNoStockTankOil) {
		t.Errorf("result %v, error %v; want nil and ErrNoStockTankOil", h, err)
	}
}
