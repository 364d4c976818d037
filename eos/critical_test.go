package eos

import (
	"errors"
	"math"
	"math/rand"
	"testing"
)

// richNearCritical is an invented rich gas condensate (12 mol % C7+ of
// 141 g/mol) whose Peng–Robinson critical temperature lies near 263 °F,
// below a reservoir temperature of 280 °F.
func richNearCritical(tb testing.TB) (*Fluid, []float64) {
	names := []string{"N2", "CO2", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "nC6"}
	pct := []float64{0.5, 2.4, 63.0, 9.0, 5.5, 1.2, 2.0, 0.9, 1.0, 2.5}
	return characterized(tb, names, pct, 12, PlusFraction{Name: "C7+", FirstCarbon: 7, M: 0.1412, SG: 0.79},
		Characterization{Pseudo: 4}, Options{VolumeShift: true})
}

// leanHeavyTail is an invented lean condensate (3.8 mol % C7+ of 160 g/mol)
// whose Peng–Robinson saturation curve reaches no vapour–liquid critical
// point: at low temperature it climbs without bound as the boundary of two
// dense phases.
func leanHeavyTail(tb testing.TB) (*Fluid, []float64) {
	names := []string{"N2", "CO2", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "nC6"}
	pct := []float64{0.8, 1.9, 82.0, 6.0, 2.6, 0.6, 0.9, 0.4, 0.4, 0.6}
	return characterized(tb, names, pct, 3.8, PlusFraction{Name: "C7+", FirstCarbon: 7, M: 0.160, SG: 0.80},
		Characterization{Pseudo: 4}, Options{VolumeShift: true})
}

// TestCriticalPureFluid: the Peng–Robinson constants Ωa and Ωb are those
// that put a pure fluid's critical point at its Tc and Pc (Peng and
// Robinson 1976), so the mixture criteria must return Tc and Pc for one
// component, and for one component entered twice under two names at any
// proportions (the same fluid), with v_c = Z_c R Tc/Pc, Z_c = 0.3074013087
// (METHODS C1).
func TestCriticalPureFluid(t *testing.T) {
	c1, _ := LibraryComponent("C1")
	twin := c1
	twin.Name = "C1 again"
	cases := []struct {
		name  string
		comps []Component
		z     []float64
	}{
		{"methane", []Component{c1}, []float64{1}},
		{"methane as two components, 30/70", []Component{c1, twin}, []float64{0.3, 0.7}},
		{"methane as two components, 1/99", []Component{c1, twin}, []float64{0.01, 0.99}},
	}
	for _, c := range cases {
		fl, err := NewFluid(c.comps, nil, Options{})
		if err != nil {
			t.Fatal(err)
		}
		cps, err := Criticals(fl, c.z)
		if err != nil || len(cps) != 1 {
			t.Fatalf("%s: %d critical points, %v", c.name, len(cps), err)
		}
		cp := cps[0]
		vc := 0.3074013087 * R * c1.Tc / c1.Pc
		if math.Abs(cp.T/c1.Tc-1) > 1e-8 || math.Abs(cp.P/c1.Pc-1) > 1e-6 || math.Abs(cp.V/vc-1) > 1e-6 {
			t.Errorf("%s: critical point %.8g K, %.8g Pa, %.6g m³/mol; want %.8g K, %.8g Pa, %.6g m³/mol (PR critical conditions)",
				c.name, cp.T, cp.P, cp.V, c1.Tc, c1.Pc, vc)
		}
	}
}

// TestCriticalOnTheEnvelope: two independent constructions of the critical
// point must agree. The envelope continuation (Michelsen 1980) passes it
// where every ln K changes sign; the Heidemann–Khalil criteria (Criticals)
// solve for it directly. For every traced envelope that crosses a critical
// point, the step across brackets the Heidemann–Khalil point in T and P.
func TestCriticalOnTheEnvelope(t *testing.T) {
	rng := rand.New(rand.NewSource(11))
	type fluid struct {
		name string
		fl   *Fluid
		z    []float64
	}
	var fluids []fluid
	for _, c := range namedFluids(t) {
		fluids = append(fluids, fluid{c.name, c.fl, c.z})
	}
	fl, z := richNearCritical(t)
	fluids = append(fluids, fluid{"rich near-critical", fl, z})
	n := 30
	if testing.Short() {
		n = 8
	}
	for k := 0; k < n; k++ {
		fl, z := randomCondensate(t, rng)
		fluids = append(fluids, fluid{"random", fl, z})
	}
	crossed := 0
	for k, c := range fluids {
		env, err := TraceEnvelope(c.fl, c.z, nil)
		if err != nil {
			t.Errorf("%s %d: %v", c.name, k, err)
			continue
		}
		if !env.HasCritical {
			continue
		}
		crossed++
		var a, b *envPoint
		for j := 1; j < len(env.pts); j++ {
			if !env.pts[j-1].past && env.pts[j].past {
				a, b = &env.pts[j-1], &env.pts[j]
			}
		}
		if a == nil {
			t.Errorf("%s %d: a critical point but no step across it", c.name, k)
			continue
		}
		n := c.fl.N()
		lnT, lnP := math.Log(env.Critical[0]), math.Log(env.Critical[1])
		between := func(x, y, v float64) bool { return math.Min(x, y)-1e-6 <= v && v <= math.Max(x, y)+1e-6 }
		if !between(a.x[n], b.x[n], lnT) {
			t.Errorf("%s %d: critical temperature %g K outside the step across it, %g to %g K", c.name, k,
				env.Critical[0], math.Exp(a.x[n]), math.Exp(b.x[n]))
		}
		if !between(a.x[n+1], b.x[n+1], lnP) && math.Abs(lnP-a.x[n+1]) > 0.02 && math.Abs(lnP-b.x[n+1]) > 0.02 {
			t.Errorf("%s %d: critical pressure %g Pa far from the step across it, %g to %g Pa", c.name, k,
				env.Critical[1], math.Exp(a.x[n+1]), math.Exp(b.x[n+1]))
		}
	}
	if crossed < 5 {
		t.Errorf("only %d of %d envelopes cross a critical point; the test needs more", crossed, len(fluids))
	}
}

// TestSinglePhaseNaming: above the critical temperature of its composition
// a single phase is a gas, whatever its density; below it, a phase denser
// than the critical density is a liquid (the pure-fluid convention,
// label.go). The rich condensate above its critical temperature at a high
// pressure is a gas (vapour fraction 1) in the flash and in Phase; a
// stock-tank-like heavy liquid at 60 °F is a liquid.
func TestSinglePhaseNaming(t *testing.T) {
	fl, z := richNearCritical(t)
	cp, ok, err := VLCritical(fl, z)
	if err != nil || !ok {
		t.Fatalf("no critical point: %v", err)
	}
	f := NewFlasher(fl, nil)
	var r FlashResult
	for _, c := range []struct {
		dT   float64 // K from the critical temperature
		p    float64 // psia
		want Phase
	}{
		{+9.0, 6000, Vapour}, // the state: 280 degF, above a critical point near 263 degF
		{+2.0, 9000, Vapour},
		{-30.0, 6000, Liquid},
		{-2.0, 9000, Liquid},
	} {
		T := cp.T + c.dT
		if err := f.Flash(&r, T, c.p*psi, z); err != nil || r.Phases != 1 {
			t.Fatalf("%+g K from Tc at %g psia: %d phases, %v", c.dT, c.p, r.Phases, err)
		}
		wantBeta := 1.0
		if c.want == Liquid {
			wantBeta = 0
		}
		if r.Single != c.want || r.Beta != wantBeta {
			t.Errorf("%+g K from the critical temperature at %g psia: %v, vapour fraction %g; want %v", c.dT, c.p, r.Single, r.Beta, c.want)
		}
		if _, ph, _ := f.Phase(T, c.p*psi, z); ph != c.want {
			t.Errorf("%+g K from the critical temperature at %g psia: Phase names it %v, want %v", c.dT, c.p, ph, c.want)
		}
	}
	// a heavy liquid at stock-tank conditions
	heavy := make([]float64, len(z))
	heavy[len(z)-1], heavy[len(z)-2] = 0.6, 0.4
	if err := f.Flash(&r, degF(60), 14.696*psi, heavy); err != nil || r.Phases != 1 || r.Single != Liquid || r.Beta != 0 {
		t.Errorf("heavy ends at 60 degF, 14.696 psia: %d phases, %v, beta %g, %v; want one liquid", r.Phases, r.Single, r.Beta, err)
	}
}

// TestNearCriticalSaturation: close to the critical temperature of the rich
// condensate the upper saturation point is a bubble point below it and a
// dew point above it, whatever the densities of the two nearly equal
// phases; the incipient phase moves away from the feed in proportion to
// the distance from the critical temperature (the envelope passes the
// critical point smoothly, ln K linear in T there: Michelsen 1980), lighter
// than the feed at a bubble point and heavier at a dew point; and the feed
// is one phase just above the point and unstable just below it. Within a
// thousandth of a kelvin the incipient phase cannot be told from the feed:
// a NearCriticalError naming the critical temperature.
func TestNearCriticalSaturation(t *testing.T) {
	fl, z := richNearCritical(t)
	cp, ok, err := VLCritical(fl, z)
	if err != nil || !ok {
		t.Fatalf("no critical point: %v", err)
	}
	heavy := fl.N() - 1
	st := NewSaturator(fl, nil)
	w := newWork(fl, nil)
	type pt struct{ dT, kmax float64 }
	var pts []pt
	for _, dT := range []float64{-3, -1.5, -1, -0.5, -0.1, -0.02, 0.02, 0.1, 0.5, 1, 1.5, 3} {
		T := cp.T + dT
		s, err := st.Upper(T, z)
		if err != nil {
			t.Errorf("%+g K from the critical temperature: %v", dT, err)
			continue
		}
		want := Dew
		if dT < 0 {
			want = Bubble
		}
		if s.Type != want {
			t.Errorf("%+g K from the critical temperature: a %v point, want %v", dT, s.Type, want)
		}
		lnKh := math.Log(s.Incipient[heavy] / z[heavy])
		if (lnKh > 0) != (want == Dew) {
			t.Errorf("%+g K: ln K of the heaviest component %g: the incipient phase is on the wrong side of the feed", dT, lnKh)
		}
		kmax := 0.0
		for i := range z {
			kmax = math.Max(kmax, math.Abs(math.Log(s.Incipient[i]/z[i])))
		}
		pts = append(pts, pt{math.Abs(dT), kmax})
		fl.setT(&w.ts, T)
		w.tmCut, w.earlyTrivial = tmUnstableSat, false // as the saturation search refines
		if !w.stableAt(s.P*(1+1e-5), z, new(int)) {
			t.Errorf("%+g K: unstable 1e-5 above the saturation pressure %g psia", dT, s.P/psi)
		}
		if math.Abs(dT) >= 0.5 && w.stableAt(s.P*(1-1e-3), z, new(int)) {
			t.Errorf("%+g K: stable 0.1 %% below the saturation pressure %g psia", dT, s.P/psi)
		}
	}
	// ln K grows linearly with |T − Tc|: the ratio kmax/|ΔT| stays within a
	// factor of two over the range (the dew and bubble sides differ a little)
	lo, hi := math.Inf(1), 0.0
	for _, p := range pts {
		r := p.kmax / p.dT
		lo, hi = math.Min(lo, r), math.Max(hi, r)
	}
	if hi > 2*lo {
		t.Errorf("max |ln K| / |T − Tc| ranges from %g to %g per K: the incipient phase does not approach the feed smoothly", lo, hi)
	}
	_, err = st.Upper(cp.T+2e-4, z)
	var ne *NearCriticalError
	if !errors.As(err, &ne) || !errors.Is(err, ErrNearCritical) || math.Abs(ne.Tc-cp.T) > 1e-9*cp.T {
		t.Errorf("at 2e-4 K from the critical temperature: %v, want a NearCriticalError naming Tc = %g K", err, cp.T)
	}
}

// TestEnvelopeEnds: where the trace of an envelope stops, and what it
// calls its points. The lean condensate with a heavy tail has no
// vapour–liquid critical point; its dew branch is listed up to where the
// incipient liquid grows heavier again, not to the tens of thousands of psia
// the curve climbs to at low temperature, and every point is a dew point.
// The rich near-critical condensate's envelope crosses its critical point
// (a bubble branch beyond it), and the saturation point at the reservoir
// temperature lies on the traced curve.
func TestEnvelopeEnds(t *testing.T) {
	fl, z := leanHeavyTail(t)
	if cps, _ := Criticals(fl, z); len(cps) != 0 {
		t.Fatalf("the lean fixture has a critical point %v; the test needs one with none", cps)
	}
	env, err := TraceEnvelope(fl, z, nil)
	if err != nil {
		t.Fatal(err)
	}
	if env.End != EndDensePhases || env.HasCritical || !env.Truncated {
		t.Errorf("lean: end %v, critical %v, truncated %v; want %v without a critical point", env.End, env.HasCritical, env.Truncated, EndDensePhases)
	}
	for _, p := range env.Points {
		if p.Type != Dew {
			t.Errorf("lean: a %v point at %g K, %g psia on a dew branch", p.Type, p.T, p.P/psi)
			break
		}
		if p.P > 15000*psi {
			t.Errorf("lean: a point at %g psia, beyond the vapour–liquid envelope", p.P/psi)
			break
		}
	}
	fl, z = richNearCritical(t)
	env, err = TraceEnvelope(fl, z, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !env.HasCritical {
		t.Fatalf("rich: no critical point (end %v)", env.End)
	}
	nb := 0
	for _, p := range env.Points {
		if p.Type == Bubble {
			nb++
			if p.T > env.Critical[0]*(1+1e-9) {
				t.Errorf("rich: a bubble point at %g K, above the critical temperature %g K", p.T, env.Critical[0])
			}
		}
	}
	if nb == 0 {
		t.Errorf("rich: no bubble branch past the critical point")
	}
}

// TestEnvelopeInsensitiveToLastBits: moving 1e-15 of a mole fraction from
// one component to the next must not make a critical point appear or vanish,
// move it, or move the cricondenbar by more than 1 %: the trace's decisions
// (where it crosses the critical point, where it stops) rest on the
// Heidemann–Khalil critical point and on thresholds far above round-off.
// Case 357 of this seed lost its critical point so before the trace went
// across it deterministically.
func TestEnvelopeInsensitiveToLastBits(t *testing.T) {
	rng := rand.New(rand.NewSource(99))
	n := 360
	if testing.Short() {
		n = 40
	}
	for k := 0; k < n; k++ {
		fl, z := randomCondensate(t, rng)
		z2 := append([]float64(nil), z...)
		i := rng.Intn(len(z))
		j := (i + 1) % len(z)
		z2[i] += 1e-15
		z2[j] -= 1e-15
		if k%9 != 0 && k != 357 {
			continue
		}
		e1, err1 := TraceEnvelope(fl, z, nil)
		e2, err2 := TraceEnvelope(fl, z2, nil)
		if (err1 == nil) != (err2 == nil) {
			t.Errorf("case %d: errors %v and %v", k, err1, err2)
			continue
		}
		if e1.HasCritical != e2.HasCritical || e1.HasCritical && math.Abs(e1.Critical[0]/e2.Critical[0]-1) > 1e-6 {
			t.Errorf("case %d: critical point %v %v against %v %v", k, e1.HasCritical, e1.Critical, e2.HasCritical, e2.Critical)
		}
		if math.Abs(e1.Cricondenbar[1]/e2.Cricondenbar[1]-1) > 0.01 {
			t.Errorf("case %d: cricondenbar %g against %g psia", k, e1.Cricondenbar[1]/psi, e2.Cricondenbar[1]/psi)
		}
	}
}
