package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/study"
)

// tunedBase is a study with a plus fraction, a library override, an
// interaction table and a [[tune.parameter]] list of every kind.
const tunedBase = `title = "tuned file test (invented)"

[reservoir]
temperature = "245 degF"   # a comment that must survive

[fluid]
equation = "PR78"
volume_shift = true

[fluid.composition]
N2 = 0.5
CO2 = 2.5
C1 = 74.0
C2 = 8.0
C3 = 4.0
nC4 = 3.0
"C7+" = 8.0

[fluid.plus]
name = "C7+"
molar_mass = 143.0
specific_gravity = 0.795

[fluid.properties.C1]
acentric_factor = 0.0115

[fluid.interaction]
"C1/C7+" = 0.03

[[tune.parameter]]
property = "critical_temperature"
component = "C7+"
min = 0.9
max = 1.1

[[tune.parameter]]
property = "acentric_factor"
component = "C1"
min = 0.5
max = 1.5

[[tune.parameter]]
property = "critical_pressure"
component = "C7+"
min = 0.9
max = 1.1

[[tune.parameter]]
property = "interaction"
pair = "C1/C7+"
min = 0.0
max = 0.2

[[tune.parameter]]
property = "molar_mass"
component = "C7+"
min = 0.8
max = 1.2

[tune.weights]
saturation_pressure = 5
`

// The tuned file, read back, is the tuned fluid (Study.Tuned at the same
// values) to the 13 digits it writes: a closed loop through the study
// reader, which is what makes "compare on the tuned file reproduces the
// statistics after tuning" hold.
func TestTunedStudyText(t *testing.T) {
	st, err := study.Parse("orig.toml", []byte(tunedBase))
	if err != nil {
		t.Fatal(err)
	}
	x := []float64{1.031, 1.2, 0.97, 0.081, 1.06}
	fl, z, err := st.Tuned(x)
	if err != nil {
		t.Fatal(err)
	}
	text, err := tunedStudyText(st, []byte(tunedBase), "tuned.toml", x, fl, z, []string{"# header line", ""})
	if err != nil {
		t.Fatal(err)
	}
	s := string(text)
	for _, want := range []string{"# header line", "# a comment that must survive", "molar_mass = 151.58", `"C1/C7+" = 0.081`, "# [[tune.parameter]]", "# [tune.weights]"} {
		if !strings.Contains(s, want) {
			t.Errorf("tuned file lacks %q:\n%s", want, s)
		}
	}
	if strings.Count(s, "\nmolar_mass = ") != 1 || strings.Count(s, `"C1/C7+" =`) != 1 {
		t.Errorf("a tuned key is set twice:\n%s", s)
	}
	back, err := study.Parse("tuned.toml", text)
	if err != nil {
		t.Fatalf("%v\n%s", err, s)
	}
	if back.Tune != nil {
		t.Error("the tuned file still tunes: its [[tune.parameter]] should be comments")
	}
	if err := sameModel(back.Fluid, back.Z, fl, z); err != nil {
		t.Errorf("read back: %v", err)
	}
	// At the start the file's fluid is the study's own, to the same digits.
	st2, _ := study.Parse("orig.toml", []byte(tunedBase))
	if err := sameModel(st2.Fluid, st2.Z, st.Fluid, st.Z); err != nil {
		t.Fatal(err)
	}
}

// A file that sets the tuned keys in a layout the line editor does not
// rewrite (a dotted key) is refused rather than written wrong.
func TestTunedStudyDottedKeys(t *testing.T) {
	src := strings.Replace(tunedBase, "[fluid.plus]\nname = \"C7+\"\nmolar_mass = 143.0\nspecific_gravity = 0.795\n",
		"[fluid.plus]\nname = \"C7+\"\nspecific_gravity = 0.795\n", 1)
	src = strings.Replace(src, "[fluid]\nequation = \"PR78\"\n", "[fluid]\nequation = \"PR78\"\nplus.molar_mass = 143.0\n", 1)
	st, err := study.Parse("orig.toml", []byte(src))
	if err != nil {
		t.Skipf("the study reader refuses the layout itself: %v", err)
	}
	x := []float64{1, 1, 1, 0.03, 1.06}
	fl, z, err := st.Tuned(x)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := tunedStudyText(st, []byte(src), "tuned.toml", x, fl, z, nil); err == nil {
		t.Error("a dotted molar_mass was not caught")
	}
}

// The [lab] paths name the same tables from the folder of the tuned file.
func TestLabPathFrom(t *testing.T) {
	dir := t.TempDir()
	table := filepath.Join(dir, "study", "lab", "cvd.csv")
	if got := labPathFrom(filepath.Join(dir, "out", "tuned.toml"), table); got != "../study/lab/cvd.csv" {
		t.Errorf("labPathFrom = %q, want ../study/lab/cvd.csv", got)
	}
}

// --save never replaces a file without --force, and writes whole files.
func TestSaveFile(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "t.toml")
	if err := saveFile(p, []byte("a"), false); err != nil {
		t.Fatal(err)
	}
	if err := saveFile(p, []byte("b"), false); err == nil || !strings.Contains(err.Error(), "--force") {
		t.Errorf("second save: %v, want a refusal naming --force", err)
	}
	if b, _ := os.ReadFile(p); string(b) != "a" {
		t.Errorf("file holds %q after a refused save", b)
	}
	if err := saveFile(p, []byte("c"), true); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(p); string(b) != "c" {
		t.Errorf("file holds %q after a forced save", b)
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".*"))
	if len(left) != 0 {
		t.Errorf("temporary files left: %v", left)
	}
}
