package eos

import (
	"encoding/json"
	"math"
	"os"
	"testing"
)

// A reproState is a state of an invented random fluid where an earlier
// flash returned a wrong split or a wrong single phase, with the right
// answer of an independent flash (see the source note of
// testdata/repro-flash.json).
type reproState struct {
	Name        string
	Note        string
	Components  []Component
	Kij         []float64
	VolumeShift bool `json:"volume_shift"`
	Equation    Equation
	Z           []float64
	T           float64 `json:"T_K"`
	P           float64 `json:"P_Pa"`
	Beta        float64 // vapour fraction (or either phase's fraction of a split of two liquids)
}

func reproFlashes(tb testing.TB) []reproState {
	b, err := os.ReadFile("testdata/repro-flash.json")
	if err != nil {
		tb.Fatal(err)
	}
	var doc struct{ States []reproState }
	if err := json.Unmarshal(b, &doc); err != nil {
		tb.Fatal(err)
	}
	return doc.States
}

// TestReproFlashes: on each state the flash gives the split of the
// independent flash (vapour fraction to the 3 decimals given; either phase
// for the split of two dense liquids), with equal fugacities, and neither
// phase unstable (a multi-start tangent-plane test against the split's
// plane) and no three-phase flag.
func TestReproFlashes(t *testing.T) {
	for _, s := range reproFlashes(t) {
		fl, err := NewFluid(s.Components, s.Kij, Options{Equation: s.Equation, VolumeShift: s.VolumeShift})
		if err != nil {
			t.Fatal(err)
		}
		var r FlashResult
		if err := NewFlasher(fl, nil).Flash(&r, s.T, s.P, s.Z); err != nil {
			t.Errorf("%s: %v", s.Name, err)
			continue
		}
		if r.Phases != 2 || math.Abs(r.Beta-s.Beta) > 6e-4 && math.Abs(1-r.Beta-s.Beta) > 6e-4 || r.ThreePhase {
			t.Errorf("%s: %d phases, vapour fraction %.4f, three-phase %v; want %s", s.Name, r.Phases, r.Beta, r.ThreePhase, s.Note)
			continue
		}
		if r.Resid > 1e-10 {
			t.Errorf("%s: fugacity residual %g", s.Name, r.Resid)
		}
		if tm := minTPD(fl, s.T, s.P, r.X); tm < tmUnstable {
			t.Errorf("%s: a phase of tm %g against the liquid of the split: not the equilibrium", s.Name, tm)
		}
	}
}
