package main

import (
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// scientific matches a number written in e-notation ("3.26e+07"); a unit
// such as "1e6 sm3" in a message is not a number of the result, and the
// tables for people write it 10^6 sm3.
var scientific = regexp.MustCompile(`[0-9]\.?[0-9]*[eE][-+]?[0-9]`)

// TestTablesForPeople: what people read fits a 120-column terminal and
// writes no ordinary quantity in e-notation, on every command, in both unit
// systems, on the example and on the invented test fluids (a 120-column
// terminal: the width the tables are laid out for).
func TestTablesForPeople(t *testing.T) {
	studies := []string{exampleStudy, o9Study, userFile, "testdata/rich-near-critical.toml"}
	var cases [][]string
	for _, st := range studies {
		for _, cmd := range []string{"fluid", "satpoint", "envelope", "separate"} {
			cases = append(cases, []string{cmd, st})
		}
		cases = append(cases, []string{"flash", st, "--pressure", "2000 psia"})
	}
	for _, cmd := range []string{"expand", "deplete", "inplace", "recover", "history"} {
		cases = append(cases, []string{cmd, exampleStudy})
	}
	cases = append(cases, []string{"expand", o9Study}, []string{"deplete", o9Study}, []string{"recover", "testdata/rich-near-critical.toml", "--start-at-dew-point"},
		[]string{"uncertainty", uncertaintyStudy})
	dir := t.TempDir()
	for i, st := range append(studies, "") { // demo on each study, and on its own example
		args := []string{"demo", "--dir", filepath.Join(dir, strconv.Itoa(i))}
		if st != "" {
			args = append(args, st)
		}
		cases = append(cases, args)
	}
	for _, c := range cases {
		for _, sys := range []string{"field", "metric"} {
			args := append(append([]string(nil), c...), "--units", sys)
			if c[0] == "demo" && sys == "metric" {
				args[2] += "-metric"
			}
			code, out, stderr := dewcell(args...)
			if code != 0 {
				t.Errorf("%q: exit %d: %s", args, code, stderr)
				continue
			}
			checkForPeople(t, strings.Join(args, " "), out)
			// The notes and warnings people read: no e-notation either.
			for i, l := range strings.Split(stderr, "\n") {
				if m := scientific.FindString(l); m != "" {
					t.Errorf("%s: standard error line %d writes %q in e-notation:\n%s", strings.Join(args, " "), i+1, m, l)
				}
			}
		}
	}
}

func checkForPeople(t *testing.T, what, out string) {
	t.Helper()
	for i, l := range strings.Split(out, "\n") {
		if n := len([]rune(l)); n > 120 {
			t.Errorf("%s: line %d is %d characters wide:\n%s", what, i+1, n, l)
		}
		if m := scientific.FindString(l); m != "" {
			t.Errorf("%s: line %d writes %q in e-notation:\n%s", what, i+1, m, l)
		}
	}
}
