package figure

import (
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
)

// linearTicks puts labelled ticks at multiples of 1, 2 or 5 times a power
// of ten, the closest spacing that keeps the labels apart on an axis of
// the given length, and unlabelled ticks between them.
type linearTicks struct {
	length     vg.Length // approximate length of the axis
	horizontal bool      // labels side by side (else one above the other)
	style      text.Style
}

// maxTicks bounds the number of ticks of an axis, whatever its range.
const maxTicks = 200

func (t linearTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo < hi) || !isFinite(lo) || !isFinite(hi) {
		return nil
	}
	span := hi - lo
	for _, step := range niceSteps(span) {
		ticks, ok := t.try(lo, hi, step)
		if ok {
			return ticks
		}
	}
	return nil
}

// niceSteps are the candidate spacings of labelled ticks for a span, from
// about a twentieth of it to the whole of it.
func niceSteps(span float64) []float64 {
	e := int(math.Floor(math.Log10(span / 20)))
	var steps []float64
	for k := e; k <= e+2; k++ {
		for _, m := range []float64{1, 2, 5} {
			steps = append(steps, m*math.Pow(10, float64(k)))
		}
	}
	return append(steps, math.Pow(10, float64(e+3)))
}

// try places labelled ticks step apart; ok is false when their labels
// would run into each other.
func (t linearTicks) try(lo, hi, step float64) (ticks []plot.Tick, ok bool) {
	first, last := math.Ceil(lo/step-1e-9), math.Floor(hi/step+1e-9)
	n := last - first + 1
	if n > 12 || n > maxTicks {
		return nil, false
	}
	decimals := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	sci := math.Max(math.Abs(lo), math.Abs(hi)) >= 1e7 || step < 1e-5
	var widest, tallest vg.Length
	for i := first; i <= last; i++ {
		v := i * step
		lbl := tickLabel(v, step, decimals, sci)
		ticks = append(ticks, plot.Tick{Value: v, Label: lbl})
		widest = max(widest, t.style.Width(lbl))
		tallest = max(tallest, t.style.Height(lbl))
	}
	if n >= 2 {
		gap := t.length * vg.Length(step/(hi-lo))
		need := tallest * 1.6
		if t.horizontal {
			need = widest + t.style.Width("00")
		}
		if gap < need {
			return nil, false
		}
	}
	// Unlabelled ticks: fifths of a step of 1 or 5, quarters of a step of 2.
	parts := 5.0
	if m := step / math.Pow(10, math.Floor(math.Log10(step)+1e-9)); math.Abs(m-2) < 1e-6 {
		parts = 4
	}
	minor := step / parts
	for i := math.Ceil(lo/minor - 1e-9); i <= math.Floor(hi/minor+1e-9); i++ {
		if math.Mod(i, parts) != 0 {
			ticks = append(ticks, plot.Tick{Value: i * minor})
		}
		if len(ticks) > maxTicks {
			break
		}
	}
	return ticks, true
}

// tickLabel writes v, a multiple of step, with the decimals the step
// needs, or in e-notation (sci) for an axis of very large or very small
// numbers.
func tickLabel(v, step float64, decimals int, sci bool) string {
	if math.Abs(v) < step/2 {
		return "0"
	}
	if sci {
		return eNotation(v)
	}
	return strconv.FormatFloat(v, 'f', decimals, 64)
}

// eNotation writes v to 4 significant digits as "2.5e6", "1e-5".
func eNotation(v float64) string {
	s := strconv.FormatFloat(v, 'e', 3, 64)
	mant, exp, _ := strings.Cut(s, "e")
	for len(mant) > 1 && (mant[len(mant)-1] == '0' || mant[len(mant)-1] == '.') {
		last := mant[len(mant)-1]
		mant = mant[:len(mant)-1]
		if last == '.' {
			break
		}
	}
	e, _ := strconv.Atoi(exp)
	return mant + "e" + strconv.Itoa(e)
}

// logTicks labels the powers of ten of a logarithmic axis; 2 and 5 times
// them too when it spans under three decades, and all nine multiples when
// under one. Within less than half a decade it falls back to the linear
// ticks. Over more than a dozen decades it labels every second or third.
type logTicks struct {
	linear linearTicks
}

func (t logTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0 && lo < hi) || !isFinite(hi) {
		return nil
	}
	decades := math.Log10(hi / lo)
	if decades < 0.5 {
		return t.linear.Ticks(lo, hi)
	}
	labelled := []int{1}
	switch {
	case decades < 1:
		labelled = []int{1, 2, 3, 4, 5, 6, 7, 8, 9}
	case decades < 3:
		labelled = []int{1, 2, 5}
	}
	every := max(1, int(math.Ceil(decades/12)))
	k0 := int(math.Floor(math.Log10(lo)))
	k1 := int(math.Ceil(math.Log10(hi)))
	var ticks []plot.Tick
	for k := k0; k <= k1 && len(ticks) < maxTicks; k++ {
		for m := 1; m <= 9; m++ {
			v := decimal(m, k)
			if v < lo*(1-1e-12) || v > hi*(1+1e-12) {
				continue
			}
			tk := plot.Tick{Value: v}
			if contains(labelled, m) && (m != 1 || (k%every+every)%every == 0) {
				tk.Label = logLabel(m, k)
			} else if m != 1 && decades > 6 {
				continue // no unlabelled ticks between decades on a long axis
			}
			ticks = append(ticks, tk)
		}
	}
	return ticks
}

// decimal is m×10^k as the float64 nearest the decimal number, so that
// 3×10^-1 is 0.3 and not 0.30000000000000004.
func decimal(m, k int) float64 {
	v, _ := strconv.ParseFloat(strconv.Itoa(m)+"e"+strconv.Itoa(k), 64)
	return v
}

// logLabel writes m×10^k: "0.02", "500", "1e6", "2e-5".
func logLabel(m, k int) string {
	if k >= 6 || k < -4 {
		return strconv.Itoa(m) + "e" + strconv.Itoa(k)
	}
	return strconv.FormatFloat(decimal(m, k), 'f', -1, 64)
}

func contains(xs []int, x int) bool {
	for _, v := range xs {
		if v == x {
			return true
		}
	}
	return false
}
