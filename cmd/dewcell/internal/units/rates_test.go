package units

import (
	"math"
	"testing"
)

// Rates by their definitions: 1 ft³ = 0.028316846592 m³, 1 bbl =
// 0.158987294928 m³ (NIST SP 811 (2008), B.8, exact), 1 d = 86400 s.
func TestRates(t *testing.T) {
	for _, c := range []struct {
		in   string
		kind Kind
		want float64 // SI, per second
	}{
		{"45 MMscf/d", GasRate, 45e6 * 0.028316846592 / 86400},
		{"9000 Mscf/d", GasRate, 9e6 * 0.028316846592 / 86400},
		{"1.3 1e6 sm3/d", GasRate, 1.3e6 / 86400},
		{"2e5 sm3/d", GasRate, 2e5 / 86400},
		{"4500 STB/d", LiquidRate, 4500 * 0.158987294928 / 86400},
		{"4500 bbl/d", LiquidRate, 4500 * 0.158987294928 / 86400},
		{"715 sm3/d", LiquidRate, 715.0 / 86400},
	} {
		got, err := Parse(c.in, c.kind, 0)
		if err != nil {
			t.Errorf("%s: %v", c.in, err)
			continue
		}
		if math.Abs(got-c.want) > 1e-14*c.want {
			t.Errorf("%s = %.15g m³/s, want %.15g", c.in, got, c.want)
		}
	}
	if _, err := Parse("45 MMscf", GasRate, 0); err == nil {
		t.Error("a volume taken for a rate")
	}
	if v := MMscfPerDay.FromSI(45e6 * 0.028316846592 / 86400); math.Abs(v-45) > 1e-12 {
		t.Errorf("45 MMscf/d shows as %g", v)
	}
}
