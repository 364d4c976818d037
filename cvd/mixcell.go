package cvd

import (
	"fmt"
	"math"

	"dewcell/eos"
)

// Cell is a compositional cell: moles of fluid at a fixed temperature in a
// pore volume that shrinks linearly with the fall of pressure,
// V(p) = V0 [1 − c (P0 − p)]. It takes injected moles, is flashed at a
// pressure, and gives up the mobile fluid that no longer fits its pore
// volume there. A reservoir model strings cells together (a swept volume as
// cells in series, an unswept one beside it) at one common pressure.
//
// A Cell reuses one flasher and starts each two-phase flash from the
// K-values of its last one. A single phase is tested for stability from the
// Wilson starts; the stability test's trials from nearly pure components,
// which look for a dense liquid–liquid split (eos.Flasher.PureTrials), run
// on the cell's first flash and on every pureEvery-th single-phase flash
// after it, not on the others: a cell's contents change little from one
// flash to the next, and those trials were two-fifths of the time of a
// gas-cycling forecast. It is not safe for concurrent use.
type Cell struct {
	fl        *eos.Fluid
	t, v0, p0 float64
	c         float64 // pore compressibility, 1/Pa
	f         *eos.Flasher
	res       eos.FlashResult
	k         []float64
	hasK      bool
	z         []float64
	singles   int // single-phase flashes so far (pureEvery)
	// The last state the stability test found one phase (stableNear); zs
	// is nil in a cell that tests every flash (the depletion cell of a
	// CVD, cell.go, whose dew point is the laboratory's).
	zs     []float64
	ps     float64
	stable bool
}

// stableNear: a cell's single-phase contents within this relative
// distance, in pressure and in every mole fraction, of the last contents
// the full stability test found stable are taken as one phase without the
// test (common practice, no published source). A reservoir model's
// pressure searches and a forecast's plateau flash each cell at nearly the
// same state many times over (a gas-cycling forecast about six times a
// substep, the states within 1e-4 of each other); a split missed so lies
// within 1e-3 of the edge of stability, where the liquid is a trace, and
// is found as soon as the contents move on.
const stableNear = 1e-3

// pureEvery: a cell's single-phase flashes run the stability test's
// pure-component trials once in this many (common practice, no published
// source: a bound on how long a split those trials alone would find can go
// unseen: about three months of a gas-cycling forecast in monthly steps,
// which flashes each cell about ten times a month).
const pureEvery = 32

// NewCell is a cell of fluid fl at temperature t (K) whose pore volume is v0
// (m³) at pressure p0 (Pa), with pore compressibility c (1/Pa).
func NewCell(fl *eos.Fluid, t, v0, p0, c float64, s *eos.Settings) (*Cell, error) {
	if !(t > 0) || !(v0 > 0) || !(p0 > 0) || c < 0 || math.IsInf(v0, 0) {
		return nil, fmt.Errorf("%w: a cell needs a temperature, a pore volume and a pressure above 0 and a compressibility of 0 or more (got %g K, %g m³, %g Pa, %g 1/Pa)", ErrBadOptions, t, v0, p0, c)
	}
	n := fl.N()
	f := eos.NewFlasher(fl, s)
	f.NameSinglePhases(false) // the cell wants volumes, not names: no critical point for every new composition
	return &Cell{fl: fl, t: t, v0: v0, p0: p0, c: c, f: f, k: make([]float64, n), z: make([]float64, n), zs: make([]float64, n)}, nil
}

// PoreVolume is the cell's pore volume at p, m³.
func (c *Cell) PoreVolume(p float64) float64 { return c.v0 * (1 - c.c*(c.p0-p)) }

// CellFlash is the cell's contents flashed at a pressure.
type CellFlash struct {
	P      float64
	Total  float64 // moles
	Volume float64 // of the fluid, m³
	Phases int
	// Beta is the vapour mole fraction; X and Y the liquid and vapour
	// compositions (both the contents in one phase); VL and VV the phases'
	// molar volumes, m³/mol (VV the fluid's in one phase).
	Beta   float64
	X, Y   []float64
	VL, VV float64
	// Dropout is the liquid volume over the pore volume.
	Dropout float64
}

// flashInto flashes the moles n at p into c.res and returns their total
// and volume; the error is the flasher's. A two-phase flash starts from the
// K-values of the last one: the steps of a depletion, and the iterations
// of a step, flash nearly the same contents at nearly the same pressure.
// The depletion cell (cell.go) and Flash share it.
func (c *Cell) flashInto(p float64, n []float64) (total, vol float64, err error) {
	for _, v := range n {
		total += v
	}
	for i, v := range n {
		c.z[i] = v / total
	}
	pure := c.singles%pureEvery == 0
	c.f.PureTrials(pure) // also for FlashFrom's fall-back on a full flash
	switch {
	case c.hasK:
		err = c.f.FlashFrom(&c.res, c.t, p, c.z, c.k)
	case !pure && c.nearStable(p):
		err = c.f.OnePhase(&c.res, c.t, p, c.z)
	default:
		err = c.f.Flash(&c.res, c.t, p, c.z)
		if err == nil && c.res.Phases == 1 {
			c.stable, c.ps = true, p
			copy(c.zs, c.z)
		}
	}
	if err != nil {
		return 0, 0, err
	}
	if c.res.Phases == 1 {
		c.singles++
	} else {
		c.stable = false
	}
	c.hasK = c.res.Phases == 2
	if c.hasK {
		for i := range c.k {
			c.k[i] = c.res.Y[i] / c.res.X[i]
			if !(c.k[i] > 0) || math.IsInf(c.k[i], 0) {
				c.hasK = false
			}
		}
	}
	if c.res.Phases == 2 {
		vol = total * (c.res.Beta*c.res.V.V + (1-c.res.Beta)*c.res.L.V)
	} else {
		vol = total * c.res.V.V // one phase: L and V hold its properties alike
	}
	return total, vol, nil
}

// nearStable reports whether the contents c.z at p are within stableNear
// of the last ones the stability test found one phase.
func (c *Cell) nearStable(p float64) bool {
	if !c.stable || c.zs == nil || math.Abs(p-c.ps) > stableNear*c.ps {
		return false
	}
	for i, v := range c.z {
		if math.Abs(v-c.zs[i]) > stableNear*c.zs[i] {
			return false
		}
	}
	return true
}

// Flash flashes the moles n at p.
func (c *Cell) Flash(p float64, n []float64) (CellFlash, error) {
	total := 0.0
	for _, v := range n {
		if v < 0 || math.IsNaN(v) {
			return CellFlash{}, fmt.Errorf("%w: a cell holds %g mol of a component", ErrBadOptions, v)
		}
		total += v
	}
	if !(total > 0) {
		return CellFlash{}, fmt.Errorf("%w: the cell is empty", ErrBadOptions)
	}
	total, vol, err := c.flashInto(p, n)
	if err != nil {
		return CellFlash{}, &eos.StateError{What: "flash of a reservoir cell", T: c.t, P: p, Err: err}
	}
	out := CellFlash{P: p, Total: total, Phases: c.res.Phases, Volume: vol}
	if c.res.Phases == 2 {
		out.Beta, out.VL, out.VV = c.res.Beta, c.res.L.V, c.res.V.V
		out.X, out.Y = append([]float64(nil), c.res.X...), append([]float64(nil), c.res.Y...)
		out.Dropout = total * (1 - out.Beta) * out.VL / c.PoreVolume(p)
	} else {
		out.Beta, out.VV = 1, c.res.V.V // one phase: its properties, named or not
		out.Y = append([]float64(nil), c.z...)
		out.X = out.Y
	}
	return out, nil
}

// Excess is the fluid that no longer fits the pore volume once the moles n
// are at p: the excess volume taken as the mobile phase (the gas; the one
// phase when single phase), moles by component. The liquid stays: a
// condensate below its critical saturation does not flow. It is zero when
// the fluid fits.
func (c *Cell) Excess(p float64, n []float64) ([]float64, CellFlash, error) {
	return c.ExcessIn(p, n, c.PoreVolume(p))
}

// ExcessIn is Excess in a pore volume of pv m³ at p instead of the cell's
// own: a cell whose volume changes otherwise than with pressure (the part
// of a swept volume that water has not reached).
func (c *Cell) ExcessIn(p float64, n []float64, pv float64) ([]float64, CellFlash, error) {
	fs, err := c.Flash(p, n)
	if err != nil {
		return nil, fs, err
	}
	out := make([]float64, len(n))
	ex := fs.Volume - pv
	if !(ex > 0) {
		return out, fs, nil
	}
	moles := ex / fs.VV
	if gas := fs.Total * fs.Beta; moles > gas {
		moles = gas // all the gas: a liquid-filled cell gives no more
	}
	for i := range out {
		out[i] = moles * fs.Y[i]
		if out[i] > n[i] {
			out[i] = n[i]
		}
	}
	return out, fs, nil
}
