package physio

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// FuzzParsePlan: any input either is refused with PlanErrors, or parses
// to a document that computes (or is refused with PlanErrors) without a
// panic and without NaN or Inf anywhere in the result.
func FuzzParsePlan(f *testing.F) {
	for _, dir := range []string{planDir, filepath.Join(planDir, "bad")} {
		files, _ := filepath.Glob(filepath.Join(dir, "*.json"))
		for _, p := range files {
			if strings.HasSuffix(p, ".result.json") {
				continue
			}
			if data, err := os.ReadFile(p); err == nil {
				f.Add(data)
			}
		}
	}
	f.Add([]byte(planSeaLevelTo8000))
	f.Add([]byte(`[]`))
	f.Add([]byte(`{"version": 1e400}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		doc, err := ParsePlan(data)
		if err != nil {
			var pe PlanErrors
			if !errors.As(err, &pe) || len(pe) == 0 {
				t.Fatalf("ParsePlan error is not PlanErrors: %v", err)
			}
			return
		}
		r, err := ComputePlan(doc)
		if err != nil {
			var pe PlanErrors
			if !errors.As(err, &pe) {
				t.Fatalf("a parsed document failed to compute: %v", err)
			}
			return
		}
		out, err := json.Marshal(r)
		if err != nil {
			t.Fatalf("marshal: %v", err)
		}
		if strings.Contains(string(out), "NaN") || strings.Contains(string(out), "Inf") {
			t.Fatalf("non-number in result: %s", out)
		}
		checkFinite(t, reflect.ValueOf(r))
		// Safe side: the margin is exactly usable − needed.
		if r.OxygenMarginL.Cmp(r.OxygenUsableL.Sub(r.OxygenNeededL.Decimal)) != 0 {
			t.Fatalf("margin %s ≠ %s − %s", r.OxygenMarginL, r.OxygenUsableL, r.OxygenNeededL)
		}
		if r.OxygenNeededL.Cmp(r.OxygenCalculatedL.Decimal) < 0 {
			t.Fatalf("needed with reserve %s below calculated %s", r.OxygenNeededL, r.OxygenCalculatedL)
		}
		// A leg judged as delivering, and every option offered, starts at
		// or above the FiO2 needed; fio2_needed is the highest leg need.
		for _, l := range r.Legs {
			if l.Delivers && l.FiO2DeliveredLow.Cmp(l.FiO2Needed.Decimal) < 0 {
				t.Fatalf("leg %d delivers with %s below the %s needed", l.Index, l.FiO2DeliveredLow, l.FiO2Needed)
			}
			for _, o := range l.Options {
				if o.FiO2Low.Cmp(l.FiO2Needed.Decimal) < 0 {
					t.Fatalf("leg %d option %q below the %s needed", l.Index, o.Label, l.FiO2Needed)
				}
			}
			if l.FiO2Needed.Cmp(r.FiO2Needed.Decimal) > 0 {
				t.Fatalf("leg %d needs %s, above fio2_needed %s", l.Index, l.FiO2Needed, r.FiO2Needed)
			}
			if !l.FiO2Possible && r.FiO2Possible {
				t.Fatalf("leg %d impossible but fio2_possible true", l.Index)
			}
		}
		if r.Status == StatusNoGo && r.Go || r.Status != StatusNoGo && !r.Go {
			t.Fatalf("status %s but go %v", r.Status, r.Go)
		}
	})
}

func checkFinite(t *testing.T, v reflect.Value) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			checkFinite(t, v.Elem())
		}
	case reflect.Struct:
		for i := 0; i < v.NumField(); i++ {
			if v.Type().Field(i).IsExported() {
				checkFinite(t, v.Field(i))
			}
		}
	case reflect.Slice:
		for i := 0; i < v.Len(); i++ {
			checkFinite(t, v.Index(i))
		}
	case reflect.Map:
		for _, k := range v.MapKeys() {
			checkFinite(t, v.MapIndex(k))
		}
	case reflect.Float64:
		if math.IsNaN(v.Float()) || math.IsInf(v.Float(), 0) {
			t.Fatalf("non-finite float in result")
		}
	}
}

// BenchmarkComputePlan: the whole chain on the pressurised long-leg example
// (parse excluded). Target well under 50 µs/op.
func BenchmarkComputePlan(b *testing.B) {
	data, err := os.ReadFile(filepath.Join(planDir, "fixed-wing-long.json"))
	if err != nil {
		b.Fatal(err)
	}
	doc, err := ParsePlan(data)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ComputePlan(doc); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseAndComputePlan: document bytes to result.
func BenchmarkParseAndComputePlan(b *testing.B) {
	data, err := os.ReadFile(filepath.Join(planDir, "ventilated.json"))
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		doc, err := ParsePlan(data)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := ComputePlan(doc); err != nil {
			b.Fatal(err)
		}
	}
}

// FuzzComputePlanValues drives the chain with documents built in Go from
// fuzzed numbers (the JSON fuzzer rarely reaches valid plans): every
// document that validates computes without a panic, without NaN or Inf,
// with the plan's safe-side invariants; every other one is refused with
// PlanErrors.
func FuzzComputePlanValues(f *testing.F) {
	f.Add(0.0, 0.0, 8000.0, 0.0, 0.21, 80.0, uint8(0), 2.0, 60.0, 2000.0, 0.5, 1.5, 0.0)
	f.Add(5400.0, 1800.0, 10500.0, 0.0, 0.28, 61.0, uint8(3), 10.0, 55.0, 1900.0, 0.4, 1.5, 30.0)
	f.Add(300.0, 9000.0, 41000.0, 8.7, 0.8, 72.0, uint8(5), 50.0, 250.0, 150.0, 1.0, 2.0, 0.0)
	f.Add(-2000.0, 18000.0, 51000.0, 11.0, 1.0, 400.0, uint8(6), 8.0, 2880.0, 3000.0, 0.6, 3.0, 240.0)
	f.Fuzz(func(t *testing.T, origin, dest, cruise, dp, fio2, pao2 float64, device uint8, flow, minutes, gauge, legFiO2, factor, resMin float64) {
		devices := []Device{NasalCannula, SimpleMask, NonRebreather, Venturi, Blender, HighFlow, Ventilator, RoomAir}
		o := &PlanOxygen{Device: devices[int(device)%len(devices)]}
		switch o.Device {
		case NasalCannula, SimpleMask, NonRebreather:
			o.FlowLpm = PlanValue(flow)
		case Venturi, Blender, HighFlow:
			o.FlowLpm, o.FiO2 = PlanValue(flow), PlanValue(legFiO2)
		case Ventilator:
			o.MinuteVolumeLpm, o.FiO2, o.Drive = PlanValue(flow), PlanValue(legFiO2), DriveBlending
			if device >= 128 {
				o.Drive, o.BiasFlowLpm, o.DriveGasLpm = DriveOxygen, PlanValue(2), PlanValue(1)
			}
		}
		size := []CylinderSize{SizeD, SizeE, SizeM, SizeG, SizeH}[int(device/8)%5]
		doc := &PlanDocument{Version: 1,
			Route: PlanRoute{OriginElevationFt: PlanValue(origin), DestinationElevationFt: PlanValue(dest),
				CruiseAltitudeFt: PlanValue(cruise), MaxDifferentialPsi: PlanValue(dp)},
			Legs: []PlanLeg{
				{Where: WhereOrigin, Minutes: PlanValue(10), Oxygen: o},
				{Where: WhereCabin, Minutes: PlanValue(minutes), Oxygen: o},
				{Where: WhereDestination, Minutes: PlanValue(10), Oxygen: o}},
			Patient: PlanPatient{FiO2: PlanValue(fio2), PaO2MmHg: PlanValue(pao2)},
			Supply:  []PlanSupply{{Size: size, PressurePsi: PlanValue(gauge)}, {WaterCapacityL: PlanValue(10), PressureBar: PlanValue(gauge / 14.5)}},
			Policy:  &PlanPolicy{ReserveFactor: PlanValue(factor), ReserveMinutes: PlanValue(resMin)},
		}
		r, err := ComputePlan(doc)
		if err != nil {
			var pe PlanErrors
			if !errors.As(err, &pe) || len(pe) == 0 {
				t.Fatalf("error is not PlanErrors: %v", err)
			}
			return
		}
		checkFinite(t, reflect.ValueOf(r))
		if r.OxygenMarginL.Cmp(r.OxygenUsableL.Sub(r.OxygenNeededL.Decimal)) != 0 {
			t.Fatalf("margin %s ≠ %s − %s", r.OxygenMarginL, r.OxygenUsableL, r.OxygenNeededL)
		}
		for _, l := range r.Legs {
			if l.Delivers && l.FiO2DeliveredLow.Cmp(l.FiO2Needed.Decimal) < 0 {
				t.Fatalf("leg %d delivers with %s below %s", l.Index, l.FiO2DeliveredLow, l.FiO2Needed)
			}
			for _, op := range l.Options {
				if op.FiO2Low.Cmp(l.FiO2Needed.Decimal) < 0 {
					t.Fatalf("option %q below the %s needed", op.Label, l.FiO2Needed)
				}
			}
		}
		// The cabin never rounds below the exact value, and never lies above
		// the cruise altitude (REFERENCES §2).
		if r.CabinAltitudeFt != nil && r.CabinAltitudeFt.InexactFloat64() > math.Ceil(cruise) {
			t.Fatalf("cabin %s above cruise %v", r.CabinAltitudeFt, cruise)
		}
		if r.HighestAltitudeFt.InexactFloat64() < math.Max(origin, dest)-1e-6 {
			t.Fatalf("highest %s below a field (%v, %v)", r.HighestAltitudeFt, origin, dest)
		}
	})
}
