package eos

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestGammaSplitTable checks the first SCN intervals of Whitson's gamma
// split against METHODS.md check value C7 (η = 92, M+ = 150 g/mol, boundaries
// 92, 106, 120, 134, …; computed there by an independent script, printed to
// 6 and 3 decimals).
func TestGammaSplitTable(t *testing.T) {
	t.Parallel()
	for _, tt := range []struct {
		alpha float64
		i     int // interval index: 0 = [92,106)
		z, m  float64
	}{
		{1.0, 0, 0.214456, 98.719},
		{1.0, 1, 0.168465, 112.719},
		{1.0, 2, 0.132336, 126.719},
		{0.5, 0, 0.376788, 96.518},
		{0.5, 1, 0.136036, 112.459},
		{2.0, 0, 0.085021, 100.946},
		{2.0, 1, 0.166537, 113.229},
	} {
		g := gammaSCN(7, 45, 92, 150, tt.alpha)
		if got := g[tt.i]; math.Abs(got.z-tt.z) > 5e-7 || math.Abs(got.m-tt.m) > 5e-4 {
			t.Errorf("alpha %g, C%d: z/z+ = %.7f, M = %.4f; want %.6f, %.3f (METHODS.md C7)",
				tt.alpha, 7+tt.i, got.z, got.m, tt.z, tt.m)
		}
	}
}

// TestGammaSplitExponentialClosedForm: for α = 1 the gamma density is the
// exponential e^(−y)/β, whose interval probabilities e^(−ya) − e^(−yb) and
// conditional means a + β − (b − a)/(e^((b−a)/β) − 1) need no incomplete
// gamma function (METHODS.md C7: "α = 1 closed form").
func TestGammaSplitExponentialClosedForm(t *testing.T) {
	t.Parallel()
	const eta, mPlus = 92.0, 150.0
	beta := mPlus - eta
	groups := gammaSCN(7, 45, eta, mPlus, 1)
	for i, g := range groups {
		a := eta
		if i > 0 {
			a = float64(14*(7+i) - 6)
		}
		if g.open {
			if want := math.Exp(-(a - eta) / beta); math.Abs(g.z-want) > 1e-14 {
				t.Errorf("C%d+: z/z+ = %.15g, want %.15g", g.first, g.z, want)
			}
			if want := a + beta; math.Abs(g.m-want) > 1e-9*want {
				t.Errorf("C%d+: M = %.12g, want %.12g", g.first, g.m, want)
			}
			continue
		}
		b := a + 14
		if a == eta {
			b = 106
		}
		if want := math.Exp(-(a-eta)/beta) - math.Exp(-(b-eta)/beta); math.Abs(g.z-want) > 1e-14 {
			t.Errorf("C%d: z/z+ = %.15g, want %.15g", g.first, g.z, want)
		}
		if want := a + beta - (b-a)/math.Expm1((b-a)/beta); math.Abs(g.m-want) > 1e-9*want {
			t.Errorf("C%d: M = %.12g, want %.12g", g.first, g.m, want)
		}
	}
	if last := groups[len(groups)-1]; !last.open || last.first != 45 {
		t.Errorf("last group C%d (open %v), want C45+", last.first, last.open)
	}
}

// TestGaussLaguerreExactness checks the quadrature nodes against the moments
// of the gamma distribution, E[x^k] = Γ(α+k)/Γ(α), which an N-point Gauss
// rule integrates exactly for k ≤ 2N − 1; and the 2-point rule for α = 1
// against its closed form: nodes 2 ∓ √2, the roots of the Laguerre
// polynomial L2(x) = (x² − 4x + 2)/2, and weights x/(9 L3(x)²) = (2 ± √2)/4.
func TestGaussLaguerreExactness(t *testing.T) {
	t.Parallel()
	for _, alpha := range []float64{0.5, 1, 2.5} {
		for n := 1; n <= 6; n++ {
			g, err := gammaQuadrature(n, 0, alpha, alpha) // η = 0, β = 1: nodes are x itself
			if err != nil {
				t.Fatal(err)
			}
			for k := 0; k <= 2*n-1; k++ {
				var got float64
				for _, gi := range g {
					got += gi.z * math.Pow(gi.m, float64(k))
				}
				lg1, _ := math.Lgamma(alpha + float64(k))
				lg0, _ := math.Lgamma(alpha)
				if want := math.Exp(lg1 - lg0); math.Abs(got-want) > 1e-9*want {
					t.Errorf("alpha %g, %d nodes: Σ w x^%d = %.12g, want Γ(α+k)/Γ(α) = %.12g", alpha, n, k, got, want)
				}
			}
		}
	}
	g, _ := gammaQuadrature(2, 0, 1, 1)
	want := [][2]float64{{2 - math.Sqrt2, (2 + math.Sqrt2) / 4}, {2 + math.Sqrt2, (2 - math.Sqrt2) / 4}}
	for i := range g {
		if math.Abs(g[i].m-want[i][0]) > 1e-13 || math.Abs(g[i].z-want[i][1]) > 1e-13 {
			t.Errorf("2-point Laguerre node %d: x = %.15g, w = %.15g; want %.15g, %.15g", i, g[i].m, g[i].z, want[i][0], want[i][1])
		}
	}
}

// TestExponentialSplit checks the Pedersen et al. (1984) form ln z_n = A + B n
// with M_n = 14n − 4 on the SCN groups, and that A and B satisfy the mole and
// mass constraints of METHODS.md 3.2 summed to a large carbon number.
func TestExponentialSplit(t *testing.T) {
	t.Parallel()
	p := PlusFraction{FirstCarbon: 7, Z: 0.08, M: 0.143, SG: 0.79}
	groups := exponentialSCN(7, 45, 143)
	a, b := exponentialAB(p)
	if b >= 0 {
		t.Errorf("B = %g, want < 0 (Pedersen et al. 1984)", b)
	}
	for _, g := range groups[:len(groups)-1] {
		if want := math.Exp(a + b*float64(g.first)); math.Abs(p.Z*g.z-want) > 1e-12*want {
			t.Errorf("C%d: z = %.12g, want exp(A + B n) = %.12g", g.first, p.Z*g.z, want)
		}
		if g.m != float64(14*g.first-4) {
			t.Errorf("C%d: M = %g, want 14n − 4", g.first, g.m)
		}
	}
	var sz, szm float64
	for n := 7; n < 2000; n++ {
		z := math.Exp(a + b*float64(n))
		sz += z
		szm += z * float64(14*n-4)
	}
	if math.Abs(sz-p.Z) > 1e-12 || math.Abs(szm/sz-143) > 1e-9 {
		t.Errorf("Σ z_n = %.12g, Σ z_n M_n/Σ z_n = %.12g; want %g, 143", sz, szm/sz, p.Z)
	}
}

// balanceFractions are plus fractions of gas condensates and a volatile oil,
// invented for the test; balanceSettings cover every split, correlation and
// several lump counts.
var balanceFractions = []PlusFraction{
	{Name: "C7+", FirstCarbon: 7, Z: 0.0821, M: 0.143, SG: 0.795},
	{FirstCarbon: 7, Z: 0.03, M: 0.118, SG: 0.76},
	{Name: "C10+", FirstCarbon: 10, Z: 0.05, M: 0.25, SG: 0.86},
	{FirstCarbon: 12, Z: 0.2, M: 0.32, SG: 0.9},
}

func balanceSettings() []Characterization {
	var cs []Characterization
	for _, corr := range []CritCorrelation{KeslerLee, RiaziDaubert, Twu, RiaziDaubert1987} {
		for _, ac := range []AcentricMethod{AcentricKeslerLee, AcentricEdmister} {
			cs = append(cs, Characterization{Split: SplitNone, Correlation: corr, Acentric: ac})
			for _, n := range []int{0, 1, 2, 3, 5, 8, 12, 20} {
				cs = append(cs, Characterization{Split: SplitExponential, Pseudo: n, Correlation: corr, Acentric: ac})
				for _, alpha := range []float64{0, 0.5, 2.5} {
					cs = append(cs, Characterization{Split: SplitGamma, Alpha: alpha, Pseudo: n, Correlation: corr, Acentric: ac})
				}
			}
			for _, n := range []int{1, 2, 3, 5} {
				cs = append(cs, Characterization{Split: SplitGammaQuadrature, Pseudo: n, Correlation: corr, Acentric: ac})
				cs = append(cs, Characterization{Split: SplitGammaQuadrature, Alpha: 2, Eta: 0.09, Pseudo: n, Correlation: corr, Acentric: ac})
			}
		}
	}
	return cs
}

// TestSplitPlusBalances: whatever the method, the pseudo-components must
// reproduce the plus fraction's mole fraction, molar mass and SG (volume
// additivity) to round-off (Whitson 1983; Pedersen et al. 1984), and be
// valid components with increasing molar mass.
func TestSplitPlusBalances(t *testing.T) {
	t.Parallel()
	const tol = 1e-9 // relative: the balances are exact up to round-off
	for _, p := range balanceFractions {
		for _, c := range balanceSettings() {
			comps, z, err := SplitPlus(p, c)
			if err != nil {
				t.Errorf("SplitPlus(%+v, %+v): %v", p, c, err)
				continue
			}
			want := c.Pseudo
			if want == 0 {
				want = 4
			}
			if c.Split == SplitNone {
				want = 1
			}
			if len(comps) != want || len(z) != want {
				t.Errorf("SplitPlus(%+v, %+v): %d components, %d fractions, want %d", p, c, len(comps), len(z), want)
				continue
			}
			var sz, mass, vol float64
			for i, ci := range comps {
				sz += z[i]
				mass += z[i] * ci.M
				vol += z[i] * ci.M / ci.SG
				if err := ci.validate(); err != nil {
					t.Errorf("SplitPlus(%+v, %+v): %v", p, c, err)
				}
				if i > 0 && !(ci.M > comps[i-1].M && z[i] > 0) {
					t.Errorf("SplitPlus(%+v, %+v): component %s M = %g after %g, z = %g", p, c, ci.Name, ci.M, comps[i-1].M, z[i])
				}
			}
			if math.Abs(sz-p.Z) > tol*p.Z || math.Abs(mass/sz-p.M) > tol*p.M || math.Abs(mass/vol-p.SG) > tol*p.SG {
				t.Errorf("SplitPlus(%+v, %+v): Σz = %.12g, M = %.12g, SG = %.12g; want %g, %g, %g",
					p, c, sz, mass/sz, mass/vol, p.Z, p.M, p.SG)
			}
		}
	}
}

// TestLumpingConservesMass lumps SCN groups directly and checks the mole,
// mass and volume balances and that every lump holds a contiguous, non-empty
// run of groups, whatever the number of lumps.
func TestLumpingConservesMass(t *testing.T) {
	t.Parallel()
	groups := gammaSCN(7, 45, 92, 143, 1)
	constantWatsonSG(groups, 0.795)
	var z0, m0, v0 float64
	for _, g := range groups {
		z0 += g.z
		m0 += g.z * g.m
		v0 += g.z * g.m / g.sg
	}
	for ng := 1; ng <= len(groups); ng++ {
		lumps := lumpGroups(groups, ng)
		if len(lumps) != ng {
			t.Fatalf("%d lumps requested, %d returned", ng, len(lumps))
		}
		var z, m, v float64
		next := 7
		for _, l := range lumps {
			if l.first != next || l.last < l.first {
				t.Errorf("%d lumps: lump %s starts at C%d, want C%d", ng, l.name(), l.first, next)
			}
			next = l.last + 1
			z += l.z
			m += l.z * l.m
			v += l.z * l.m / l.sg
		}
		if !lumps[ng-1].open || lumps[ng-1].last != 45 {
			t.Errorf("%d lumps: last lump %s, want open, through C45+", ng, lumps[ng-1].name())
		}
		if math.Abs(z-z0) > 1e-14 || math.Abs(m-m0) > 1e-12*m0 || math.Abs(v-v0) > 1e-12*v0 {
			t.Errorf("%d lumps: Σz = %.15g, Σz M = %.15g, Σz M/SG = %.15g; groups %.15g, %.15g, %.15g", ng, z, m, v, z0, m0, v0)
		}
	}
}

// TestLumpBoundariesEqualLnM: with few lumps, the groups go to the lump
// whose ln M interval holds them (Whitson 1983).
func TestLumpBoundariesEqualLnM(t *testing.T) {
	t.Parallel()
	groups := gammaSCN(7, 45, 92, 143, 1)
	constantWatsonSG(groups, 0.795)
	const ng = 3
	lo, hi := math.Log(groups[0].m), math.Log(groups[len(groups)-1].m)
	lumps := lumpGroups(groups, ng)
	k := 0
	for li, l := range lumps {
		for ; k < len(groups) && groups[k].first <= l.last; k++ {
			interval := int(float64(ng) * (math.Log(groups[k].m) - lo) / (hi - lo))
			interval = min(interval, ng-1)
			if interval != li {
				t.Errorf("C%d (M = %.1f) in lump %d (%s), want lump %d", groups[k].first, groups[k].m, li, l.name(), interval)
			}
		}
	}
}

// TestSplitPlusNames checks the naming convention: contiguous carbon-number
// ranges "C7-C9", single groups "C10", the last "C20+"; SplitNone keeps the
// plus fraction's name; quadrature components are numbered.
func TestSplitPlusNames(t *testing.T) {
	t.Parallel()
	re := regexp.MustCompile(`^C(\d+)(?:-C(\d+)|\+)?$`)
	p := PlusFraction{FirstCarbon: 7, Z: 0.08, M: 0.143, SG: 0.795}
	for _, c := range []Characterization{{}, {Pseudo: 1}, {Pseudo: 7}, {Pseudo: 20}, {Split: SplitExponential, Pseudo: 6}} {
		comps, _, err := SplitPlus(p, c)
		if err != nil {
			t.Fatal(err)
		}
		next := 7
		for i, ci := range comps {
			m := re.FindStringSubmatch(ci.Name)
			if m == nil {
				t.Errorf("%+v: name %q does not match C<n>, C<n>-C<m> or C<n>+", c, ci.Name)
				continue
			}
			first, _ := strconv.Atoi(m[1])
			last := first
			if m[2] != "" {
				last, _ = strconv.Atoi(m[2])
			}
			if first != next || last < first {
				t.Errorf("%+v: component %d named %q, want to start at C%d", c, i, ci.Name, next)
			}
			next = last + 1
			if isLast := i == len(comps)-1; isLast != strings.HasSuffix(ci.Name, "+") {
				t.Errorf("%+v: component %d of %d named %q", c, i, len(comps), ci.Name)
			}
		}
	}
	one, _, _ := SplitPlus(p, Characterization{Pseudo: 1})
	if one[0].Name != "C7+" {
		t.Errorf("one lump named %q, want C7+", one[0].Name)
	}
	none, _, _ := SplitPlus(PlusFraction{Name: "heavy end", FirstCarbon: 7, Z: 0.08, M: 0.143, SG: 0.795}, Characterization{Split: SplitNone})
	if none[0].Name != "heavy end" {
		t.Errorf("SplitNone named %q, want the plus fraction's name", none[0].Name)
	}
	q, _, _ := SplitPlus(p, Characterization{Split: SplitGammaQuadrature, Pseudo: 3})
	for i, ci := range q {
		if want := fmt.Sprintf("C7+Q%d", i+1); ci.Name != want {
			t.Errorf("quadrature component %d named %q, want %q", i, ci.Name, want)
		}
	}
}

// TestSplitOneLumpIsNoSplit: one lump of the whole distribution has the plus
// fraction's own M and SG, so it must equal SplitNone (properties are computed
// from each lump's M and SG).
func TestSplitOneLumpIsNoSplit(t *testing.T) {
	t.Parallel()
	p := PlusFraction{FirstCarbon: 7, Z: 0.08, M: 0.143, SG: 0.795}
	none, _, err := SplitPlus(p, Characterization{Split: SplitNone, Correlation: Twu})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []Characterization{{Pseudo: 1, Correlation: Twu}, {Split: SplitExponential, Pseudo: 1, Correlation: Twu}} {
		one, _, err := SplitPlus(p, c)
		if err != nil {
			t.Fatal(err)
		}
		a, b := one[0], none[0]
		for _, f := range [][2]float64{{a.M, b.M}, {a.SG, b.SG}, {a.Tc, b.Tc}, {a.Pc, b.Pc}, {a.Omega, b.Omega}, {a.Vc, b.Vc}} {
			if math.Abs(f[0]-f[1]) > 1e-9*math.Abs(f[1]) {
				t.Errorf("%v, one lump: %+v, want %+v", c.Split, a, b)
				break
			}
		}
	}
}

// TestSplitPlusErrors: bad input returns a *PlusError naming the field.
func TestSplitPlusErrors(t *testing.T) {
	t.Parallel()
	ok := PlusFraction{FirstCarbon: 7, Z: 0.08, M: 0.143, SG: 0.795}
	with := func(f func(*PlusFraction)) PlusFraction { p := ok; f(&p); return p }
	for _, tt := range []struct {
		p     PlusFraction
		c     Characterization
		field string
	}{
		{with(func(p *PlusFraction) { p.FirstCarbon = 0 }), Characterization{}, "PlusFraction.FirstCarbon"},
		{with(func(p *PlusFraction) { p.FirstCarbon = 41 }), Characterization{}, "PlusFraction.FirstCarbon"},
		{with(func(p *PlusFraction) { p.Z = 0 }), Characterization{}, "PlusFraction.Z"},
		{with(func(p *PlusFraction) { p.Z = -0.1 }), Characterization{}, "PlusFraction.Z"},
		{with(func(p *PlusFraction) { p.Z = 1.5 }), Characterization{}, "PlusFraction.Z"},
		{with(func(p *PlusFraction) { p.Z = math.NaN() }), Characterization{}, "PlusFraction.Z"},
		{with(func(p *PlusFraction) { p.M = 0 }), Characterization{}, "PlusFraction.M"},
		{with(func(p *PlusFraction) { p.M = 143 }), Characterization{}, "PlusFraction.M"}, // g/mol by mistake
		{with(func(p *PlusFraction) { p.M = math.Inf(1) }), Characterization{}, "PlusFraction.M"},
		{with(func(p *PlusFraction) { p.M = 0.092 }), Characterization{}, "PlusFraction.M"},                        // not above η = 92 g/mol
		{with(func(p *PlusFraction) { p.M = 0.094 }), Characterization{Split: SplitExponential}, "PlusFraction.M"}, // not above M_7 = 94
		{with(func(p *PlusFraction) { p.SG = 0.5 }), Characterization{}, "PlusFraction.SG"},
		{with(func(p *PlusFraction) { p.SG = 1.3 }), Characterization{}, "PlusFraction.SG"},
		{with(func(p *PlusFraction) { p.SG = math.NaN() }), Characterization{}, "PlusFraction.SG"},
		{ok, Characterization{Split: 7}, "Characterization.Split"},
		{ok, Characterization{Correlation: -1}, "Characterization.Correlation"},
		{ok, Characterization{Acentric: 2}, "Characterization.Acentric"},
		{ok, Characterization{Alpha: -1}, "Characterization.Alpha"},
		{ok, Characterization{Alpha: math.NaN()}, "Characterization.Alpha"},
		{ok, Characterization{Alpha: 21}, "Characterization.Alpha"},
		{ok, Characterization{Split: SplitExponential, Alpha: 1}, "Characterization.Alpha"},
		{ok, Characterization{Split: SplitNone, Eta: 0.09}, "Characterization.Eta"},
		{ok, Characterization{Eta: -0.09}, "Characterization.Eta"},
		{ok, Characterization{Eta: 0.107}, "Characterization.Eta"}, // above the C7 group [η, 106)
		{ok, Characterization{Split: SplitGammaQuadrature, Eta: 0.15}, "PlusFraction.M"},
		{ok, Characterization{Pseudo: -1}, "Characterization.Pseudo"},
		{ok, Characterization{Pseudo: 21}, "Characterization.Pseudo"},
		{ok, Characterization{Split: SplitNone, Pseudo: 3}, "Characterization.Pseudo"},
		// A plus fraction barely heavier than η: its distribution holds
		// more than 1e-12 in only 3 SCN groups.
		{with(func(p *PlusFraction) { p.M = 0.095 }), Characterization{Alpha: 2.5}, "Characterization.Pseudo"},
	} {
		comps, z, err := SplitPlus(tt.p, tt.c)
		var pe *PlusError
		if !errors.As(err, &pe) || !errors.Is(err, ErrBadPlus) || pe.Field != tt.field || comps != nil || z != nil {
			t.Errorf("SplitPlus(%+v, %+v) = %d comps, %v; want a *PlusError on %s", tt.p, tt.c, len(comps), err, tt.field)
			continue
		}
		if !strings.Contains(err.Error(), tt.field) {
			t.Errorf("error %q does not name %s", err, tt.field)
		}
	}
}

// TestSplitPlusCorrelationRange: a characterization whose heaviest
// pseudo-component lies beyond the correlations' range fails with
// ErrCorrelationRange instead of returning unphysical constants.
func TestSplitPlusCorrelationRange(t *testing.T) {
	t.Parallel()
	// A light-coloured, very paraffinic heavy C7+ (Kw ≈ 14): the C45+ group
	// reaches M ≈ 1 kg/mol, where Kesler–Lee gives Tc below Søreide's Tb.
	p := PlusFraction{FirstCarbon: 7, Z: 0.1, M: 0.45, SG: 0.7}
	comps, z, err := SplitPlus(p, Characterization{Pseudo: 8})
	if !errors.Is(err, ErrCorrelationRange) || comps != nil || z != nil {
		t.Errorf("SplitPlus(%+v) = %d comps, %v; want ErrCorrelationRange", p, len(comps), err)
	}
}
