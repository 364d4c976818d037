package study

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
)

// Limits on what a study may say about a fluid. They catch unit mistakes
// (kg/mol for g/mol, a pressure in bar read as psia) rather than bound
// physics closely; common practice, no published source.
const (
	sumTolerance = 0.05   // mol %: DESIGN.md, "must sum to 100 within 0.05"
	maxMolarMass = 2000.0 // g/mol, any component
	maxPlusMass  = 1000.0 // g/mol, a plus fraction
	minPlusSG    = 0.6    // plus-fraction specific gravity, 60/60 degF
	maxPlusSG    = 1.2
	maxTc        = 2000.0 // K
	maxPc        = 100e6  // Pa
	maxPseudo    = 20
	maxCarbon    = 100
	maxGamma     = 20.0 // gamma shape; Whitson (1983) reports 0.5 to 2.5
)

var plusName = regexp.MustCompile(`^C([0-9]+)\+$`)

// spec is one entry of [fluid.composition] with what the file says of it.
type spec struct {
	name  string  // as in the file
	pct   float64 // mol %
	plus  bool
	comp  eos.Component // library or user component; canonical library name
	first int           // index of its first component in the fluid
	count int           // number of components it became
	// A user component's optional properties the file does not give.
	noVc, noShift bool
}

// srkShiftEstimate names the volume shift of a component of an SRK fluid
// whose shift the file does not give (eos.PenelouxSRKShift).
const srkShiftEstimate = "Peneloux et al. (1982) for SRK, from the Rackett Z_RA = 0.29056 − 0.08775 ω"

// vcEstimate names the estimate of a critical volume the file does not give
// (eos.Fluid.CriticalVolume).
const vcEstimate = "Zc R Tc/Pc, Zc = 0.2918 − 0.0928 ω (Reid, Prausnitz and Sherwood 1977)"

func (r *reader) fluid(s *Study, f *fileFluid, md toml.MetaData) {
	if f == nil {
		r.failf("fluid", "missing section; [fluid.composition] is needed")
		return
	}
	var opt eos.Options
	switch r.choice("fluid.equation", f.Equation, "PR78", "PR78", "PR76", "SRK") {
	case "PR76":
		opt.Equation = eos.PR76
	case "SRK":
		opt.Equation = eos.SRK
	default:
		opt.Equation = eos.PR78
	}
	opt.VolumeShift = r.boolean("fluid.volume_shift", f.VolumeShift, false)
	var cp eos.ChuehPrausnitz
	if a, ok := r.between("fluid.hydrocarbon_kij_a", f.KijA, "the Chueh–Prausnitz constant A", false, 0, 1, false, true); ok {
		cp.A = a
		cp.Off = a == 0 // in eos.ChuehPrausnitz, A = 0 alone would mean the default A
	}
	cp.B, _ = r.between("fluid.hydrocarbon_kij_b", f.KijB, "the Chueh–Prausnitz exponent B", false, 0, 20, true, false)
	if r.err != nil {
		return
	}

	specs := r.composition(f, tableOrder(md, "fluid", "composition"))
	if r.err != nil {
		return
	}
	plus := r.plus(f, specs)
	if r.adj != nil && r.adj.plusM > 0 {
		plus.p.M = r.adj.plusM
	}
	pseudoNames := r.properties(f, specs, tableOrder(md, "fluid", "properties"))
	if r.err != nil {
		return
	}

	// Components in file order, the plus fraction split in its place.
	var comps []eos.Component
	var z []float64
	total := 0.0
	for _, sp := range specs {
		total += sp.pct
	}
	for i := range specs {
		sp := &specs[i]
		sp.first = len(comps)
		if sp.plus {
			plus.p.Z = sp.pct / total
			pc, pz, err := eos.SplitPlus(plus.p, plus.c)
			if err != nil {
				r.err = &Error{File: r.file, Key: "fluid.plus", Msg: fmt.Sprintf("cannot split %s: %v", sp.name, err), Err: err}
				return
			}
			comps = append(comps, pc...)
			z = append(z, pz...)
			sp.count = len(pc)
			continue
		}
		comps = append(comps, sp.comp)
		z = append(z, sp.pct/total)
		sp.count = 1
	}
	normalise(z)
	r.pseudoProperties(f, specs, comps, pseudoNames)
	if r.err != nil {
		return
	}
	if opt.Equation == eos.SRK {
		r.srkShifts(specs, comps)
	}
	groups := componentGroups(specs, comps)
	if r.adj != nil {
		if r.err = r.adj.properties(r.file, groups, comps); r.err != nil {
			return
		}
	}

	// Default coefficients from the canonical names, then the names of the file.
	n := len(comps)
	kij := eos.DefaultKij(comps, cp)
	if len(kij) != n*n {
		r.failf("fluid", "internal error: %d default interaction coefficients for %d components", len(kij), n)
		return
	}
	for _, sp := range specs {
		if !sp.plus {
			comps[sp.first].Name = sp.name
		}
	}
	r.interaction(f, groups, comps, kij, tableOrder(md, "fluid", "interaction"))
	if r.err != nil {
		return
	}
	if r.adj != nil {
		if r.err = r.adj.interactions(r.file, groups, comps, kij); r.err != nil {
			return
		}
	}
	fl, err := eos.NewFluid(comps, kij, opt)
	if err != nil {
		r.err = &Error{File: r.file, Key: "fluid", Msg: err.Error(), Err: err}
		return
	}
	s.specs = specs
	s.Fluid, s.Z = fl, z
	s.Estimates = r.estimates(specs, plus, n, opt)
	s.groups = groups
	s.plusName = plus.p.Name
	s.plusM = plus.p.M
}

// srkShifts gives every component whose volume_shift the file does not
// give the Peneloux, Rauzy and Fréze (1982) shift of the Soave–Redlich–Kwong
// equation (eos.PenelouxSRKShift): the library's shifts and those of the
// plus-fraction correlations are Peng–Robinson's.
func (r *reader) srkShifts(specs []spec, comps []eos.Component) {
	for _, sp := range specs {
		for j := sp.first; j < sp.first+sp.count; j++ {
			name := comps[j].Name
			if !sp.plus {
				name = sp.name
			}
			if !r.shiftGiven[name] {
				comps[j].Shift = eos.PenelouxSRKShift(comps[j].Omega)
			}
		}
	}
}

// componentGroups maps each name of the file or of the fluid to the
// components it stands for: a component's own name to itself, the plus
// fraction's name to all its pseudo-components.
func componentGroups(specs []spec, comps []eos.Component) map[string][]int {
	groups := map[string][]int{}
	for i, c := range comps {
		groups[c.Name] = []int{i}
	}
	for _, sp := range specs {
		g := make([]int, sp.count)
		for j := range g {
			g[j] = sp.first + j
		}
		groups[sp.name] = g
	}
	return groups
}

// estimates says, per component, how the properties the file does not give
// were obtained, and warns of each estimate or default of a user component.
func (r *reader) estimates(specs []spec, plus plusSpec, n int, opt eos.Options) []string {
	est := make([]string, n)
	for _, sp := range specs {
		if sp.plus {
			note := pseudoNote(sp.name, plus.c)
			for j := range sp.count {
				est[sp.first+j] = note
			}
			continue
		}
		var notes []string
		k := key("fluid", "properties", sp.name)
		if sp.noVc {
			notes = append(notes, "critical volume estimated as "+vcEstimate)
			r.warnings = append(r.warnings, fmt.Sprintf("%s: %s gives no critical_volume: the viscosity (Lohrenz–Bray–Clark) uses one estimated as %s, "+
				"and the Chueh–Prausnitz coefficients of %s with hydrocarbons, which need a critical volume, are 0 where [fluid.interaction] does not set them; "+
				"give critical_volume to use a known value", r.file, k, vcEstimate, sp.name))
		}
		if sp.noShift && opt.VolumeShift && opt.Equation == eos.SRK {
			notes = append(notes, "volume shift estimated as "+srkShiftEstimate)
		} else if sp.noShift && opt.VolumeShift {
			notes = append(notes, "volume shift not given: 0")
			r.warnings = append(r.warnings, fmt.Sprintf("%s: %s gives no volume_shift: its volumes are not shifted (s = 0) although fluid.volume_shift is true; give volume_shift to shift them",
				r.file, k))
		}
		est[sp.first] = strings.Join(notes, "; ")
	}
	return est
}

// pseudoNote says how the properties of a pseudo-component split from the
// plus fraction name were obtained, in the words of the study file's keys
// (eos.PseudoComponent lists the correlations each one means).
func pseudoNote(name string, c eos.Characterization) string {
	split := map[eos.SplitMethod]string{eos.SplitGammaQuadrature: "gamma-quadrature", eos.SplitExponential: "exponential", eos.SplitNone: "none"}[c.Split]
	if split == "" {
		split = "gamma"
	}
	corr := map[eos.CritCorrelation]string{eos.RiaziDaubert: "riazi-daubert", eos.RiaziDaubert1987: "riazi-daubert-1987", eos.Twu: "twu"}[c.Correlation]
	if corr == "" {
		corr = "kesler-lee"
	}
	acentric := "kesler-lee"
	if c.Acentric == eos.AcentricEdmister {
		acentric = "edmister"
	}
	return fmt.Sprintf("from the %s split: split %s, correlation %s, acentric %s", name, split, corr, acentric)
}

// normalise scales z to sum to 1, then nudges its largest entry until the
// sum, taken in order, is exactly 1.
func normalise(z []float64) {
	sum := func() float64 {
		s := 0.0
		for _, v := range z {
			s += v
		}
		return s
	}
	s := sum()
	big := 0
	for i := range z {
		z[i] /= s
		if z[i] > z[big] {
			big = i
		}
	}
	for range 8 {
		s = sum()
		if s == 1 {
			return
		}
		z[big] += 1 - s
	}
}

func (r *reader) composition(f *fileFluid, order []string) []spec {
	if len(f.Composition) == 0 {
		r.missing("fluid.composition", "the mole percent of each component, such as C1 = 73.2")
		return nil
	}
	var specs []spec
	total := 0.0
	for _, name := range order {
		k := key("fluid", "composition", name)
		v, ok := f.Composition[name]
		if !ok {
			continue
		}
		pct, ok := r.number(k, v, "a mole percent", true)
		if !ok {
			return nil
		}
		if pct < 0 || pct > 100 {
			r.failf(k, "%v is out of range; want a mole percent from 0 to 100", pct)
			return nil
		}
		if name == "" || strings.ContainsAny(name, "/ \t") {
			r.failf(k, "component names may not be empty or contain '/' or spaces")
			return nil
		}
		specs = append(specs, spec{name: name, pct: pct})
		total += pct
	}
	if len(specs) != len(f.Composition) {
		// Keys missing from MetaData.Keys: cannot happen with BurntSushi/toml v1.
		r.failf("fluid.composition", "internal error: %d of %d components in order", len(specs), len(f.Composition))
		return nil
	}
	if math.Abs(total-100) > sumTolerance {
		r.failf("fluid.composition", "sums to %.6g mol%%; want 100 within %g", total, sumTolerance)
		return nil
	}
	if math.Abs(total-100) >= 5e-7 { // shows in six decimals
		sum := strings.TrimRight(fmt.Sprintf("%.6f", total), "0")
		r.warnings = append(r.warnings, fmt.Sprintf("%s: fluid.composition sums to %s mol%%; normalised to 100", r.file, sum))
	}
	// Two names for one library component (C6 and nC6).
	seen := map[string]string{}
	for _, sp := range specs {
		if c, ok := eos.LibraryComponent(sp.name); ok {
			if other, dup := seen[c.Name]; dup {
				r.failf(key("fluid", "composition", sp.name), "%s and %s are the same library component", other, sp.name)
				return nil
			}
			seen[c.Name] = sp.name
		}
	}
	return specs
}

type plusSpec struct {
	p eos.PlusFraction
	c eos.Characterization
}

// plus reads [fluid.plus] and marks the plus fraction among specs.
func (r *reader) plus(f *fileFluid, specs []spec) plusSpec {
	var ps plusSpec
	fp := f.Plus
	if fp == nil {
		for _, sp := range specs {
			if strings.HasSuffix(sp.name, "+") {
				r.missing("fluid.plus", fmt.Sprintf("a [fluid.plus] section describing %s (name, molar_mass, specific_gravity)", sp.name))
				return ps
			}
		}
		return ps
	}
	name := r.text("fluid.plus.name", fp.Name, true)
	if r.err != nil {
		return ps
	}
	found := -1
	for i := range specs {
		if specs[i].name == name {
			found = i
		}
	}
	if found < 0 {
		r.failf("fluid.plus.name", "%q is not in fluid.composition", name)
		return ps
	}
	if specs[found].pct == 0 {
		r.failf(key("fluid", "composition", name), "the plus fraction is 0 mol%%; give its amount, or remove it and [fluid.plus]")
		return ps
	}
	if _, ok := eos.LibraryComponent(name); ok {
		r.failf("fluid.plus.name", "%q is a library component, not a plus fraction", name)
		return ps
	}
	for _, sp := range specs {
		if sp.name != name && strings.HasSuffix(sp.name, "+") {
			r.failf(key("fluid", "composition", sp.name), "only one plus fraction is supported, and [fluid.plus] describes %s", name)
			return ps
		}
	}
	specs[found].plus = true
	ps.p.Name = name

	first := 0
	if m := plusName.FindStringSubmatch(name); m != nil {
		if n, err := strconv.Atoi(m[1]); err == nil {
			first = n
		} else {
			first = -1
		}
	}
	if n, ok := r.integer("fluid.plus.first_carbon", fp.FirstCarbon, "the carbon number n of the Cn+ fraction", 2, maxCarbon); ok {
		if first != 0 && n != first {
			r.failf("fluid.plus.first_carbon", "%d, but the name %q says %d", n, name, first)
		}
		first = n
	} else if first == 0 && r.err == nil {
		r.missing("fluid.plus.first_carbon", fmt.Sprintf("the carbon number n of the fraction, because the name %q does not say it (as C7+ would)", name))
	}
	if first < 2 || first > maxCarbon {
		r.failf("fluid.plus.name", "carbon number %d of %q is out of range; want 2 to %d", first, name, maxCarbon)
	}
	ps.p.FirstCarbon = first
	eta := float64(14*first - 6) // g/mol, the default minimum molar mass (Whitson, 1983)

	split := r.choice("fluid.plus.split", fp.Split, "gamma", "gamma", "gamma-quadrature", "exponential", "none")
	gamma := split == "gamma" || split == "gamma-quadrature"
	switch split {
	case "gamma-quadrature":
		ps.c.Split = eos.SplitGammaQuadrature
	case "exponential":
		ps.c.Split = eos.SplitExponential
	case "none":
		ps.c.Split = eos.SplitNone
	default:
		ps.c.Split = eos.SplitGamma
	}
	if a, ok := r.between("fluid.plus.gamma_shape", fp.GammaShape, "the gamma shape alpha", false, 0, maxGamma, true, false); ok {
		if !gamma {
			r.failf("fluid.plus.gamma_shape", "applies only with split = \"gamma\" or \"gamma-quadrature\", not %q", split)
		}
		ps.c.Alpha = a
	}
	if e, ok := r.between("fluid.plus.minimum_molar_mass", fp.MinimumMolarMass, "the minimum molar mass in g/mol", false, 0, maxPlusMass, true, false); ok {
		if !gamma {
			r.failf("fluid.plus.minimum_molar_mass", "applies only with split = \"gamma\" or \"gamma-quadrature\", not %q", split)
		}
		ps.c.Eta = e / 1000
		eta = e
	}
	if n, ok := r.integer("fluid.plus.pseudo_components", fp.PseudoComponents, "the number of pseudo-components", 1, maxPseudo); ok {
		if split == "none" && n != 1 {
			r.failf("fluid.plus.pseudo_components", "%d, but split = \"none\" keeps %s as one pseudo-component", n, name)
		}
		ps.c.Pseudo = n
	}
	switch r.choice("fluid.plus.correlation", fp.Correlation, "kesler-lee", "kesler-lee", "riazi-daubert", "riazi-daubert-1987", "twu") {
	case "riazi-daubert":
		ps.c.Correlation = eos.RiaziDaubert
	case "riazi-daubert-1987":
		ps.c.Correlation = eos.RiaziDaubert1987
	case "twu":
		ps.c.Correlation = eos.Twu
	default:
		ps.c.Correlation = eos.KeslerLee
	}
	if r.choice("fluid.plus.acentric", fp.Acentric, "kesler-lee", "kesler-lee", "edmister") == "edmister" {
		ps.c.Acentric = eos.AcentricEdmister
	}

	m, ok := r.number("fluid.plus.molar_mass", fp.MolarMass, "the molar mass of the plus fraction in g/mol", true)
	if ok && (m <= eta || m > maxPlusMass) {
		r.failf("fluid.plus.molar_mass", "%v g/mol is out of range; want more than the minimum molar mass %g g/mol and at most %g g/mol",
			m, eta, maxPlusMass)
	}
	ps.p.M = m / 1000
	ps.p.SG, _ = r.between("fluid.plus.specific_gravity", fp.SpecificGravity, "the specific gravity (60/60 degF) of the plus fraction", true, minPlusSG, maxPlusSG, false, false)
	return ps
}

// properties reads [fluid.properties.NAME] into the specs: library
// components with overrides, user components in full. It returns the names
// that are not in the composition, which pseudoProperties looks for among
// the pseudo-components of the plus fraction.
func (r *reader) properties(f *fileFluid, specs []spec, order []string) (pseudo []string) {
	for _, name := range order {
		inComp := false
		for _, sp := range specs {
			if sp.name == name {
				inComp = true
				if sp.plus {
					r.failf(key("fluid", "properties", name), "%s is the plus fraction; describe it in [fluid.plus], or name one of its pseudo-components", name)
					return
				}
			}
		}
		if !inComp {
			pseudo = append(pseudo, name)
		}
	}
	for i := range specs {
		sp := &specs[i]
		if sp.plus {
			continue
		}
		lib, isLib := eos.LibraryComponent(sp.name)
		fp := f.Properties[sp.name]
		if fp == nil {
			if !isLib {
				r.failf(key("fluid", "composition", sp.name), "unknown component %q: not in the library (%s), not the plus fraction, and no [fluid.properties.%s] defines it",
					sp.name, strings.Join(eos.LibraryNames(), ", "), sp.name)
				return
			}
			sp.comp = lib
			continue
		}
		c := lib
		if !isLib {
			c = eos.Component{Name: sp.name}
		}
		noShift, noVc := r.componentProperties(sp.name, fp, &c, !isLib) // a user component needs the four properties of the equation of state
		if !isLib {
			sp.noShift, sp.noVc = noShift, noVc
		}
		if r.err != nil {
			return
		}
		sp.comp = c
	}
	return pseudo
}

// componentProperties reads the properties fp gives of component name into
// c; need says the four properties of the equation of state are required.
// It says whether the volume shift and the critical volume were left out.
func (r *reader) componentProperties(name string, fp *fileProps, c *eos.Component, need bool) (noShift, noVc bool) {
	k := func(field string) string { return key("fluid", "properties", name, field) }
	if v, ok := r.between(k("molar_mass"), fp.MolarMass, "a molar mass in g/mol", need, 0, maxMolarMass, true, false); ok {
		c.M = v / 1000
	}
	if v, ok := r.quantity(k("critical_temperature"), fp.CriticalTemperature, units.Temperature, need); ok {
		if v > maxTc {
			r.failf(k("critical_temperature"), "%.6g K is out of range; want at most %g K", v, maxTc)
		}
		c.Tc = v
	}
	if v, ok := r.quantity(k("critical_pressure"), fp.CriticalPressure, units.Pressure, need); ok {
		if v <= 0 || v > maxPc {
			r.failf(k("critical_pressure"), "%.6g Pa is out of range; want above 0 and at most %g MPa", v, maxPc/1e6)
		}
		c.Pc = v
	}
	if v, ok := r.between(k("acentric_factor"), fp.AcentricFactor, "an acentric factor", need, -1, 3, true, true); ok {
		c.Omega = v
	}
	if v, ok := r.between(k("volume_shift"), fp.VolumeShift, "a dimensionless Peneloux shift s = c/b", false, -1, 1, true, true); ok {
		c.Shift = v
		if r.shiftGiven == nil {
			r.shiftGiven = map[string]bool{}
		}
		r.shiftGiven[name] = true
	} else {
		noShift = true
	}
	if v, ok := r.quantity(k("critical_volume"), fp.CriticalVolume, units.MolarVolume, false); ok {
		if v <= 0 {
			r.failf(k("critical_volume"), "must be above zero")
		}
		c.Vc = v
	} else {
		noVc = true
	}
	if v, ok := r.quantity(k("boiling_point"), fp.BoilingPoint, units.Temperature, false); ok {
		c.Tb = v
	}
	if v, ok := r.between(k("specific_gravity"), fp.SpecificGravity, "a specific gravity (60/60 degF)", false, 0, 3, true, false); ok {
		c.SG = v
	}
	return noShift, noVc
}

// pseudoProperties applies [fluid.properties.NAME] of the names that are
// not in the composition to the pseudo-components of the plus fraction
// that fluid prints under those names: overrides of the split's properties.
func (r *reader) pseudoProperties(f *fileFluid, specs []spec, comps []eos.Component, names []string) {
	for _, name := range names {
		found := -1
		var pseudo []string
		for _, sp := range specs {
			if !sp.plus {
				continue
			}
			for j := sp.first; j < sp.first+sp.count; j++ {
				pseudo = append(pseudo, comps[j].Name)
				if comps[j].Name == name {
					found = j
				}
			}
		}
		if found < 0 {
			if len(pseudo) == 0 {
				r.failf(key("fluid", "properties", name), "%s is not in fluid.composition", name)
			} else {
				r.failf(key("fluid", "properties", name), "%s is not in fluid.composition, nor a pseudo-component of the plus fraction (%s)", name, strings.Join(pseudo, ", "))
			}
			return
		}
		r.componentProperties(name, f.Properties[name], &comps[found], false)
		if r.err != nil {
			return
		}
	}
}

// interaction applies [fluid.interaction] to kij, n×n for comps.
func (r *reader) interaction(f *fileFluid, groups map[string][]int, comps []eos.Component, kij []float64, order []string) {
	n := len(comps)
	setBy := make(map[[2]int]string)
	for _, pair := range order {
		k := key("fluid", "interaction", pair)
		parts := strings.Split(pair, "/")
		if len(parts) != 2 {
			r.failf(k, `want a pair of component names such as "C1/C7+"`)
			return
		}
		a, b := strings.TrimSpace(parts[0]), strings.TrimSpace(parts[1])
		ga, okA := groups[a]
		gb, okB := groups[b]
		switch {
		case !okA:
			r.failf(k, "%q is not a component of the fluid", a)
			return
		case !okB:
			r.failf(k, "%q is not a component of the fluid", b)
			return
		case a == b:
			r.failf(k, "a component does not interact with itself")
			return
		}
		v, ok := r.between(k, f.Interaction[pair], "an interaction coefficient", true, -1, 1, true, true)
		if !ok {
			return
		}
		for _, i := range ga {
			for _, j := range gb {
				if i == j {
					continue
				}
				ij := [2]int{min(i, j), max(i, j)}
				if prev, dup := setBy[ij]; dup {
					r.failf(k, "sets %s/%s, which %s already set", comps[i].Name, comps[j].Name, prev)
					return
				}
				setBy[ij] = k
				kij[i*n+j], kij[j*n+i] = v, v
			}
		}
	}
}
