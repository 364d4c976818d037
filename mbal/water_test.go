package mbal

import (
	"math"
	"testing"
)

// TestWaterFVFMcCain checks the correlation against the worked example of
// McCain (1990) as restated at wiki.pengtools.com ("Water formation volume
// factor"): at 3176 psia and 165 °F, ΔV_wp = −0.0047241, ΔV_wt = 0.027 and
// B_w = 1.022, printed to 4 digits. Our hand evaluation of the same terms,
// (1 + 0.0270001)(1 − 0.0047241) = 1.0221485, is checked to 1e-6. At
// standard conditions (60 °F, 14.696 psia) B_w is 1 within the fit's
// residual (2e-5 here: ΔV_wt(60) = −1.0001e−2 + 8.00346e−3 + 1.98235e−3
// = −1.5e−5).
func TestWaterFVFMcCain(t *testing.T) {
	got := WaterFVFMcCain(rDegF(165), 3176*rPsi)
	if math.Abs(got-1.022) > 5e-4 {
		t.Errorf("B_w(165 °F, 3176 psia) = %.6f, McCain's example 1.022", got)
	}
	if math.Abs(got-1.0221485) > 1e-6 {
		t.Errorf("B_w(165 °F, 3176 psia) = %.8f, hand evaluation 1.0221485", got)
	}
	if std := WaterFVFMcCain(rDegF(60), 14.696*rPsi); math.Abs(std-1) > 1e-4 {
		t.Errorf("B_w at standard conditions = %.6f, want 1", std)
	}
	if !WaterFVFMcCainRange(rDegF(248), 4950*rPsi) || WaterFVFMcCainRange(rDegF(300), 3000*rPsi) || WaterFVFMcCainRange(rDegF(200), 6000*rPsi) {
		t.Error("range of the data: up to 260 °F and 5000 psia")
	}
}
