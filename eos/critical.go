package eos

import (
	"math"
	"sort"
	"sync"
)

// Critical point of a mixture by the criteria of Gibbs in the form of
// Heidemann and Khalil (1980), evaluated for a cubic equation of state as
// Michelsen and Heidemann (1981) describe. At temperature T and total volume
// V, with Q_ij = ∂²(A/RT)/∂n_i∂n_j at the feed n = z,
//
//	Q Δn = 0                               (the limit of stability)
//	C = Σ_ijk ∂³(A/RT)/∂n_i∂n_j∂n_k Δn_i Δn_j Δn_k = 0
//
// Q is scaled to M_ij = √(z_i z_j) Q_ij = δ_ij + √(z_i z_j) F_ij, with F the
// reduced residual Helmholtz energy of pr.go; the eigenvector u of its
// vanishing eigenvalue gives Δn_i = √z_i u_i. For each molar volume v the
// temperature where λ = 0 is found (the spinodal); along it, the cubic form
// C is the derivative of Δnᵀ Q(z + sΔn) Δn at s = 0 (its ideal part
// −Σ Δn_i³/z_i² exactly, its residual part by a central difference), and its
// zeros in v are the critical points.
//
// References: Heidemann and Khalil (1980); Michelsen and Heidemann (1981),
// in full in doc.go.

// A CriticalPoint is a vapour–liquid critical point of a mixture.
type CriticalPoint struct {
	T, P float64 // K, Pa
	V    float64 // molar volume of the equation of state (untranslated), m³/mol
}

// critWork holds the scratch space of the critical-point search, over the
// m components present in the feed.
type critWork struct {
	fl  *Fluid
	ts  tstate
	idx []int     // the components present
	z   []float64 // their mole fractions (summing to 1)
	x   []float64 // n-vector scratch: a composition
	psi []float64 // n-vector: Σ_j a_ij x_j
	fm  []float64 // m×m: F_ij
	ld  []float64 // m×m: M, then its LDLᵀ factors
	u   []float64 // eigenvector of the eigenvalue of M nearest zero
	dn  []float64 // Δn over the present components
	xs  []float64 // m-vector scratch
}

func newCritWork(fl *Fluid, z []float64) *critWork {
	c := &critWork{fl: fl, ts: newTState(fl.n), x: make([]float64, fl.n), psi: make([]float64, fl.n)}
	for i, zi := range z {
		if zi > 0 {
			c.idx = append(c.idx, i)
			c.z = append(c.z, zi)
		}
	}
	normalise(c.z)
	m := len(c.idx)
	c.fm = make([]float64, m*m)
	c.ld = make([]float64, m*m)
	c.u = make([]float64, m)
	c.dn = make([]float64, m)
	c.xs = make([]float64, m)
	return c
}

// hessian fills c.fm with F_ij = ∂²F/∂n_i∂n_j at fixed T and V for one mole
// of composition xs (over the present components) in molar volume v: the
// derivatives of F = −n g − D f/T of pr.go (Michelsen and Mollerup 2007,
// ch. 3). It reports false when v is not above the co-volume.
func (c *critWork) hessian(t, v float64, xs []float64) bool {
	fl := c.fl
	ts := &c.ts
	fl.setT(ts, t)
	n := fl.n
	for i := range c.x {
		c.x[i] = 0
	}
	for k, i := range c.idx {
		c.x[i] = xs[k]
	}
	D, B := 0.0, 0.0
	for _, i := range c.idx {
		s := 0.0
		row := ts.aij[i*n : i*n+n]
		for _, j := range c.idx {
			s += row[j] * c.x[j]
		}
		c.psi[i] = s
		D += c.x[i] * s
		B += c.x[i] * fl.b[i]
	}
	if !(v > B) {
		return false
	}
	vb := v - B
	p1, p2 := v+fl.cubic.d1*B, v+fl.cubic.d2*B
	dd := fl.cubic.dd
	f := math.Log(p1/p2) / (R * B * dd)
	fV := -1 / (R * p1 * p2)
	fVV := (1/(p2*p2) - 1/(p1*p1)) / (R * B * dd)
	fB := -(f + v*fV) / B
	fBV := -(2*fV + v*fVV) / B
	fBB := -(2*fB + v*fBV) / B
	gB := -1 / vb
	gBB := -1 / (vb * vb)
	FnB := -gB
	FBD := -fB / t
	FBB := -gBB - D/t*fBB
	FD := -f / t
	m := len(c.idx)
	for a, i := range c.idx {
		bi, Di := fl.b[i], 2*c.psi[i]
		for b := 0; b <= a; b++ {
			j := c.idx[b]
			bj, Dj := fl.b[j], 2*c.psi[j]
			val := FnB*(bi+bj) + FBD*(bi*Dj+bj*Di) + FBB*bi*bj + FD*2*ts.aij[i*n+j]
			c.fm[a*m+b], c.fm[b*m+a] = val, val
		}
	}
	return true
}

// factor forms M = I + √(z_i z_j) F_ij at t and v and its LDLᵀ
// factorisation (without pivoting) in c.ld. It returns det M and the number
// of negative pivots, which is the number of negative eigenvalues of M
// (Sylvester's law of inertia); ok is false when v is not above the
// co-volume or the matrix is not finite.
func (c *critWork) factor(t, v float64) (det float64, neg int, ok bool) {
	if !c.hessian(t, v, c.z) {
		return 0, 0, false
	}
	m := len(c.idx)
	a := c.ld
	for i := 0; i < m; i++ {
		for j := 0; j < m; j++ {
			a[i*m+j] = math.Sqrt(c.z[i]*c.z[j]) * c.fm[i*m+j]
		}
		a[i*m+i]++
	}
	det = 1
	for k := 0; k < m; k++ {
		d := a[k*m+k]
		for j := 0; j < k; j++ {
			d -= a[k*m+j] * a[k*m+j] * a[j*m+j]
		}
		if math.IsNaN(d) {
			return 0, 0, false
		}
		if d == 0 {
			// exactly singular: keep a pivot the inverse iteration of
			// nullVector can divide by
			d = 1e-150
		}
		a[k*m+k] = d
		for i := k + 1; i < m; i++ {
			s := a[i*m+k]
			for j := 0; j < k; j++ {
				s -= a[i*m+j] * a[k*m+j] * a[j*m+j]
			}
			a[i*m+k] = s / d
		}
		det *= d
		if d < 0 {
			neg++
		}
	}
	return det, neg, true
}

// nullVector leaves in c.u, after factor, the eigenvector of M whose
// eigenvalue is nearest zero, by three steps of inverse iteration, normalised
// and oriented so that Σ Δn_i b_i ≥ 0.
func (c *critWork) nullVector() {
	m := len(c.idx)
	a := c.ld
	for i := range c.u {
		c.u[i] = 1 / math.Sqrt(float64(m))
	}
	for it := 0; it < 3; it++ {
		// solve L D Lᵀ y = u
		for i := 0; i < m; i++ {
			s := c.u[i]
			for j := 0; j < i; j++ {
				s -= a[i*m+j] * c.u[j]
			}
			c.u[i] = s
		}
		for i := 0; i < m; i++ {
			c.u[i] /= a[i*m+i]
		}
		for i := m - 1; i >= 0; i-- {
			s := c.u[i]
			for j := i + 1; j < m; j++ {
				s -= a[j*m+i] * c.u[j]
			}
			c.u[i] = s
		}
		big := 0.0
		for _, x := range c.u {
			big = max(big, math.Abs(x))
		}
		norm := 0.0
		for i := range c.u {
			c.u[i] /= big
			norm += c.u[i] * c.u[i]
		}
		norm = math.Sqrt(norm)
		for i := range c.u {
			c.u[i] /= norm
		}
	}
	s := 0.0
	for k := 0; k < m; k++ {
		s += math.Sqrt(c.z[k]) * c.u[k] * c.fl.b[c.idx[k]]
	}
	if s < 0 {
		for k := range c.u {
			c.u[k] = -c.u[k]
		}
	}
}

// spinodalT returns the highest temperature at which M(T, v) is singular,
// the limit of stability of the feed at molar volume v: from the guess t0 it
// finds a temperature where M is positive definite and one, below it, with
// one negative eigenvalue, then solves det M = 0 between them by the
// Illinois variant of false position to tol relative. NaN when there is
// none between 1 K and 100 t0.
func (c *critWork) spinodalT(v, t0, tol float64) float64 {
	d0, neg0, ok := c.factor(t0, v)
	if !ok {
		return math.NaN()
	}
	// Move from t0 (down when M is positive definite there, up when not)
	// by secant steps on det M, each at least 0.5 % and at most 30 %, until
	// the inertia changes. hi keeps the last positive-definite point.
	dir := -1.0
	if neg0 > 0 {
		dir = 1
	}
	ta, da := t0, d0
	tb := t0 * (1 + dir*0.005)
	var hi, dHi, lo, dLo float64
	for k := 0; ; k++ {
		if k == 60 || tb < 1 || tb > 100*t0 {
			return math.NaN()
		}
		db, neg, ok := c.factor(tb, v)
		if !ok {
			return math.NaN()
		}
		if (neg == 0) != (neg0 == 0) {
			if neg0 == 0 {
				hi, dHi, lo, dLo = ta, da, tb, db
			} else {
				hi, dHi, lo, dLo = tb, db, ta, da
			}
			if neg > 1 || neg0 > 1 {
				// the lower end must hold exactly one negative eigenvalue:
				// bisect towards the positive-definite end
				for j := 0; ; j++ {
					if j == 60 {
						return math.NaN()
					}
					t := math.Sqrt(lo * hi)
					d, neg, ok := c.factor(t, v)
					if !ok {
						return math.NaN()
					}
					if neg == 0 {
						hi, dHi = t, d
					} else {
						lo, dLo = t, d
						if neg == 1 {
							break
						}
					}
				}
			}
			break
		}
		next := tb - db*(tb-ta)/(db-da)
		step := (next - tb) * dir // the secant's step, positive onwards
		lim := math.Abs(tb - ta)
		if !(step > 0.5*lim) || math.IsInf(next, 0) || math.IsNaN(next) {
			next = tb + dir*2*lim // the secant points back or stalls: double the step
		}
		next = max(tb/1.3, min(tb*1.3, next))
		// overshoot a little so that the next point lies past the root
		next += dir * 0.002 * next
		ta, da, tb = tb, db, next
	}
	// det M > 0 at hi, < 0 at lo
	side := 0
	for it := 0; it < 100; it++ {
		t := (lo*dHi - hi*dLo) / (dHi - dLo)
		if !(t > lo && t < hi) {
			t = 0.5 * (lo + hi)
		}
		d, _, ok := c.factor(t, v)
		if !ok || d == 0 {
			return t
		}
		if hi-lo < tol*t {
			return t
		}
		if d > 0 {
			hi, dHi = t, d
			if side == 1 {
				dLo /= 2
			}
			side = 1
		} else {
			lo, dLo = t, d
			if side == -1 {
				dHi /= 2
			}
			side = -1
		}
	}
	return 0.5 * (lo + hi)
}

// cubic returns the cubic form C at t and v, after nullVector has set c.u.
func (c *critWork) cubic(t, v float64) float64 {
	m := len(c.idx)
	for a := range c.dn {
		c.dn[a] = math.Sqrt(c.z[a]) * c.u[a]
	}
	ideal := 0.0
	eps := 1e-4
	for a, d := range c.dn {
		ideal -= d * d * d / (c.z[a] * c.z[a])
		if d != 0 {
			eps = min(eps, 0.01*c.z[a]/math.Abs(d))
		}
	}
	// Δnᵀ F(z + sΔn, V) Δn at s = ±eps; F is homogeneous of degree −1 in
	// (n, V), so at N = Σ n moles it is F(n/N, V/N)/N.
	quad := func(s float64) float64 {
		xs := c.xs
		N := 0.0
		for a := range xs {
			xs[a] = c.z[a] + s*c.dn[a]
			N += xs[a]
		}
		for a := range xs {
			xs[a] /= N
		}
		if !c.hessian(t, v/N, xs) {
			return math.NaN()
		}
		q := 0.0
		for a := 0; a < m; a++ {
			for b := 0; b < m; b++ {
				q += c.dn[a] * c.fm[a*m+b] * c.dn[b]
			}
		}
		return q / N
	}
	return ideal + (quad(eps)-quad(-eps))/(2*eps)
}

// Criticals returns the vapour–liquid critical points of feed z: the zeros
// of the cubic form along the spinodal, scanned over molar volumes from 1.2
// to 12 times the mixture co-volume b (16 steps in ln v, halved up to three
// times where |C| dips without changing sign, where two zeros may lie close
// together) and each solved to 1e-9 in v, in order of increasing volume. A mixture whose spinodal has no such zero
// (for example a heavy tail whose saturation curve turns up into a
// liquid–liquid region) gives none. A single component gives its own Tc and
// Pc.
func Criticals(fl *Fluid, z []float64) ([]CriticalPoint, error) {
	fl.checkLen(z)
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	c := newCritWork(fl, z)
	bm, tGuess := 0.0, 0.0
	for k, i := range c.idx {
		bm += c.z[k] * fl.b[i]
		tGuess += c.z[k] * fl.tc[i]
	}
	tGuess *= 1.5
	type node struct{ v, t, cf float64 }
	eval := func(v, t0, tol float64) node {
		t := c.spinodalT(v, t0, tol)
		if math.IsNaN(t) {
			return node{v, t, math.NaN()}
		}
		c.factor(t, v)
		c.nullVector()
		return node{v, t, c.cubic(t, v)}
	}
	// A coarse scan in ln v, refined where |C| has an interior minimum
	// without a change of sign (two zeros may lie close together there).
	const coarse = 16
	ratio := math.Pow(12/1.2, 1.0/coarse)
	nodes := make([]node, 0, 4*coarse)
	for k := 0; k <= coarse; k++ {
		t0 := tGuess
		if n := len(nodes); n > 0 && !math.IsNaN(nodes[n-1].t) {
			t0 = nodes[n-1].t
			if n > 1 && !math.IsNaN(nodes[n-2].t) {
				t0 = t0 * t0 / nodes[n-2].t // geometric extrapolation
			}
		}
		nodes = append(nodes, eval(1.2*bm*math.Pow(ratio, float64(k)), t0, 1e-4))
	}
	for pass := 0; pass < 3; pass++ {
		var more []node
		for k := 1; k+1 < len(nodes); k++ {
			a, b, d := nodes[k-1], nodes[k], nodes[k+1]
			if math.IsNaN(a.cf) || math.IsNaN(b.cf) || math.IsNaN(d.cf) || a.cf*b.cf <= 0 || b.cf*d.cf <= 0 {
				continue
			}
			if math.Abs(b.cf) < math.Abs(a.cf) && math.Abs(b.cf) < math.Abs(d.cf) {
				more = append(more, eval(math.Sqrt(a.v*b.v), 0.5*(a.t+b.t), 1e-4), eval(math.Sqrt(b.v*d.v), 0.5*(b.t+d.t), 1e-4))
			}
		}
		if len(more) == 0 {
			break
		}
		nodes = append(nodes, more...)
		sort.Slice(nodes, func(i, j int) bool { return nodes[i].v < nodes[j].v })
	}
	var out []CriticalPoint
	for k := 1; k < len(nodes); k++ {
		prev, cur := nodes[k-1], nodes[k]
		if !math.IsNaN(prev.cf) && !math.IsNaN(cur.cf) && prev.cf*cur.cf <= 0 {
			a, b := prev, cur
			side := 0
			for it := 0; it < 100 && b.v-a.v > 1e-9*a.v; it++ {
				v := (a.v*b.cf - b.v*a.cf) / (b.cf - a.cf)
				if !(v > a.v && v < b.v) {
					v = 0.5 * (a.v + b.v)
				}
				mid := eval(v, 0.5*(a.t+b.t), 1e-10)
				if math.IsNaN(mid.cf) {
					break
				}
				if mid.cf == 0 {
					a, b = mid, mid
					break
				}
				if mid.cf*a.cf > 0 {
					a = mid
					if side == -1 {
						b.cf /= 2
					}
					side = -1
				} else {
					b = mid
					if side == 1 {
						a.cf /= 2
					}
					side = 1
				}
			}
			v := 0.5 * (a.v + b.v)
			if t := c.spinodalT(v, 0.5*(a.t+b.t), 1e-13); !math.IsNaN(t) {
				out = append(out, CriticalPoint{T: t, V: v, P: fl.pressure(&c.ts, t, v, z)})
			}
		}
	}
	return out, nil
}

// pressure returns the cubic's pressure of composition x (full
// length) at t and molar volume v (untranslated).
func (f *Fluid) pressure(ts *tstate, t, v float64, x []float64) float64 {
	f.setT(ts, t)
	n := f.n
	am, bm := 0.0, 0.0
	for i := 0; i < n; i++ {
		if x[i] == 0 {
			continue
		}
		row := ts.aij[i*n : i*n+n]
		s := 0.0
		for j, xj := range x {
			s += row[j] * xj
		}
		am += x[i] * s
		bm += x[i] * f.b[i]
	}
	return R*t/(v-bm) - am/(v*v+f.cubic.u*bm*v+f.cubic.w*bm*bm)
}

// VLCritical returns the vapour–liquid critical point of feed z: of the
// points Criticals finds, the one of largest molar volume (a critical point
// between two dense phases lies at a smaller volume). ok is false when
// Criticals finds none.
//
// The fluid remembers the answers for its last few compositions (a
// depletion, its separator and its saturation point ask for the same feed
// many times over).
func VLCritical(fl *Fluid, z []float64) (cp CriticalPoint, ok bool, err error) {
	if cp, ok, found := fl.crit.get(z); found {
		return cp, ok, nil
	}
	cps, err := Criticals(fl, z)
	if err != nil {
		return CriticalPoint{}, false, err
	}
	if len(cps) > 0 {
		cp, ok = cps[len(cps)-1], true
	}
	fl.crit.put(z, cp, ok)
	return cp, ok, nil
}

// critMemo remembers the vapour–liquid critical points of a fluid's last
// few compositions. It is safe for concurrent use.
type critMemo struct {
	mu      sync.Mutex
	entries [4]struct {
		z  []float64
		cp CriticalPoint
		ok bool
	}
	next int
}

func (m *critMemo) get(z []float64) (CriticalPoint, bool, bool) {
	m.mu.Lock()
	defer m.mu.Unlock()
	for _, e := range m.entries {
		if e.z != nil && sameVector(e.z, z) {
			return e.cp, e.ok, true
		}
	}
	return CriticalPoint{}, false, false
}

func (m *critMemo) put(z []float64, cp CriticalPoint, ok bool) {
	m.mu.Lock()
	defer m.mu.Unlock()
	e := &m.entries[m.next]
	e.z = append(e.z[:0], z...)
	e.cp, e.ok = cp, ok
	m.next = (m.next + 1) % len(m.entries)
}
