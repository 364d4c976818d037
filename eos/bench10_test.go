package eos_test

import (
	"testing"

	"dewcell/eos"
	"dewcell/internal/phys"
	"dewcell/internal/testfluid"
)

// The benchmarks of this file run on the invented 10-component gas
// condensate of internal/testfluid (Condensate10) at its 250 °F reservoir
// temperature. Every solver is started from scratch each iteration (cold
// start) except in BenchmarkFlashFrom10; the scratch space (Flasher,
// Saturator) is reused, as a caller reuses it.

// bench10 returns the fluid and its upper dew point at the reservoir
// temperature.
func bench10(b *testing.B) (testfluid.Case, float64) {
	b.Helper()
	c, err := testfluid.Condensate10()
	if err != nil {
		b.Fatal(err)
	}
	sat, err := eos.UpperSaturation(c.Fluid, c.T, c.Z, nil)
	if err != nil || sat.Type != eos.Dew {
		b.Fatalf("setup: upper saturation %v (%v)", err, sat.Type)
	}
	return c, sat.P
}

// flash10Cases are the pressures of BenchmarkFlash10 and
// BenchmarkFlashFrom10 with the number of phases there.
func flash10Cases(c testfluid.Case, dew float64) []struct {
	name   string
	p      float64
	phases int
} {
	return []struct {
		name   string
		p      float64
		phases int
	}{
		{"two-phase-0.9dew", 0.9 * dew, 2},
		{"two-phase-1500psia", 1500 * phys.PaPerPsi, 2},
		{"single-phase-4800psia", c.Pi, 1},
	}
}

// BenchmarkFlash10: the PT flash from a cold start (stability test, then
// the split when unstable) at 0.9 of the dew pressure, deep in the
// two-phase region and above the dew point. The single phase is named
// (the default): its critical point is solved once, in the setup, and
// cached for the feed.
func BenchmarkFlash10(b *testing.B) {
	c, dew := bench10(b)
	for _, bc := range flash10Cases(c, dew) {
		b.Run(bc.name, func(b *testing.B) {
			f, res := eos.NewFlasher(c.Fluid, nil), new(eos.FlashResult)
			if err := f.Flash(res, c.T, bc.p, c.Z); err != nil || res.Phases != bc.phases {
				b.Fatalf("setup: %v, phases %d, want %d", err, res.Phases, bc.phases)
			}
			b.ReportAllocs()
			for b.Loop() {
				if err := f.Flash(res, c.T, bc.p, c.Z); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkFlashFrom10: the two-phase flashes of BenchmarkFlash10 started
// from the K-values of a flash 3 % higher in pressure, as a depletion step
// or a separator stage does.
func BenchmarkFlashFrom10(b *testing.B) {
	c, dew := bench10(b)
	for _, bc := range flash10Cases(c, dew) {
		if bc.phases != 2 {
			continue
		}
		b.Run(bc.name, func(b *testing.B) {
			f, res := eos.NewFlasher(c.Fluid, nil), new(eos.FlashResult)
			if err := f.Flash(res, c.T, bc.p*1.03, c.Z); err != nil || res.Phases != 2 {
				b.Fatalf("setup: %v, phases %d", err, res.Phases)
			}
			k := make([]float64, c.Fluid.N())
			for i := range k {
				k[i] = res.Y[i] / res.X[i]
			}
			if err := f.FlashFrom(res, c.T, bc.p, c.Z, k); err != nil || res.Phases != 2 {
				b.Fatalf("setup: %v, phases %d", err, res.Phases)
			}
			b.ReportAllocs()
			for b.Loop() {
				if err := f.FlashFrom(res, c.T, bc.p, c.Z, k); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkUpperSaturation10: the upper dew point from scratch.
func BenchmarkUpperSaturation10(b *testing.B) {
	c, _ := bench10(b)
	s := eos.NewSaturator(c.Fluid, nil)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := s.Upper(c.T, c.Z); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkLowerDewPoint10: the lower dew point below the upper one, given
// the upper dew pressure.
func BenchmarkLowerDewPoint10(b *testing.B) {
	c, dew := bench10(b)
	s := eos.NewSaturator(c.Fluid, nil)
	if sat, err := s.Lower(c.T, c.Z, dew); err != nil || !(sat.P > 0 && sat.P < dew) {
		b.Fatalf("setup: lower dew point %v at %g Pa, upper %g Pa", err, sat.P, dew)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := s.Lower(c.T, c.Z, dew); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTraceEnvelope10: the whole phase envelope.
func BenchmarkTraceEnvelope10(b *testing.B) {
	c, _ := bench10(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := eos.TraceEnvelope(c.Fluid, c.Z, nil); err != nil {
			b.Fatal(err)
		}
	}
}
