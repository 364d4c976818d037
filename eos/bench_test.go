package eos

import "testing"

// benchCase is a 12-component gas condensate: eight library components and a
// C7+ split into four pseudo-components. The compositions are invented for
// benchmarking only.
type benchCase struct {
	name string
	fl   *Fluid
	z    []float64
	t    float64 // K
	p    float64 // Pa, a two-phase pressure below the dew point
}

func benchCases(tb testing.TB) []benchCase {
	mk := func(name string, defined map[string]float64, plus PlusFraction, tf, ppsia float64) benchCase {
		order := []string{"N2", "CO2", "C1", "C2", "C3", "nC4", "nC5", "nC6"}
		amounts := make([]float64, len(order))
		for i, nm := range order {
			amounts[i] = defined[nm] / 100
		}
		fl, z := characterized(tb, order, amounts, plus.Z, plus, Characterization{}, Options{Equation: PR78, VolumeShift: true})
		return benchCase{name: name, fl: fl, z: z, t: degF(tf), p: ppsia * psi}
	}
	return []benchCase{
		mk("lean", map[string]float64{"N2": 0.5, "CO2": 2.5, "C1": 78, "C2": 8, "C3": 4, "nC4": 2.3, "nC5": 1.2, "nC6": 0.8},
			PlusFraction{Name: "C7+", FirstCarbon: 7, Z: 0.027, M: 0.135, SG: 0.78}, 240, 2500),
		mk("rich", map[string]float64{"N2": 0.3, "CO2": 2.4, "C1": 72, "C2": 8.5, "C3": 4.8, "nC4": 2.6, "nC5": 1.4, "nC6": 1.0},
			PlusFraction{Name: "C7+", FirstCarbon: 7, Z: 0.07, M: 0.150, SG: 0.80}, 250, 3500),
	}
}

func BenchmarkFlash(b *testing.B) {
	for _, bc := range benchCases(b) {
		b.Run(bc.name, func(b *testing.B) {
			f, res := NewFlasher(bc.fl, nil), new(FlashResult)
			if err := f.Flash(res, bc.t, bc.p, bc.z); err != nil || res.Phases != 2 {
				b.Fatalf("setup: %v, phases %d", err, res.Phases)
			}
			b.ReportAllocs()
			for b.Loop() {
				if err := f.Flash(res, bc.t, bc.p, bc.z); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkUpperSaturation(b *testing.B) {
	for _, bc := range benchCases(b) {
		b.Run(bc.name, func(b *testing.B) {
			s := NewSaturator(bc.fl, nil)
			b.ReportAllocs()
			for b.Loop() {
				if _, err := s.Upper(bc.t, bc.z); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkTraceEnvelope(b *testing.B) {
	for _, bc := range benchCases(b) {
		b.Run(bc.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := TraceEnvelope(bc.fl, bc.z, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkFlashFrom: the flash of BenchmarkFlash started from the K-values
// of a flash 3 % higher in pressure, as a depletion step does.
func BenchmarkFlashFrom(b *testing.B) {
	for _, bc := range benchCases(b) {
		b.Run(bc.name, func(b *testing.B) {
			f, res := NewFlasher(bc.fl, nil), new(FlashResult)
			if err := f.Flash(res, bc.t, bc.p*1.03, bc.z); err != nil || res.Phases != 2 {
				b.Fatalf("setup: %v, phases %d", err, res.Phases)
			}
			k := make([]float64, bc.fl.N())
			for i := range k {
				k[i] = res.Y[i] / res.X[i]
			}
			b.ReportAllocs()
			for b.Loop() {
				if err := f.FlashFrom(res, bc.t, bc.p, bc.z, k); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
