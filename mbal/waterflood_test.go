package mbal

import (
	"math"
	"testing"

	"dewcell/internal/testfluid"
)

// Water injection at a voidage replacement of 1 into a reservoir without
// pore compressibility holds the pressure (a volume balance: the water
// takes the place of what is produced), and by flood-out, with the whole
// volume swept, has produced all but the residual gas: a fraction
// 1 − Sgr/(1 − Swi) of the gas in place at that pressure (the frontal
// displacement of a gas reservoir by water, e.g. Agarwal, Al-Hussainy and
// Ramey (1965), SPE-1243; from memory).
func TestWaterInjectionLimits(t *testing.T) {
	c, err := testfluid.Lean()
	if err != nil {
		t.Fatal(err)
	}
	res := Reservoir{T: c.T, Pi: c.Pi, Abandonment: c.Abandonment, PoreVolume: 1e6, Sw: 0.2}
	vsc := rTrain.StandardConditions().IdealGasVolume()
	m, err := NewWaterModel(c.Fluid, c.Z, res, rTrain, nil, WaterOptions{Voidage: 1, Sgr: 0.25, Sweep: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	s := m.Initial()
	st := s.x.(*waterState)
	n0 := 0.0
	for i := range st.ahead {
		n0 += st.ahead[i] + st.un[i]
	}
	steps := 0
	for !m.Flooded(s) {
		steps++
		if steps > 1000 {
			t.Fatal("no flood-out in 1000 steps")
		}
		if s, err = m.Advance(s, 0.005*n0*vsc, 0); err != nil {
			t.Fatal(err)
		}
		if d := s.P/res.Pi - 1; math.Abs(d) > 0.01 {
			t.Fatalf("step %d: pressure %.0f psia, %.2f %% off the initial %.0f psia", steps, s.P/psiPa, 100*d, res.Pi/psiPa)
		}
		if e := m.BalanceError(s); e > 1e-8 {
			t.Fatalf("step %d: component balance off by %.3g", steps, e)
		}
	}
	produced := 0.0
	for _, v := range s.x.(*waterState).produced {
		produced += v
	}
	want := 1 - 0.25/(1-0.2)
	if got := produced / n0; math.Abs(got-want) > 0.006 { // one step of 0.5 % resolves the flood-out
		t.Errorf("produced %.4f of the gas in place by flood-out, want 1 − Sgr/(1 − Swi) = %.4f", got, want)
	}
	trapped := 0.0
	for _, v := range m.Trapped(s) {
		trapped += v
	}
	if math.Abs(trapped/n0-0.25/0.8) > 0.006 {
		t.Errorf("trapped %.4f of the gas in place, want Sgr/(1 − Swi) = %.4f", trapped/n0, 0.25/0.8)
	}
	if !(s.Cum.Water > 0) {
		t.Error("no water injected")
	}
}
