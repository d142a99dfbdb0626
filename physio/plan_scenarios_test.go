package physio

import (
	"strings"
	"testing"
)

// Hand-worked chains for the cases a crew meets, in scenarios of our own.
// Pressures are from the U.S. Standard Atmosphere 1976 (REFERENCES §1),
// checked with GNU units' stdatmPH where it reaches (troposphere):
//   - stdatmPH(5000 ft) = 632.356 mmHg = 84.3073 kPa
//   - stdatmPH(6000 ft) = 609.047 mmHg
//   - stdatmPH(8000 ft) = 564.514 mmHg
//   - stdatmPH(9000 ft) = 543.258 mmHg
//
// Water vapour at 37 °C is the conventional 47 mmHg (REFERENCES §3
// [practice]); PaCO2 40 mmHg and R 0.8 give PaCO2/R = 50 mmHg.

func planWarning(r *PlanResult, code string) *PlanWarning {
	for i := range r.Warnings {
		if r.Warnings[i].Code == code {
			return &r.Warnings[i]
		}
	}
	return nil
}

// Pressurised, non-sea-level origin, the cabin held at the origin field:
// P(20 000 ft) + 8 psi = 101.72 kPa (GNU units `stdatmPH(20000 ft) + 8 psi`)
// is above P(5 000 ft) = 84.31 kPa, so the cabin stays at the 5 000 ft
// field (REFERENCES §2: never below the altitude held on the ground).
func TestPlanCabinHeldAtHighOrigin(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 5000, "destination_elevation_ft": 1000, "cruise_altitude_ft": 20000, "max_differential_psi": 8},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}},
          {"where": "cabin", "minutes": 60, "oxygen": {"device": "room_air"}},
          {"where": "destination", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 60}, "supply": []}`)
	exact(t, "cabin_altitude_ft", *r.CabinAltitudeFt, "5000")
	exact(t, "highest_altitude_ft", r.HighestAltitudeFt, "5000")
	// Same pressure as the ground: the ground FiO2 holds and nothing expands.
	exact(t, "fio2_needed", r.FiO2Needed, "0.21")
	exact(t, "gas_expansion_ratio", r.GasExpansionRatio, "1")
	if !r.Pressurised || r.MaxCruiseAltitudeFt == nil {
		t.Error("pressurised plan without max_cruise_altitude_ft")
	}
	// No oxygen used, none carried: margin 0, not short.
	exact(t, "oxygen_needed_l", r.OxygenNeededL, "0")
	if hasWarning(r, WarnSupplyShort) || !r.Go {
		t.Errorf("status %s, warnings %v", r.Status, r.Warnings)
	}
}

// Pressurised, cabin above the floor: cruise 30 000 ft with 6 psi.
// GNU units `~stdatmPH(stdatmPH(30000 ft) + 6 psi)` → 9 349.7077 ft, shown
// rounded up. Mixed supply with a bar residual (10 bar):
//   - water capacity 2 L at 200 bar: 2·(200 − 10) = 380 L [practice, §7];
//   - a label of 340 L at 137 bar (the UK D size's 340 L at 13 700 kPa,
//     Lutman & Petros 2006 [pub]) read at 100 bar: 340·(100 − 10)/137 =
//     223.36 → 223 L (down);
//   - two E at 2 000 psi, factor 0.28 L/psi [practice]: GNU units
//     `(2000 psi - 10 bar) / psi * 0.28` → 519.389 → 519 L each (down).
//
// Blender 20 L/min total at FiO2 0.6: O2 share 20·(0.6 − 0.21)/0.79 =
// 9.8734 → 9.88 L/min (up) [practice, §8]; legs 10 + 30 + 10 min →
// 493.67 L → 494 (up); ×1.5 (default reserve, [practice]) = 740.51 → 741.
// SpO2 92 % only: PaO2 from the exact inverse of Severinghaus eq. 1.
func TestPlanPressurisedMixedSupply(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 5000, "destination_elevation_ft": 1000, "cruise_altitude_ft": 30000, "max_differential_psi": 6},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "blender", "flow_lpm": 20, "fio2": 0.6}},
          {"where": "cabin", "minutes": 30, "oxygen": {"device": "blender", "flow_lpm": 20, "fio2": 0.6}},
          {"where": "destination", "minutes": 10, "oxygen": {"device": "blender", "flow_lpm": 20, "fio2": 0.6}}],
 "patient": {"fio2": 0.4, "spo2_percent": 92, "paco2_mmhg": 40},
 "supply": [{"water_capacity_l": 2, "pressure_bar": 200},
            {"label_contents_l": 340, "label_pressure_bar": 137, "pressure_bar": 100},
            {"size": "E", "pressure_psi": 2000, "count": 2}],
 "policy": {"residual_bar": 10}}`)
	exact(t, "cabin_altitude_ft", *r.CabinAltitudeFt, "9350")
	if !hasWarning(r, WarnCabinAbove8000Ft) {
		t.Error("want CABIN_ABOVE_8000FT for a 9 350 ft cabin")
	}
	// FiO2 at the cabin: 0.4·(632.356 − 47)/(P(9349.7 ft) − 47);
	// P(9349.7 ft) = 535.98 mmHg (GNU units stdatmPH) → 0.47884 → 0.48.
	exact(t, "fio2_needed", r.FiO2Needed, "0.48")
	exact(t, "leg oxygen_lpm", r.Legs[1].OxygenLpm, "9.88")
	exact(t, "leg oxygen_l", r.Legs[1].OxygenL, "297")
	exact(t, "oxygen_calculated_l", r.OxygenCalculatedL, "494")
	exact(t, "oxygen_needed_l", r.OxygenNeededL, "741")
	want := []string{"380", "223", "519", "519"}
	if len(r.Cylinders) != len(want) {
		t.Fatalf("%d cylinders, want %d", len(r.Cylinders), len(want))
	}
	for i, w := range want {
		exact(t, "usable "+r.Cylinders[i].Name, r.Cylinders[i].UsableL, w)
	}
	exact(t, "oxygen_usable_l", r.OxygenUsableL, "1641")
	exact(t, "oxygen_margin_l", r.OxygenMarginL, "900")
	exact(t, "residual_bar", r.ResidualBar, "10")
	// 9.88 L/min uses the 380 L cylinder up at 380/9.8734 = 38.49 min →
	// minute 38 (down), in flight.
	exact(t, "first change", *r.Cylinders[0].ChangeMinute, "38")
	if *r.Cylinders[0].ChangeLeg != 1 || !hasWarning(r, WarnChangeInFlight) {
		t.Errorf("first change in leg %d; want leg 1 (the cabin) and CYLINDER_CHANGE_IN_FLIGHT", *r.Cylinders[0].ChangeLeg)
	}
	if r.Ground.PaO2Source != "from_spo2" {
		t.Errorf("pao2 source %q", r.Ground.PaO2Source)
	}
	// SpO2 92 % on eq. 1 [pub, Severinghaus 1979]: S(63.79) = 0.9200.
	nearly(t, "PaO2 from SpO2 92 %", r.Ground.PaO2MmHg, 63.79, 0.11)
}

// Unpressurised: cabin = cruise (REFERENCES §2, ΔP 0); no cruise limit.
func TestPlanUnpressurised(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 500, "destination_elevation_ft": 200, "cruise_altitude_ft": 9000},
 "legs": [{"where": "cabin", "minutes": 40, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 85}, "supply": [{"size": "D", "pressure_psi": 2000}]}`)
	exact(t, "cabin_altitude_ft", *r.CabinAltitudeFt, "9000")
	if r.Pressurised || r.MaxCruiseAltitudeFt != nil {
		t.Errorf("unpressurised: pressurised %v, max cruise %v", r.Pressurised, r.MaxCruiseAltitudeFt)
	}
	nearly(t, "cabin pressure", r.Legs[0].PressureMmHg, 543.26, 0.051)
	if !hasWarning(r, WarnCabinAbove8000Ft) {
		t.Error("want CABIN_ABOVE_8000FT")
	}
}

// A pilot's stated cabin overrides the computed one, also on a pressurised
// aircraft; the cruise limit still comes from the differential.
func TestPlanStatedCabinOverridesPressurised(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0, "cruise_altitude_ft": 41000,
           "max_differential_psi": 6, "cabin_altitude_ft": 6000},
 "legs": [{"where": "cabin", "minutes": 60, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`)
	exact(t, "cabin_altitude_ft", *r.CabinAltitudeFt, "6000")
	nearly(t, "cabin pressure", r.Legs[0].PressureMmHg, 609.05, 0.051)
	if cabin, _ := r.Explain.Get("cabin_altitude_ft"); cabin.Source != srcPilot || !r.Pressurised || r.MaxCruiseAltitudeFt == nil {
		t.Errorf("stated cabin: source %q, pressurised %v", cabin.Source, r.Pressurised)
	}
	// FiO2 0.21·(760 − 47)/(609.05 − 47) = 0.2664 → 0.27; room air
	// falls short, so options are offered.
	exact(t, "fio2_needed", r.FiO2Needed, "0.27")
	if r.Legs[0].Delivers || len(r.Legs[0].Options) == 0 {
		t.Errorf("room air at 6 000 ft should fall short with options; delivers %v", r.Legs[0].Delivers)
	}
}

// Ventilator, both drives [practice, REFERENCES §9], and a ventilated leg
// that falls short. Ground FiO2 0.5 at sea level; stated 8 000 ft cabin:
// FiO2 needed 0.5·(760 − 47)/(564.51 − 47) = 0.6889 → 0.69 (up).
//   - blending at 0.5: (8 + 2)·(0.5 − 0.21)/0.79 = 3.6709 L/min; 60 min →
//     220.25 → 221 L (up).
//   - oxygen-driven at 0.6 with leak 1 and drive gas 1: (8 + 2 + 1)·0.6 + 1
//     = 7.6 L/min; 30 min → 228 L.
//   - need with factor 1 and 30 reserve minutes at the highest flow:
//     448.25 + 30·7.6 = 676.25 → 677 L (up); usable 10·(200 − 10) = 1 900 L.
//
// The only option offered for the ventilated leg is the ventilator with
// its FiO2 raised: (8 + 2)·(0.69 − 0.21)/0.79 = 6.076 → 6.1 L/min (up).
func TestPlanVentilatorBothDrives(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0, "cabin_altitude_ft": 8000},
 "legs": [{"where": "cabin", "minutes": 60, "oxygen": {"device": "ventilator", "drive": "blending",
            "minute_volume_lpm": 8, "bias_flow_lpm": 2, "fio2": 0.5}},
          {"where": "destination", "minutes": 30, "oxygen": {"device": "ventilator", "drive": "oxygen",
            "minute_volume_lpm": 8, "bias_flow_lpm": 2, "leak_lpm": 1, "drive_gas_lpm": 1, "fio2": 0.6}}],
 "patient": {"fio2": 0.5, "pao2_mmhg": 120, "paco2_mmhg": 40},
 "supply": [{"water_capacity_l": 10, "pressure_bar": 200}],
 "policy": {"residual_bar": 10, "reserve_factor": 1, "reserve_minutes": 30}}`)
	exact(t, "blending oxygen_lpm", r.Legs[0].OxygenLpm, "3.68")
	exact(t, "blending oxygen_l", r.Legs[0].OxygenL, "221")
	exact(t, "oxygen-driven oxygen_lpm", r.Legs[1].OxygenLpm, "7.6")
	exact(t, "oxygen-driven oxygen_l", r.Legs[1].OxygenL, "228")
	exact(t, "oxygen_calculated_l", r.OxygenCalculatedL, "449")
	exact(t, "oxygen_needed_l", r.OxygenNeededL, "677")
	exact(t, "oxygen_usable_l", r.OxygenUsableL, "1900")
	exact(t, "oxygen_margin_l", r.OxygenMarginL, "1223")
	exact(t, "fio2_needed", r.FiO2Needed, "0.69")
	l := r.Legs[0]
	if l.Delivers || !hasWarning(r, WarnSetUpBelowNeed) {
		t.Fatalf("ventilator at 0.5 in an 8 000 ft cabin should fall short of 0.69")
	}
	if len(l.Options) != 1 || l.Options[0].Device != Ventilator {
		t.Fatalf("options for a ventilated leg = %+v, want only the ventilator", l.Options)
	}
	exact(t, "option FiO2", l.Options[0].FiO2Low, "0.69")
	exact(t, "option oxygen_lpm", l.Options[0].OxygenLpm, "6.1")
	if !r.Legs[1].Delivers {
		t.Error("the sea-level leg at 0.6 holds a 0.5 ground state")
	}
}

// Every option offered for a leg that falls short would itself deliver the
// need by the leg's own rule: its low end (rounded down) at or above the
// need (rounded up). Room air in an 8 000 ft cabin needs 0.29 (REFERENCES
// §4 [calc] 0.289). By the BTS 2017 ranges [pub] with the cannula's
// +0.04 per L/min [practice] and Alvea's ±0.04 band, the lowest flows that
// start at or above 0.29: cannula 4 L/min (0.32–0.40), simple mask
// 5 L/min (0.36–0.44), non-rebreather 10 L/min (0.56–0.64); the Venturi
// 0.31 setting at its 6 L/min minimum; high-flow 30 L/min total at 0.29:
// 30·0.08/0.79 = 3.04 → 3.1 L/min oxygen.
func TestPlanOptionsDeliver(t *testing.T) {
	r := mustPlan(t, planSeaLevelTo8000)
	l := r.Legs[1]
	if l.Delivers {
		t.Fatal("room air at 8 000 ft should fall short")
	}
	exact(t, "need", l.FiO2Needed, "0.29")
	got := map[string]PlanOption{}
	for _, o := range l.Options {
		if o.FiO2Low.Cmp(l.FiO2Needed.Decimal) < 0 {
			t.Errorf("option %q starts at FiO2 %s, below the %s needed", o.Label, o.FiO2Low, l.FiO2Needed)
		}
		if _, dup := got[string(o.Device)]; !dup {
			got[string(o.Device)] = o
		}
		if !strings.HasPrefix(o.Label, "option: ") {
			t.Errorf("label %q is not marked as an option", o.Label)
		}
	}
	for dev, lpm := range map[Device]string{NasalCannula: "4", SimpleMask: "5", NonRebreather: "10", Venturi: "6", HighFlow: "3.1"} {
		o, ok := got[string(dev)]
		if !ok {
			t.Errorf("no %s option", dev)
			continue
		}
		exact(t, string(dev)+" option oxygen_lpm", o.OxygenLpm, lpm)
	}
	exact(t, "Venturi option FiO2", got[string(Venturi)].FiO2Low, "0.31")
	// Sorted by oxygen flow.
	for i := 1; i < len(l.Options); i++ {
		if l.Options[i].OxygenLpm.Cmp(l.Options[i-1].OxygenLpm.Decimal) < 0 {
			t.Errorf("options not sorted by oxygen flow: %v", l.Options)
		}
	}
}

// A high-flow leg that falls short is offered the same device with its
// FiO2 raised at the same total first: 50 L/min at 0.82 →
// 50·(0.82 − 0.21)/0.79 = 38.61 → 38.7 L/min oxygen (up).
func TestPlanOptionsSameDeviceFirst(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0, "cabin_altitude_ft": 400},
 "legs": [{"where": "cabin", "minutes": 15, "oxygen": {"device": "high_flow", "flow_lpm": 50, "fio2": 0.8}}],
 "patient": {"fio2": 0.8, "pao2_mmhg": 72, "paco2_mmhg": 36}, "supply": []}`)
	l := r.Legs[0]
	// 0.8·(760 − 47)/(P(400 ft) − 47), P(400 ft) = 749.08 mmHg
	// (GNU units stdatmPH) → 0.8124 → 0.82.
	exact(t, "need", l.FiO2Needed, "0.82")
	if l.Delivers || len(l.Options) == 0 {
		t.Fatal("high-flow at 0.8 should fall short of 0.82")
	}
	first := l.Options[0]
	if first.Device != HighFlow || first.TotalLpm.String() != "50" {
		t.Fatalf("first option %+v, want high_flow at the same 50 L/min", first)
	}
	exact(t, "same-device oxygen", first.OxygenLpm, "38.7")
	for _, o := range l.Options[1:] {
		if o.Device == HighFlow && o.TotalLpm.String() == "50" {
			t.Error("the same high-flow set-up is offered twice")
		}
		if o.FiO2Low.Cmp(l.FiO2Needed.Decimal) < 0 {
			t.Errorf("option %q starts below the need", o.Label)
		}
	}
}

// A destination field higher than every planned leg, with no leg of its
// own, is flagged with the FiO2 it needs: 0.21·(760 − 47)/(543.26 − 47)
// = 0.3017 → 0.31 at 9 000 ft. With a ground FiO2 of 0.8 it would need
// 0.8·713/496.26 = 1.149: FiO2 1.0 cannot, a no-go.
func TestPlanUnplannedHigherField(t *testing.T) {
	doc := `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 9000, "cabin_altitude_ft": 6000},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "OX"}},
          {"where": "cabin", "minutes": 60, "oxygen": {"device": "OX"}}],
 "patient": {"fio2": FIO2, "pao2_mmhg": 75}, "supply": []}`
	air := strings.NewReplacer("FIO2", "0.21", `"OX"`, `"nasal_cannula", "flow_lpm": 2`).Replace(doc)
	r := mustPlan(t, air)
	w := planWarning(r, WarnFieldAboveLegs)
	if w == nil || !strings.Contains(w.Message, "destination field (9000 ft)") || !strings.Contains(w.Message, "FiO2 0.31") {
		t.Fatalf("want FIELD_ABOVE_LEGS naming the 9000 ft destination and FiO2 0.31; got %v", r.Warnings)
	}
	if w.Severity != SeverityCaution || r.Status == StatusGo {
		t.Errorf("severity %s, status %s", w.Severity, r.Status)
	}
	// The highest leg is still the cabin; the flag does not move the numbers.
	exact(t, "highest_altitude_ft", r.HighestAltitudeFt, "6000")

	// Ground FiO2 0.8, a 3 000 ft cabin the high-flow set-up still holds
	// (0.8·713/(681.14 − 47) = 0.8995 → 0.90, GNU units
	// stdatmPH(3000 ft) = 681.14 mmHg); only the destination cannot.
	high := strings.NewReplacer("FIO2", "0.8", `"OX"`, `"high_flow", "flow_lpm": 40, "fio2": 0.9`,
		`"pao2_mmhg": 75`, `"pao2_mmhg": 300`, `"cabin_altitude_ft": 6000`, `"cabin_altitude_ft": 3000`).Replace(doc)
	r = mustPlan(t, high)
	exact(t, "cabin fio2_needed", r.FiO2Needed, "0.9")
	var unreachable []PlanWarning
	for _, w := range r.Warnings {
		if w.Code == WarnFiO2Unreachable {
			unreachable = append(unreachable, w)
		}
	}
	if len(unreachable) != 1 || !strings.Contains(unreachable[0].Message, "destination field (9000 ft)") ||
		!strings.Contains(unreachable[0].Message, "FiO2 1.15") || r.FiO2Possible || r.Go {
		t.Errorf("want one FIO2_UNREACHABLE at the destination field (1.149 → 1.15) and no-go; got possible %v, %v", r.FiO2Possible, r.Warnings)
	}
	// A destination leg there makes it a planned leg instead.
	withLeg := strings.Replace(air, `"legs": [`, `"legs": [{"where": "destination", "minutes": 5, "oxygen": {"device": "simple_mask", "flow_lpm": 5}}, `, 1)
	r = mustPlan(t, withLeg)
	if hasWarning(r, WarnFieldAboveLegs) {
		t.Error("FIELD_ABOVE_LEGS with a destination leg")
	}
	exact(t, "highest_altitude_ft", r.HighestAltitudeFt, "9000")
	exact(t, "fio2_needed", r.FiO2Needed, "0.31")
}

// Counts above 1 expand into cylinders used in turn; a cylinder at its
// residual is flagged in the unit of the policy (bar here).
func TestPlanCountAndResidualInBar(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 30, "oxygen": {"device": "simple_mask", "flow_lpm": 6}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 85},
 "supply": [{"water_capacity_l": 2, "pressure_bar": 10, "count": 1},
            {"water_capacity_l": 2, "pressure_bar": 150, "count": 3}],
 "policy": {"residual_bar": 20, "reserve_factor": 1}}`)
	if len(r.Cylinders) != 4 {
		t.Fatalf("%d cylinders, want 4", len(r.Cylinders))
	}
	// 2·(150 − 20) = 260 L each [practice, §7]; the first holds none.
	exact(t, "empty first", r.Cylinders[0].UsableL, "0")
	for i := 1; i < 4; i++ {
		exact(t, "usable", r.Cylinders[i].UsableL, "260")
		if r.Cylinders[i].Copy != i {
			t.Errorf("copy %d, want %d", r.Cylinders[i].Copy, i)
		}
	}
	w := planWarning(r, WarnCylinderAtResidual)
	if w == nil || !strings.Contains(w.Message, "20 bar residual") {
		t.Errorf("want CYLINDER_AT_RESIDUAL in bar, got %v", r.Warnings)
	}
	// 6 L/min × 30 min = 180 L from the second cylinder: it is not emptied.
	exact(t, "oxygen_calculated_l", r.OxygenCalculatedL, "180")
	if r.Cylinders[1].ChangeMinute != nil {
		t.Errorf("second cylinder emptied at %s", r.Cylinders[1].ChangeMinute)
	}
	// Supply reaches the residual after the transport: 30 + (780 − 180)/6 = 130.
	exact(t, "supply_exhausted_minute", *r.SupplyExhaustedMin, "130")
}

// Ground state measured at a 6 000 ft destination (609.047 mmHg, GNU units
// stdatmPH), on air with PaO2 60 mmHg, flown from sea level in a stated
// 8 000 ft cabin (564.514 mmHg). Hand-worked with PH2O 47 and PaCO2/R 50:
//   - ground PAO2 0.21·(609.047 − 47) − 50 = 68.03 mmHg; a/A = 60/68.03;
//   - cabin FiO2 needed 0.21·562.047/517.514 = 0.2281 → 0.23; at the
//     sea-level origin 0.21·562.047/713 = 0.1655 → 0.17 (both up);
//   - cabin on a 2 L/min cannula (low end 0.24, BTS 2017 with Alvea's
//     band): PAO2 0.24·517.514 − 50 = 74.20; PaO2 60·74.20/68.03 = 65.44;
//   - FiO2 1.0 holds the ground state up to PB = 47 + 0.21·562.047 =
//     165.03 mmHg, in the isothermal layer: 11 179.0 m = 36 676.5 ft
//     [calc, REFERENCES §1 formula in double precision], shown rounded down.
func TestPlanMeasuredAtDestinationWithFlight(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 6000, "cabin_altitude_ft": 8000},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}},
          {"where": "cabin", "minutes": 60, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}},
          {"where": "destination", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 60, "paco2_mmhg": 40, "measured_at": "destination"},
 "supply": [{"size": "D", "pressure_psi": 2000}]}`)
	if r.Ground.MeasuredAt != WhereDestination {
		t.Fatalf("measured_at %q", r.Ground.MeasuredAt)
	}
	nearly(t, "ground PAO2", r.Ground.AlveolarPO2MmHg, 68.0, 0.051)
	exact(t, "cabin fio2_needed", r.Legs[1].FiO2Needed, "0.23")
	exact(t, "origin fio2_needed", r.Legs[0].FiO2Needed, "0.17")
	exact(t, "destination fio2_needed", r.Legs[2].FiO2Needed, "0.21")
	exact(t, "fio2_needed (highest leg)", r.FiO2Needed, "0.23")
	nearly(t, "cabin PAO2", r.Legs[1].PAO2MmHg, 74.2, 0.051)
	nearly(t, "cabin expected PaO2", r.Legs[1].PaO2ExpectedMmHg, 65.4, 0.051)
	exact(t, "max_cabin_altitude_ft", r.MaxCabinAltitudeFt, "36676")
	nearly(t, "destination expected PaO2 (the ground state)", r.Legs[2].PaO2ExpectedMmHg, 60, 0.11)
	if !r.Legs[1].Delivers {
		t.Error("cannula 2 L/min (0.24) holds 0.23")
	}
}

// A flight whose cabin altitude lies below both fields is flagged (a
// plausibility check of our own, not a published value): an unpressurised
// cruise of −2000 ft between fields at 5400 ft and 1800 ft, and a stated
// cabin altitude likewise. The numbers stay as given: the flight leg is at
// −2000 ft. A cruise between the two fields (down a valley) and a
// pressurised cabin held at the origin are not flagged; a pressurised
// aircraft cruising below both fields is (its cabin is at the cruise).
func TestPlanCabinBelowFields(t *testing.T) {
	doc := `{"version": 1,
 "route": {"origin_elevation_ft": 5400, "destination_elevation_ft": 1800, ROUTE},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}},
          {"where": "cabin", "minutes": 40, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 60}, "supply": []}`
	plan := func(route string) *PlanResult {
		return mustPlan(t, strings.Replace(doc, "ROUTE", route, 1))
	}
	r := plan(`"cruise_altitude_ft": -2000`)
	w := planWarning(r, WarnCabinBelowFields)
	if w == nil || w.Severity != SeverityCaution || w.Leg == nil || *w.Leg != 1 ||
		!strings.Contains(w.Message, "cabin altitude -2000 ft is below both fields (origin 5400 ft, destination 1800 ft)") ||
		!strings.Contains(w.Message, "check the cruise altitude") {
		t.Fatalf("want CABIN_BELOW_FIELDS on leg 2 naming −2000 ft and both fields; got %v", r.Warnings)
	}
	if r.Status == StatusGo {
		t.Errorf("status %s with a caution", r.Status)
	}
	exact(t, "cabin leg altitude_ft", r.Legs[1].AltitudeFt, "-2000")

	r = plan(`"cabin_altitude_ft": 1000`)
	if w := planWarning(r, WarnCabinBelowFields); w == nil || !strings.Contains(w.Message, "check the stated cabin altitude") {
		t.Errorf("stated cabin 1000 ft: want CABIN_BELOW_FIELDS naming the stated cabin altitude; got %v", r.Warnings)
	}
	if r := plan(`"cruise_altitude_ft": 1000, "max_differential_psi": 4`); !hasWarning(r, WarnCabinBelowFields) {
		t.Errorf("pressurised, cruise 1000 ft: want CABIN_BELOW_FIELDS; got %v", r.Warnings)
	}
	for _, route := range []string{`"cruise_altitude_ft": 4000`, `"cruise_altitude_ft": 1800`, `"cruise_altitude_ft": 25000, "max_differential_psi": 4`} {
		if r := plan(route); hasWarning(r, WarnCabinBelowFields) {
			t.Errorf("%s: CABIN_BELOW_FIELDS, want none: %v", route, r.Warnings)
		}
	}
}
