package cvd

import (
	"math"
	"testing"
)

// TestFitLine checks the least-squares line against closed forms.
func TestFitLine(t *testing.T) {
	// exactly collinear points: y = 2 − 0.5 x, R² = 1 and no residual
	f := fitLine([]float64{0, 1, 2, 3, 5}, []float64{2, 1.5, 1, 0.5, -0.5})
	if !f.ok || math.Abs(f.r2-1) > 1e-15 || math.Abs(f.slope+0.5) > 1e-15 || math.Abs(f.intercept-2) > 1e-15 {
		t.Errorf("collinear: ok %v, R² %.17g, slope %g, intercept %g; want 1, -0.5, 2 (closed form)", f.ok, f.r2, f.slope, f.intercept)
	}
	for i, e := range f.resid {
		if math.Abs(e) > 1e-15 || math.Abs(f.studentized[i]) > 1e-5 {
			t.Errorf("collinear: residual %d = %g, studentized %g; want 0", i, e, f.studentized[i])
		}
	}
	// (0,0), (1,1), (2,0): slope 0, intercept 1/3, SSR = SST = 2/3, R² = 0
	f = fitLine([]float64{0, 1, 2}, []float64{0, 1, 0})
	if math.Abs(f.slope) > 1e-15 || math.Abs(f.intercept-1.0/3) > 1e-15 || math.Abs(f.r2) > 1e-15 || math.Abs(f.se-math.Sqrt(2.0/3)) > 1e-15 {
		t.Errorf("peak: slope %g, intercept %g, R² %g, se %g; want 0, 1/3, 0, sqrt(2/3) (closed form)", f.slope, f.intercept, f.r2, f.se)
	}
	// x = 0…4, y = 0 but y_2 = 1: slope 0, intercept 0.2, residuals
	// −0.2, −0.2, 0.8, −0.2, −0.2, SSR 0.8; leverage h_0 = 1/5 + 4/10 = 0.6,
	// s_(0)² = (0.8 − 0.04/0.4)/2 = 0.35, t_0 = −0.2/sqrt(0.35 · 0.4); without
	// point 2 the others lie on a line: its studentized residual is huge
	f = fitLine([]float64{0, 1, 2, 3, 4}, []float64{0, 0, 1, 0, 0})
	if want := -0.2 / math.Sqrt(0.35*0.4); math.Abs(f.studentized[0]-want) > 1e-12 {
		t.Errorf("studentized residual 0 = %.15g, want %.15g (closed form)", f.studentized[0], want)
	}
	if !(f.studentized[2] > 1e6) {
		t.Errorf("studentized residual of the lone outlier = %g, want huge", f.studentized[2])
	}
	// too few points, or a single x: no line
	if fitLine([]float64{1, 2}, []float64{1, 2}).ok || fitLine([]float64{1, 1, 1}, []float64{1, 2, 3}).ok {
		t.Error("a line through two points or one x")
	}
}

// TestTrendFindsTheWrongStep: on a straight line with one value raised 10 %,
// the raised value alone is taken off the trend, whether inside or at an end
// (closed form: every other value lies exactly on the line).
func TestTrendFindsTheWrongStep(t *testing.T) {
	p := []float64{8, 7, 6, 5, 4, 3}
	for bad := range p {
		v := make([]float64, len(p))
		b := make([]float64, len(p))
		for k := range v {
			v[k] = 500 + 20*(8-p[k])
			b[k] = 1e-3
		}
		v[bad] *= 1.1
		out := trend(p, v, b, 0.03)
		for k, tc := range out {
			if tc == nil {
				t.Fatalf("bad %d: no comparison for %d", bad, k)
			}
			if tc.OffTrend != (k == bad) {
				t.Errorf("bad %d: value %d off the trend %v (deviation %.4g)", bad, k, tc.OffTrend, tc.Deviation)
			}
		}
		if d := out[bad].Deviation; math.Abs(d-math.Log(1.1)) > 1e-12 {
			t.Errorf("bad %d: deviation %g, want ln 1.1", bad, d)
		}
	}
}
