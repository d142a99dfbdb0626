package cli

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var updateGolden = flag.Bool("update", false, "rewrite the brief golden files under testdata/plans")

const planDir = "../../testdata/plans"

func runPlan(args []string, stdin string) (int, string, string) {
	var out, errb bytes.Buffer
	code := Plan(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

// The brief of each example plan matches its golden text (refresh with
// go test ./app/cli -update), and the exit status follows the go/no-go.
func TestPlanBriefGolden(t *testing.T) {
	want := map[string]int{ // status decided by the engine; see testdata/plans/*.result.json
		"rotor-mountain.json":  ExitGo,
		"fixed-wing-long.json": ExitGo,
		"ventilated.json":      ExitGo,
		"fio2-unmatched.json":  ExitNoGo,
	}
	for name, wantCode := range want {
		t.Run(name, func(t *testing.T) {
			path := filepath.Join(planDir, name)
			code, out, errs := runPlan([]string{path}, "")
			if code != wantCode || errs != "" {
				t.Fatalf("exit %d (want %d), stderr %q", code, wantCode, errs)
			}
			first := strings.SplitN(out, "\n", 2)[0]
			if (code == ExitNoGo) != strings.HasPrefix(first, "NO-GO") {
				t.Errorf("first line %q does not match exit %d", first, code)
			}
			if !strings.Contains(out, "Caution: Planning aid only") {
				t.Error("brief lacks the caution line")
			}
			golden := strings.TrimSuffix(path, ".json") + ".txt"
			if *updateGolden {
				if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			g, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run with -update)", err)
			}
			if string(g) != out {
				t.Errorf("brief differs from %s:\n%s", golden, out)
			}
		})
	}
}

// --json prints the same result document the engine's golden holds.
func TestPlanJSONMatchesEngineGolden(t *testing.T) {
	path := filepath.Join(planDir, "ventilated.json")
	code, out, _ := runPlan([]string{"--json", path}, "")
	if code != ExitGo {
		t.Fatalf("exit %d", code)
	}
	g, err := os.ReadFile(strings.TrimSuffix(path, ".json") + ".result.json")
	if err != nil {
		t.Fatal(err)
	}
	if out != string(g) {
		t.Error("--json output differs from the engine golden result")
	}
}

func TestPlanStdinAndUsage(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(planDir, "rotor-mountain.json"))
	if err != nil {
		t.Fatal(err)
	}
	if code, out, _ := runPlan([]string{"-"}, string(data)); code != ExitGo || !strings.HasPrefix(out, "GO") {
		t.Errorf("stdin: exit %d, %q", code, out)
	}
	for _, args := range [][]string{{}, {"a.json", "b.json"}, {"--yaml", "a.json"}, {"/nonexistent/plan.json"}} {
		if code, _, errs := runPlan(args, ""); code != ExitUsage || errs == "" {
			t.Errorf("%v: exit %d, stderr %q; want 2 and a message", args, code, errs)
		}
	}
	if code, out, _ := runPlan([]string{"--help"}, ""); code != ExitGo || !strings.Contains(out, "usage: alvea plan") {
		t.Errorf("--help: exit %d", code)
	}
}

// A bad document exits 2 and names every problem by path, value, range and unit.
func TestPlanBadDocumentExit(t *testing.T) {
	code, out, errs := runPlan([]string{filepath.Join(planDir, "bad", "out-of-range.json")}, "")
	if code != ExitUsage || out != "" {
		t.Fatalf("exit %d, stdout %q", code, out)
	}
	for _, want := range []string{"11 problems in the plan document", "  supply[1].pressure_bar: 412 is above the 300 bar limit",
		"  route.origin_elevation_ft: 25000 is above the 18000 ft limit"} {
		if !strings.Contains(errs, want) {
			t.Errorf("stderr lacks %q:\n%s", want, errs)
		}
	}
	// A contradiction found while computing (PaO2 above PAO2) is also exit 2.
	if code, _, errs := runPlan([]string{filepath.Join(planDir, "bad", "pao2-above-alveolar.json")}, ""); code != ExitUsage || !strings.Contains(errs, "patient.pao2_mmhg") {
		t.Errorf("exit %d, %q", code, errs)
	}
}

// The result document carries every key issue 3 requires, as JSON numbers
// (or null where the quantity does not apply: max_cruise_altitude_ft on an
// unpressurised aircraft), with warnings as {code, message}.
func TestPlanJSONRequiredKeys(t *testing.T) {
	top := []string{"cabin_altitude_ft", "highest_altitude_ft", "fio2_needed", "max_cabin_altitude_ft",
		"oxygen_needed_l", "oxygen_usable_l", "oxygen_margin_l", "gas_expansion_ratio"}
	leg := []string{"altitude_ft", "pressure_mmhg", "pao2_mmhg", "pao2_expected_mmhg", "spo2_expected_percent",
		"fio2_needed", "oxygen_lpm", "oxygen_l"}
	for _, tc := range []struct {
		file        string
		pressurised bool
	}{{"fixed-wing-long.json", true}, {"rotor-mountain.json", false}} {
		code, out, errs := runPlan([]string{"--json", filepath.Join(planDir, tc.file)}, "")
		if code != ExitGo || errs != "" {
			t.Fatalf("%s: exit %d, %s", tc.file, code, errs)
		}
		var doc map[string]any
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatalf("%s: %v", tc.file, err)
		}
		for _, k := range top {
			if _, ok := doc[k].(float64); !ok {
				t.Errorf("%s: %s = %v, want a number", tc.file, k, doc[k])
			}
		}
		if _, ok := doc["fio2_possible"].(bool); !ok {
			t.Errorf("%s: fio2_possible = %v, want true/false", tc.file, doc["fio2_possible"])
		}
		mc, present := doc["max_cruise_altitude_ft"]
		if !present {
			t.Errorf("%s: max_cruise_altitude_ft absent", tc.file)
		}
		if _, isNum := mc.(float64); isNum != tc.pressurised {
			t.Errorf("%s: max_cruise_altitude_ft = %v; want a number only when pressurised", tc.file, mc)
		}
		legs, _ := doc["legs"].([]any)
		if len(legs) == 0 {
			t.Fatalf("%s: no legs", tc.file)
		}
		for i, l := range legs {
			m, _ := l.(map[string]any)
			for _, k := range leg {
				if _, ok := m[k].(float64); !ok {
					t.Errorf("%s: legs[%d].%s = %v, want a number", tc.file, i, k, m[k])
				}
			}
		}
		ws, ok := doc["warnings"].([]any)
		if !ok {
			t.Fatalf("%s: warnings = %v, want a list", tc.file, doc["warnings"])
		}
		for _, w := range ws {
			m, _ := w.(map[string]any)
			if c, _ := m["code"].(string); c == "" || m["message"] == "" {
				t.Errorf("%s: warning %v lacks code or message", tc.file, w)
			}
		}
	}
}
