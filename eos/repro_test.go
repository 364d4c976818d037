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
	Beta        float64 // vapour fraction (or either phase's fraction of a split of two liquids); 0: any
	ThreePhase  bool    `json:"three_phase"` // the two-phase split must be flagged three-phase
	// UnstableAt, for a saturation state: the feed is unstable at P, so the
	// upper saturation pressure at T lies above it.
	UnstableAt bool `json:"unstable_at"`
}

func (s reproState) fluid(tb testing.TB) *Fluid {
	fl, err := NewFluid(s.Components, s.Kij, Options{Equation: s.Equation, VolumeShift: s.VolumeShift})
	if err != nil {
		tb.Fatal(err)
	}
	return fl
}

func reproFlashes(tb testing.TB) (flashes, saturations []reproState) {
	b, err := os.ReadFile("testdata/repro-flash.json")
	if err != nil {
		tb.Fatal(err)
	}
	var doc struct{ States, Saturation []reproState }
	if err := json.Unmarshal(b, &doc); err != nil {
		tb.Fatal(err)
	}
	return doc.States, doc.Saturation
}

// TestReproFlashes: on each state the flash gives the split of the
// independent flash (vapour fraction to the 3 decimals given; either phase
// for the split of two dense liquids), or, where the file gives none, a
// split at all; with equal fugacities (to the 1e-8 a split is accepted at
// the work bound); with neither phase unstable (a multi-start
// tangent-plane test against the split's plane) and no three-phase flag,
// or, for the three-phase states, with the flag.
func TestReproFlashes(t *testing.T) {
	flashes, _ := reproFlashes(t)
	for _, s := range flashes {
		fl := s.fluid(t)
		var r FlashResult
		if err := NewFlasher(fl, nil).Flash(&r, s.T, s.P, s.Z); err != nil {
			t.Errorf("%s: %v", s.Name, err)
			continue
		}
		wrongBeta := s.Beta > 0 && math.Abs(r.Beta-s.Beta) > 6e-4 && math.Abs(1-r.Beta-s.Beta) > 6e-4
		if r.Phases != 2 || wrongBeta || r.ThreePhase != s.ThreePhase {
			t.Errorf("%s: %d phases, vapour fraction %.4f, three-phase %v; want %s", s.Name, r.Phases, r.Beta, r.ThreePhase, s.Note)
			continue
		}
		if r.Resid > flashLooseTol {
			t.Errorf("%s: fugacity residual %g", s.Name, r.Resid)
		}
		if tm := minTPD(fl, s.T, s.P, r.X); !s.ThreePhase && tm < tmUnstable {
			t.Errorf("%s: a phase of tm %g against the liquid of the split: not the equilibrium", s.Name, tm)
		}
	}
}

// TestReproSaturation: where the feed is unstable at P (by the independent
// reference), the upper saturation pressure lies above P, and the feed is
// one phase just above it and two just below.
func TestReproSaturation(t *testing.T) {
	_, sats := reproFlashes(t)
	for _, s := range sats {
		fl := s.fluid(t)
		up, err := UpperSaturation(fl, s.T, s.Z, nil)
		if err != nil {
			t.Errorf("%s: %v", s.Name, err)
			continue
		}
		if s.UnstableAt && !(up.P > s.P) {
			t.Errorf("%s: upper saturation pressure %.8g Pa, not above %.8g Pa: %s", s.Name, up.P, s.P, s.Note)
		}
		f := NewFlasher(fl, nil)
		var r FlashResult
		for _, c := range []struct {
			f      float64
			phases int
		}{{1.001, 1}, {0.999, 2}} {
			if err := f.Flash(&r, s.T, up.P*c.f, s.Z); err != nil || r.Phases != c.phases {
				t.Errorf("%s: at %g of the saturation pressure: %d phases (%v), want %d", s.Name, c.f, r.Phases, err, c.phases)
			}
		}
	}
}
