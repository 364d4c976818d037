package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The example's laboratory report was made by the equation of state itself
// (labdata_test.go) and rounded as a PVT report prints: it satisfies the
// Whitson-Torp material balance (Whitson and Torp 1983, JPT 35(3)) to its
// rounding, so every step must pass. A defect planted in it must be found at
// the step it was planted in, and the steps before it stay clean.

// labVariant writes the example with its laboratory tables into a fresh
// folder, the CVD table passed through edit (rows as cells, the header
// first), and returns the study's path.
func labVariant(t *testing.T, edit func(rows [][]string)) string {
	t.Helper()
	path := exampleVariant(t, "")
	cvdPath := filepath.Join(filepath.Dir(path), "lab", "cvd.csv")
	data, err := os.ReadFile(cvdPath)
	if err != nil {
		t.Fatal(err)
	}
	var rows [][]string
	for _, line := range strings.Split(strings.TrimSpace(string(data)), "\n") {
		rows = append(rows, strings.Split(line, ","))
	}
	edit(rows)
	var b strings.Builder
	for _, r := range rows {
		b.WriteString(strings.Join(r, ",") + "\n")
	}
	if err := os.WriteFile(cvdPath, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// stepVerdicts are the verdicts of the check's steps by pressure (psia).
func stepVerdicts(t *testing.T, doc map[string]any) map[float64]string {
	t.Helper()
	steps, ok := doc["steps"].([]any)
	if !ok || len(steps) == 0 {
		t.Fatalf("no steps table in %v", keys(doc))
	}
	out := map[float64]string{}
	for _, s := range steps {
		row := s.(map[string]any)
		out[row["pressure_psia"].(float64)] = row["verdict"].(string)
	}
	return out
}

func TestCheckExample(t *testing.T) {
	doc := runJSON(t, "check", exampleStudy)
	if v := doc["verdict"]; v != "ok" {
		t.Errorf("verdict %v, want ok for a report the model made (findings %v)", v, doc["findings"])
	}
	vs := stepVerdicts(t, doc)
	if len(vs) != 8 {
		t.Errorf("%d steps, want the 8 below the saturation pressure", len(vs))
	}
	for p, v := range vs {
		if v != "ok" {
			t.Errorf("step at %g psia: %s, want ok", p, v)
		}
	}
	if n := num(t, doc, "step_count"); n != 8 {
		t.Errorf("step_count %g, want 8", n)
	}
	// The cell-volume identity Z2 = (p/p_d) Z_d/(1 − n_p) holds on the
	// model's own numbers to their rounding (Z to 4 decimals): within
	// 0.05 %.
	for _, s := range doc["steps"].([]any) {
		row := s.(map[string]any)
		if d, _ := row["z_two_phase_deviation_pct"].(float64); d > 0.05 || d < -0.05 {
			t.Errorf("step at %v psia: two-phase Z off the identity by %.3f %%", row["pressure_psia"], d)
		}
	}
}

// gasColumns are the indices of the gas_ columns of the header.
func gasColumns(header []string) []int {
	var out []int
	for j, h := range header {
		if strings.HasPrefix(h, "gas_") {
			out = append(out, j)
		}
	}
	return out
}

func TestCheckFindsPlantedDefects(t *testing.T) {
	rowOf := func(rows [][]string, p string) int {
		for i, r := range rows {
			if r[0] == p {
				return i
			}
		}
		t.Fatalf("no row at %s psia", p)
		return -1
	}
	cases := []struct {
		name    string
		edit    func(rows [][]string)
		flagged []float64 // steps that must not be ok
		clean   []float64 // steps that must stay ok
	}{
		{"gas compositions of 2700 and 2200 psia swapped", func(rows [][]string) {
			a, b := rowOf(rows, "2700"), rowOf(rows, "2200")
			for _, j := range gasColumns(rows[0]) {
				rows[a][j], rows[b][j] = rows[b][j], rows[a][j]
			}
		}, []float64{2700}, []float64{4200, 3700, 3200}},
		{"dropout at 1700 psia 3 % too high", func(rows [][]string) {
			i := rowOf(rows, "1700")
			if rows[i][1] != "18.02" {
				t.Fatalf("dropout at 1700 psia is %s; the test expects the stored 18.02", rows[i][1])
			}
			rows[i][1] = "21.02"
		}, []float64{1700}, []float64{4200, 3700, 3200, 2700, 2200}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			doc := runJSON(t, "check", labVariant(t, c.edit))
			if v := doc["verdict"]; v != "suspect" && v != "inconsistent" {
				t.Errorf("verdict %v, want suspect or inconsistent", v)
			}
			vs := stepVerdicts(t, doc)
			for _, p := range c.flagged {
				if v := vs[p]; v != "suspect" && v != "inconsistent" {
					t.Errorf("step at %g psia: %s, want it flagged", p, v)
				}
			}
			for _, p := range c.clean {
				if v := vs[p]; v != "ok" {
					t.Errorf("step at %g psia: %s, want ok (the defect lies at a later step)", p, v)
				}
			}
		})
	}
}

func TestCheckUsageErrors(t *testing.T) {
	noLab := writeStudy(t, stripLab(string(mustRead(t, exampleStudy))))
	noCVD := exampleVariant(t, "", `cvd = "lab/cvd.csv"`, "")
	drop := func(prefix string) func(rows [][]string) {
		return func(rows [][]string) {
			header := rows[0]
			for i, r := range rows {
				var kept []string
				for j, c := range r {
					if !strings.HasPrefix(header[j], prefix) {
						kept = append(kept, c)
					}
				}
				rows[i] = kept
			}
		}
	}
	noGas := labVariant(t, drop("gas_"))
	noCO2 := labVariant(t, drop("gas_CO2"))
	for _, c := range []struct {
		name, path string
		want       []string
	}{
		{"no [lab]", noLab, []string{"no [lab] section", "saturation_pressure"}},
		{"no cvd table", noCVD, []string{"no cvd table", "gas_<component>"}},
		{"no gas compositions", noGas, []string{"lab/cvd.csv", "no gas_<component> columns"}},
		{"a component left out", noCO2, []string{"lab/cvd.csv", "leave out CO2", "add the column gas_CO2"}},
	} {
		code, _, stderr := dewcell("check", c.path)
		if code != exitUsage {
			t.Errorf("%s: exit %d, want %d: %s", c.name, code, exitUsage, stderr)
		}
		for _, w := range c.want {
			if !strings.Contains(stderr, w) {
				t.Errorf("%s: %q does not mention %q", c.name, stderr, w)
			}
		}
	}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return data
}
