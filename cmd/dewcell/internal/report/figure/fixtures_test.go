package figure

import (
	"math"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/units"
)

// The figures below have the shapes of the ones the commands draw, with
// invented numbers of a plausible gas condensate (not computed): they are
// for looking at and for the checks of what is drawn, not of values.

var pressure = report.Axis{Label: "Pressure", Unit: units.Psia, Reverse: true}

func envelopeFigure() *report.Figure {
	return &report.Figure{
		Name:    "phase-envelope",
		Title:   "Phase envelope",
		Caption: "Saturation pressures of the reservoir fluid.",
		X:       report.Axis{Label: "Temperature", Unit: units.DegF},
		Y:       report.Axis{Label: "Pressure", Unit: units.Psia},
		Series: []report.Series{
			{Label: "Dew points", Style: report.Line,
				X: []float64{150, 170, 190, 220, 250, 280, 310, 340, 360, 375, 380, 378, 370, 355, 340},
				Y: []float64{4300, 4520, 4600, 4550, 4400, 4150, 3750, 3150, 2550, 1900, 1400, 1000, 600, 300, 100}},
			{Label: "Bubble points", Style: report.Dashed,
				X: []float64{-60, -20, 20, 60, 100, 130, 150},
				Y: []float64{900, 1500, 2150, 2800, 3450, 3950, 4300}},
		},
		Marks: []report.Mark{
			{Label: "Critical point", X: 150, Y: 4300},
			{Label: "Cricondenbar", X: 190, Y: 4600},
			{Label: "Cricondentherm", X: 380, Y: 1400},
			{Label: "Initial state", X: 250, Y: 5200},
			{Label: "Dew point", X: 250, Y: 4400},
		},
		Lines: []report.RefLine{{Label: "Reservoir temperature", Value: 250, Vertical: true}},
	}
}

// depletion pressures, psia, from the dew point down.
var depletion = []float64{4400, 4000, 3500, 3000, 2500, 2000, 1500, 1000, 500}

func dropoutFigure() *report.Figure {
	return &report.Figure{
		Name:  "cvd-liquid-dropout",
		Title: "Constant-volume depletion: liquid dropout",
		X:     pressure,
		Y:     report.Axis{Label: "Liquid dropout", Unit: units.Percent},
		Series: []report.Series{
			{Label: "Model", Style: report.Line, X: depletion, Y: []float64{0, 4.1, 8.3, 10.6, 11.5, 11.6, 11.1, 10.2, 9.0}},
			{Label: "Laboratory", Style: report.Points, X: depletion, Y: []float64{0, 3.6, 7.9, 10.9, 11.8, 11.2, 10.8, 9.6, 8.1}},
		},
	}
}

func cceFigure() *report.Figure {
	p := []float64{6000, 5500, 5000, 4400, 4000, 3500, 3000, 2500, 2000, 1500, 1000}
	return &report.Figure{
		Name:  "cce-relative-volume",
		Title: "Constant-composition expansion",
		X:     pressure,
		Y:     report.Axis{Label: "Relative volume V/Vsat"},
		Series: []report.Series{
			{Label: "Model", Style: report.LinePoints, X: p, Y: []float64{0.928, 0.948, 0.970, 1, 1.057, 1.146, 1.268, 1.441, 1.703, 2.139, 3.013}},
		},
		Marks: []report.Mark{{Label: "Dew point", X: 4400, Y: 1}},
	}
}

func compositionFigure() *report.Figure {
	names := []string{"N2", "CO2", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "C6", "C7+"}
	z := []float64{0.005, 0.02, 0.72, 0.085, 0.045, 0.009, 0.016, 0.007, 0.008, 0.012, 0.073}
	f := &report.Figure{
		Name:  "produced-gas-composition",
		Title: "Composition of the produced gas",
		X:     pressure,
		Y:     report.Axis{Label: "Mole fraction", Log: true},
	}
	for i, n := range names {
		y := make([]float64, len(depletion))
		for j, p := range depletion {
			// Heavier components drop out of the gas as pressure falls
			// below the dew point; the lightest gain.
			drop := (4400 - p) / 4400
			w := float64(i-2) / 8
			y[j] = z[i] * math.Exp(-3*w*drop*(1-0.6*drop))
		}
		f.Series = append(f.Series, report.Series{Label: n, Style: report.LinePoints, X: depletion, Y: y})
	}
	return f
}

func recoveryFigure() *report.Figure {
	return &report.Figure{
		Name:  "recovery",
		Title: "Recovery by depletion",
		X:     pressure,
		Y:     report.Axis{Label: "Recovery", Unit: units.Percent, Min: 0, Max: 100},
		Series: []report.Series{
			{Label: "Wet gas", Style: report.Line, X: depletion, Y: []float64{0, 8.9, 20.1, 31.2, 42.3, 53.6, 64.9, 76.0, 87.1}},
			{Label: "Sales gas", Style: report.Line, X: depletion, Y: []float64{0, 9.1, 20.8, 32.4, 44.0, 55.7, 67.2, 78.4, 89.4}},
			{Label: "Condensate", Style: report.Line, X: depletion, Y: []float64{0, 5.9, 11.8, 16.5, 20.4, 23.8, 26.9, 29.8, 32.6}},
		},
	}
}

func saturationFigure() *report.Figure {
	return &report.Figure{
		Name:  "condensate-saturation",
		Title: "Condensate saturation in the reservoir",
		X:     pressure,
		Y:     report.Axis{Label: "Condensate saturation", Unit: units.Percent},
		Series: []report.Series{
			{Label: "Condensate saturation", Style: report.Line, X: depletion, Y: []float64{0, 3.3, 6.7, 8.6, 9.3, 9.4, 9.0, 8.3, 7.3}},
		},
		Lines: []report.RefLine{{Label: "Critical condensate saturation", Value: 10}},
	}
}

func pzFigure() *report.Figure {
	gp := []float64{0, 12.4, 25.1, 39.8, 52.0, 66.3, 80.9}
	pz := []float64{4850, 4490, 4160, 3740, 3420, 3010, 2620}
	return &report.Figure{
		Name:  "p-over-z",
		Title: "p/Z against cumulative wet gas",
		X:     report.Axis{Label: "Cumulative wet gas", Unit: units.Bscf},
		Y:     report.Axis{Label: "p/Z", Unit: units.Psia},
		Series: []report.Series{
			{Label: "History", Style: report.Points, X: gp, Y: pz},
			{Label: "Straight-line fit", Style: report.Dashed, X: []float64{0, 175}, Y: []float64{4851, 0}},
		},
		Marks: []report.Mark{{Label: "Gas initially in place", X: 175, Y: 0}},
	}
}

func allFigures() []*report.Figure {
	return []*report.Figure{envelopeFigure(), dropoutFigure(), cceFigure(), compositionFigure(),
		recoveryFigure(), saturationFigure(), pzFigure()}
}
