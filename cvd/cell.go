package cvd

import (
	"errors"
	"fmt"
	"math"

	"dewcell/eos"
)

// This file holds the depletion cell: a fixed amount of fluid at the
// reservoir temperature in a volume that may shrink with pressure, which
// gives up, at each lower pressure, the fluid that no longer fits. Two steps
// take it from one pressure to the next: the laboratory's removal (step) and
// the step of the continuous process, of second or third order (advance).

// FlowState is the state of a two-phase cell that decides how much of the
// liquid flows with the gas.
type FlowState struct {
	P float64 // Pa
	// LiquidFraction is the liquid volume over the cell volume (the liquid
	// dropout; times 1 − Sw it is the condensate saturation of a reservoir).
	LiquidFraction float64
	// GasViscosity and LiquidViscosity are the Lohrenz–Bray–Clark
	// viscosities of the equilibrium phases, Pa·s.
	GasViscosity, LiquidViscosity float64
}

// ErrStepNoConvergence: a step of the continuous depletion
// did not settle on a produced amount and stream; Deplete retries it with a
// smaller step and reports it only if that fails too.
var ErrStepNoConvergence = errors.New("depletion step did not converge")

// cellState is the cell at one pressure after the fluid that no longer fits
// has been produced: per mole of fluid initially in the cell.
type cellState struct {
	p, vCell float64
	n        []float64 // moles of each component in the cell
	total    float64
	phases   int
	dew      bool // the saturation point itself: feed with an incipient phase of zero amount
	beta     float64
	x, y     []float64 // liquid and vapour compositions; x nil and y the cell composition in one phase
	liq, gas eos.PhaseProps
	dropout  float64 // liquid volume over cell volume
	muG, muL float64 // Pa·s (muL zero without liquid)
	fL       float64 // liquid share of the produced reservoir volume
	phi      float64 // liquid share of the produced moles
	s        []float64
}

// cell is the workspace of a depletion: the fluid, the compositional cell
// that flashes its contents (Cell, shared with the reservoir models of
// pressure maintenance) and scratch.
type cell struct {
	fl      *eos.Fluid
	t       float64
	o       *DepletionOptions
	base    *Cell
	res     *eos.FlashResult // the base's last flash
	v0      float64          // cell volume at the start pressure, m³ per mole of initial fluid
	start   float64          // Pa
	zc      []float64        // the base's composition of the last flash
	trial   []float64
	sEnd    []float64
	avg     []float64
	guess   []float64
	fPrev   []float64 // the iteration before in advance: s(b) − s_end
	gPrev   []float64 // and s(b)
	flashes int       // flashes made, for the benchmarks and tests
	// toOil is the fraction of each component of the feed that the
	// separator train sends to the stock tank, and oil0 and gas0 the moles
	// of stock-tank oil and surface gas per mole of feed; nil without a
	// train. They weigh the error estimates of the adaptive integration.
	toOil      []float64
	oil0, gas0 float64
}

func newCell(fl *eos.Fluid, t float64, o *DepletionOptions) *cell {
	n := fl.N()
	base := &Cell{fl: fl, t: t, f: eos.NewFlasher(fl, o.Settings), k: make([]float64, n), z: make([]float64, n)}
	return &cell{fl: fl, t: t, o: o, base: base, res: &base.res,
		zc: base.z, trial: make([]float64, n), sEnd: make([]float64, n), avg: make([]float64, n), guess: make([]float64, n), fPrev: make([]float64, n), gPrev: make([]float64, n)}
}

// volume is the cell volume at p: V_start [1 − c (p_start − p)].
func (c *cell) volume(p float64) (float64, error) {
	v := c.v0 * (1 - c.o.PoreCompressibility*(c.start-p))
	if !(v > 0) {
		return 0, &eos.StateError{What: "the depletion", T: c.t, P: p, Err: fmt.Errorf("%w: pore compressibility %g 1/Pa shrinks the cell to nothing", ErrBadOptions, c.o.PoreCompressibility)}
	}
	return v, nil
}

// flash flashes the moles n at p into c.res and returns their total and
// volume.
func (c *cell) flash(p float64, n []float64) (total, vol float64, err error) {
	c.flashes++
	if total, vol, err = c.base.flashInto(p, n); err != nil {
		return 0, 0, &eos.StateError{What: "flash of the cell", T: c.t, P: p, Err: err}
	}
	return total, vol, nil
}

// single is the props of the one phase of c.res.
func (c *cell) single() eos.PhaseProps {
	if c.res.Single == eos.Liquid {
		return c.res.L
	}
	return c.res.V
}

// liquidFlow evaluates o.LiquidFlow, checked.
func (c *cell) liquidFlow(fs FlowState) (float64, error) {
	if c.o.LiquidFlow == nil || !(fs.LiquidFraction > 0) {
		return 0, nil
	}
	f := c.o.LiquidFlow(fs)
	if !(f >= 0 && f <= 1) {
		return 0, &eos.StateError{What: "the liquid flow", T: c.t, P: fs.P, Err: fmt.Errorf("%w: the liquid flow gives %g at liquid fraction %g, want 0 to 1", ErrBadOptions, f, fs.LiquidFraction)}
	}
	return f, nil
}

// setStream sets b's produced stream from its phases: in one phase the cell
// fluid itself; in two the gas and the share fL of the produced reservoir
// volume as liquid.
func (c *cell) setStream(b *cellState) {
	if b.s == nil {
		b.s = make([]float64, len(b.n))
	}
	if b.phases != 2 || b.fL == 0 {
		b.phi = 0
		copy(b.s, b.y)
		return
	}
	l, g := b.fL/b.liq.V, (1-b.fL)/b.gas.V
	b.phi = l / (l + g)
	for i := range b.s {
		b.s[i] = b.phi*b.x[i] + (1-b.phi)*b.y[i]
	}
}

// fill sets b from the flash in c.res of the cell contents (total moles
// filling vol) at p: phases, dropout (liquid volume over vol, which is the
// cell volume once the step has converged), viscosities and the stream.
func (c *cell) fill(b *cellState, p, total, vol float64) error {
	n := len(c.zc)
	b.p, b.total, b.phases, b.dew = p, total, c.res.Phases, false
	if b.y == nil {
		b.y = make([]float64, n)
	}
	b.fL, b.muL, b.dropout = 0, 0, 0
	if c.res.Phases == 2 {
		if b.x == nil {
			b.x = make([]float64, n)
		}
		b.beta = c.res.Beta
		copy(b.x, c.res.X)
		copy(b.y, c.res.Y)
		b.liq, b.gas = c.res.L, c.res.V
		b.dropout = total * (1 - b.beta) * b.liq.V / vol
		b.muG = c.fl.ViscosityLBC(c.t, b.y, b.gas.V)
		if c.o.LiquidFlow != nil {
			b.muL = c.fl.ViscosityLBC(c.t, b.x, b.liq.V)
			f, err := c.liquidFlow(FlowState{P: p, LiquidFraction: b.dropout, GasViscosity: b.muG, LiquidViscosity: b.muL})
			if err != nil {
				return err
			}
			b.fL = f
		}
	} else {
		b.x = nil
		b.beta = 1
		copy(b.y, c.zc)
		b.gas, b.liq = c.single(), eos.PhaseProps{}
		b.muG = c.fl.ViscosityLBC(c.t, b.y, b.gas.V)
	}
	c.setStream(b)
	return nil
}

// dewState is the cell at the saturation point sat holding total moles of
// feed z: one phase with an incipient phase of zero amount; it produces the
// feed.
func (c *cell) dewState(sat eos.Saturation, z []float64, total float64) (*cellState, error) {
	v, err := c.volume(sat.P)
	if err != nil {
		return nil, err
	}
	b := &cellState{p: sat.P, vCell: v, total: total, phases: 2, dew: true, beta: 1,
		n: make([]float64, len(z)), x: append([]float64(nil), sat.Incipient...), y: append([]float64(nil), z...),
		liq: sat.Inc, gas: sat.Feed}
	for i, zi := range z {
		b.n[i] = total * zi
	}
	b.muG = c.fl.ViscosityLBC(c.t, z, sat.Feed.V)
	if c.o.LiquidFlow != nil {
		b.muL = c.fl.ViscosityLBC(c.t, b.x, sat.Inc.V)
	}
	c.setStream(b)
	return b, nil
}

// step is the laboratory's removal from a at the lower pressure p: the cell
// contents are flashed at p and the fluid that no longer fits the cell
// volume is produced. In one phase it is the fluid itself. In two it is gas
// and, with o.LiquidFlow, liquid, in the proportion that LiquidFlow gives for
// the cell after the removal (an implicit step, solved by bisection, so
// that no step takes the liquid past the point where it stops flowing). The
// produced stream is that of the end state: a first-order step of the
// continuous process. It returns the end state, the moles produced and
// their composition (b.s).
func (c *cell) step(a *cellState, p float64) (*cellState, float64, error) {
	vCell, err := c.volume(p)
	if err != nil {
		return nil, 0, err
	}
	total, vol, err := c.flash(p, a.n)
	if err != nil {
		return nil, 0, err
	}
	b := &cellState{vCell: vCell, n: make([]float64, len(a.n))}
	if err := c.fill(b, p, total, vol); err != nil {
		return nil, 0, err
	}
	excess := vol - vCell
	if c.res.Phases != 2 {
		removed := total - vCell/b.gas.V
		if removed < 0 {
			return nil, 0, &eos.StateError{What: "the depletion", T: c.t, P: p, Err: fmt.Errorf("%w: the single-phase cell contents shrink below the cell volume", ErrNotDew)}
		}
		for i := range b.n {
			b.n[i] = (total - removed) * c.zc[i]
		}
		b.total = total - removed
		return b, removed, nil
	}
	if excess < 0 {
		return nil, 0, &eos.StateError{What: "the depletion", T: c.t, P: p, Err: fmt.Errorf("%w: the cell contents fill %.6g of the cell volume; no gas can be removed", ErrNotDew, vol/vCell)}
	}
	nV, nL := total*b.beta, total*(1-b.beta)
	vL, vV := b.liq.V, b.gas.V
	f := 0.0
	if c.o.LiquidFlow != nil {
		fs := FlowState{P: p, GasViscosity: b.muG, LiquidViscosity: b.muL}
		// g(f) = f − F(S(f)) rises with f, from ≤ 0 at 0 to ≥ 0 at 1
		sAfter := func(f float64) float64 { return math.Max(0, (nL*vL-f*excess)/vCell) }
		lo, hi := 0.0, 1.0
		fs.LiquidFraction = sAfter(0)
		if g0, err := c.liquidFlow(fs); err != nil {
			return nil, 0, err
		} else if g0 > 0 {
			for range 60 {
				mid := 0.5 * (lo + hi)
				fs.LiquidFraction = sAfter(mid)
				fm, err := c.liquidFlow(fs)
				if err != nil {
					return nil, 0, err
				}
				if mid > fm {
					hi = mid
				} else {
					lo = mid
				}
			}
			f = 0.5 * (lo + hi)
		}
	}
	outL, outV := f*excess/vL, (1-f)*excess/vV
	if outV > nV || outL > nL {
		return nil, 0, &eos.StateError{What: "the depletion", T: c.t, P: p, Err: fmt.Errorf("%w: removing the excess volume would take more of a phase than the cell holds", ErrNotDew)}
	}
	nL, nV = nL-outL, nV-outV
	for i := range b.n {
		b.n[i] = nL*b.x[i] + nV*b.y[i]
	}
	b.total = nL + nV
	b.beta = nV / b.total
	b.dropout = nL * vL / vCell
	b.fL = f
	c.setStream(b)
	return b, outL + outV, nil
}

// past is a state before the start of a step, for the third-order step:
// the stream s produced there and h1, the moles produced between it and the
// step's start.
type past struct {
	s  []float64
	h1 float64
}

// advance is the step of the continuous depletion from a to the lower
// pressure p. Over the step the produced stream moves from s(a) to s(b), b
// the end state; the step produces dN moles whose composition is the mean
// of the stream over the step, dN such that what stays fills the cell at p.
// Without pr the mean is (s(a) + s(b))/2, the trapezoidal rule in the
// cumulative moles produced (second order); with pr it is the mean of the
// quadratic through pr, a and b, the variable-step Adams–Moulton rule of
// third order:
//
//	m = (s_a + s_b)/2 − h/(6(h + h₁)) [(s_b − s_a) − (h/h₁)(s_a − s_pr)],
//
// h = dN. It starts from the guesses sGuess of s(b) and dnGuess of dN (the
// laboratory's step, or the step before extrapolated) and alternates a flash
// of the trial contents with a correction of dN by the volume left over and
// of s(b) by the new state. It returns the end state, dN and the mean stream
// (in c.avg, overwritten by the next call).
func (c *cell) advance(a *cellState, pr *past, sGuess []float64, dnGuess, p float64) (*cellState, float64, []float64, error) {
	const maxIter = 12
	// The step has settled when the volume left over is below volTol of the
	// cell and the end stream moved by less than sTol in mole fraction. The
	// iteration contracts by a factor of 1e-3 to 0.1 a flash, so the last
	// correction of dN, made without a flash, leaves the contents filling
	// the cell to about 1e-7 and the mean stream within about 1e-7: an error
	// that the next step's volume balance takes back rather than carries on,
	// and far below what a step may make (tol/minSteps of the moles).
	const volTol, sTol = 1e-6, 1e-6
	vCell, err := c.volume(p)
	if err != nil {
		return nil, 0, nil, err
	}
	copy(c.sEnd, sGuess)
	dN := dnGuess
	b := &cellState{vCell: vCell, n: make([]float64, len(a.n))}
	var dnPrev, rPrev float64
	for k := range maxIter {
		c.mean(a, pr, dN)
		for i, m := range c.avg {
			c.trial[i] = a.n[i] - dN*m
			if c.trial[i] < 0 {
				return nil, 0, nil, &eos.StateError{What: "the depletion step", T: c.t, P: p, Err: fmt.Errorf("%w: the step would produce more %s than the cell holds", ErrStepNoConvergence, c.fl.Component(i).Name)}
			}
		}
		total, vol, err := c.flash(p, c.trial)
		if err != nil {
			return nil, 0, nil, err
		}
		if err := c.fill(b, p, total, vol); err != nil {
			return nil, 0, nil, err
		}
		r := vol - b.vCell
		// next end stream: the new state's, with a secant (Anderson)
		// acceleration of the fixed point from the iteration before
		ds, num, den := 0.0, 0.0, 0.0
		for i, v := range b.s {
			f := v - c.sEnd[i]
			ds = math.Max(ds, math.Abs(f))
			if k > 0 {
				df := f - c.fPrev[i]
				num += f * df
				den += df * df
			}
			c.fPrev[i] = f
		}
		theta := 0.0
		if k > 0 && den > 0 {
			theta = num / den
		}
		for i, v := range b.s {
			x := v
			if theta != 0 {
				x -= theta * (v - c.gPrev[i])
			}
			c.gPrev[i] = v
			c.sEnd[i] = x
		}
		// the volume one mole of the mean stream takes out, were it a mixture
		// of the equilibrium phases at p
		vRem := b.gas.V
		if b.phases == 2 {
			phi := 0.5 * (a.phi + b.phi)
			vRem = phi*b.liq.V + (1-phi)*b.gas.V
		}
		// secant on the volume left over once there are two tries, when it
		// agrees in sign and roughly in size with vRem
		step := r / vRem
		if k > 0 && dN != dnPrev {
			if slope := (r - rPrev) / (dN - dnPrev); slope < 0 && -slope > vRem/3 && -slope < 3*vRem {
				step = -r / slope
			}
		}
		dnPrev, rPrev = dN, r
		dN += step
		if math.Abs(r) <= volTol*b.vCell && ds <= sTol {
			// the last correction: the mean with the new s(b), the moles
			// left, and what they fill
			c.mean(a, pr, dN)
			for i := range b.n {
				b.n[i] = a.n[i] - dN*c.avg[i]
			}
			b.total = 0
			for _, v := range b.n {
				b.total += v
			}
			return b, dN, c.avg, nil
		}
	}
	return nil, 0, nil, &eos.StateError{What: "the depletion step", T: c.t, P: p, Err: fmt.Errorf("%w: it did not settle in %d flashes", ErrStepNoConvergence, maxIter)}
}

// mean sets c.avg to the mean stream of a step of dN moles from a, its end
// stream c.sEnd (see advance).
func (c *cell) mean(a *cellState, pr *past, dN float64) {
	w := 0.0
	if pr != nil {
		w = dN / (6 * (dN + pr.h1))
	}
	for i := range c.avg {
		m := 0.5 * (a.s[i] + c.sEnd[i])
		if pr != nil {
			m -= w * ((c.sEnd[i] - a.s[i]) - dN/pr.h1*(a.s[i]-pr.s[i]))
		}
		c.avg[i] = m
	}
}
