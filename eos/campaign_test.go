package eos_test

// A random-state campaign: invented gas condensates and volatile oils at
// random temperatures and pressures, near their critical points and at their
// saturation points, each result of the package's solvers checked against the
// independent Peng–Robinson reference of indep_test.go:
//
//   - Flash returns no error and a well-formed result, within maxFlashTime
//     ("flash-error", "bad-result", "time");
//   - a two-phase result has equal fugacities (|ln f_i^L − ln f_i^V| ≤ 1e-8 by
//     the reference, "fugacity"), closes the component balance
//     z = βy + (1 − β)x to 1e-10 ("balance"), and has a Gibbs energy no more
//     than 1e-9 RT per mole above the lowest split the reference finds from
//     its own starts ("gibbs"); when there is no lower two-phase split but
//     the reference finds the split's phases unstable, a three-phase
//     minimisation from the unstable trial phase decides between
//     "three-phase" (a three-phase split of lower Gibbs energy exists: the
//     result is not the equilibrium) and "split-phase-unstable" (none found);
//   - a single-phase result is stable by the reference's tangent-plane test,
//     lowest distance ≥ −1e-8 ("single-unstable");
//   - each upper saturation point, and lower dew point where there is one,
//     has flashes 0.1 % either side with one phase on the single-phase side
//     and two on the other ("sat-side", and the flash checks above); its feed
//     and incipient phase have equal fugacities by the reference (1e-8; 1e-7
//     within 2 K of the critical temperature, as documented) and differ
//     ("sat-point"); its label agrees with the side of the envelope's
//     critical temperature ("sat-label");
//   - ErrNoSaturation is confirmed by the reference's stability test at
//     pressures from 0.1 to 60 MPa ("sat-missed"); ErrTwoPhaseToLimit is
//     accepted where the documentation gives it, a feed unstable even at
//     400 MPa by the reference, and any other error fails ("sat-error");
//   - an envelope traces without error ("envelope-error") and its critical
//     point lies on the traced curve: between the lowest and highest traced
//     temperature, at or below the cricondenbar ("envelope-critical");
//   - no solver panics ("panic").
//
// The tolerances are the ones the flash is asked to meet: it converges
// |Δ ln f| to 1e-12 (Settings), so 1e-8 leaves four orders of magnitude for
// the round-off of a second code; an exact split closes the balance to
// round-off (1e-16), so 1e-10 is loose; 1e-9 RT per mole in G is far above
// the round-off of G (about 1e-14) and far below the Gibbs-energy gap of a
// wrong split (1e-3 to 1 RT in the cases the campaign was written for). The
// fluids are invented (common practice, no published source: the ranges of
// lean to rich condensates and volatile oils of the trade).
//
// Running it:
//
//	DEWCELL_CAMPAIGN_STRICT=1 go test -run TestCampaign ./eos/       # a few hundred states
//	DEWCELL_CAMPAIGN=100000 go test -run TestCampaign -timeout 0 ./eos/  # 100,000 random states
//
// Further variables: DEWCELL_CAMPAIGN_SEED (base seed, default 1),
// DEWCELL_CAMPAIGN_FLUID=k (only fluid k, to reproduce a failure),
// DEWCELL_CAMPAIGN_NEAR=n (near-critical states per fluid, default 4),
// DEWCELL_CAMPAIGN_SHOW=n (failures printed per kind, default 5),
// DEWCELL_CAMPAIGN_DUMP=dir (a study file for every failing state).

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"dewcell/eos"
)

// Tolerances of the checks (see the file comment).
const (
	campLnF     = 1e-8  // max |ln f_i^L − ln f_i^V|
	campBalance = 1e-10 // max |z_i − (β y_i + (1 − β) x_i)|
	campGibbs   = 1e-9  // RT per mole of feed
	campTPD     = -1e-8 // lowest tangent-plane distance of a stable phase
	campSatStep = 1e-3  // relative pressure step either side of a saturation point
	// maxFlashIter: a flash that reports more iterations than this
	// (stability trials, substitution, Newton and the test of the split
	// together) is timed again alone; common practice, no published source:
	// Michelsen's flash, with a second-order finish, converges in a few tens
	// of iterations away from critical points.
	maxFlashIter = 100
	// maxFlashTime bounds the time of one flash, the fastest of three runs
	// alone (a single timing inside the concurrent run scatters by an order
	// of magnitude on a shared machine).
	maxFlashTime = 2 * time.Millisecond
)

// campaignConfig is read from the environment.
type campaignConfig struct {
	seed     uint64
	fluids   int // fluids drawn
	perFluid int // random states per fluid
	nearCrit int // near-critical states per fluid with a critical point
	only     int // run only this fluid, or −1
	show     int // failures printed per kind
	dump     string
}

func campaignFromEnv(t *testing.T) campaignConfig {
	c := campaignConfig{seed: 1, perFluid: 10, nearCrit: 4, only: -1, show: 5}
	random := 400
	if testing.Short() {
		random = 100
	}
	atoi := func(name string, dst *int) {
		if v := os.Getenv(name); v != "" {
			n, err := strconv.Atoi(v)
			if err != nil || n < 0 {
				t.Fatalf("%s=%q: want a whole number >= 0", name, v)
			}
			*dst = n
		}
	}
	atoi("DEWCELL_CAMPAIGN", &random)
	atoi("DEWCELL_CAMPAIGN_SHOW", &c.show)
	atoi("DEWCELL_CAMPAIGN_NEAR", &c.nearCrit)
	atoi("DEWCELL_CAMPAIGN_FLUID", &c.only)
	if os.Getenv("DEWCELL_CAMPAIGN_FLUID") == "" {
		c.only = -1
	}
	if v := os.Getenv("DEWCELL_CAMPAIGN_SEED"); v != "" {
		s, err := strconv.ParseUint(v, 10, 64)
		if err != nil {
			t.Fatalf("DEWCELL_CAMPAIGN_SEED=%q: want a whole number", v)
		}
		c.seed = s
	}
	c.dump = os.Getenv("DEWCELL_CAMPAIGN_DUMP")
	c.fluids = (random + c.perFluid - 1) / c.perFluid
	return c
}

// A campFluid is one invented fluid and how it was drawn.
type campFluid struct {
	index int
	kind  string // "gas condensate" or "volatile oil"
	how   string // the heavy end, the options and the kij
	fl    *eos.Fluid
	z     []float64
	comps []eos.Component
}

// drawFluid draws a gas condensate (two in three) or a volatile oil: library
// components, and a heavy end that is either a C7+ fraction characterized by
// SplitPlus (any split, 1 to 4 pseudo-components, any correlation) or 1 to 4
// pseudo-components of their own from PseudoComponent, of molar masses
// spread over a factor 2 to 6 and specific gravities at one Watson factor
// (Whitson 1983, SG = 6.0108 M^0.17947 Kw^−1.18241). A draw the
// characterization rejects (correlations out of range) is drawn again.
func drawFluid(index int, rng *rand.Rand) *campFluid {
	for {
		if cf, err := tryDrawFluid(index, rng); err == nil {
			return cf
		}
	}
}

func tryDrawFluid(index int, rng *rand.Rand) (*campFluid, error) {
	u := func(a, b float64) float64 { return a + (b-a)*rng.Float64() }
	maybe := func(p float64) bool { return rng.Float64() < p }
	oil := maybe(1.0 / 3)
	var names []string
	var amounts []float64
	add := func(name string, v float64) {
		names = append(names, name)
		amounts = append(amounts, v)
	}
	if maybe(0.8) {
		add("N2", u(0.1, 3))
	}
	if maybe(0.8) {
		add("CO2", u(0.2, 8))
	}
	if maybe(0.25) {
		add("H2S", u(0.1, 4))
	}
	var heavy, mPlus float64
	kind := "gas condensate"
	if oil {
		kind = "volatile oil"
		add("C1", u(30, 58))
		add("C2", u(5, 10))
		add("C3", u(3, 8))
		if maybe(0.85) {
			add("iC4", u(0.5, 2))
		}
		add("nC4", u(1, 4))
		if maybe(0.85) {
			add("iC5", u(0.5, 2))
		}
		add("nC5", u(0.5, 2.5))
		if maybe(0.85) {
			add("nC6", u(1, 4))
		}
		heavy, mPlus = u(15, 38), u(170, 280)
	} else {
		add("C1", u(58, 86))
		add("C2", u(4, 11))
		add("C3", u(1.5, 7))
		if maybe(0.85) {
			add("iC4", u(0.2, 1.5))
		}
		add("nC4", u(0.4, 3))
		if maybe(0.85) {
			add("iC5", u(0.2, 1.2))
		}
		add("nC5", u(0.2, 1.5))
		if maybe(0.85) {
			add("nC6", u(0.2, 1.5))
		}
		heavy, mPlus = u(0.8, 13), u(105, 200)
	}
	var comps []eos.Component
	var z []float64
	for i, nm := range names {
		c, ok := eos.LibraryComponent(nm)
		if !ok {
			return nil, fmt.Errorf("library has no %s", nm)
		}
		comps = append(comps, c)
		z = append(z, amounts[i])
	}
	corr := eos.CritCorrelation(rng.IntN(4))
	acen := eos.AcentricMethod(rng.IntN(2))
	var how string
	if maybe(0.5) {
		sg := math.Min(1.1, 0.70+0.16*(mPlus-105)/175+u(-0.015, 0.02))
		ch := eos.Characterization{Correlation: corr, Acentric: acen}
		switch rng.IntN(4) {
		case 0:
			ch.Split, ch.Alpha, ch.Pseudo = eos.SplitGamma, u(0.5, 2.5), 1+rng.IntN(4)
		case 1:
			ch.Split, ch.Pseudo = eos.SplitExponential, 1+rng.IntN(4)
		case 2:
			ch.Split, ch.Alpha, ch.Pseudo = eos.SplitGammaQuadrature, u(0.5, 2.5), 1+rng.IntN(4)
		case 3:
			ch.Split = eos.SplitNone
		}
		pcs, pz, err := eos.SplitPlus(eos.PlusFraction{Name: "C7+", FirstCarbon: 7, Z: 1, M: mPlus / 1000, SG: sg}, ch)
		if err != nil {
			return nil, err
		}
		comps = append(comps, pcs...)
		for _, v := range pz {
			z = append(z, v*heavy)
		}
		how = fmt.Sprintf("C7+ %.4g mol%% of M %.5g g/mol, SG %.4g, split %v (alpha %.3g) into %d, %v, %v acentric factor",
			heavy, mPlus, sg, ch.Split, ch.Alpha, len(pcs), ch.Correlation, ch.Acentric)
	} else {
		k := 1 + rng.IntN(4)
		m1 := u(95, 130)
		spread := 1.0
		if k > 1 {
			spread = math.Pow(u(2, 6), 1/float64(k-1))
		}
		kw := u(11.4, 12.6)
		decay := u(0, 1.2)
		var wsum float64
		ws := make([]float64, k)
		for j := range ws {
			ws[j] = math.Exp(-decay * float64(j))
			wsum += ws[j]
		}
		var parts []string
		for j := 0; j < k; j++ {
			m := m1 * math.Pow(spread, float64(j))
			sg := 6.0108 * math.Pow(m, 0.17947) * math.Pow(kw, -1.18241) // Whitson (1983)
			c, err := eos.PseudoComponent(fmt.Sprintf("H%d", j+1), m/1000, sg, eos.Characterization{Correlation: corr, Acentric: acen})
			if err != nil {
				return nil, err
			}
			comps = append(comps, c)
			z = append(z, heavy*ws[j]/wsum)
			parts = append(parts, fmt.Sprintf("%.4g g/mol", m))
		}
		how = fmt.Sprintf("%d pseudo-components (%s) at Watson factor %.4g, %.4g mol%% in all, %v, %v acentric factor",
			k, strings.Join(parts, ", "), kw, heavy, corr, acen)
	}
	opt := eos.Options{Equation: eos.PR78, VolumeShift: maybe(0.5)}
	if maybe(0.2) {
		opt.Equation = eos.PR76
	}
	cp := eos.ChuehPrausnitz{A: u(0.1, 0.25)}
	if maybe(0.15) {
		cp = eos.ChuehPrausnitz{Off: true}
	}
	sum := 0.0
	for _, v := range z {
		sum += v
	}
	for i := range z {
		z[i] /= sum
	}
	fl, err := eos.NewFluid(comps, eos.DefaultKij(comps, cp), opt)
	if err != nil {
		return nil, err
	}
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	kijText := fmt.Sprintf("Chueh-Prausnitz A = %.4g", cp.A)
	if cp.Off {
		kijText = "no hydrocarbon-hydrocarbon kij"
	}
	how += fmt.Sprintf("; %v, volume shift %v; default kij, %s", opt.Equation, opt.VolumeShift, kijText)
	return &campFluid{index: index, kind: kind, how: how, fl: fl, z: z, comps: comps}, nil
}

// describe gives everything needed to rebuild the fluid outside the test.
func (cf *campFluid) describe() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s: %s\n", cf.kind, cf.how)
	fmt.Fprintf(&b, "  %-8s %-22s %-10s %-20s %-20s %-20s %-22s %s\n", "name", "z", "M kg/mol", "Tc K", "Pc Pa", "omega", "Vc m3/mol", "shift")
	for i, c := range cf.comps {
		fmt.Fprintf(&b, "  %-8s %-22s %-10s %-20s %-20s %-20s %-22s %s\n", c.Name, g17(cf.z[i]), g17(c.M), g17(c.Tc), g17(c.Pc), g17(c.Omega), g17(c.Vc), g17(c.Shift))
	}
	return b.String()
}

func g17(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func compText(names []string, x []float64) string {
	parts := make([]string, len(x))
	for i := range x {
		parts[i] = names[i] + "=" + strconv.FormatFloat(x[i], 'g', 6, 64)
	}
	return strings.Join(parts, " ")
}

// studyTOML writes the fluid as a study file at temperature t, every
// component's properties and every interaction coefficient spelt out.
func (cf *campFluid) studyTOML(title string, t float64) string {
	var b strings.Builder
	opt := cf.fl.Options()
	fmt.Fprintf(&b, "title = %q\n\n[reservoir]\ntemperature = \"%s K\"\n\n[fluid]\nequation = %q\nvolume_shift = %v\n\n[fluid.composition]\n",
		title, g17(t), opt.Equation.String(), opt.VolumeShift)
	// a name ending in "+" would make the study reader expect a plus fraction
	name := func(c eos.Component) string { return strings.ReplaceAll(c.Name, "+", "plus") }
	for i, c := range cf.comps {
		fmt.Fprintf(&b, "%q = %s\n", name(c), g17(100*cf.z[i]))
	}
	for _, c := range cf.comps {
		if _, lib := eos.LibraryComponent(c.Name); lib {
			continue
		}
		fmt.Fprintf(&b, "\n[fluid.properties.%q]\nmolar_mass = %s\ncritical_temperature = \"%s K\"\ncritical_pressure = \"%s Pa\"\nacentric_factor = %s\nvolume_shift = %s\n",
			name(c), g17(1000*c.M), g17(c.Tc), g17(c.Pc), g17(c.Omega), g17(c.Shift))
		if c.Vc > 0 {
			fmt.Fprintf(&b, "critical_volume = \"%s m3/mol\"\n", g17(c.Vc))
		}
		if c.Tb > 0 {
			fmt.Fprintf(&b, "boiling_point = \"%s K\"\n", g17(c.Tb))
		}
		if c.SG > 0 {
			fmt.Fprintf(&b, "specific_gravity = %s\n", g17(c.SG))
		}
	}
	b.WriteString("\n[fluid.interaction]\n")
	for i := range cf.comps {
		for j := i + 1; j < len(cf.comps); j++ {
			fmt.Fprintf(&b, "\"%s/%s\" = %s\n", name(cf.comps[i]), name(cf.comps[j]), g17(cf.fl.Kij(i, j)))
		}
	}
	return b.String()
}

// A campFailure is one wrong answer.
type campFailure struct {
	kind   string
	fluid  int
	state  string
	t, p   float64
	detail string
}

// fluidOutcome collects what one fluid's checks found.
type fluidOutcome struct {
	cf           *campFluid
	failures     []campFailure
	states       int // flashes checked
	kinds        map[string]int
	notes        map[string]int // what was found that is not a failure
	single, two  int
	nearCritical int // near-critical states
	satPoints    int
	iters        []int
	slowest      time.Duration
	slowestAt    string
	mostIter     int
	mostIterAt   string
}

type campChecker struct {
	cf    *campFluid
	ref   *prRef
	fla   *eos.Flasher
	sat   *eos.Saturator
	res   eos.FlashResult
	names []string
	out   *fluidOutcome
	seed  uint64
	n     int // states so far, for the trial seeds
}

func (c *campChecker) fail(kind, state string, t, p float64, format string, args ...any) {
	c.out.failures = append(c.out.failures, campFailure{kind: kind, fluid: c.cf.index, state: state, t: t, p: p, detail: fmt.Sprintf(format, args...)})
}

func (c *campChecker) trialRNG() *rand.Rand {
	c.n++
	return rand.New(rand.NewPCG(c.seed^0x9e3779b97f4a7c15, uint64(c.cf.index)<<20|uint64(c.n)))
}

// vapourFraction labels the lighter phase of a split vapour, as the
// package does.
func (c *campChecker) vapourFraction(t, p float64, s refSplit) float64 {
	if c.ref.density(t, p, s.a) <= c.ref.density(t, p, s.b) {
		return s.beta
	}
	return 1 - s.beta
}

// flash runs and checks one state and returns the number of phases the
// solver found (0 on error).
func (c *campChecker) flash(state string, t, p float64) int {
	z := c.cf.z
	start := time.Now()
	err := c.fla.Flash(&c.res, t, p, z)
	el := time.Since(start)
	o := c.out
	o.states++
	where := fmt.Sprintf("fluid %d %s (T %.6g K, P %.6g Pa)", c.cf.index, state, t, p)
	if el > o.slowest {
		o.slowest, o.slowestAt = el, where
	}
	if err != nil {
		c.fail("flash-error", state, t, p, "Flash: %v", err)
		return 0
	}
	r := &c.res
	o.iters = append(o.iters, r.Iter)
	if r.Iter > o.mostIter {
		o.mostIter, o.mostIterAt = r.Iter, where
	}
	if r.Iter > maxFlashIter {
		fastest := time.Duration(math.MaxInt64)
		var again eos.FlashResult
		for k := 0; k < 3; k++ {
			start := time.Now()
			c.fla.Flash(&again, t, p, z)
			fastest = min(fastest, time.Since(start))
		}
		if fastest > maxFlashTime {
			c.fail("time", state, t, p, "the flash took %d iterations and %v (the fastest of three runs alone), more than %v", r.Iter, fastest, maxFlashTime)
		} else {
			o.notes[fmt.Sprintf("flash of more than %d iterations, under %v timed alone", maxFlashIter, maxFlashTime)]++
		}
	}
	if msg := malformed(r, len(z)); msg != "" {
		c.fail("bad-result", state, t, p, "%s", msg)
		return r.Phases
	}
	rng := c.trialRNG()
	if r.Phases == 1 {
		o.single++
		st := c.ref.stability(t, p, z, nil, rng, 3, c.cf.comps)
		if st.min.tpd < campTPD {
			msg := fmt.Sprintf("solver: one phase (%v, %d iterations); reference: tangent-plane distance %.4g from the %s trial, at %s",
				r.Single, r.Iter, st.min.tpd, st.min.start, compText(c.names, st.min.w))
			if best, _, ok := c.ref.lowestSplit(t, p, z, c.cf.comps, st); ok {
				gz := c.ref.gibbs(t, p, z, make([]float64, c.ref.n))
				msg += fmt.Sprintf("; reference split: vapour fraction %.6g, G %.4g RT per mole below the single phase (from %s)",
					c.vapourFraction(t, p, best), gz-best.G, best.start)
			}
			c.fail("single-unstable", state, t, p, "%s", msg)
		}
		return 1
	}
	o.two++
	x, y, beta := r.X, r.Y, r.Beta
	bal := 0.0
	for i := range z {
		bal = math.Max(bal, math.Abs(z[i]-(beta*y[i]+(1-beta)*x[i])))
	}
	if !(bal <= campBalance) {
		c.fail("balance", state, t, p, "max |z − (βy + (1 − β)x)| = %.3g (vapour fraction %.17g)", bal, beta)
	}
	if df := c.ref.maxLnFDiff(t, p, x, y); !(df <= campLnF) {
		c.fail("fugacity", state, t, p, "reference max |ln f_L − ln f_V| = %.3g on the solver's phases (solver's residual %.3g, vapour fraction %.6g)", df, r.Resid, beta)
	}
	scratch := make([]float64, c.ref.n)
	gs := beta*c.ref.gibbs(t, p, y, scratch) + (1-beta)*c.ref.gibbs(t, p, x, scratch)
	gz := c.ref.gibbs(t, p, z, scratch)
	st := c.ref.stability(t, p, z, nil, rng, 3, c.cf.comps)
	// With equal fugacities the tangent plane of the liquid is that of the
	// vapour, so testing the liquid tests both phases.
	extra := [][]float64{z}
	for _, q := range st.points {
		extra = append(extra, q.w)
	}
	stx := c.ref.stability(t, p, x, extra, rng, 2, c.cf.comps)
	var more []tpdPoint // a phase that would lower G is also a start for a better split
	if stx.min.tpd < campTPD {
		more = append(more, stx.min)
	}
	best, _, ok := c.ref.lowestSplit(t, p, z, c.cf.comps, st, more...)
	low, lowWhat := gz, "the single phase"
	if ok && best.G < low {
		low, lowWhat = best.G, fmt.Sprintf("the split of vapour fraction %.6g from %s (residual %.2g)", c.vapourFraction(t, p, best), best.start, best.resid)
	}
	unstable := ""
	if stx.min.tpd < campTPD {
		unstable = fmt.Sprintf("the reference finds the solver's phases unstable: tangent-plane distance %.4g from the %s trial, at %s",
			stx.min.tpd, stx.min.start, compText(c.names, stx.min.w))
	}
	switch {
	case gs > low+campGibbs:
		msg := fmt.Sprintf("solver: vapour fraction %.6g (Z_L %.4g, Z_V %.4g), G − G_feed = %.6g RT; reference: %s, G − G_feed = %.6g RT, lower by %.4g RT per mole",
			beta, r.L.Z, r.V.Z, gs-gz, lowWhat, low-gz, gs-low)
		if unstable != "" {
			msg += "; " + unstable
		}
		c.fail("gibbs", state, t, p, "%s", msg)
	case unstable == "" && r.ThreePhase:
		c.fail("false-three-phase", state, t, p, "solver: vapour fraction %.6g flagged three-phase, but the reference finds its phases stable", beta)
	case unstable != "" && r.ThreePhase:
		// flagged: the split is not the equilibrium, and the solver says so
		c.out.notes["two-phase split flagged three-phase (the reference finds a phase of negative tangent-plane distance)"]++
	case unstable != "":
		// No two-phase split below the solver's, yet a phase would lower G:
		// look for the three-phase split that the unstable phase opens.
		g3, amt := math.Inf(1), [3]float64{}
		for _, frac := range []float64{0.5, 0.05} {
			if g, a := c.ref.threePhaseFrom(t, p, z, x, y, beta, stx.min.w, frac); g < g3 {
				g3, amt = g, a
			}
		}
		if g3 < gs-campGibbs && math.Min(amt[0], math.Min(amt[1], amt[2])) > 1e-6 {
			c.fail("three-phase", state, t, p, "solver: vapour fraction %.6g; %s; no two-phase split of lower Gibbs energy found, but a three-phase split %.4g RT per mole lower, phase amounts %.4g (solver's liquid), %.4g (vapour), %.4g (new)",
				beta, unstable, gs-g3, amt[0], amt[1], amt[2])
		} else {
			c.fail("split-phase-unstable", state, t, p, "solver: vapour fraction %.6g; %s; no split of lower Gibbs energy found with two phases or three (best three-phase %.3g RT per mole lower)",
				beta, unstable, gs-g3)
		}
	}
	return 2
}

// malformed says what is wrong with the form of a flash result, or "".
func malformed(r *eos.FlashResult, n int) string {
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	if r.Phases != 1 && r.Phases != 2 {
		return fmt.Sprintf("%d phases", r.Phases)
	}
	if len(r.X) != n || len(r.Y) != n {
		return fmt.Sprintf("%d and %d mole fractions for %d components", len(r.X), len(r.Y), n)
	}
	sx, sy := 0.0, 0.0
	for i := 0; i < n; i++ {
		if bad(r.X[i]) || bad(r.Y[i]) || r.X[i] < 0 || r.Y[i] < 0 {
			return fmt.Sprintf("mole fraction %d: x %g, y %g", i, r.X[i], r.Y[i])
		}
		sx += r.X[i]
		sy += r.Y[i]
	}
	if math.Abs(sx-1) > 1e-12 || math.Abs(sy-1) > 1e-12 {
		return fmt.Sprintf("mole fractions sum to %.17g and %.17g", sx, sy)
	}
	if r.Phases == 2 {
		switch {
		case !(r.Beta > 0 && r.Beta < 1):
			return fmt.Sprintf("two phases with vapour fraction %g", r.Beta)
		case bad(r.L.Z) || bad(r.V.Z) || r.L.Z <= 0 || r.V.Z <= 0:
			return fmt.Sprintf("Z_L %g, Z_V %g", r.L.Z, r.V.Z)
		case r.V.Rho > r.L.Rho:
			return fmt.Sprintf("the vapour is denser (%g kg/m³) than the liquid (%g kg/m³)", r.V.Rho, r.L.Rho)
		}
	} else if r.Beta != 0 && r.Beta != 1 {
		return fmt.Sprintf("one phase with vapour fraction %g", r.Beta)
	}
	return ""
}

// saturation checks the upper saturation point at t, and the lower dew point
// below it. It returns the type of the upper point and whether one was found.
func (c *campChecker) saturation(t float64) (eos.SatType, bool) {
	z := c.cf.z
	up, err := c.sat.Upper(t, z)
	if err != nil {
		if !errors.Is(err, eos.ErrNoSaturation) {
			// documented: ErrTwoPhaseToLimit when the feed is unstable even at 400 MPa
			hi := c.ref.stability(t, 400e6, z, nil, c.trialRNG(), 2, c.cf.comps)
			if errors.Is(err, eos.ErrTwoPhaseToLimit) && hi.min.tpd < campTPD {
				c.out.notes["upper saturation: unstable even at 400 MPa (documented ErrTwoPhaseToLimit)"]++
				return 0, false
			}
			c.fail("sat-error", "upper saturation", t, math.NaN(), "UpperSaturation: %v; the reference finds the feed stable at 400 MPa (lowest tangent-plane distance %.3g), the documented top of the search",
				err, hi.min.tpd)
			return 0, false
		}
		// confirm: stable at every pressure of a scan
		for k := 0; k <= 14; k++ {
			p := 0.1e6 * math.Pow(600, float64(k)/14)
			st := c.ref.stability(t, p, z, nil, c.trialRNG(), 2, c.cf.comps)
			if st.min.tpd < campTPD {
				c.fail("sat-missed", "upper saturation", t, p, "UpperSaturation: %v; but the reference finds the feed unstable at %.6g Pa (tangent-plane distance %.4g)", err, p, st.min.tpd)
				break
			}
		}
		return 0, false
	}
	c.out.satPoints++
	c.satPoint("upper saturation", t, up)
	var low eos.Saturation
	hasLow := false
	if up.Type == eos.Dew {
		low, err = c.sat.Lower(t, z, up.P)
		switch {
		case err == nil:
			hasLow = true
			c.out.satPoints++
			c.satPoint("lower dew point", t, low)
		case !errors.Is(err, eos.ErrNoSaturation):
			c.fail("sat-error", "lower dew point", t, math.NaN(), "LowerDewPoint below %.6g Pa: %v", up.P, err)
		}
	}
	c.side("upper saturation +0.1 %", t, up.P*(1+campSatStep), 1, up)
	if !hasLow || low.P < up.P*(1-2*campSatStep) {
		c.side("upper saturation -0.1 %", t, up.P*(1-campSatStep), 2, up)
	}
	if hasLow {
		c.side("lower dew point -0.1 %", t, low.P*(1-campSatStep), 1, low)
		if low.P < up.P*(1-2*campSatStep) {
			c.side("lower dew point +0.1 %", t, low.P*(1+campSatStep), 2, low)
		}
	}
	return up.Type, true
}

func (c *campChecker) satPoint(state string, t float64, s eos.Saturation) {
	df := c.ref.maxLnFDiff(t, s.P, c.cf.z, s.Incipient)
	triv := 0.0
	for i, zi := range c.cf.z {
		triv = math.Max(triv, math.Abs(math.Log(s.Incipient[i]/zi)))
	}
	tol := campLnF
	if cp, ok, _ := eos.VLCritical(c.cf.fl, c.cf.z); ok && math.Abs(t-cp.T) < 2 {
		// documented: within 2 K of the critical temperature the point may be
		// the one interpolated on the traced envelope, kept with a residual
		// up to 1e-7 where Newton cannot improve it (eos.Saturator.Upper)
		tol = 1e-7
	}
	switch {
	case !(df <= tol):
		c.fail("sat-point", state, t, s.P, "%v point: reference max |ln f_feed − ln f_incipient| = %.3g (solver's residual %.3g)", s.Type, df, s.Resid)
	case !(triv > 1e-5):
		c.fail("sat-point", state, t, s.P, "%v point: the incipient phase is the feed (max |ln(w_i/z_i)| = %.3g): the trivial solution", s.Type, triv)
	}
}

func (c *campChecker) side(state string, t, p float64, want int, s eos.Saturation) {
	got := c.flash(state, t, p)
	if got != 0 && got != want {
		c.fail("sat-side", state, t, p, "%v point at %.17g Pa: the flash %.1g %s it finds %d phase(s), want %d",
			s.Type, s.P, campSatStep, map[bool]string{true: "above", false: "below"}[p > s.P], got, want)
	}
}

// envelope traces the envelope and checks that its critical point lies on
// the traced curve. It returns the critical point when there is a plausible one.
func (c *campChecker) envelope() (tc, pc float64, ok bool) {
	env, err := eos.TraceEnvelope(c.cf.fl, c.cf.z, nil)
	if err != nil {
		c.fail("envelope-error", "envelope", math.NaN(), math.NaN(), "TraceEnvelope: %v", err)
		return 0, 0, false
	}
	if !env.HasCritical {
		return 0, 0, false
	}
	tmin, tmax := math.Inf(1), math.Inf(-1)
	for _, pt := range env.Points {
		tmin, tmax = math.Min(tmin, pt.T), math.Max(tmax, pt.T)
	}
	tc, pc = env.Critical[0], env.Critical[1]
	if !(tc >= tmin && tc <= tmax && pc <= env.Cricondenbar[1]*(1+1e-9)) {
		c.fail("envelope-critical", "envelope", tc, pc, "critical point %.6g K, %.6g Pa off the traced curve: points from %.6g to %.6g K, cricondenbar %.6g Pa at %.6g K",
			tc, pc, tmin, tmax, env.Cricondenbar[1], env.Cricondenbar[0])
		return 0, 0, false
	}
	return tc, pc, true
}

// guarded runs fn and records a panic as a failure.
func (c *campChecker) guarded(state string, t, p float64, fn func()) {
	defer func() {
		if e := recover(); e != nil {
			c.fail("panic", state, t, p, "panic: %v", e)
		}
	}()
	fn()
}

// runFluid draws fluid k and checks it.
func runFluid(cfg campaignConfig, k int) *fluidOutcome {
	rng := rand.New(rand.NewPCG(cfg.seed, uint64(k)))
	cf := drawFluid(k, rng)
	// every random number of the states is drawn before any solver runs
	type tp struct{ t, p float64 }
	states := make([]tp, cfg.perFluid)
	for j := range states {
		states[j] = tp{250 + 250*rng.Float64(), 0.1e6 * math.Pow(600, rng.Float64())}
	}
	tSat := 250 + 250*rng.Float64()
	box := make([]tp, cfg.nearCrit)
	for j := range box {
		box[j] = tp{1 + 0.03*(2*rng.Float64()-1), 1 + 0.05*(2*rng.Float64()-1)}
	}
	o := &fluidOutcome{cf: cf, kinds: map[string]int{}, notes: map[string]int{}}
	c := &campChecker{cf: cf, ref: newPRRef(cf.fl), fla: eos.NewFlasher(cf.fl, nil), sat: eos.NewSaturator(cf.fl, nil), out: o, seed: cfg.seed}
	for _, comp := range cf.comps {
		c.names = append(c.names, comp.Name)
	}
	for j, s := range states {
		name := fmt.Sprintf("random state %d", j)
		c.guarded(name, s.t, s.p, func() { c.flash(name, s.t, s.p) })
	}
	var typ eos.SatType
	var found, ok bool
	var tc, pc float64
	c.guarded("upper saturation", tSat, math.NaN(), func() { typ, found = c.saturation(tSat) })
	c.guarded("envelope", math.NaN(), math.NaN(), func() { tc, pc, ok = c.envelope() })
	if ok {
		for j, s := range box {
			o.nearCritical++
			name := fmt.Sprintf("near-critical state %d", j)
			c.guarded(name, tc*s.t, pc*s.p, func() { c.flash(name, tc*s.t, pc*s.p) })
		}
		if found && math.Abs(tSat-tc) > 0.5 {
			want := eos.Dew
			if tSat < tc {
				want = eos.Bubble
			}
			if typ != want {
				c.fail("sat-label", "upper saturation", tSat, math.NaN(), "a %v point at %.6g K, but the envelope's critical temperature is %.6g K (%.6g Pa): want a %v point",
					typ, tSat, tc, pc, want)
			}
		}
	}
	for _, f := range o.failures {
		o.kinds[f.kind]++
	}
	return o
}

// TestCampaign runs the random-state campaign (see the file comment).
func TestCampaign(t *testing.T) {
	cfg := campaignFromEnv(t)
	var list []int
	for k := 0; k < cfg.fluids; k++ {
		if cfg.only < 0 || cfg.only == k {
			list = append(list, k)
		}
	}
	if cfg.only >= cfg.fluids {
		list = []int{cfg.only}
	}
	outs := make([]*fluidOutcome, len(list))
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < runtime.GOMAXPROCS(0); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range jobs {
				outs[j] = runFluid(cfg, list[j])
			}
		}()
	}
	for j := range list {
		jobs <- j
	}
	close(jobs)
	wg.Wait()

	counts := map[string]int{}
	shown := map[string]int{}
	notes := map[string]int{}
	var iters []int
	var states, single, two, near, sats int
	var slowest time.Duration
	var slowestAt, mostIterAt string
	mostIter := 0
	for _, o := range outs {
		states += o.states
		single += o.single
		two += o.two
		near += o.nearCritical
		sats += o.satPoints
		iters = append(iters, o.iters...)
		if o.slowest > slowest {
			slowest, slowestAt = o.slowest, o.slowestAt
		}
		if o.mostIter > mostIter {
			mostIter, mostIterAt = o.mostIter, o.mostIterAt
		}
		for k, v := range o.notes {
			notes[k] += v
		}
		described := false
		for _, f := range o.failures {
			counts[f.kind]++
			if cfg.dump != "" {
				dumpFailure(t, cfg, o.cf, f)
			}
			if shown[f.kind] >= cfg.show {
				continue
			}
			shown[f.kind]++
			desc := ""
			if !described {
				desc = "\n" + o.cf.describe()
				described = true
			}
			t.Errorf("%s: seed %d, fluid %d, %s: T = %s K, P = %s Pa: %s\n  rerun: DEWCELL_CAMPAIGN_STRICT=1 DEWCELL_CAMPAIGN_SEED=%d DEWCELL_CAMPAIGN_NEAR=%d DEWCELL_CAMPAIGN_FLUID=%d go test -run TestCampaign ./eos/%s",
				f.kind, cfg.seed, f.fluid, f.state, g17(f.t), g17(f.p), f.detail, cfg.seed, cfg.nearCrit, f.fluid, desc)
		}
	}
	sort.Ints(iters)
	pct := func(q float64) int {
		if len(iters) == 0 {
			return 0
		}
		return iters[int(q*float64(len(iters)-1))]
	}
	t.Logf("%d fluids, %d flashes (%d one-phase, %d two-phase; %d near-critical), %d saturation points", len(outs), states, single, two, near, sats)
	t.Logf("flash iterations: median %d, 99th percentile %d, most %d (%s); slowest flash %.3g ms (%s)",
		pct(0.5), pct(0.99), mostIter, mostIterAt, slowest.Seconds()*1e3, slowestAt)
	var noteKeys []string
	for k := range notes {
		noteKeys = append(noteKeys, k)
	}
	sort.Strings(noteKeys)
	for _, k := range noteKeys {
		t.Logf("not a failure: %s: %d", k, notes[k])
	}
	var kinds []string
	for k := range counts {
		kinds = append(kinds, k)
	}
	sort.Strings(kinds)
	for _, k := range kinds {
		t.Logf("failures %-22s %d", k, counts[k])
	}
	total, printed := 0, 0
	for _, k := range kinds {
		total += counts[k]
		printed += shown[k]
	}
	switch {
	case total == 0:
		t.Logf("no failures")
	case printed < total:
		t.Errorf("%d failures in all, %d of them printed (DEWCELL_CAMPAIGN_SHOW sets how many per kind)", total, printed)
	}
}

// dumpFailure writes the failing state as a study file (and the command to
// run on it) into cfg.dump.
func dumpFailure(t *testing.T, cfg campaignConfig, cf *campFluid, f campFailure) {
	if err := os.MkdirAll(cfg.dump, 0o755); err != nil {
		t.Fatal(err)
	}
	temp := f.t
	if math.IsNaN(temp) {
		temp = 350
	}
	slug := strings.NewReplacer(" ", "-", "%", "pct", "+", "plus").Replace(f.state)
	name := fmt.Sprintf("%s-s%d-f%d-%s.toml", f.kind, cfg.seed, f.fluid, slug)
	var cmd string
	switch {
	case strings.HasPrefix(f.kind, "envelope"):
		cmd = "envelope"
	case strings.HasPrefix(f.kind, "sat-") && !strings.Contains(f.state, "%"):
		cmd = "satpoint"
	default:
		cmd = fmt.Sprintf("flash --pressure \"%s Pa\" --temperature \"%s K\"", g17(f.p), g17(f.t))
	}
	body := fmt.Sprintf("# %s: %s\n# command: %s\n# %s\n", f.kind, f.state, cmd, strings.ReplaceAll(f.detail, "\n", " ")) +
		cf.studyTOML(fmt.Sprintf("random %s %d", cf.kind, cf.index), temp)
	if err := os.WriteFile(filepath.Join(cfg.dump, name), []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
}
