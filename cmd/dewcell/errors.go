package main

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
	"dewcell/mbal"
)

// explain writes err for the person who runs the command: each step of the
// chain of what was being done, a state in the output units, a solver's
// failure in words. The library errors give their states in SI (their
// Error text is for developers); this is where they get the study's units.
func explain(err error, sys units.System) string {
	var parts []string
	for err != nil {
		switch e := err.(type) {
		case *eos.StateError:
			parts = append(parts, e.What+atState(sys, e.T, e.P))
			err = e.Err
			continue
		case *eos.NearCriticalError:
			parts = append(parts, nearCriticalText(sys, e))
			err = nil
			continue
		case *eos.SolveError:
			parts = append(parts, e.Error())
			err = nil
			continue
		case *mbal.OilError:
			parts = append(parts, oilText(sys, e))
			err = nil
			continue
		}
		inner := errors.Unwrap(err)
		if inner == nil {
			parts = append(parts, err.Error())
			break
		}
		msg, in := err.Error(), inner.Error()
		if prefix, ok := strings.CutSuffix(msg, ": "+in); ok {
			parts = append(parts, prefix)
			err = inner
			continue
		}
		// the wrapper writes its own text after or around the inner error's
		parts = append(parts, msg)
		break
	}
	return strings.Join(parts, ": ")
}

// atState is " at 250 degF and 3000 psia" (either part missing when zero).
func atState(sys units.System, t, p float64) string {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	switch {
	case t > 0 && p > 0:
		return fmt.Sprintf(" at %.6g %s and %.6g %s", tU.FromSI(t), tU.Symbol, pU.FromSI(p), pU.Symbol)
	case t > 0:
		return fmt.Sprintf(" at %.6g %s", tU.FromSI(t), tU.Symbol)
	case p > 0:
		return fmt.Sprintf(" at %.6g %s", pU.FromSI(p), pU.Symbol)
	}
	return ""
}

// nearCriticalText says that the incipient phase could not be told from the
// feed, and how close the temperature is to the critical one.
func nearCriticalText(sys units.System, e *eos.NearCriticalError) string {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	msg := fmt.Sprintf("at %.6g %s the incipient phase cannot be told from the feed", tU.FromSI(e.T), tU.Symbol)
	if e.Tc > 0 {
		msg += fmt.Sprintf(": the temperature is %.3g %s from the fluid's critical point (%.6g %s, %.6g %s), where the dew and bubble points meet; a saturation pressure there is the critical pressure",
			math.Abs(tU.FromSI(e.T)-tU.FromSI(e.Tc)), tU.Symbol, tU.FromSI(e.Tc), tU.Symbol, pU.FromSI(e.Pc), pU.Symbol)
	}
	return msg
}

// oilText says that the fluid is an oil at the reservoir temperature, and
// how far that lies below its critical temperature.
func oilText(sys units.System, e *mbal.OilError) string {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	msg := fmt.Sprintf("at %.6g %s the fluid is an oil: its saturation point, %.6g %s, is a bubble point, where it starts to release gas", tU.FromSI(e.T), tU.Symbol, pU.FromSI(e.Pb), pU.Symbol)
	if e.Tc > 0 {
		msg += fmt.Sprintf(" (the reservoir temperature lies %.3g %s below the fluid's critical temperature of %.6g %s; above it the fluid would be a gas condensate)",
			tU.FromSI(e.Tc)-tU.FromSI(e.T), tU.Symbol, tU.FromSI(e.Tc), tU.Symbol)
	}
	return msg + "; the depletion model of a gas-condensate reservoir does not apply to an oil, whose liquid flows"
}

// failure is an error as the user reads it (explain), the library error
// kept for errors.Is and errors.As.
type failure struct {
	text string
	err  error
}

func (f *failure) Error() string { return f.text }
func (f *failure) Unwrap() error { return f.err }

// userError returns err with its text for the user, unless it already
// carries its own exit code (usage and input errors, written for the user).
func userError(err error, sys units.System) error {
	if err == nil {
		return nil
	}
	var ec cli.ExitCoder
	if errors.As(err, &ec) {
		return err
	}
	return &failure{text: explain(err, sys), err: err}
}
