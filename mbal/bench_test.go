package mbal

import (
	"testing"

	"dewcell/internal/testfluid"
)

// BenchmarkRecover: the depletion recovery of the 12-component test
// condensate in the reservoir of TestInPlaceHandWorked (250 °F, 5200 psia
// down to 700 psia, two-stage separator), with the condensate immobile and
// with it flowing, in the default steps.
func BenchmarkRecover(b *testing.B) {
	fl, z := rCondensate(b)
	r := field640
	r.Cf, r.Cw = 4e-6/rPsi, 3e-6/rPsi
	for _, bc := range []struct {
		name string
		o    RecoverOptions
	}{
		{"immobile", RecoverOptions{}},
		{"mobile", RecoverOptions{MobileLiquid: true}},
	} {
		b.Run(bc.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Recover(fl, z, r, rTrain, bc.o); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkRecover10: the depletion recovery of the invented 10-component
// condensate (internal/testfluid Condensate10) in the reservoir of
// TestInPlaceHandWorked at the fluid's 250 °F and 4800 psia initial
// pressure, down to 700 psia, with the condensate immobile, integrated in
// the default steps to the default tolerance.
func BenchmarkRecover10(b *testing.B) {
	c, err := testfluid.Condensate10()
	if err != nil {
		b.Fatal(err)
	}
	r := field640
	r.T, r.Pi, r.Abandonment = c.T, c.Pi, c.Abandonment
	r.Cf, r.Cw = 4e-6/rPsi, 3e-6/rPsi
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Recover(c.Fluid, c.Z, r, rTrain, RecoverOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}
