package cvd_test

import (
	"math"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/internal/refdata"
)

// o9Lab is the laboratory report that the reference values of fluid O9
// (testdata/pr-open.json, computed by CalebBell/thermo 0.6.1) would make: the
// dew point, the CVD rows with their produced-gas compositions and the CCE.
// The O9 components are reported one by one.
func o9Lab(t testing.TB, d *refdata.Data) cvd.LabReport {
	t.Helper()
	lab := cvd.LabReport{T: d.O9.TK, SaturationP: d.O9.DewPoint.PPa}
	rep := &cvd.LabCVD{}
	for i, c := range d.O9.Components {
		rep.Gas = append(rep.Gas, cvd.LabComponent{Name: c.Name, Index: []int{i}})
	}
	for _, row := range d.O9.CVD.Rows {
		rep.Points = append(rep.Points, cvd.LabCVDPoint{
			P: row.PPa, Dropout: row.DropoutPct / 100, Produced: row.ProducedPct / 100,
			ZGas: row.ZV, ZTwoPhase: row.ZTwoPhase, Gas: append([]float64(nil), row.ProducedY...),
			GasViscosity: cvd.Missing, CGR: cvd.Missing,
		})
	}
	lab.CVD = rep
	cce := &cvd.LabCCE{}
	for _, row := range d.O9.CCE.Rows {
		pt := cvd.LabCCEPoint{P: row.PPa, RelativeVolume: row.RelativeVolume, LiquidVolume: row.LiquidPct / 100,
			Z: cvd.Missing, Density: cvd.Missing}
		if row.Z != nil {
			pt.Z = *row.Z
		}
		if row.Rho != nil {
			pt.Density = *row.Rho
		}
		cce.Points = append(cce.Points, pt)
	}
	lab.CCE = cce
	return lab
}

// The model O9 against the report an independent library computed for the
// same model: every deviation within the acceptance tolerances of
// refdata_test.go (dropout, liquid volume and produced within 0.05 %
// absolute, Z within 1e-4, relative volume within 1e-4 relative), and every
// quantity of the report compared.
func TestCompareO9Reference(t *testing.T) {
	d := loadRef(t)
	fl, z := o9Fluid(t)
	lab := o9Lab(t, d)
	c, err := cvd.Compare(fl, z, lab, cvd.CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	src := refdata.File + ", o9"
	if math.Abs(c.SaturationDeviation) > 1e-6 {
		t.Errorf("saturation deviation %g, want below 1e-6 (%s)", c.SaturationDeviation, src)
	}
	if c.Start != c.Saturation.P {
		t.Errorf("the cell is charged at %g Pa, want the model's dew point %g Pa: the measured one is not above it", c.Start, c.Saturation.P)
	}
	tol := map[string]float64{
		cvd.QLiquidDropout: accFraction, cvd.QProduced: accFraction, cvd.QLiquidVolume: accFraction,
		cvd.QZGas: accZ, cvd.QZTwoPhase: accZ, cvd.QZ: accZ,
	}
	want := []string{cvd.QSaturationPressure, cvd.QLiquidDropout, cvd.QProduced, cvd.QZGas, cvd.QZTwoPhase}
	for _, comp := range d.O9.Components {
		want = append(want, cvd.GasQuantity(comp.Name))
	}
	want = append(want, cvd.QRelativeVolume, cvd.QLiquidVolume, cvd.QZ, cvd.QDensity)
	if len(c.Quantities) != len(want) {
		t.Fatalf("%d quantities compared, want %d", len(c.Quantities), len(want))
	}
	for i, q := range c.Quantities {
		if q.Name != want[i] {
			t.Errorf("quantity %d is %s, want %s", i, q.Name, want[i])
		}
		if q.Stats.Count != len(q.Points) || q.Stats.Count == 0 {
			t.Errorf("%s: count %d for %d points", q.Name, q.Stats.Count, len(q.Points))
		}
		lim, abs := tol[q.Name]
		switch {
		case abs && q.Stats.AAD > lim, abs && math.Abs(q.Stats.MaxDeviation) > lim:
			t.Errorf("%s: AAD %g, max %g, want within %g (%s)", q.Name, q.Stats.AAD, q.Stats.MaxDeviation, lim, src)
		case !abs && q.Kind == cvd.Absolute && q.Stats.AAD > 1e-6: // compositions, same equations
			t.Errorf("%s: AAD %g mole fraction, want within 1e-6 (%s)", q.Name, q.Stats.AAD, src)
		case !abs && q.Kind == cvd.Relative && q.Stats.AARD > accRelVol:
			t.Errorf("%s: AARD %g, want within %g (%s)", q.Name, q.Stats.AARD, accRelVol, src)
		}
	}
	if n := len(c.Quantity(cvd.QLiquidDropout).Points); n != len(d.O9.CVD.Rows) {
		t.Errorf("%d dropout points, want %d (every row, the dew point's included)", n, len(d.O9.CVD.Rows))
	}
}

// A model that misses: the heavy pseudo-component's critical temperature
// raised 3 % moves the dew point up and the dropout with it; the statistics
// are those of the points, computed again here by hand.
func TestCompareStatistics(t *testing.T) {
	d := loadRef(t)
	fl, z := o9Fluid(t)
	heavy := scaledHeavyTc(t, fl, 1.03)
	c, err := cvd.Compare(heavy, z, o9Lab(t, d), cvd.CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !(c.SaturationDeviation > 0.005) {
		t.Errorf("saturation deviation %g: a heavier end should raise the dew point", c.SaturationDeviation)
	}
	if c.Start != c.Saturation.P || c.Start <= d.O9.DewPoint.PPa {
		t.Errorf("start %g Pa: want the model's dew point, above the measured one", c.Start)
	}
	q := c.Quantity(cvd.QLiquidDropout)
	var sum, abs, worst float64
	for _, p := range q.Points {
		diff := p.Model - p.Lab
		sum += diff
		abs += math.Abs(diff)
		if math.Abs(diff) > math.Abs(worst) {
			worst = diff
		}
	}
	n := float64(len(q.Points))
	if !(q.Stats.AAD > 0.005) {
		t.Errorf("dropout AAD %g: want a visible miss", q.Stats.AAD)
	}
	for _, chk := range []struct {
		what      string
		got, want float64
	}{{"AAD", q.Stats.AAD, abs / n}, {"bias", q.Stats.Bias, sum / n}, {"max", q.Stats.MaxDeviation, worst}} {
		if math.Abs(chk.got-chk.want) > 1e-15 {
			t.Errorf("dropout %s = %g, want %g (the mean of the points)", chk.what, chk.got, chk.want)
		}
	}
}

// StatsOf on numbers worked by hand.
func TestStatsOf(t *testing.T) {
	pts := []cvd.PointComparison{
		{P: 3, Lab: 10, Model: 11}, // +1, +10 %
		{P: 2, Lab: 20, Model: 17}, // −3, −15 %
		{P: 1, Lab: 0, Model: 0.5}, // +0.5, no relative difference
		{P: 0.5, Lab: 4, Model: 4}, // 0, 0 %
	}
	s := cvd.StatsOf(pts)
	// count 4; AAD (1+3+0.5+0)/4 = 1.125; bias (1−3+0.5+0)/4 = −0.375;
	// max −3 at P = 2; AARD (0.10+0.15+0)/3 over the 3 points with lab ≠ 0.
	if s.Count != 4 || s.RelativeCount != 3 {
		t.Errorf("counts %d, %d; want 4, 3", s.Count, s.RelativeCount)
	}
	for _, chk := range []struct {
		what      string
		got, want float64
	}{{"AAD", s.AAD, 1.125}, {"bias", s.Bias, -0.375}, {"max", s.MaxDeviation, -3}, {"max at", s.MaxAt, 2}, {"AARD", s.AARD, 0.25 / 3}} {
		if math.Abs(chk.got-chk.want) > 1e-15 {
			t.Errorf("%s = %g, want %g (worked by hand)", chk.what, chk.got, chk.want)
		}
	}
}

// A liquid volume reported over the total volume is the model's liquid
// over its own total volume: (V_L/V_sat)/(V/V_sat).
func TestCompareLiquidBasis(t *testing.T) {
	d := loadRef(t)
	fl, z := o9Fluid(t)
	var cce cvd.LabCCE
	cce.LiquidBasis = cvd.OfTotalVolume
	for _, row := range d.O9.CCE.Rows {
		if row.Region == "two phase" {
			cce.Points = append(cce.Points, cvd.LabCCEPoint{P: row.PPa, RelativeVolume: cvd.Missing,
				LiquidVolume: row.LiquidPct / 100 / row.RelativeVolume, Z: cvd.Missing, Density: cvd.Missing})
		}
	}
	c, err := cvd.Compare(fl, z, cvd.LabReport{T: d.O9.TK, CCE: &cce}, cvd.CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	q := c.Quantity(cvd.QLiquidVolume)
	if q == nil || len(q.Points) != len(cce.Points) || q.Stats.AAD > accFraction {
		t.Fatalf("liquid volume of the total: %+v, want every point within %g (%s)", q, accFraction, refdata.File)
	}
	if c.Quantity(cvd.QRelativeVolume) != nil || c.Quantity(cvd.QSaturationPressure) != nil {
		t.Error("quantities compared that the report does not give")
	}
}

func TestCompareNothing(t *testing.T) {
	fl, z := o9Fluid(t)
	if _, err := cvd.Compare(fl, z, cvd.LabReport{T: 400}, cvd.CompareOptions{}); err == nil {
		t.Error("an empty report compared without error")
	}
}

// A model whose dew point lies below the measured one charges its cell at
// the measured saturation pressure, as the laboratory did: its first steps
// produce the single-phase gas, and at the measured saturation pressure its
// gas is the feed.
func TestCompareChargedAboveModelDewPoint(t *testing.T) {
	d := loadRef(t)
	fl, z := o9Fluid(t)
	light := scaledHeavyTc(t, fl, 0.97)
	lab := o9Lab(t, d)
	c, err := cvd.Compare(light, z, lab, cvd.CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !(c.Saturation.P < lab.SaturationP) || c.Start != lab.SaturationP {
		t.Fatalf("model dew point %g Pa, start %g Pa; want the dew point below the measured %g Pa and the start there", c.Saturation.P, c.Start, lab.SaturationP)
	}
	first := c.Quantity(cvd.QLiquidDropout).Points[0]
	if first.Model != 0 {
		t.Errorf("dropout at the charging pressure %g, want 0", first.Model)
	}
	g := c.Quantity(cvd.GasQuantity(d.O9.Components[2].Name)).Points[0]
	if g.Model != z[2] {
		t.Errorf("gas %s at the charging pressure %g, want the feed's %g", d.O9.Components[2].Name, g.Model, z[2])
	}
	for _, p := range c.Quantity(cvd.QProduced).Points[1:] {
		if !(p.Model > 0) {
			t.Errorf("produced at %g Pa is %g, want above 0", p.P, p.Model)
		}
	}
}

// scaledHeavyTc is fl with the critical temperature of its heaviest
// component multiplied by f, the interaction coefficients kept.
func scaledHeavyTc(t *testing.T, fl *eos.Fluid, f float64) *eos.Fluid {
	t.Helper()
	comps := fl.Components()
	comps[len(comps)-1].Tc *= f
	n := fl.N()
	kij := make([]float64, n*n)
	for i := range n {
		for j := range n {
			kij[i*n+j] = fl.Kij(i, j)
		}
	}
	out, err := eos.NewFluid(comps, kij, fl.Options())
	if err != nil {
		t.Fatal(err)
	}
	return out
}
