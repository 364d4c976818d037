package main

import (
	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
)

func fluidCommand() *cli.Command {
	return studyCommand("fluid",
		"the characterized fluid: components, mole %, critical properties, volume shifts, interaction coefficients",
		nil, func(_ *cli.Context, o *options, st *study.Study) error {
			return o.emit(fluidReport(st, o.sys))
		})
}

// fluidReport tabulates the components of the study's fluid and their
// interaction coefficients. The column estimated says how the properties the
// study does not give were obtained, such as a user component's critical
// volume.
func fluidReport(st *study.Study, sys units.System) *Report {
	fl := st.Fluid
	tU, pU, vU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.MolarVolume)
	t := Table{
		Name:  "components",
		Title: "components",
		Columns: []Column{
			{Name: "component"},
			{Name: "mole", Label: "Mole percent", Unit: units.Percent, Format: report.MolePercent},
			{Name: "molar_mass", Unit: units.GPerMol},
			{Name: "critical_temperature", Unit: tU},
			{Name: "critical_pressure", Unit: pU},
			{Name: "acentric_factor", Format: report.Fixed(4)},
			{Name: "volume_shift", Format: report.Fixed(4)},
			{Name: "critical_volume", Unit: vU},
			{Name: "estimated", Label: "How estimated"},
		},
	}
	n := fl.N()
	m := &Matrix{Name: "kij", Title: "binary interaction coefficients kij", Format: report.Fixed(4), Labels: make([]string, n), Values: make([][]float64, n)}
	for i, c := range fl.Components() {
		vc, _ := fl.CriticalVolume(i) // the estimate, when the study gives none
		est := ""
		if i < len(st.Estimates) {
			est = st.Estimates[i]
		}
		t.Rows = append(t.Rows, []any{
			c.Name,
			units.Percent.FromSI(st.Z[i]),
			units.GPerMol.FromSI(c.M),
			tU.FromSI(c.Tc),
			pU.FromSI(c.Pc),
			c.Omega,
			c.Shift,
			vU.FromSI(vc),
			est,
		})
		m.Labels[i] = c.Name
		m.Values[i] = make([]float64, n)
		for j := range n {
			m.Values[i][j] = fl.Kij(i, j)
		}
	}
	opt := fl.Options()
	return &Report{
		Name:    "fluid",
		Section: "Fluid model",
		Title:   fluidTitle(st),
		Fields: []Field{
			{Column: Column{Name: "equation"}, Value: fl.Cubic().Name()},
			{Column: Column{Name: "volume_shift_applied"}, Value: opt.VolumeShift},
		},
		Tables: []Table{t},
		Matrix: m,
	}
}

func fluidTitle(st *study.Study) string {
	if st.Title == "" {
		return "fluid of " + st.File
	}
	return "fluid: " + st.Title
}
