package cvd

import (
	"testing"

	"dewcell/internal/testfluid"
)

// BenchmarkDeplete: a 10-step CVD of the 12-component condensate, with the
// dew point and a two-stage separator train for every step's gas.
func BenchmarkDeplete(b *testing.B) {
	fl, z := condensate(b, true)
	o := DepletionOptions{Abandonment: 700 * psi, Steps: 10, Train: twoStage}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Deplete(fl, z, degF(250), o); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkExpand: a CCE of 15 pressures of the same condensate.
func BenchmarkExpand(b *testing.B) {
	fl, z := condensate(b, true)
	var ps []float64
	for k := 0; k < 15; k++ {
		ps = append(ps, (6000-350*float64(k))*psi)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Expand(fl, z, degF(250), ps, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkDeplete10: an 8-step CVD of the invented 10-component
// condensate (internal/testfluid Condensate10) from its dew point at 250 °F
// to 700 psia, with the dew point, the search for the maximum dropout and
// the two-stage separator train for every step's gas.
func BenchmarkDeplete10(b *testing.B) {
	c, err := testfluid.Condensate10()
	if err != nil {
		b.Fatal(err)
	}
	o := DepletionOptions{Abandonment: c.Abandonment, Steps: 8, Train: twoStage}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Deplete(c.Fluid, c.Z, c.T, o); err != nil {
			b.Fatal(err)
		}
	}
}
