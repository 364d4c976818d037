package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"
)

// The JSON keys of the commands are read by other programs: they must not
// change. testdata/golden/json-keys.txt lists, for each case below, every
// key path of its output (array elements as "[]"), as the commands wrote
// them before the output layer was rebuilt; a case may add only the keys in
// addedKeys. Rewrite the file with -update only for a deliberate addition,
// and say so in the commit.
const jsonKeysFile = "testdata/golden/json-keys.txt"

// addedKeys are top-level keys a result may carry beyond the pinned ones:
// the warnings and notes of the run, which the output layer now keeps with
// the result.
var addedKeys = []string{"warnings", "notes"}

var jsonKeyCases = []struct {
	name string
	args []string
}{
	{"fluid", []string{"fluid", "../../examples/sablewick.toml"}},
	{"fluid-metric", []string{"fluid", "../../examples/sablewick.toml", "--units", "metric"}},
	{"fluid-user3", []string{"fluid", userFile}},
	{"flash-two-phase", []string{"flash", "../../examples/sablewick.toml", "--pressure", "3000 psia"}},
	{"flash-one-phase", []string{"flash", "../../examples/sablewick.toml", "--pressure", "6000 psia", "--units", "metric"}},
	{"satpoint", []string{"satpoint", "../../examples/sablewick.toml"}},
	{"envelope", []string{"envelope", "../../examples/sablewick.toml"}},
	{"expand", []string{"expand", "../../examples/sablewick.toml"}},
	{"deplete", []string{"deplete", "../../examples/sablewick.toml"}},
	{"deplete-metric", []string{"deplete", "../../examples/sablewick.toml", "--units", "metric"}},
	{"separate", []string{"separate", "../../examples/sablewick.toml"}},
	{"inplace", []string{"inplace", "../../examples/sablewick.toml"}},
	{"inplace-metric", []string{"inplace", "../../examples/sablewick.toml", "--units", "metric"}},
	{"recover", []string{"recover", "../../examples/sablewick.toml"}},
	{"recover-fixed", []string{"recover", "../../examples/sablewick.toml", "--fixed-steps", "5", "--units", "metric"}},
	{"recover-rich", []string{"recover", "testdata/rich-near-critical.toml", "--start-at-dew-point"}},
	{"history", []string{"history", "../../examples/sablewick.toml"}},
	{"history-metric", []string{"history", "../../examples/sablewick.toml", "--units", "metric"}},
	{"compare", []string{"compare", "../../examples/sablewick.toml"}},
	{"compare-metric", []string{"compare", "../../examples/sablewick.toml", "--units", "metric"}},
	{"check", []string{"check", "../../examples/sablewick.toml"}},
	{"tune", []string{"tune", "../../examples/sablewick.toml"}},
	{"forecast", []string{"forecast", "../../examples/sablewick.toml"}},
	{"forecast-metric", []string{"forecast", "../../examples/sablewick.toml", "--units", "metric"}},
	{"maintain", []string{"maintain", "../../examples/sablewick.toml"}},
	{"uncertainty", []string{"uncertainty", uncertaintyStudy}},
	{"demo", []string{"demo"}},
}

// jsonKeyPaths lists the key paths of a JSON document, sorted.
func jsonKeyPaths(data []byte) ([]string, error) {
	var v any
	if err := json.Unmarshal(data, &v); err != nil {
		return nil, err
	}
	seen := map[string]bool{}
	var walk func(prefix string, v any)
	walk = func(prefix string, v any) {
		switch x := v.(type) {
		case map[string]any:
			for k, e := range x {
				p := k
				if prefix != "" {
					p = prefix + "." + k
				}
				seen[p] = true
				walk(p, e)
			}
		case []any:
			for _, e := range x {
				walk(prefix+"[]", e)
			}
		}
	}
	walk("", v)
	out := make([]string, 0, len(seen))
	for k := range seen {
		out = append(out, k)
	}
	sort.Strings(out)
	return out, nil
}

// added reports whether the key path p is one of addedKeys, at the top of
// a result or of one of demo's results, or inside one.
func added(p string) bool {
	parts := strings.SplitN(p, ".", 3)
	for i := 0; i < len(parts) && i < 2; i++ {
		if slices.Contains(addedKeys, strings.TrimSuffix(parts[i], "[]")) {
			return true
		}
	}
	return false
}

// demoAdds reports whether the key path p of case name is a result that
// demo gained with the workflow's constant-composition expansion: the keys
// of the expand command, under "expansion".
func demoAdds(name, p string, want map[string][]string) bool {
	rest, ok := strings.CutPrefix(p, "expansion.")
	if name != "demo" || !ok && p != "expansion" {
		return false
	}
	return p == "expansion" || slices.Contains(want["expand"], rest)
}

func TestJSONKeysUnchanged(t *testing.T) {
	got := map[string][]string{}
	for _, c := range jsonKeyCases {
		args := append(append([]string(nil), c.args...), "--format", "json")
		if c.name == "demo" {
			args = append(args, "--dir", filepath.Join(t.TempDir(), "demo"))
		}
		code, stdout, stderr := dewcell(args...)
		if code != 0 {
			t.Fatalf("%s: exit %d\n%s", c.name, code, stderr)
		}
		keys, err := jsonKeyPaths([]byte(stdout))
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		got[c.name] = keys
	}
	if *update {
		var b strings.Builder
		fmt.Fprintln(&b, "# JSON key paths of each case of TestJSONKeysUnchanged (jsonkeys_test.go), written by the")
		fmt.Fprintln(&b, "# commands themselves; array elements are \"[]\". Other programs read these keys: they must not change.")
		for _, c := range jsonKeyCases {
			fmt.Fprintf(&b, "\n[%s]\n", c.name)
			for _, k := range got[c.name] {
				if !added(k) {
					fmt.Fprintln(&b, k)
				}
			}
		}
		if err := os.WriteFile(jsonKeysFile, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	data, err := os.ReadFile(jsonKeysFile)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string][]string{}
	var name string
	for i, line := range strings.Split(string(data), "\n") {
		switch {
		case line == "" || strings.HasPrefix(line, "#"):
		case strings.HasPrefix(line, "[") && strings.HasSuffix(line, "]") && !strings.Contains(line, "."):
			name = strings.Trim(line, "[]")
			want[name] = nil
		case name == "":
			t.Fatalf("%s:%d: key outside a case", jsonKeysFile, i+1)
		default:
			want[name] = append(want[name], line)
		}
	}
	for _, c := range jsonKeyCases {
		w, ok := want[c.name]
		if !ok {
			t.Errorf("%s: case %s is not in the file; run with -update", jsonKeysFile, c.name)
			continue
		}
		for _, k := range w {
			if !slices.Contains(got[c.name], k) {
				t.Errorf("%s: key %s is gone", c.name, k)
			}
		}
		for _, k := range got[c.name] {
			if !slices.Contains(w, k) && !added(k) && !demoAdds(c.name, k, want) {
				t.Errorf("%s: new key %s", c.name, k)
			}
		}
	}
}
