package physio

import (
	"errors"
	"math"
	"testing"
	"time"
)

// Fuzz targets for the supply formulas, seeded from the test tables: no
// panic, no NaN/Inf for accepted input, typed errors for refused input,
// monotonic where physics says so, and rounding never on the unsafe side.

// supplyFuzzErr fails unless err is one of the package's typed errors.
func supplyFuzzErr(t *testing.T, err error) {
	t.Helper()
	var re *RangeError
	var pe *ParseError
	var ie *ImpossibleError
	if !errors.As(err, &re) && !errors.As(err, &pe) && !errors.As(err, &ie) {
		t.Fatalf("untyped error %T: %v", err, err)
	}
}

func supplyFuzzCylinder(kind uint8, size string, wc, nominal, nominalBar float64) Cylinder {
	switch kind % 3 {
	case 0:
		return Cylinder{Size: CylinderSize(size)}
	case 1:
		return Cylinder{WaterCapacity: Litres(wc)}
	default:
		return Cylinder{NominalContents: Litres(nominal), NominalPressure: Bar(nominalBar)}
	}
}

func FuzzCylinderUsable(f *testing.F) {
	f.Add(uint8(0), "E", 10.0, 340.0, 137.0, 2000.0, 1500.0, 200.0)
	f.Add(uint8(1), "", 10.0, 0.0, 0.0, 200.0, 137.0, 13.8)
	f.Add(uint8(2), "", 0.0, 340.0, 137.0, 137.0, 50.0, 13.8)
	f.Add(uint8(0), "H", 0.0, 0.0, 0.0, 3000.0, 0.0, 200.0)
	f.Add(uint8(1), "", -1.0, 0.0, 0.0, 1e300, -5.0, math.NaN())
	f.Fuzz(func(t *testing.T, kind uint8, size string, wc, nominal, nominalBar, g1, g2, residual float64) {
		c := supplyFuzzCylinder(kind, size, wc, nominal, nominalBar)
		// Gauges in the cylinder's own unit: psi for CGA sizes, bar otherwise.
		p := Bar
		if kind%3 == 0 {
			p = Psi
		}
		if err := c.Validate(); err != nil {
			supplyFuzzErr(t, err)
			return
		}
		u1, err1 := c.Usable(p(g1), p(residual))
		u2, err2 := c.Usable(p(g2), p(residual))
		c1, errC := c.Contents(p(g1))
		if err1 != nil {
			supplyFuzzErr(t, err1)
		}
		if err2 != nil {
			supplyFuzzErr(t, err2)
		}
		if errC != nil {
			supplyFuzzErr(t, errC)
		}
		if err1 == nil {
			supplyFinite(t, "Usable", float64(u1))
			if u1 < 0 {
				t.Fatalf("Usable %v < 0", u1)
			}
			if g1 <= residual && u1 != 0 {
				t.Fatalf("Usable at or below residual = %v, want 0", u1)
			}
			shown, ok := Round(u1.Litres(), 0, RoundDown)
			if f, _ := shown.Float64(); !ok || f > u1.Litres() {
				t.Fatalf("usable %v shown as %v: rounded up", u1, shown)
			}
			if errC == nil && u1 > c1+1e-9*c1 {
				t.Fatalf("usable %v > contents %v", u1, c1)
			}
		}
		if errC == nil {
			supplyFinite(t, "Contents", float64(c1))
		}
		// More gauge, more usable oxygen.
		if err1 == nil && err2 == nil && g2 > g1 && u2 < u1 {
			t.Fatalf("Usable(%v) = %v < Usable(%v) = %v", g2, u2, g1, u1)
		}
	})
}

func FuzzEndurance(f *testing.F) {
	f.Add(504.0, 10.0, 12.0)
	f.Add(0.0, 0.025, 15.0)
	f.Add(100000.0, 0.01, 200.0)
	f.Add(-1.0, 0.0, math.Inf(1))
	f.Fuzz(func(t *testing.T, litres, flow1, flow2 float64) {
		d1, err1 := Endurance(Litres(litres), LitresPerMinute(flow1))
		d2, err2 := Endurance(Litres(litres), LitresPerMinute(flow2))
		if err1 != nil {
			supplyFuzzErr(t, err1)
			return
		}
		if d1 < 0 || d1 > time.Duration(litres/flow1*float64(time.Minute))+1 {
			t.Fatalf("Endurance(%v, %v) = %v", litres, flow1, d1)
		}
		shown, _ := Round(d1.Minutes(), 0, RoundDown)
		if f, _ := shown.Float64(); f > d1.Minutes() {
			t.Fatalf("%v shown as %v min: rounded up", d1, shown)
		}
		// More flow, less (or equal) time.
		if err2 == nil && flow2 > flow1 && d2 > d1 {
			t.Fatalf("more flow %v > %v gave more time %v > %v", flow2, flow1, d2, d1)
		}
	})
}

func FuzzGaugeAtTemperature(f *testing.F) {
	f.Add(200.0, 20.0, -20.0, 101.325)
	f.Add(0.0, 65.0, -60.0, 5.0)
	f.Add(137.0, -10.0, 22.0, 75.262)
	f.Add(-1.0, 400.0, math.NaN(), 0.0)
	f.Fuzz(func(t *testing.T, gaugeBar, fromC, toC, ambientKPa float64) {
		g, err := GaugeAtTemperature(Bar(gaugeBar), Celsius(fromC), Celsius(toC), Kilopascals(ambientKPa))
		if err != nil {
			supplyFuzzErr(t, err)
			return
		}
		supplyFinite(t, "GaugeAtTemperature", float64(g))
		// Absolute pressure never negative; warmer reads higher.
		if float64(g)+ambientKPa*1000 < -1e-6 {
			t.Fatalf("absolute pressure below zero: %v", g)
		}
		if toC > fromC && g < Bar(gaugeBar)-1e-6 || toC < fromC && g > Bar(gaugeBar)+1e-6 {
			t.Fatalf("%v bar from %v °C to %v °C gave %v bar", gaugeBar, fromC, toC, g.Bar())
		}
		// Round trip back to the first temperature.
		if g >= 0 {
			back, err := GaugeAtTemperature(g, Celsius(toC), Celsius(fromC), Kilopascals(ambientKPa))
			if err == nil && math.Abs(back.Bar()-gaugeBar) > 1e-9*math.Max(1, gaugeBar) {
				t.Fatalf("round trip %v → %v → %v bar", gaugeBar, g.Bar(), back.Bar())
			}
		}
	})
}

func FuzzDeviceFiO2(f *testing.F) {
	devices := []Device{NasalCannula, SimpleMask, NonRebreather, Venturi, Blender, HighFlow, Ventilator, "tent"}
	f.Add(uint8(0), 1.0, 6.0)
	f.Add(uint8(1), 5.0, 7.5)
	f.Add(uint8(2), 10.0, 15.0)
	f.Add(uint8(3), 2.0, 15.0)
	f.Add(uint8(5), 10.0, 60.0)
	f.Add(uint8(7), math.NaN(), -1.0)
	f.Fuzz(func(t *testing.T, which uint8, flow1, flow2 float64) {
		d := devices[int(which)%len(devices)]
		r1, err1 := DeviceFiO2(d, LitresPerMinute(flow1))
		r2, err2 := DeviceFiO2(d, LitresPerMinute(flow2))
		if err1 != nil {
			supplyFuzzErr(t, err1)
			return
		}
		supplyFinite(t, "DeviceFiO2", float64(r1.Low), float64(r1.High))
		if r1.Low < 0.21 || r1.High > 1 || r1.Low > r1.High {
			t.Fatalf("%s %v L/min: range %+v", d, flow1, r1)
		}
		// More flow never lowers the FiO2 a device can reach.
		if err2 == nil && flow2 > flow1 && (r2.High < r1.High || r2.Low < r1.Low) {
			t.Fatalf("%s: %v L/min %+v, %v L/min %+v", d, flow1, r1, flow2, r2)
		}
	})
}

func FuzzBlend(f *testing.F) {
	f.Add(5.0, 5.0, 50.0, 0.6)
	f.Add(10.0, 0.0, 60.0, 1.0)
	f.Add(0.0, 10.0, 10.0, 0.21)
	f.Add(2.0, 50.0, 0.0, 0.4)
	f.Add(-1.0, math.Inf(1), 1e300, math.NaN())
	f.Fuzz(func(t *testing.T, o2, air, total, fio2 float64) {
		b, err := BlendFiO2(LitresPerMinute(o2), LitresPerMinute(air))
		if err != nil {
			supplyFuzzErr(t, err)
		} else {
			supplyFinite(t, "BlendFiO2", float64(b))
			if b < 0.21-1e-12 || b > 1+1e-12 {
				t.Fatalf("BlendFiO2(%v, %v) = %v", o2, air, b)
			}
		}
		share, err := OxygenShareOfBlend(LitresPerMinute(total), Fraction(fio2))
		if err != nil {
			supplyFuzzErr(t, err)
		} else {
			supplyFinite(t, "OxygenShareOfBlend", float64(share))
			if share < 0 || share > LitresPerMinute(total)*(1+1e-12) {
				t.Fatalf("share %v of %v", share, total)
			}
			// Oxygen used is shown rounded UP.
			shown, _ := Round(share.LitresPerMinute(), 1, RoundUp)
			if f, _ := shown.Float64(); f < share.LitresPerMinute() {
				t.Fatalf("share %v shown as %v: rounded down", share, shown)
			}
		}
		if ratio, err := VenturiEntrainmentRatio(Fraction(fio2)); err != nil {
			supplyFuzzErr(t, err)
		} else {
			supplyFinite(t, "VenturiEntrainmentRatio", ratio)
			if ratio < 0 {
				t.Fatalf("ratio %v", ratio)
			}
			if tf, err := VenturiTotalFlow(LitresPerMinute(o2), Fraction(fio2)); err == nil {
				supplyFinite(t, "VenturiTotalFlow", float64(tf))
				if tf < LitresPerMinute(o2) {
					t.Fatalf("Venturi total %v below O2 %v", tf, o2)
				}
			}
		}
		if hf, err := HighFlowOxygen(LitresPerMinute(total), Fraction(fio2)); err != nil {
			supplyFuzzErr(t, err)
		} else {
			supplyFinite(t, "HighFlowOxygen", float64(hf))
		}
	})
}

func FuzzSetUpsFor(f *testing.F) {
	for _, n := range []float64{0.22, 0.289, 0.44, 0.551, 0.9, 1, 0.21, -1, math.NaN()} {
		f.Add(n)
	}
	f.Fuzz(func(t *testing.T, needed float64) {
		opts := SetUpsFor(Fraction(needed))
		for i, o := range opts {
			supplyFinite(t, "SetUpsFor", float64(o.Flow), float64(o.TotalFlow), float64(o.FiO2.Low), float64(o.FiO2.High))
			if i > 0 && o.Flow < opts[i-1].Flow-1e-6 {
				t.Fatalf("not sorted at %d: %+v", i, opts)
			}
			if o.FiO2.High < Fraction(needed)-1e-9 {
				t.Fatalf("%+v cannot reach %v", o, needed)
			}
		}
	})
}

func FuzzVentilatorOxygen(f *testing.F) {
	f.Add(false, 8.0, 2.0, 0.0, 0.0, 0.5, 0.6)
	f.Add(true, 8.0, 2.0, 1.0, 1.0, 0.6, 1.0)
	f.Add(true, 0.1, 0.0, 0.0, 60.0, 0.21, 0.3)
	f.Add(false, -1.0, math.NaN(), 100.0, 0.0, 2.0, 0.0)
	f.Fuzz(func(t *testing.T, oxygen bool, ve, bias, leak, drive, fio2a, fio2b float64) {
		d := DriveBlending
		if oxygen {
			d = DriveOxygen
		}
		a, errA := VentilatorOxygen(d, Flow(ve), Flow(bias), Flow(leak), Flow(drive), Fraction(fio2a))
		b, errB := VentilatorOxygen(d, Flow(ve), Flow(bias), Flow(leak), Flow(drive), Fraction(fio2b))
		if errA != nil {
			supplyFuzzErr(t, errA)
			return
		}
		supplyFinite(t, "VentilatorOxygen", float64(a))
		if a < Flow(drive)-1e-9 {
			t.Fatalf("oxygen %v below drive gas %v", a, drive)
		}
		// A higher FiO2 never uses less oxygen.
		if errB == nil && fio2b > fio2a && b < a-1e-9 {
			t.Fatalf("FiO2 %v uses %v < FiO2 %v uses %v", fio2b, b, fio2a, a)
		}
	})
}

func FuzzReserveRequired(f *testing.F) {
	f.Add(200.0, 1.5, 0.0, 600.0, 4.0)
	f.Add(0.0, 1.0, 30.0, 0.0, 0.0)
	f.Add(1000.0, 3.0, 240.0, 1e6, 200.0)
	f.Add(-1.0, 0.0, -5.0, math.Inf(1), math.NaN())
	f.Fuzz(func(t *testing.T, residualPsi, factor, addedMin, need, flow float64) {
		p := ReservePolicy{Residual: Psi(residualPsi), Factor: factor, AddedMinutes: Minutes(addedMin)}
		got, err := p.Required(Litres(need), LitresPerMinute(flow))
		if err != nil {
			supplyFuzzErr(t, err)
			return
		}
		supplyFinite(t, "Required", float64(got))
		if got < Litres(need) {
			t.Fatalf("required %v below need %v", got, need)
		}
		shown, _ := Round(got.Litres(), 0, RoundUp)
		if f, _ := shown.Float64(); f < got.Litres() {
			t.Fatalf("required %v shown as %v: rounded down", got, shown)
		}
	})
}

func FuzzBoyle(f *testing.F) {
	f.Add(101325.0, 75262.0, 0.5, 2451.6625)
	f.Add(1000.0, 1e6, 100.0, -1000.0)
	f.Add(75262.0, 101325.0, 0.0, 0.0)
	f.Add(0.0, -1.0, math.NaN(), math.Inf(1))
	f.Fuzz(func(t *testing.T, from, to, litres, inside float64) {
		r, err := ExpansionRatio(Pascals(from), Pascals(to))
		if err != nil {
			supplyFuzzErr(t, err)
			return
		}
		supplyFinite(t, "ExpansionRatio", r)
		back, err := ExpansionRatio(Pascals(to), Pascals(from))
		if err != nil || math.Abs(r*back-1) > 1e-12 {
			t.Fatalf("ratio %v × inverse %v ≠ 1 (%v)", r, back, err)
		}
		if to < from && r < 1 || to > from && r > 1 {
			t.Fatalf("%v → %v Pa: ratio %v", from, to, r)
		}
		if v, err := ExpandedVolume(Litres(litres), Pascals(from), Pascals(to)); err != nil {
			supplyFuzzErr(t, err)
		} else {
			supplyFinite(t, "ExpandedVolume", float64(v))
		}
		if o, err := RigidSpaceOverpressure(Pascals(inside), Pascals(from), Pascals(to)); err != nil {
			supplyFuzzErr(t, err)
		} else {
			supplyFinite(t, "RigidSpaceOverpressure", float64(o))
			// An ascent (lower ambient) raises the inside above its start.
			if to < from && o < Pascals(inside) {
				t.Fatalf("ascent lowered overpressure: %v → %v", inside, o)
			}
		}
	})
}
