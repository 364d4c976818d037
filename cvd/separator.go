package cvd

import (
	"errors"
	"fmt"
	"math"

	"dewcell/eos"
	"dewcell/internal/phys"
)

// Conditions are a temperature and a pressure.
type Conditions struct {
	T float64 // K
	P float64 // Pa
}

// IdealGasVolume is the molar volume of an ideal gas at c, R T/P, m³/mol:
// the standard volume of one mole when c are standard conditions.
func (c Conditions) IdealGasVolume() float64 { return eos.R * c.T / c.P }

// Standard conditions of the trade (package phys).
var (
	// StandardField is 60 °F and 14.696 psia.
	StandardField = Conditions{T: phys.FieldStandardT, P: phys.FieldStandardP}
	// StandardMetric is 15 °C and 101.325 kPa.
	StandardMetric = Conditions{T: phys.MetricStandardT, P: phys.MetricStandardP}
)

// Reference values for surface products (package phys).
const (
	// MolarMassAir is the molar mass of dry air, kg/mol (28.9647 g/mol; gas
	// specific gravity is M/M_air).
	MolarMassAir = phys.MolarMassAir
	// WaterDensity60F is the density of water at 60 °F, kg/m³ (62.366 lb/ft³),
	// the reference of the 60/60 °F specific gravity of oils.
	WaterDensity60F = phys.WaterDensity60F
)

// A Train is a sequence of separator stages; the stock tank at the standard
// conditions follows the last one. Liquid from each stage feeds the next, and
// the gas of every stage, the stock tank's included, is sales gas.
type Train struct {
	Stages   []Conditions
	Standard Conditions // reference of standard volumes; zero means StandardField
	// Tank is where the stock tank, the last stage, operates; zero means
	// the Standard conditions.
	Tank Conditions
}

// StandardConditions are the conditions of the train's standard volumes:
// Standard, or StandardField when that is zero.
func (tr Train) StandardConditions() Conditions {
	if tr.Standard == (Conditions{}) {
		return StandardField
	}
	return tr.Standard
}

func (tr Train) tank() Conditions {
	if tr.Tank == (Conditions{}) {
		return tr.StandardConditions()
	}
	return tr.Tank
}

// StageResult is one stage of a separator calculation. Amounts are per mole of
// well stream fed to the train.
type StageResult struct {
	Conditions
	Feed      float64   // moles entering the stage
	GasMoles  float64   // moles of gas leaving the stage
	GasVolume float64   // standard volume of that gas, m³ (ideal gas at standard conditions)
	Gas       []float64 // gas composition (nil when the stage makes no gas)
	GasM      float64   // gas molar mass, kg/mol (0 when no gas)
	// GasGravity is the specific gravity of the stage's gas, GasM/MolarMassAir
	// (0 when no gas).
	GasGravity float64
	// GOR is the stage's gas over the train's stock-tank oil, standard
	// m³/m³: the stage GOR of a separator test. With no stock-tank oil it is
	// +Inf where the stage makes gas; with no gas it is 0.
	GOR      float64
	Liquid   []float64 // liquid composition passed on (nil when none is left)
	LiqMoles float64   // moles of liquid passed on
}

// SeparatorResult is the surface split of one mole of well stream.
type SeparatorResult struct {
	Stages []StageResult // the separator stages, then the stock tank

	GasMoles   float64   // surface gas moles (all stages): the mole fraction of the feed that ends up as gas
	GasVolume  float64   // surface gas, standard m³
	GasM       float64   // mean molar mass of the surface gas, kg/mol (0 when no gas)
	GasGravity float64   // specific gravity of the surface gas (air = 1)
	Gas        []float64 // composition of the combined surface gas

	OilMoles   float64   // stock-tank oil moles
	OilVolume  float64   // stock-tank oil volume at standard conditions, m³
	OilM       float64   // stock-tank oil molar mass, kg/mol (0 when no oil)
	OilDensity float64   // kg/m³ at standard conditions, volume-shifted when the fluid is
	OilRho60F  float64   // kg/m³ at 60 °F and 14.696 psia, whatever the standard conditions
	OilSG      float64   // 60/60 °F specific gravity: OilRho60F over WaterDensity60F
	API        float64   // API gravity, 141.5/SG − 131.5 (phys.APIGravity)
	Oil        []float64 // stock-tank oil composition

	// GOR is surface gas over stock-tank oil, standard m³/m³; CGR is its
	// inverse. With no oil GOR is +Inf and CGR 0; with no gas GOR is 0 and
	// CGR +Inf.
	GOR, CGR float64
}

// ErrBadTrain reports an invalid separator train.
var ErrBadTrain = errors.New("invalid separator train")

// A Separator flashes well streams through a train, reusing one eos.Flasher.
// Not safe for concurrent use.
type Separator struct {
	fl    *eos.Fluid
	train Train
	f     *eos.Flasher
	res   eos.FlashResult
	feed  []float64
	gas   []float64
	// stageK holds per stage the K-values of its last two-phase flash
	// (nil when it had none); the next Separate starts from them.
	stageK [][]float64
}

// NewSeparator checks the train and returns a Separator for fluid fl.
func NewSeparator(fl *eos.Fluid, train Train, s *eos.Settings) (*Separator, error) {
	for k, st := range append(append([]Conditions(nil), train.Stages...), train.tank(), train.StandardConditions()) {
		if !(st.T > 0 && st.P > 0) || math.IsInf(st.T, 0) || math.IsInf(st.P, 0) {
			return nil, fmt.Errorf("%w: stage %d at %g K and %g Pa", ErrBadTrain, k+1, st.T, st.P)
		}
	}
	return &Separator{
		fl: fl, train: train, f: eos.NewFlasher(fl, s),
		feed: make([]float64, fl.N()), gas: make([]float64, fl.N()),
		stageK: make([][]float64, len(train.Stages)+1),
	}, nil
}

// stageName names stage k (from 0) for messages: "separator stage 2", or
// "the stock tank".
func (s *Separator) stageName(k int) string {
	if k == len(s.train.Stages) {
		return "the stock tank"
	}
	return fmt.Sprintf("separator stage %d", k+1)
}

// keepK keeps the K-values of stage k's flash in s.res for the next
// Separate, or forgets them when the stage was one phase.
func (s *Separator) keepK(k int) {
	if s.res.Phases != 2 {
		s.stageK[k] = nil
		return
	}
	if s.stageK[k] == nil {
		s.stageK[k] = make([]float64, s.fl.N())
	}
	for i := range s.stageK[k] {
		s.stageK[k][i] = s.res.Y[i] / s.res.X[i]
	}
}

// Separate flashes one mole of well stream z through the train: each stage is
// an isothermal flash of the liquid of the stage before at the stage's
// pressure and temperature, the last one the stock tank (Whitson and Brulé
// 2000, ch. 7). Gas volumes are ideal-gas volumes at standard conditions:
// n R T_sc / p_sc, 379.48 scf/lbmol at 60 °F and 14.696 psia; the stock-tank
// oil volume is that of the tank's liquid at standard conditions.
func (s *Separator) Separate(z []float64) (SeparatorResult, error) {
	n := s.fl.N()
	std, tk := s.train.StandardConditions(), s.train.tank()
	stages := append(append([]Conditions(nil), s.train.Stages...), tk)
	var r SeparatorResult
	copy(s.feed, z)
	for i := range s.gas {
		s.gas[i] = 0
	}
	moles := 1.0
	for _, st := range stages {
		sr := StageResult{Conditions: st, Feed: moles}
		if moles == 0 {
			r.Stages = append(r.Stages, sr)
			continue
		}
		// from the K-values this stage had the last time it split in two: a
		// train is run again and again on similar streams
		k := s.stageK[len(r.Stages)]
		var err error
		if k != nil {
			err = s.f.FlashFrom(&s.res, st.T, st.P, s.feed, k)
		} else {
			err = s.f.Flash(&s.res, st.T, st.P, s.feed)
		}
		if err != nil {
			return r, &eos.StateError{What: s.stageName(len(r.Stages)), T: st.T, P: st.P, Err: err}
		}
		s.keepK(len(r.Stages))
		gasFrac := s.res.Beta
		if s.res.Phases == 1 {
			if s.res.Single == eos.Vapour {
				gasFrac = 1
			} else {
				gasFrac = 0
			}
		}
		sr.GasMoles = moles * gasFrac
		sr.LiqMoles = moles - sr.GasMoles
		if sr.GasMoles > 0 {
			sr.Gas = append([]float64(nil), s.res.Y...)
			sr.GasM = s.fl.MolarMass(sr.Gas)
			sr.GasGravity = sr.GasM / MolarMassAir
			sr.GasVolume = sr.GasMoles * eos.R * std.T / std.P
			for i := 0; i < n; i++ {
				s.gas[i] += sr.GasMoles * sr.Gas[i]
			}
		}
		if sr.LiqMoles > 0 {
			sr.Liquid = append([]float64(nil), s.res.X...)
			copy(s.feed, s.res.X)
		}
		moles = sr.LiqMoles
		r.GasMoles += sr.GasMoles
		r.GasVolume += sr.GasVolume
		r.Stages = append(r.Stages, sr)
	}
	if r.GasMoles > 0 {
		r.Gas = make([]float64, n)
		for i := range r.Gas {
			r.Gas[i] = s.gas[i] / r.GasMoles
		}
		r.GasM = s.fl.MolarMass(r.Gas)
		r.GasGravity = r.GasM / MolarMassAir
	}
	tank := r.Stages[len(r.Stages)-1]
	r.OilMoles = tank.LiqMoles
	r.GOR, r.CGR = math.Inf(1), 0
	if r.OilMoles > 0 {
		r.Oil = tank.Liquid
		// the stock-tank liquid is evaluated on its own: it is the liquid of
		// the last flash, at its bubble point in the tank
		pp := s.res.L
		if s.res.Phases != 2 || tk != std {
			pp, _ = s.fl.Props(std.T, std.P, r.Oil)
		}
		r.OilM = pp.M
		r.OilDensity = pp.Rho
		r.OilVolume = r.OilMoles * pp.V
		// Specific and API gravity are defined at 60 °F (and one
		// atmosphere, 14.696 psia) whatever the standard conditions of the
		// volumes: the stock-tank liquid is evaluated there.
		r.OilRho60F = pp.Rho
		if std != StandardField {
			p60, _ := s.fl.Props(StandardField.T, StandardField.P, r.Oil)
			r.OilRho60F = p60.Rho
		}
		r.OilSG = r.OilRho60F / WaterDensity60F
		r.API = phys.APIGravity(r.OilSG)
		r.GOR = r.GasVolume / r.OilVolume
		r.CGR = r.OilVolume / r.GasVolume
		if r.GasVolume == 0 {
			r.CGR = math.Inf(1)
		}
	}
	for k := range r.Stages {
		st := &r.Stages[k]
		switch {
		case !(st.GasMoles > 0):
			st.GOR = 0
		case r.OilMoles > 0:
			st.GOR = st.GasVolume / r.OilVolume
		default:
			st.GOR = math.Inf(1)
		}
	}
	return r, nil
}
