package physio

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var updatePlanGolden = flag.Bool("update", false, "rewrite the plan golden files under testdata/plans")

const planDir = "../testdata/plans"

func mustPlan(t *testing.T, doc string) *PlanResult {
	t.Helper()
	d, err := ParsePlan([]byte(doc))
	if err != nil {
		t.Fatalf("ParsePlan: %v", err)
	}
	r, err := ComputePlan(d)
	if err != nil {
		t.Fatalf("ComputePlan: %v", err)
	}
	return r
}

func nearly(t *testing.T, what string, got Number, want, tol float64) {
	t.Helper()
	g := got.InexactFloat64()
	if math.Abs(g-want) > tol {
		t.Errorf("%s = %s, want %g ± %g", what, got, want, tol)
	}
}

func exact(t *testing.T, what string, got Number, want string) {
	t.Helper()
	if got.String() != want {
		t.Errorf("%s = %s, want %s", what, got, want)
	}
}

func hasWarning(r *PlanResult, code string) bool {
	for _, w := range r.Warnings {
		if w.Code == code {
			return true
		}
	}
	return false
}

// Sea level to a stated 8 000 ft cabin, patient on air with PaO2 80 mmHg,
// one E cylinder at 2 000 psi. Check values (REFERENCES.md):
//   - P(8 000 ft) = 564.51 mmHg [calc, U.S. Standard Atmosphere 1976; GNU
//     units `stdatmPH(8000 ft)` → 564.51402].
//   - FiO2 0.21 → 0.289 at 8 000 ft [calc, §4] (0.2893 with PH2O 47 mmHg),
//     shown rounded up: 0.29.
//   - PAO2 at sea level on air 99.7 mmHg [pub-example, Egan's workbook];
//     at 8 000 ft 58.7 mmHg [calc, §3] (58.68, shown rounded down to 58.6).
//   - Boyle sea level → 8 000 ft ×1.346 [calc, §10], shown rounded up.
//   - E cylinder, 2 000 psi, 200 psi residual: 504 L; at 10 L/min it
//     reaches the residual at 50.4 min [calc, §7] → minute 50 (down).
const planSeaLevelTo8000 = `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0, "cabin_altitude_ft": 8000},
 "legs": [
   {"where": "cabin", "minutes": 60, "oxygen": {"device": "non_rebreather", "flow_lpm": 10}},
   {"where": "cabin", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 80, "paco2_mmhg": 40},
 "supply": [{"size": "E", "pressure_psi": 2000, "count": 1}]}`

func TestPlanSeaLevelTo8000ft(t *testing.T) {
	r := mustPlan(t, planSeaLevelTo8000)
	exact(t, "cabin_altitude_ft", *r.CabinAltitudeFt, "8000")
	exact(t, "highest_altitude_ft", r.HighestAltitudeFt, "8000")
	nearly(t, "leg pressure_mmhg", r.Legs[0].PressureMmHg, 564.51, 0.06)
	nearly(t, "ground PAO2", r.Ground.AlveolarPO2MmHg, 99.7, 0.2)
	nearly(t, "PAO2 on air at 8000 ft", r.Legs[1].PAO2MmHg, 58.7, 0.2)
	exact(t, "fio2_needed", r.FiO2Needed, "0.29")
	if !r.FiO2Possible {
		t.Error("fio2_possible false, want true")
	}
	if g := r.GasExpansionRatio.InexactFloat64(); g < 1.346 || g > 1.347 {
		t.Errorf("gas_expansion_ratio = %v, want 1.346 rounded up (1.346–1.347)", g)
	}
	exact(t, "usable E", r.Cylinders[0].UsableL, "504")
	exact(t, "E change minute", *r.Cylinders[0].ChangeMinute, "50")
	// Need: 10 L/min × 60 min = 600 L; ×1.5 reserve (DefaultReservePolicy,
	// common practice) = 900 L; margin 504 − 900 = −396 L.
	exact(t, "oxygen_calculated_l", r.OxygenCalculatedL, "600")
	exact(t, "oxygen_needed_l", r.OxygenNeededL, "900")
	exact(t, "oxygen_margin_l", r.OxygenMarginL, "-396")
	if !hasWarning(r, WarnSupplyShort) || r.Status != StatusNoGo || r.Go {
		t.Errorf("want SUPPLY_SHORT and no_go, got %s %v", r.Status, r.Warnings)
	}
	// Room air at 8 000 ft is below the needed 0.29: the set-up falls short
	// and options are listed.
	if r.Legs[1].Delivers || len(r.Legs[1].Options) == 0 || !hasWarning(r, WarnSetUpBelowNeed) {
		t.Errorf("room-air leg: delivers %v, %d options", r.Legs[1].Delivers, len(r.Legs[1].Options))
	}
	// Non-rebreather at 10 L/min: BTS 2017 range starts at 0.60 ≥ 0.29.
	if !r.Legs[0].Delivers {
		t.Error("non-rebreather leg should deliver FiO2 0.29")
	}
	// Every number has its explanation.
	for _, k := range []string{"cabin_altitude_ft", "highest_altitude_ft", "fio2_needed", "max_cabin_altitude_ft",
		"oxygen_needed_l", "oxygen_usable_l", "oxygen_margin_l", "gas_expansion_ratio"} {
		f, ok := r.Explain.Get(k)
		if !ok || f.Formula == "" || f.Source == "" || f.Rounding == "" {
			t.Errorf("explain[%q] = %+v, want formula, source and rounding", k, f)
		}
	}
	if fio2, _ := r.Explain.Get("fio2_needed"); fio2.Rounding != "up" {
		t.Error("fio2_needed must round up")
	}
	if usable, _ := r.Explain.Get("oxygen_usable_l"); usable.Rounding != "down" {
		t.Error("oxygen_usable_l must round down")
	}
}

// Non-sea-level origin: 5 000 ft (632.36 mmHg [calc, REFERENCES §1; GNU
// units stdatmPH(5000 ft) → 632.35638]) to an 8 000 ft cabin (564.51).
// Hand-worked: FiO2 = 0.21·(632.36 − 47)/(564.51 − 47) = 0.2375 → 0.24
// (up); Boyle 632.36/564.51 = 1.1202 → 1.121 (up).
func TestPlanHighOrigin(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 5000, "destination_elevation_ft": 0, "cabin_altitude_ft": 8000},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}},
          {"where": "cabin", "minutes": 60, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 70, "paco2_mmhg": 40},
 "supply": [{"size": "D", "pressure_psi": 2000}]}`)
	nearly(t, "ground pressure", r.Ground.PressureMmHg, 632.36, 0.06)
	exact(t, "fio2_needed", r.FiO2Needed, "0.24")
	exact(t, "gas_expansion_ratio", r.GasExpansionRatio, "1.121")
	exact(t, "origin leg fio2_needed", r.Legs[0].FiO2Needed, "0.21")
	// Cannula 2 L/min: 0.28 ± 0.04 (BTS 2017 interpolation, see DeviceFiO2): low 0.24 ≥ 0.24.
	if !r.Legs[1].Delivers {
		t.Errorf("cannula 2 L/min should deliver 0.24, low end %s", r.Legs[1].FiO2DeliveredLow)
	}
	// The PaO2 at altitude follows the ground a/A ratio [practice, §4],
	// hand-worked with PH2O 47 mmHg (REFERENCES §3 [practice]) and
	// PaCO2/R = 50: ground PAO2 0.21·(632.356 − 47) − 50 = 72.925 mmHg,
	// a/A = 70/72.925; cabin PAO2 at the cannula's low end
	// 0.24·(564.514 − 47) − 50 = 74.203 mmHg; PaO2 = 70·74.203/72.925 =
	// 71.227 mmHg, shown rounded down.
	nearly(t, "cabin PAO2", r.Legs[1].PAO2MmHg, 74.2, 0.11)
	nearly(t, "cabin expected PaO2", r.Legs[1].PaO2ExpectedMmHg, 71.2, 0.11)
	if r.Legs[1].PaO2ExpectedMmHg.InexactFloat64() > 71.227 {
		t.Error("expected PaO2 must round down")
	}
	// On room air at the origin the ground state is reproduced: PaO2 70.
	nearly(t, "origin expected PaO2", r.Legs[0].PaO2ExpectedMmHg, 70, 0.11)
}

// High destination: sea level origin, stated 8 000 ft cabin, destination at
// 10 000 ft (522.66 mmHg [calc, REFERENCES §1; GNU units → 522.65519]).
// The destination is the highest exposure, not the cabin. Hand-worked:
// FiO2 = 0.21·(760 − 47)/(522.66 − 47) = 0.3148 → 0.32;
// Boyle 760/522.66 = 1.4541 → 1.455.
func TestPlanHighDestination(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 10000, "cabin_altitude_ft": 8000},
 "legs": [{"where": "cabin", "minutes": 60, "oxygen": {"device": "simple_mask", "flow_lpm": 6}},
          {"where": "destination", "minutes": 30, "oxygen": {"device": "simple_mask", "flow_lpm": 6}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 85},
 "supply": [{"size": "M", "pressure_psi": 2000}]}`)
	exact(t, "highest_altitude_ft", r.HighestAltitudeFt, "10000")
	if r.HighestLeg != 1 {
		t.Errorf("highest_leg = %d, want 1 (the destination)", r.HighestLeg)
	}
	nearly(t, "destination pressure", r.Legs[1].PressureMmHg, 522.66, 0.06)
	exact(t, "fio2_needed", r.FiO2Needed, "0.32")
	exact(t, "gas_expansion_ratio", r.GasExpansionRatio, "1.455")
	if !hasWarning(r, WarnFieldAbove8000Ft) {
		t.Error("want FIELD_ABOVE_8000FT for the 10 000 ft destination")
	}
	// PaCO2 absent: the 40 mmHg default is applied and reported.
	found := false
	for _, a := range r.Assumptions {
		if a.Path == "patient.paco2_mmhg" && a.Value == "40" {
			found = true
		}
	}
	if !found {
		t.Errorf("assumptions %v lack patient.paco2_mmhg = 40", r.Assumptions)
	}
}

// Return leg: the ground state measured at the 10 000 ft destination field
// is the reference; descending to sea level needs less than 0.21:
// 0.21·(522.66 − 47)/(760 − 47) = 0.1401 → 0.15 (up).
func TestPlanMeasuredAtDestination(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 10000},
 "legs": [{"where": "origin", "minutes": 20, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 45, "measured_at": "destination"},
 "supply": []}`)
	nearly(t, "ground pressure", r.Ground.PressureMmHg, 522.66, 0.06)
	exact(t, "fio2_needed at sea level", r.Legs[0].FiO2Needed, "0.15")
	if !r.Legs[0].Delivers || r.Status != StatusGo {
		t.Errorf("room air at sea level holds a 10 000 ft ground state; status %s %v", r.Status, r.Warnings)
	}
	if r.CabinAltitudeFt != nil {
		t.Errorf("no cruise given: cabin_altitude_ft = %s, want null", r.CabinAltitudeFt)
	}
}

// FiO2 0.8 at sea level cannot be matched at 8 000 ft: 0.8·713/517.51 =
// 1.102 → 1.11 (PH2O 47 mmHg at 37 °C, REFERENCES §3 [practice]). The
// highest altitude where FiO2 1.0 holds it is where PB = 47 + 0.8·(760 −
// 47) = 617.4 mmHg: GNU units
// `~stdatmPH(47 mmHg + 0.8*(stdatmPH(0 ft) - 47 mmHg))` → 5638.1426 ft
// (external oracle), shown rounded down: 5638. Pressurised at 50 000 ft with 9.234 psi the cabin is 8 000 ft
// (REFERENCES §2 [calc]; the McGraw-Hill dictionary's 9.25 psi [pub]).
func TestPlanFiO2Unreachable(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0, "cruise_altitude_ft": 50000, "max_differential_psi": 9.234},
 "legs": [{"where": "cabin", "minutes": 30, "oxygen": {"device": "blender", "flow_lpm": 30, "fio2": 1.0}}],
 "patient": {"fio2": 0.8, "pao2_mmhg": 75},
 "supply": [{"size": "H", "pressure_psi": 2200}]}`)
	nearly(t, "cabin_altitude_ft", *r.CabinAltitudeFt, 8000, 5)
	nearly(t, "fio2_needed", r.FiO2Needed, 1.10, 0.011)
	if r.FiO2Possible || !hasWarning(r, WarnFiO2Unreachable) || r.Go {
		t.Errorf("want FIO2_UNREACHABLE, no-go; got possible %v, %v", r.FiO2Possible, r.Warnings)
	}
	exact(t, "max_cabin_altitude_ft (5638.14 rounded down)", r.MaxCabinAltitudeFt, "5638")
	if r.MaxCruiseAltitudeFt == nil {
		t.Fatal("pressurised: max_cruise_altitude_ft missing")
	}
	// The cruise that keeps that cabin with 9.234 psi: ambient
	// P(5638.15 ft) − 9.234 psi = 18 647.0 Pa, below P11, so the 1976
	// isothermal layer gives H = 11 000 + (R*·T11/(g0·M0))·ln(22 632.06/18 647.0)
	// = 12 228.2 m = 40 118.9 ft [calc, REFERENCES §1–2 formulas in double
	// precision outside the project], shown rounded down.
	if m := r.MaxCruiseAltitudeFt.InexactFloat64(); m != 40118 {
		t.Errorf("max_cruise_altitude_ft = %v, want 40118 (40 118.9 rounded down)", m)
	}
	// Blender at FiO2 1.0, 30 L/min: all oxygen, 30 L/min (share formula, REFERENCES §8).
	exact(t, "oxygen_lpm", r.Legs[0].OxygenLpm, "30")
}

// Ventilator, blending: (V̇E + bias + leak)·(FiO2 − 0.21)/0.79 + drive gas
// [practice, REFERENCES §9]: (8 + 2 + 0)·(0.5 − 0.21)/0.79 = 3.6709 →
// 3.68 L/min (up); × 100 min = 367.09 → 368 L (up).
func TestPlanVentilator(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 100, "oxygen": {"device": "ventilator", "drive": "blending",
   "minute_volume_lpm": 8, "bias_flow_lpm": 2, "fio2": 0.5}}],
 "patient": {"fio2": 0.5, "pao2_mmhg": 150},
 "supply": [{"water_capacity_l": 10, "pressure_bar": 200}],
 "policy": {"residual_bar": 10, "reserve_factor": 1, "reserve_minutes": 30}}`)
	exact(t, "oxygen_lpm", r.Legs[0].OxygenLpm, "3.68")
	exact(t, "oxygen_l", r.Legs[0].OxygenL, "368")
	// Water capacity: 10 L × (200 − 10) bar = 1900 L [practice, REFERENCES §7].
	exact(t, "usable", r.OxygenUsableL, "1900")
	// Reserve: 367.09 × 1 + 30 min × 3.6709 L/min = 477.22 → 478 L (up).
	exact(t, "oxygen_needed_l", r.OxygenNeededL, "478")
	if !hasWarning(r, WarnVentilatorEstimate) {
		t.Error("want VENTILATOR_ESTIMATE")
	}
}

// SpO2 only: PaO2 from the exact inverse of Severinghaus eq. 1. Eq. 1 at
// 60 mmHg gives 1/(23400/(60³ + 150·60) + 1) = 90.58 % [calc; the paper's
// Table 1 lists 90.85 % for the data eq. 1 fits], so SpO2 90.58 % gives
// PaO2 ≈ 60 mmHg.
// SpO2 above 97 % is on the flat curve: OUTSIDE_VALIDITY.
func TestPlanSpO2Only(t *testing.T) {
	doc := `{"version": 1, "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "venturi", "fio2": 0.28, "flow_lpm": 4}}],
 "patient": {"fio2": 0.28, "spo2_percent": SPO2}, "supply": [],
 "policy": {"spo2_target_percent": 88}}`
	r := mustPlan(t, strings.Replace(doc, "SPO2", "90.58", 1))
	nearly(t, "PaO2 from SpO2 90.58 %", r.Ground.PaO2MmHg, 60, 0.15)
	if r.Ground.PaO2Source != "from_spo2" || !hasWarning(r, WarnPaO2FromSpO2) || hasWarning(r, WarnOutsideValidity) {
		t.Errorf("source %s, warnings %v", r.Ground.PaO2Source, r.Warnings)
	}
	r = mustPlan(t, strings.Replace(doc, "SPO2", "98", 1))
	if !hasWarning(r, WarnOutsideValidity) {
		t.Errorf("SpO2 98 %%: want OUTSIDE_VALIDITY, got %v", r.Warnings)
	}
}

// Cylinder order and changes across legs of different flows, E factor
// 0.28 L/psi [practice]: two E at 1 000 psi give (1000 − 200)·0.28 = 224 L
// each. Legs: 20 min at 5 L/min (100 L), 40 min at 10 L/min (400 L).
// Cylinder 1 empties at 20 + 124/10 = 32.4 → minute 32 (leg 2); cylinder 2
// at 32.4 + 22.4 = 54.8 → minute 54; supply exhausted at minute 54.
func TestPlanCylinderChanges(t *testing.T) {
	r := mustPlan(t, `{"version": 1, "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 20, "oxygen": {"device": "simple_mask", "flow_lpm": 5}},
          {"where": "destination", "minutes": 40, "oxygen": {"device": "non_rebreather", "flow_lpm": 10}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90},
 "supply": [{"size": "E", "pressure_psi": 1000, "count": 2}],
 "policy": {"reserve_factor": 1}}`)
	if len(r.Cylinders) != 2 {
		t.Fatalf("%d cylinders, want 2", len(r.Cylinders))
	}
	exact(t, "cyl 1 change", *r.Cylinders[0].ChangeMinute, "32")
	exact(t, "cyl 2 start", *r.Cylinders[1].StartMinute, "32")
	exact(t, "cyl 2 change", *r.Cylinders[1].ChangeMinute, "54")
	if *r.Cylinders[0].ChangeLeg != 1 {
		t.Errorf("change leg %d, want 1", *r.Cylinders[0].ChangeLeg)
	}
	exact(t, "supply_exhausted_minute", *r.SupplyExhaustedMin, "54")
	exact(t, "margin", r.OxygenMarginL, "-52")
}

// Every example plan computes; its JSON result matches the golden file
// (refresh with go test ./physio -run TestPlanGolden -update).
func TestPlanGolden(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join(planDir, "*.json"))
	n := 0
	for _, f := range files {
		if strings.HasSuffix(f, ".result.json") {
			continue
		}
		n++
		t.Run(filepath.Base(f), func(t *testing.T) {
			data, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			doc, err := ParsePlan(data)
			if err != nil {
				t.Fatalf("ParsePlan: %v", err)
			}
			r, err := ComputePlan(doc)
			if err != nil {
				t.Fatalf("ComputePlan: %v", err)
			}
			got, _ := json.MarshalIndent(r, "", "  ")
			got = append(got, '\n')
			golden := strings.TrimSuffix(f, ".json") + ".result.json"
			compareGolden(t, golden, got)
			// The document round-trips through json.Marshal.
			again, _ := json.Marshal(doc)
			doc2, err := ParsePlan(again)
			if err != nil {
				t.Fatalf("re-parse of marshalled document: %v", err)
			}
			r2, _ := ComputePlan(doc2)
			got2, _ := json.MarshalIndent(r2, "", "  ")
			if !bytes.Equal(got[:len(got)-1], got2) {
				t.Error("marshalled document computes differently")
			}
		})
	}
	if n < 4 {
		t.Errorf("%d example plans, want at least 4", n)
	}
}

// Bad documents are refused with every problem named; messages are golden.
func TestPlanBadDocuments(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join(planDir, "bad", "*.json"))
	if len(files) < 6 {
		t.Fatalf("%d bad documents, want at least 6", len(files))
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			data, _ := os.ReadFile(f)
			doc, err := ParsePlan(data)
			if err == nil {
				_, err = ComputePlan(doc)
			}
			var pe PlanErrors
			if !errors.As(err, &pe) || len(pe) == 0 {
				t.Fatalf("want PlanErrors, got %v", err)
			}
			compareGolden(t, strings.TrimSuffix(f, ".json")+".txt", []byte(err.Error()+"\n"))
		})
	}
}

// The message the issue gives as its example, word for word.
func TestPlanErrorMessageExample(t *testing.T) {
	data, _ := os.ReadFile(filepath.Join(planDir, "bad", "out-of-range.json"))
	_, err := ParsePlan(data)
	if err == nil || !strings.Contains(err.Error(), "supply[1].pressure_bar: 412 is above the 300 bar limit") {
		t.Errorf("got %v", err)
	}
	if !errors.Is(err.(PlanErrors)[0], ErrOutOfRange) {
		t.Error("range errors should unwrap to ErrOutOfRange")
	}
}

func TestPlanValidateGoDocument(t *testing.T) {
	d := &PlanDocument{Version: 1}
	err := d.Validate()
	var pe PlanErrors
	if !errors.As(err, &pe) || len(pe) < 4 {
		t.Fatalf("empty document: %v", err)
	}
	if _, err := ComputePlan(d); err == nil {
		t.Error("ComputePlan accepted an empty document")
	}
	if _, err := ComputePlan(nil); err == nil {
		t.Error("ComputePlan accepted nil")
	}
}

func compareGolden(t *testing.T, path string, got []byte) {
	t.Helper()
	if *updatePlanGolden {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with -update to create)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the output (run with -update after checking):\n--- got\n%s", path, got)
	}
}
