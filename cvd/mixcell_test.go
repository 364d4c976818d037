package cvd

import (
	"math"
	"testing"

	"dewcell/eos"
	"dewcell/internal/testfluid"
)

// TestCellNearStable: a cell taken down through its dew point in steps of
// 1e-4 of the dew pressure. Against a fresh flash of the same contents at
// every step (the full stability test each time): where both are one phase
// the cell's volume is the same to the last bit; the cell finds the split
// no later than stableNear below the dew point (the bound of the stability
// test it leaves out next to a state found stable); once two-phase it
// agrees with the fresh flash to 1e-9. Dew points from the saturation
// search, fluids of internal/testfluid.
func TestCellNearStable(t *testing.T) {
	for _, mk := range []func() (testfluid.Case, error){testfluid.Lean, testfluid.Sour, testfluid.Rich, testfluid.Condensate10} {
		c, err := mk()
		if err != nil {
			t.Fatal(err)
		}
		sat, err := eos.NewSaturator(c.Fluid, nil).Upper(c.T, c.Z)
		if err != nil {
			t.Fatal(err)
		}
		if sat.Type != eos.Dew {
			t.Fatalf("%s: a %v point", c.Name, sat.Type)
		}
		cell, err := NewCell(c.Fluid, c.T, 1, c.Pi, 0, nil)
		if err != nil {
			t.Fatal(err)
		}
		fresh := eos.NewFlasher(c.Fluid, nil)
		fresh.NameSinglePhases(false)
		n, zc, total := make([]float64, len(c.Z)), make([]float64, len(c.Z)), 0.0
		for i, v := range c.Z {
			n[i] = 1000 * v
			total += n[i]
		}
		for i, v := range n {
			zc[i] = v / total // as the cell normalises its contents
		}
		var r eos.FlashResult
		firstCell, firstFresh, skipped := math.NaN(), math.NaN(), 0
		for k := -20; k <= 30; k++ {
			p := sat.P * (1 - 1e-4*float64(k))
			fs, err := cell.Flash(p, n)
			if err != nil {
				t.Fatal(err)
			}
			if err := fresh.Flash(&r, c.T, p, zc); err != nil {
				t.Fatal(err)
			}
			switch {
			case fs.Phases == 1 && r.Phases == 1:
				if want := total * r.V.V; fs.Volume != want {
					t.Errorf("%s at %.6g Pa: one-phase volume %.17g, fresh flash %.17g", c.Name, p, fs.Volume, want)
				}
			case fs.Phases == 1:
				skipped++
			case r.Phases == 2:
				if d := math.Abs(fs.Beta - r.Beta); d > 1e-9 {
					t.Errorf("%s at %.6g Pa: vapour fraction %.12g, fresh flash %.12g", c.Name, p, fs.Beta, r.Beta)
				}
			default:
				t.Errorf("%s at %.6g Pa: the cell splits, the fresh flash does not", c.Name, p)
			}
			if fs.Phases == 2 && math.IsNaN(firstCell) {
				firstCell = p
			}
			if r.Phases == 2 && math.IsNaN(firstFresh) {
				firstFresh = p
			}
		}
		if math.IsNaN(firstCell) || math.IsNaN(firstFresh) {
			t.Fatalf("%s: no split found (cell %v, fresh %v)", c.Name, firstCell, firstFresh)
		}
		if firstFresh < sat.P*(1-1.5e-4) || firstFresh > sat.P {
			t.Errorf("%s: the fresh flash splits first at %.8g Pa, the dew point is %.8g Pa", c.Name, firstFresh, sat.P)
		}
		// the documented bound, 1e-3 of the pressure, plus one step
		if firstCell < sat.P*(1-1e-3-1e-4) {
			t.Errorf("%s: the cell splits first at %.8g Pa, %.2g below the dew point %.8g Pa (bound 1e-3)", c.Name, firstCell, 1-firstCell/sat.P, sat.P)
		}
		t.Logf("%s: %d states one phase in the cell and two in the fresh flash", c.Name, skipped)
	}
}

// TestDepletionCellTestsEveryFlash: the depletion cell of a CVD runs the
// full stability test at every flash, also next to a state it found one
// phase: 1e-4 below the dew point (from the saturation search) it splits,
// where a reservoir cell would still take its contents as one phase.
func TestDepletionCellTestsEveryFlash(t *testing.T) {
	c, err := testfluid.Condensate10()
	if err != nil {
		t.Fatal(err)
	}
	sat, err := eos.NewSaturator(c.Fluid, nil).Upper(c.T, c.Z)
	if err != nil {
		t.Fatal(err)
	}
	dc := newCell(c.Fluid, c.T, &DepletionOptions{})
	n := make([]float64, len(c.Z))
	for i, v := range c.Z {
		n[i] = 1000 * v
	}
	for k, p := range []float64{sat.P * (1 + 1e-4), sat.P * (1 - 1e-4)} {
		if _, _, err := dc.flash(p, n); err != nil {
			t.Fatal(err)
		}
		if want := 1 + k; dc.res.Phases != want {
			t.Errorf("at %.8g Pa (dew point %.8g Pa): %d phases, want %d", p, sat.P, dc.res.Phases, want)
		}
	}
}
