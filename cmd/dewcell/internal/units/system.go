package units

import (
	"fmt"

	"dewcell/internal/phys"
)

// A System is a set of output units, one per kind of quantity.
type System int

const (
	// Field: degF, psia, ft, acre, bbl, 1/psi, lb/ft3, g/mol, ft3/lbmol;
	// MMscf, STB, scf/STB, Mscf/acre-ft and STB/acre-ft; bulk rock in acre-ft.
	Field System = iota
	// Metric: degC, bara, m, ha, m3, 1/bar, kg/m3, g/mol, m3/kmol;
	// 1e6 sm3, sm3, sm3/sm3 and sm3/ha-m; bulk rock in ha-m.
	Metric
)

// ParseSystem reads the name of a unit system, "field" or "metric".
func ParseSystem(s string) (System, error) {
	switch s {
	case "field":
		return Field, nil
	case "metric":
		return Metric, nil
	}
	return 0, fmt.Errorf("unknown unit system %q, want field or metric", s)
}

func (s System) String() string {
	if s == Metric {
		return "metric"
	}
	return "field"
}

var systems = [2]map[Kind]Unit{
	Field: {
		Temperature:     DegF,
		Pressure:        Psia,
		Length:          Foot,
		Area:            Acre,
		Volume:          Barrel,
		Compressibility: PerPsi,
		Density:         LbPerFt3,
		MolarMass:       GPerMol,
		MolarVolume:     Ft3PerLb,
		GasVolume:       MMscf,
		LiquidVolume:    STB,
		GasOilRatio:     ScfPerSTB,
		GasPerBulk:      MscfPerAcreFt,
		LiquidPerBulk:   STBPerAcreFt,
		GasRate:         MMscfPerDay,
		LiquidRate:      STBPerDay,
		Energy:          MMBtu,
		HeatingValue:    BtuPerScf,
	},
	Metric: {
		Temperature:     DegC,
		Pressure:        Bara,
		Length:          Metre,
		Area:            Hectare,
		Volume:          CuMetre,
		Compressibility: PerBar,
		Density:         KgPerM3,
		MolarMass:       GPerMol,
		MolarVolume:     M3PerKmol,
		GasVolume:       MillionSm3,
		LiquidVolume:    LiquidSm3,
		GasOilRatio:     Sm3PerSm3,
		GasPerBulk:      GasSm3PerHaM,
		LiquidPerBulk:   LiquidSm3PerHaM,
		GasRate:         MillionSm3PerDay,
		LiquidRate:      Sm3PerDay,
		Energy:          Gigajoule,
		HeatingValue:    MegajoulePerSm3,
	},
}

// Unit returns the output unit of kind k in s; a dimensionless number for
// Dimensionless.
func (s System) Unit(k Kind) Unit {
	if s != Metric {
		s = Field
	}
	if u, ok := systems[s][k]; ok {
		return u
	}
	return Fraction
}

// Bulk returns the unit of bulk rock volume in s: acre-ft (field) or
// hectare-metres (metric), the volumes that in-place figures are quoted per.
func (s System) Bulk() Unit {
	if s == Metric {
		return HectareMetre
	}
	return AcreFoot
}

// Conditions are a temperature and a pressure, in K and Pa.
type Conditions struct {
	T, P float64
}

// Standard returns the standard conditions of s: 60 °F and 14.696 psia for
// field units, 15 °C and 101.325 kPa for metric units (package phys).
func (s System) Standard() Conditions {
	if s == Metric {
		return Conditions{T: phys.MetricStandardT, P: phys.MetricStandardP}
	}
	return Conditions{T: phys.FieldStandardT, P: phys.FieldStandardP}
}
