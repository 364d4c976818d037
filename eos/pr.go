package eos

import "math"

// Cubic-equation mixture thermodynamics in the reduced residual Helmholtz form of
// Michelsen and Mollerup (2007, ch. 3): for n moles in volume V,
//
//	F(n, T, V) = A_res/(R T) = −n g(V, B) − D(T)/T · f(V, B)
//	g = ln(1 − B/V),  f = ln[(V + δ1 B)/(V + δ2 B)] / (R B (δ1 − δ2))
//	B = Σ n_i b_i,  D = Σ_i Σ_j n_i n_j a_ij,
//
// δ1, δ2 those of the fluid's Cubic (1 ± √2 for Peng–Robinson, 1 and 0 for
// Soave–Redlich–Kwong),
// from which ln φ_i = ∂F/∂n_i − ln Z, and the composition, pressure and
// temperature derivatives of ln φ follow by the chain rule. Every evaluation
// here is for one mole (n = 1), so "∂ ln φ_i/∂n_j" means n ∂ ln φ_i/∂n_j.

// tstate caches the temperature-dependent attraction parameters of a fluid.
type tstate struct {
	t    float64
	a    []float64 // a_i(T)
	da   []float64 // da_i/dT
	aij  []float64 // (1 − k_ij) √(a_i a_j)
	daij []float64 // d a_ij/dT
}

func newTState(n int) tstate {
	return tstate{
		t:    math.NaN(),
		a:    make([]float64, n),
		da:   make([]float64, n),
		aij:  make([]float64, n*n),
		daij: make([]float64, n*n),
	}
}

// setT fills ts for temperature t unless it already holds it.
func (f *Fluid) setT(ts *tstate, t float64) {
	if ts.t == t {
		return
	}
	n := f.n
	for i := 0; i < n; i++ {
		sq := math.Sqrt(t / f.tc[i])
		m := 1 + f.kappa[i]*(1-sq)
		ts.a[i] = f.ac[i] * m * m
		ts.da[i] = -f.ac[i] * f.kappa[i] * m / math.Sqrt(t*f.tc[i])
	}
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			aij := (1 - f.kij[i*n+j]) * math.Sqrt(ts.a[i]*ts.a[j])
			daij := 0.5 * aij * (ts.da[i]/ts.a[i] + ts.da[j]/ts.a[j])
			ts.aij[i*n+j], ts.aij[j*n+i] = aij, aij
			ts.daij[i*n+j], ts.daij[j*n+i] = daij, daij
		}
	}
	ts.t = t
}

// loneRoot is the label chooseRoot gives a lone root: one not named, as
// only Props needs the name (loneRootLabel).
const loneRoot Phase = -1

// rootChoice selects the root of the cubic.
type rootChoice int

const (
	rootMinG   rootChoice = iota // lowest Gibbs energy
	rootVapour                   // largest root
	rootLiquid                   // smallest root above B
)

// deriv flags which derivatives evalPhase computes besides ln φ.
type deriv uint8

const (
	dN deriv = 1 << iota // n ∂ ln φ_i/∂n_j at fixed T, P
	dP                   // ∂ ln φ_i/∂P at fixed T, n
	dT                   // ∂ ln φ_i/∂T at fixed P, n
)

// phase holds one evaluation of the equation of state at T, P and a composition.
type phase struct {
	psi      []float64 // Σ_j a_ij x_j
	q, pin   []float64 // scratch of derivs
	lnphi    []float64 // ln φ_i, with the Peneloux term when the fluid has VolumeShift
	dn       []float64 // n×n: n ∂ ln φ_i/∂n_j
	dp       []float64 // ∂ ln φ_i/∂P, 1/Pa
	dt       []float64 // ∂ ln φ_i/∂T, 1/K
	z        float64   // EOS compressibility factor (untranslated)
	v        float64   // translated molar volume, m³/mol
	label    Phase     // Vapour for the largest root of three, Liquid for the smallest; loneRoot
	lone     bool      // the cubic had one root above B (Props names it by loneRootLabel)
	lnPhiMix float64   // Σ x_i ln φ_i: the reduced residual Gibbs energy of the mixture

	vEOS, am, bm, p float64 // untranslated molar volume and mixture parameters, kept for derivs
}

func newPhase(n int) phase {
	return phase{
		psi:   make([]float64, n),
		q:     make([]float64, n),
		pin:   make([]float64, n),
		lnphi: make([]float64, n),
		dn:    make([]float64, n*n),
		dp:    make([]float64, n),
		dt:    make([]float64, n),
	}
}

// evalPhase evaluates the phase of composition x (summing to 1) at the
// temperature held in ts and pressure p, on the root chosen by rc.
func (f *Fluid) evalPhase(ph *phase, ts *tstate, p float64, x []float64, rc rootChoice, want deriv) {
	n := f.n
	t := ts.t
	rt := R * t
	am, bm := 0.0, 0.0
	x = x[:n]
	for i := 0; i < n; i++ {
		row := ts.aij[i*n : i*n+n]
		row = row[:len(x)] // one bounds check for the row, none in the loop
		s := 0.0
		for j, xj := range x {
			s += row[j] * xj
		}
		ph.psi[i] = s
		am += x[i] * s
		bm += x[i] * f.b[i]
	}
	A := am * p / (rt * rt)
	B := bm * p / rt
	z, label := f.chooseRoot(A, B, x, ts, rc)
	ph.z, ph.label = z, label
	ph.lone = label == loneRoot

	// Classical closed form for ln φ (Peng and Robinson 1976, eq. 18 written
	// for mixtures and for any δ1, δ2).
	cb := &f.cubic
	lnZB := math.Log(z - B)
	lnR := math.Log((z + cb.d1*B) / (z + cb.d2*B))
	k := A / (cb.dd * B) * lnR
	cshift := 0.0
	mix := 0.0
	ibm, tam, prt := 1/bm, 2/am, p/rt
	b, c, psi, lnphi := f.b[:n], f.c[:n], ph.psi[:n], ph.lnphi[:n]
	x = x[:n]
	for i := range lnphi {
		bi := b[i] * ibm
		lp := bi*(z-1) - lnZB - k*(psi[i]*tam-bi) - c[i]*prt
		lnphi[i] = lp
		mix += x[i] * lp
		cshift += x[i] * c[i]
	}
	ph.lnPhiMix = mix
	v := z * rt / p
	ph.v = v - cshift
	ph.vEOS, ph.am, ph.bm, ph.p = v, am, bm, p
	if want != 0 {
		f.derivs(ph, ts, x, want)
	}
}

// derivs adds to ph, evaluated by evalPhase at composition x, the derivatives
// of ln φ flagged in want, from the Helmholtz derivatives of one mole
// (Michelsen and Mollerup 2007, ch. 3).
func (f *Fluid) derivs(ph *phase, ts *tstate, x []float64, want deriv) {
	n := f.n
	t := ts.t
	rt := R * t
	v, am, bm, p := ph.vEOS, ph.am, ph.bm, ph.p
	D := am
	vb := v - bm
	p1 := v + f.cubic.d1*bm
	p2 := v + f.cubic.d2*bm
	dd := f.cubic.dd
	fv := math.Log(p1/p2) / (R * bm * dd)
	gV := bm / (v * vb)
	gB := -1 / vb
	gVV := -1/(vb*vb) + 1/(v*v)
	gBV := 1 / (vb * vb)
	gBB := -1 / (vb * vb)
	fV := -1 / (R * p1 * p2)
	fB := -(fv + v*fV) / bm
	fVV := (1/(p2*p2) - 1/(p1*p1)) / (R * bm * dd)
	fBV := -(2*fV + v*fVV) / bm
	fBB := -(2*fB + v*fBV) / bm

	FD := -fv / t
	FVV := -gVV - D/t*fVV
	FBV := -gBV - D/t*fBV
	FDV := -fV / t
	PV := -rt*FVV - rt/(v*v)
	// P_i = ∂P/∂n_i = −RT F_iV + RT/V, with F_iV = −g_V + F_BV b_i + F_DV D_i.
	// Keep RT/P_V scaling in mind: v̄_i = −P_i/P_V.
	if want&(dN|dP|dT) != 0 {
		// reuse dp as scratch for P_i when dP is not wanted
		for i := 0; i < n; i++ {
			FiV := -gV + FBV*f.b[i] + FDV*2*ph.psi[i]
			ph.dp[i] = -rt*FiV + rt/v // P_i for now
		}
	}
	if want&dN != 0 {
		FnB := -gB
		FBD := -fB / t
		FBB := -gBB - D/t*fBB
		inv := 1 / (rt * PV)
		// F_ij = F_nB (b_i + b_j) + F_BD (b_i D_j + b_j D_i) + F_BB b_i b_j
		// + F_D 2 a_ij = b_i q_j + b_j q_i + 2 F_D a_ij with
		// q_i = F_nB + F_BD D_i + F_BB b_i/2, D_i = 2 ψ_i; the pressure
		// term P_i P_j/(RT P_V) with P_i/(RT P_V) kept per component.
		q, pin := ph.q[:n], ph.pin[:n]
		b, dp := f.b[:n], ph.dp[:n]
		for i := range q {
			q[i] = FnB + FBD*2*ph.psi[i] + 0.5*FBB*b[i]
			pin[i] = dp[i] * inv
		}
		fd2 := 2 * FD
		for i := 0; i < n; i++ {
			bi, qi, Pi := b[i], q[i], pin[i]
			row := ph.dn[i*n : i*n+i+1]
			arow := ts.aij[i*n : i*n+i+1]
			for j := range row {
				val := bi*q[j] + b[j]*qi + fd2*arow[j] + 1 + Pi*dp[j]
				row[j] = val
				ph.dn[j*n+i] = val
			}
		}
	}
	if want&dT != 0 {
		DT := 0.0
		for i := 0; i < n; i++ {
			row := ts.daij[i*n : i*n+n]
			s := 0.0
			for j, xj := range x {
				s += row[j] * xj
			}
			ph.dt[i] = s // Σ_j x_j da_ij/dT for now
			DT += x[i] * s
		}
		c := DT/t - D/(t*t)
		FBT := -c * fB
		FDT := fv / (t * t)
		FVT := -c * fV
		PT := -rt*FVT + p/t
		for i := 0; i < n; i++ {
			FiT := FBT*f.b[i] + FDT*2*ph.psi[i] + FD*2*ph.dt[i]
			vbar := -ph.dp[i] / PV
			ph.dt[i] = FiT + 1/t - vbar*PT/rt + f.c[i]*p/(rt*t)
		}
	}
	if want&(dN|dP|dT) != 0 {
		for i := 0; i < n; i++ {
			vbar := -ph.dp[i] / PV
			ph.dp[i] = vbar/rt - 1/p - f.c[i]/rt
		}
	}
}

// chooseRoot solves the cubic in Z and picks a root.
func (f *Fluid) chooseRoot(A, B float64, x []float64, ts *tstate, rc rootChoice) (float64, Phase) {
	cb := &f.cubic
	r, nr := cubicRoots(cb.coefficients(A, B))
	// keep roots above B
	lo, hi := math.Inf(1), math.Inf(-1)
	for k := 0; k < nr; k++ {
		if r[k] > B {
			lo = min(lo, r[k])
			hi = max(hi, r[k])
		}
	}
	if math.IsInf(lo, 1) { // cannot happen for physical A, B; guard against round-off
		z := B * (1 + 1e-10)
		return z, Liquid
	}
	if lo == hi {
		return lo, loneRoot // named, where wanted, by loneRootLabel
	}
	switch rc {
	case rootVapour:
		return hi, Vapour
	case rootLiquid:
		return lo, Liquid
	}
	// (g_V − g_L)/RT for the same composition (METHODS 1.5).
	dg := (hi - lo) - math.Log((hi-B)/(lo-B)) -
		A/(cb.dd*B)*math.Log((hi+cb.d1*B)*(lo+cb.d2*B)/((hi+cb.d2*B)*(lo+cb.d1*B)))
	if dg > 0 {
		return lo, Liquid
	}
	return hi, Vapour
}

// phaseLabel is the label of the root ph holds, for composition x at t: a
// lone root named by loneRootLabel.
func (f *Fluid) phaseLabel(ph *phase, x []float64, t float64) Phase {
	if ph.lone {
		return f.loneRootLabel(x, t)
	}
	return ph.label
}

// loneRootLabel labels a single-root state by comparing T with the Li (1971)
// pseudo-critical temperature Σ φ_i Tc_i, the volume fractions φ_i taken with the
// co-volumes b_i in place of critical volumes.
func (f *Fluid) loneRootLabel(x []float64, t float64) Phase {
	if t >= f.liTc(x) {
		return Vapour
	}
	return Liquid
}

// cubicRoots returns the real roots of z³ + c2 z² + c1 z + c0, each polished by
// Newton's method.
func cubicRoots(c2, c1, c0 float64) (r [3]float64, n int) {
	p := c1 - c2*c2/3
	q := 2*c2*c2*c2/27 - c2*c1/3 + c0
	disc := q*q/4 + p*p*p/27
	shift := -c2 / 3
	if disc > 0 {
		s := math.Sqrt(disc)
		r[0] = math.Cbrt(-q/2+s) + math.Cbrt(-q/2-s) + shift
		n = 1
	} else {
		m := 2 * math.Sqrt(-p/3)
		var th float64
		if m != 0 {
			arg := 3 * q / (p * m)
			arg = max(-1, min(1, arg))
			th = math.Acos(arg) / 3
		}
		r[0] = m*math.Cos(th) + shift
		r[1] = m*math.Cos(th-2*math.Pi/3) + shift
		r[2] = m*math.Cos(th-4*math.Pi/3) + shift
		n = 3
	}
	for k := 0; k < n; k++ {
		z := r[k]
		for it := 0; it < 3; it++ {
			fz := ((z+c2)*z+c1)*z + c0
			dfz := (3*z+2*c2)*z + c1
			if dfz == 0 {
				break
			}
			dz := fz / dfz
			z -= dz
			if math.Abs(dz) <= 1e-16*math.Abs(z) {
				break
			}
		}
		r[k] = z
	}
	return r, n
}

// Props returns the single-phase properties of composition x at t (K) and p
// (Pa) on the cubic root of lowest Gibbs energy, and the label of that root.
// It allocates; use a Flasher in loops.
func (f *Fluid) Props(t, p float64, x []float64) (PhaseProps, Phase) {
	f.checkLen(x)
	ts := newTState(f.n)
	f.setT(&ts, t)
	ph := newPhase(f.n)
	f.evalPhase(&ph, &ts, p, x, rootMinG, 0)
	return f.props(&ph, t, p, x), f.phaseLabel(&ph, x, t)
}

func (f *Fluid) props(ph *phase, t, p float64, x []float64) PhaseProps {
	m := f.MolarMass(x)
	return PhaseProps{Z: p * ph.v / (R * t), V: ph.v, Rho: m / ph.v, M: m}
}
