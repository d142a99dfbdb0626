package physio

import (
	"errors"
	"math"
	"testing"
)

func TestDeviceFiO2LowFlow(t *testing.T) {
	// Published ranges: BTS guideline for oxygen use in adults, Thorax
	// 2017;72(Suppl 1) [pub] — cannula 1–6 L/min ≈ 0.24–0.44, simple mask
	// 5–10 L/min 0.40–0.60, non-rebreather 10–15 L/min 0.60–0.90. The
	// cannula's +0.04 per L/min from 0.24 at 1 L/min is common practice
	// [practice]. The ±0.04 band (DeviceFiO2Band) is Alvea's convention, so
	// the published values are checked as the band's centre, and the band's
	// limits are [calc].
	tests := []struct {
		d         Device
		flow      float64
		centre    float64 // source in src
		low, high float64 // [calc] centre ± 0.04, within 0.21 and the published maximum
		src       string
	}{
		{NasalCannula, 1, 0.24, 0.21, 0.28, "BTS 2017 [pub] lower end"},
		{NasalCannula, 2, 0.28, 0.24, 0.32, "+0.04 per L/min [practice]"},
		{NasalCannula, 3, 0.32, 0.28, 0.36, "+0.04 per L/min [practice]"},
		{NasalCannula, 4, 0.36, 0.32, 0.40, "+0.04 per L/min [practice]"},
		{NasalCannula, 6, 0.44, 0.40, 0.44, "BTS 2017 [pub] upper end"},
		{SimpleMask, 5, 0.40, 0.36, 0.44, "BTS 2017 [pub] lower end"},
		{SimpleMask, 10, 0.60, 0.56, 0.60, "BTS 2017 [pub] upper end"},
		{NonRebreather, 10, 0.60, 0.56, 0.64, "BTS 2017 [pub] lower end"},
		{NonRebreather, 15, 0.90, 0.86, 0.90, "BTS 2017 [pub] upper end"},
	}
	for _, tc := range tests {
		r, err := DeviceFiO2(tc.d, LitresPerMinute(tc.flow))
		if err != nil {
			t.Fatalf("%s %v L/min: %v", tc.d, tc.flow, err)
		}
		if !supplyClose(float64(r.Low), tc.low, 1e-9) || !supplyClose(float64(r.High), tc.high, 1e-9) {
			t.Errorf("%s %v L/min = %.4f–%.4f, want %.2f–%.2f", tc.d, tc.flow, r.Low, r.High, tc.low, tc.high)
		}
		lf := deviceLowFlowTable[tc.d]
		if got := deviceLowFlowEstimate(lf, tc.flow); !supplyClose(got, tc.centre, 1e-9) {
			t.Errorf("%s %v L/min estimate %v, want %v (%s)", tc.d, tc.flow, got, tc.centre, tc.src)
		}
	}
}

func TestDeviceFiO2SetOnDevice(t *testing.T) {
	// Venturi: 0.24 up to the highest setting whose minimum flow is reached
	// (minimum flows: common practice, recalled from training material
	// [memory]; the adapter's label wins).
	for _, tc := range []struct{ flow, high float64 }{{2, 0.24}, {4, 0.28}, {7, 0.31}, {10, 0.40}, {14.9, 0.40}, {15, 0.60}} {
		r, err := DeviceFiO2(Venturi, LitresPerMinute(tc.flow))
		if err != nil || r.Low != 0.24 || float64(r.High) != tc.high {
			t.Errorf("Venturi %v L/min = %+v, %v; want 0.24–%v", tc.flow, r, err, tc.high)
		}
	}
	for _, d := range []Device{Blender, HighFlow} {
		r, err := DeviceFiO2(d, LitresPerMinute(30))
		if err != nil || r.Low != 0.21 || r.High != 1 {
			t.Errorf("%s = %+v, %v; want 0.21–1", d, r, err)
		}
	}
	_, err := DeviceFiO2(Ventilator, LitresPerMinute(8))
	if !errors.Is(err, ErrImpossible) {
		t.Errorf("DeviceFiO2(ventilator) = %v, want ErrImpossible (use VentilatorOxygen)", err)
	}
}

func TestDeviceFlowRange(t *testing.T) {
	// BTS 2017 [pub] for the low-flow devices; Venturi from the settings'
	// minimum flows [memory]; high-flow 10–60 L/min adults [practice].
	tests := []struct {
		d        Device
		min, max float64
		ok       bool
	}{
		{NasalCannula, 1, 6, true}, {SimpleMask, 5, 10, true}, {NonRebreather, 10, 15, true},
		{Venturi, 2, 15, true}, {HighFlow, 10, 60, true},
		{Blender, 0, 0, false}, {Ventilator, 0, 0, false}, {"tent", 0, 0, false},
	}
	for _, tc := range tests {
		min, max, ok := DeviceFlowRange(tc.d)
		if ok != tc.ok || float64(min) != tc.min || float64(max) != tc.max {
			t.Errorf("DeviceFlowRange(%s) = %v, %v, %v; want %v, %v, %v", tc.d, min, max, ok, tc.min, tc.max, tc.ok)
		}
	}
}

func TestVenturi(t *testing.T) {
	// REFERENCES §8 [calc]: FiO2 0.40 → 3.16:1; 0.28 → 10.29:1
	// (air:O2 = (1 − F)/(F − 0.21)); the rest [calc] from the same formula.
	tests := []struct {
		fio2, ratio float64
		rel         float64
		src         string
	}{
		{0.40, 3.16, 5e-3, "REFERENCES §8 [calc], given to 2 decimals"},
		{0.28, 10.29, 5e-4, "REFERENCES §8 [calc], given to 2 decimals"},
		{0.40, 0.60 / 0.19, 1e-12, "[calc]"},
		{0.24, 0.76 / 0.03, 1e-12, "[calc]"},
		{0.60, 0.40 / 0.39, 1e-12, "[calc]"},
		{1.00, 0, 0, "[calc] pure oxygen entrains nothing"},
	}
	for _, tc := range tests {
		got, err := VenturiEntrainmentRatio(Fraction(tc.fio2))
		if err != nil || !supplyClose(got, tc.ratio, tc.rel) {
			t.Errorf("VenturiEntrainmentRatio(%v) = %v, %v; want %v (%s)", tc.fio2, got, err, tc.ratio, tc.src)
		}
	}
	// Total flow = O2 × (1 + ratio) [calc]: 0.40 at 10 L/min → 41.58 L/min.
	total, err := VenturiTotalFlow(LitresPerMinute(10), 0.40)
	if err != nil || !supplyClose(total.LitresPerMinute(), 10*(1+0.60/0.19), 1e-12) {
		t.Errorf("VenturiTotalFlow(10, 0.40) = %v, %v; want 41.58", total, err)
	}
	// The total flow blended back gives the setting: an independent
	// consistency check through BlendFiO2.
	for _, s := range VenturiSettings {
		min, err := VenturiMinimumFlow(s)
		if err != nil {
			t.Fatal(err)
		}
		total, _ := VenturiTotalFlow(min, s)
		back, err := BlendFiO2(min, total-min)
		if err != nil || !supplyClose(float64(back), float64(s), 1e-12) {
			t.Errorf("setting %v: blended back to %v, %v", s, back, err)
		}
	}
}

func TestVenturiMinimumFlow(t *testing.T) {
	// Minimum O2 flows printed on common adapters [memory; practice].
	want := map[float64]float64{0.24: 2, 0.28: 4, 0.31: 6, 0.35: 8, 0.40: 10, 0.60: 15}
	for s, f := range want {
		got, err := VenturiMinimumFlow(Fraction(s))
		if err != nil || float64(got) != f {
			t.Errorf("VenturiMinimumFlow(%v) = %v, %v; want %v", s, got, err, f)
		}
	}
	if got, err := VenturiMinimumFlow(Percent(28)); err != nil || got != 4 {
		t.Errorf("VenturiMinimumFlow(28 %%) = %v, %v; want 4", got, err)
	}
	for _, s := range []float64{0.5, 0, -0.24, 24, math.NaN()} {
		_, err := VenturiMinimumFlow(Fraction(s))
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, ErrOutOfRange) || pe.Quantity != "Venturi setting" || pe.Want == "" {
			t.Errorf("VenturiMinimumFlow(%v) = %v, want *ParseError listing the settings", s, err)
		}
	}
}

func TestBlending(t *testing.T) {
	// Mixing FiO2 = (Q_O2 + 0.21·Q_air)/(Q_O2 + Q_air), REFERENCES §8 [calc].
	tests := []struct{ o2, air, want float64 }{
		{5, 5, 0.605},                   // [calc] equal parts
		{10, 0, 1},                      // [calc] oxygen only
		{0, 10, 0.21},                   // [calc] air only
		{15, 45, (15 + 0.21*45) / 60.0}, // [calc]
	}
	for _, tc := range tests {
		got, err := BlendFiO2(LitresPerMinute(tc.o2), LitresPerMinute(tc.air))
		if err != nil || !supplyClose(float64(got), tc.want, 1e-12) {
			t.Errorf("BlendFiO2(%v, %v) = %v, %v; want %v", tc.o2, tc.air, got, err, tc.want)
		}
	}
	// O2 share Q_O2 = Q_total·(F − 0.21)/0.79, REFERENCES §8 [calc].
	shares := []struct{ total, fio2, want float64 }{
		{50, 0.60, 50 * 0.39 / 0.79}, // 24.68 L/min
		{40, 0.21, 0},
		{40, 1, 40},
	}
	for _, tc := range shares {
		got, err := OxygenShareOfBlend(LitresPerMinute(tc.total), Fraction(tc.fio2))
		if err != nil || !supplyClose(got.LitresPerMinute(), tc.want, 1e-12) {
			t.Errorf("OxygenShareOfBlend(%v, %v) = %v, %v; want %v", tc.total, tc.fio2, got, err, tc.want)
		}
		back, err := BlendFiO2(got, LitresPerMinute(tc.total)-got)
		if err != nil || !supplyClose(float64(back), tc.fio2, 1e-12) {
			t.Errorf("share of %v at %v blended back to %v, %v", tc.total, tc.fio2, back, err)
		}
	}
	// High-flow: same share, adult range 10–60 L/min [practice].
	hf, err := HighFlowOxygen(LitresPerMinute(60), 1)
	if err != nil || hf != 60 {
		t.Errorf("HighFlowOxygen(60, 1.0) = %v, %v; want 60", hf, err)
	}
	hf, err = HighFlowOxygen(LitresPerMinute(40), 0.5)
	if err != nil || !supplyClose(hf.LitresPerMinute(), 40*0.29/0.79, 1e-12) {
		t.Errorf("HighFlowOxygen(40, 0.5) = %v, %v; want 14.68 [calc]", hf, err)
	}
}

func TestSetUpsFor(t *testing.T) {
	// 0.289: the FiO2 that keeps room-air inspired PO2 at an 8 000 ft cabin
	// (REFERENCES §4 [calc]).
	got := SetUpsFor(0.289)
	want := []struct {
		d    Device
		flow float64
	}{
		{NasalCannula, 2},             // 0.24–0.32 ([calc] band)
		{NasalCannula, 3},             // 0.28–0.36
		{HighFlow, 30 * 0.079 / 0.79}, // 3.0 L/min O2 at 30 L/min total
		{Venturi, 6},                  // 0.31 setting, its minimum flow
		{HighFlow, 60 * 0.079 / 0.79},
	}
	if len(got) != len(want) {
		t.Fatalf("SetUpsFor(0.289) = %+v, want %d options", got, len(want))
	}
	for i, w := range want {
		if got[i].Device != w.d || !supplyClose(got[i].Flow.LitresPerMinute(), w.flow, 1e-9) {
			t.Errorf("option %d = %s %v L/min, want %s %v", i, got[i].Device, got[i].Flow, w.d, w.flow)
		}
	}
	for _, needed := range []float64{0.22, 0.289, 0.4, 0.44, 0.551, 0.75, 0.9, 1} {
		opts := SetUpsFor(Fraction(needed))
		if len(opts) == 0 {
			t.Errorf("SetUpsFor(%v): no option (high-flow always fits)", needed)
		}
		for i, o := range opts {
			if i > 0 && o.Flow < opts[i-1].Flow-1e-6 {
				t.Errorf("SetUpsFor(%v) not sorted by oxygen flow at %d", needed, i)
			}
			switch o.Device {
			case Venturi:
				if float64(o.FiO2.Low) < needed-1e-9 {
					t.Errorf("SetUpsFor(%v): Venturi %v is below the need", needed, o.FiO2.Low)
				}
			default:
				if float64(o.FiO2.Low) > needed+1e-12 || float64(o.FiO2.High) < needed-1e-12 {
					t.Errorf("SetUpsFor(%v): %s %v L/min range %+v does not cover the need", needed, o.Device, o.Flow, o.FiO2)
				}
			}
			if o.TotalFlow < o.Flow {
				t.Errorf("SetUpsFor(%v): total flow %v below oxygen flow %v", needed, o.TotalFlow, o.Flow)
			}
		}
	}
	// 0.551 (ground 0.40 at an 8 000 ft cabin, REFERENCES §4 [calc]): beyond
	// a cannula; simple mask 8 and 9 L/min ([calc] bands 0.48–0.56, 0.52–0.60).
	var masks []float64
	for _, o := range SetUpsFor(0.551) {
		if o.Device == NasalCannula {
			t.Errorf("SetUpsFor(0.551) offers a cannula at %v L/min", o.Flow)
		}
		if o.Device == SimpleMask {
			masks = append(masks, o.Flow.LitresPerMinute())
		}
	}
	if len(masks) != 2 || masks[0] != 8 || masks[1] != 9 {
		t.Errorf("SetUpsFor(0.551) masks at %v L/min, want [8 9]", masks)
	}
	// Needs exactly at a band edge ([calc] cannula bands 0.24–0.32 at 2 and
	// 0.28–0.36 at 3 L/min) keep both set-ups despite float noise.
	var edge []float64
	for _, o := range SetUpsFor(0.32) {
		if o.Device == NasalCannula {
			edge = append(edge, o.Flow.LitresPerMinute())
		}
	}
	if len(edge) != 3 || edge[0] != 2 || edge[1] != 3 || edge[2] != 4 {
		t.Errorf("SetUpsFor(0.32) cannula flows %v, want [2 3 4]", edge)
	}
	// No supplemental oxygen needed, or impossible: nil.
	for _, n := range []float64{0.21, 0.1, 0, -1, 1.01, math.NaN(), math.Inf(1)} {
		if got := SetUpsFor(Fraction(n)); got != nil {
			t.Errorf("SetUpsFor(%v) = %+v, want nil", n, got)
		}
	}
}

func TestDeviceBadInput(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	// Flow outside each device's range names the device, range and L/min.
	for _, tc := range []struct {
		d        Device
		quantity string
		flows    []float64
	}{
		{NasalCannula, "nasal cannula oxygen flow", []float64{-1, 0, 0.5, 6.5, 1e9, inf, nan}},
		{SimpleMask, "simple mask oxygen flow", []float64{-5, 0, 4, 11, nan}},
		{NonRebreather, "non-rebreather oxygen flow", []float64{0, 9, 16, inf}},
		{Venturi, "Venturi oxygen flow", []float64{0, 1, 16, nan}},
		{Blender, "blender flow", []float64{-1, 0, 201, inf}},
		{HighFlow, "high-flow total flow", []float64{0, 5, 61, 1e300, nan}},
	} {
		for _, f := range tc.flows {
			_, err := DeviceFiO2(tc.d, LitresPerMinute(f))
			supplyWantRange(t, err, tc.quantity, "L/min")
		}
	}
	for _, d := range []Device{"", "cannula", "NASAL_CANNULA", "tent"} {
		_, err := DeviceFiO2(d, LitresPerMinute(2))
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, ErrSyntax) || pe.Quantity != "device" {
			t.Errorf("DeviceFiO2(%q) = %v, want *ParseError for device", d, err)
		}
	}
	for _, f := range []float64{0.21, 0.2, 0, -0.4, 1.01, 40, inf, nan} {
		_, err := VenturiEntrainmentRatio(Fraction(f))
		supplyWantRange(t, err, "Venturi FiO2", "")
		_, err = VenturiTotalFlow(LitresPerMinute(10), Fraction(f))
		supplyWantRange(t, err, "Venturi FiO2", "")
	}
	for _, f := range []float64{0, -2, 500, nan} {
		_, err := VenturiTotalFlow(LitresPerMinute(f), 0.4)
		supplyWantRange(t, err, "Venturi oxygen flow", "L/min")
	}
	for _, f := range []float64{-1, 201, inf, nan} {
		_, err := BlendFiO2(LitresPerMinute(f), LitresPerMinute(5))
		supplyWantRange(t, err, "oxygen flow", "L/min")
		_, err = BlendFiO2(LitresPerMinute(5), LitresPerMinute(f))
		supplyWantRange(t, err, "air flow", "L/min")
	}
	_, err := BlendFiO2(0, 0)
	supplyWantRange(t, err, "total blended flow", "L/min")
	for _, f := range []float64{0, -10, 250, inf, nan} {
		_, err := OxygenShareOfBlend(LitresPerMinute(f), 0.5)
		supplyWantRange(t, err, "total flow", "L/min")
	}
	for _, f := range []float64{0.2, 0, -1, 1.5, 60, nan} {
		_, err := OxygenShareOfBlend(LitresPerMinute(40), Fraction(f))
		supplyWantRange(t, err, "FiO2", "")
		_, err = HighFlowOxygen(LitresPerMinute(40), Fraction(f))
		supplyWantRange(t, err, "FiO2", "")
	}
	for _, f := range []float64{0, 9.9, 60.1, -30, inf, nan} {
		_, err := HighFlowOxygen(LitresPerMinute(f), 0.5)
		supplyWantRange(t, err, "high-flow total flow", "L/min")
	}
}

func TestVenturiSettingsIsACopy(t *testing.T) {
	saved := VenturiSettings[1]
	VenturiSettings[1] = 0.5
	defer func() { VenturiSettings[1] = saved }()
	if f, err := VenturiMinimumFlow(0.28); err != nil || f != 4 {
		t.Errorf("after changing VenturiSettings, VenturiMinimumFlow(0.28) = %v, %v; want 4", f, err)
	}
}
