package mbal

import "testing"

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
