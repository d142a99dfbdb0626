package physio

import (
	"errors"
	"math"
	"testing"
	"time"
)

func TestCylinderFactor(t *testing.T) {
	// Cylinder factors of CGA letter sizes, L/psi: REFERENCES §7 [practice]
	// (the figures taught in North American transport training).
	tests := []struct {
		size CylinderSize
		want float64
	}{
		{SizeD, 0.16}, {SizeE, 0.28}, {SizeM, 1.56}, {SizeG, 2.41},
		{SizeH, 3.14}, {SizeK, 3.14}, {"e", 0.28}, {" h ", 3.14},
	}
	for _, tc := range tests {
		got, err := CylinderFactor(tc.size)
		if err != nil || got != tc.want {
			t.Errorf("CylinderFactor(%q) = %v, %v; want %v", tc.size, got, err, tc.want)
		}
	}
}

func TestCylinderFactorBadInput(t *testing.T) {
	for _, size := range []CylinderSize{"", "Z", "EE", "bar", "E size", "C"} {
		_, err := CylinderFactor(size)
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, ErrSyntax) || pe.Quantity != "cylinder size" || pe.Want == "" {
			t.Errorf("CylinderFactor(%q) error = %v, want *ParseError for cylinder size listing the sizes", size, err)
		}
	}
}

func TestCylinderContents(t *testing.T) {
	e, _ := FactorCylinder(SizeE)
	h, _ := FactorCylinder(SizeH)
	ten, _ := WaterCapacityCylinder(Litres(10))
	// Lutman D, Petros AJ, Emerg Med J 2006;23:703–4 [pub]: UK D size cylinder
	// holds 340 L at 13 700 kPa.
	ukD, err := LabelledCylinder(Litres(340), Kilopascals(13700))
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name  string
		c     Cylinder
		gauge Pressure
		want  float64 // litres
		rel   float64
		src   string
	}{
		{"E full", e, Psi(2000), 560, 1e-12, "[calc] 2000 psi × 0.28 L/psi (factor method, REFERENCES §7)"},
		{"H full", h, Psi(2200), 6908, 1e-12, "[calc] 2200 psi × 3.14 L/psi"},
		{"E empty", e, 0, 0, 0, "[calc] 0 psi"},
		{"E as a literal, lower case", Cylinder{Size: " e"}, Psi(2000), 560, 1e-12, "[calc] same as E"},
		{"10 L at 200 bar", ten, Bar(200), 2000, 1e-12, "[calc] water capacity × gauge bar, REFERENCES §7"},
		{"10 L at 137 bar", ten, Bar(137), 1370, 1e-12, "[calc] water capacity × gauge bar"},
		{"UK D full", ukD, Kilopascals(13700), 340, 1e-12, "[pub] Lutman & Petros 2006: 340 L at 13 700 kPa"},
		{"UK D half", ukD, Kilopascals(6850), 170, 1e-12, "[calc] label contents scaled by gauge/nominal"},
	}
	for _, tc := range tests {
		got, err := tc.c.Contents(tc.gauge)
		if err != nil || !supplyClose(got.Litres(), tc.want, tc.rel) {
			t.Errorf("%s: Contents = %v L, %v; want %v L (%s)", tc.name, got.Litres(), err, tc.want, tc.src)
		}
	}
}

func TestCylinderContentsUnitsOracle(t *testing.T) {
	// A water-capacity cylinder read on a psi gauge: GNU units does the
	// psi→bar conversion independently of quantity.go.
	ten, _ := WaterCapacityCylinder(Litres(10))
	got, err := ten.Contents(Psi(2000))
	if err != nil {
		t.Fatal(err)
	}
	want := supplyUnits(t, "10 liter * 2000 psi / bar", "liter") // GNU units oracle
	if !supplyClose(got.Litres(), want, 1e-6) {
		t.Errorf("10 L cylinder at 2000 psi = %v L, GNU units says %v L", got.Litres(), want)
	}
}

func TestCylinderUsableAndEndurance(t *testing.T) {
	// REFERENCES §7 [calc]: E cylinder at 2000 psi, residual 200 psi,
	// 10 L/min → (2000 − 200)·0.28/10 = 50.4 min.
	e, _ := FactorCylinder(SizeE)
	usable, err := e.Usable(Psi(2000), DefaultResidualPsi)
	if err != nil || !supplyClose(usable.Litres(), 504, 1e-12) {
		t.Fatalf("E usable = %v L, %v; want 504 L ([calc] 1800 psi × 0.28)", usable.Litres(), err)
	}
	d, err := Endurance(usable, LitresPerMinute(10))
	if err != nil || !supplyClose(d.Minutes(), 50.4, 1e-9) {
		t.Fatalf("Endurance = %v, %v; want 50.4 min (REFERENCES §7 [calc])", d, err)
	}
	// Shown to a person: minutes rounded DOWN.
	shown, ok := Round(d.Minutes(), 0, RoundDown)
	if !ok || shown.String() != "50" {
		t.Errorf("shown minutes = %v, want 50 (rounded down from 50.4)", shown)
	}

	// Water capacity: 10 L at 200 bar with a 200 psi (13.79 bar) residual;
	// oracle GNU units.
	ten, _ := WaterCapacityCylinder(Litres(10))
	got, err := ten.Usable(Bar(200), Psi(200))
	want := supplyUnits(t, "10 liter * (200 bar - 200 psi) / bar", "liter") // GNU units oracle
	if err != nil || !supplyClose(got.Litres(), want, 1e-6) {
		t.Errorf("10 L usable = %v L, %v; GNU units says %v L", got.Litres(), err, want)
	}
}

func TestCylinderUsableAtOrBelowResidual(t *testing.T) {
	// At or below the residual the cylinder is due for change: 0 L, not an
	// error (the brief's rule; nothing usable is left above the residual).
	e, _ := FactorCylinder(SizeE)
	for _, g := range []float64{0, 100, 199.999, 200} {
		got, err := e.Usable(Psi(g), Psi(200))
		if err != nil || got != 0 {
			t.Errorf("Usable(%v psi, 200 psi) = %v, %v; want 0, nil", g, got, err)
		}
	}
	got, err := e.Usable(Psi(201), Psi(200))
	if err != nil || !(got > 0) {
		t.Errorf("Usable(201 psi, 200 psi) = %v, %v; want > 0", got, err)
	}
}

func TestCylinderMaxPressureAndMethod(t *testing.T) {
	e, _ := FactorCylinder(SizeE)
	w, _ := WaterCapacityCylinder(Litres(2))
	l, _ := LabelledCylinder(Litres(460), Bar(230))
	tests := []struct {
		c      Cylinder
		max    Pressure
		method string
	}{
		{e, Psi(3000), CylinderMethodFactor},
		{w, Bar(300), CylinderMethodWaterCapacity},
		{l, Bar(300), CylinderMethodLabel},
		{Cylinder{}, 0, ""},
		{Cylinder{Size: SizeE, WaterCapacity: 10}, 0, ""},
	}
	for _, tc := range tests {
		if got := tc.c.MaxPressure(); got != tc.max {
			t.Errorf("%+v MaxPressure = %v, want %v", tc.c, got, tc.max)
		}
		if got := tc.c.Method(); got != tc.method {
			t.Errorf("%+v Method = %q, want %q", tc.c, got, tc.method)
		}
	}
	// The top of the range is accepted, just above it is not.
	if _, err := e.Contents(Psi(3000)); err != nil {
		t.Errorf("E at 3000 psi: %v", err)
	}
	if _, err := w.Contents(Bar(300)); err != nil {
		t.Errorf("2 L at 300 bar: %v", err)
	}
}

func TestCylinderNeverMixed(t *testing.T) {
	// A cylinder with more than one definition, or none, is invalid.
	for _, c := range []Cylinder{
		{},
		{Size: SizeE, WaterCapacity: Litres(10)},
		{Size: SizeE, NominalContents: Litres(680)},
		{WaterCapacity: Litres(10), NominalPressure: Bar(200)},
		{Size: SizeD, WaterCapacity: Litres(2), NominalContents: Litres(340), NominalPressure: Kilopascals(13700)},
	} {
		err := c.Validate()
		var ie *ImpossibleError
		if !errors.As(err, &ie) || !errors.Is(err, ErrImpossible) {
			t.Errorf("%+v Validate = %v, want *ImpossibleError", c, err)
		}
		if _, err := c.Contents(Bar(100)); err == nil {
			t.Errorf("%+v Contents accepted an invalid cylinder", c)
		}
		if _, err := c.Usable(Bar(100), 0); err == nil {
			t.Errorf("%+v Usable accepted an invalid cylinder", c)
		}
	}
}

func TestCylinderBadInput(t *testing.T) {
	e, _ := FactorCylinder(SizeE)
	ten, _ := WaterCapacityCylinder(Litres(10))
	lab, _ := LabelledCylinder(Litres(340), Kilopascals(13700))
	inf := math.Inf(1)
	nan := math.NaN()

	t.Run("constructors", func(t *testing.T) {
		if _, err := FactorCylinder("Q"); !errors.Is(err, ErrSyntax) {
			t.Errorf("FactorCylinder(Q) = %v, want ErrSyntax", err)
		}
		for _, wc := range []float64{-1, 0.05, 101, 1e300, inf, nan} {
			_, err := WaterCapacityCylinder(Litres(wc))
			supplyWantRange(t, err, "water capacity", "L")
		}
		// A zero water capacity is no definition at all.
		if _, err := WaterCapacityCylinder(0); !errors.Is(err, ErrImpossible) {
			t.Errorf("WaterCapacityCylinder(0) = %v, want ErrImpossible", err)
		}
		for _, v := range []float64{-340, 0.5, 40000, inf, nan} {
			_, err := LabelledCylinder(Litres(v), Bar(137))
			supplyWantRange(t, err, "nominal contents", "L")
		}
		for _, p := range []Pressure{Bar(-1), 0, Bar(5), Bar(301), Psi(1e9), Pressure(nan)} {
			_, err := LabelledCylinder(Litres(340), p)
			supplyWantRange(t, err, "nominal pressure", "bar")
		}
	})

	t.Run("gauge", func(t *testing.T) {
		for _, g := range []Pressure{Psi(-1), Psi(3000.5), Bar(1000), Pressure(inf), Pressure(nan), Pressure(-inf)} {
			_, err := e.Contents(g)
			supplyWantRange(t, err, "gauge pressure", "psi")
			_, err = e.Usable(g, Psi(200))
			supplyWantRange(t, err, "gauge pressure", "psi")
		}
		for _, g := range []Pressure{Bar(-0.1), Bar(300.1), Psi(5000), Pressure(nan)} {
			_, err := ten.Contents(g)
			supplyWantRange(t, err, "gauge pressure", "bar")
			_, err = lab.Contents(g)
			supplyWantRange(t, err, "gauge pressure", "bar")
		}
		for _, r := range []Pressure{Psi(-200), Psi(4000), Pressure(nan)} {
			_, err := e.Usable(Psi(2000), r)
			supplyWantRange(t, err, "residual pressure", "psi")
		}
	})

	t.Run("endurance", func(t *testing.T) {
		for _, u := range []float64{-1, 1e6, inf, nan} {
			_, err := Endurance(Litres(u), LitresPerMinute(2))
			supplyWantRange(t, err, "usable oxygen", "L")
		}
		for _, f := range []float64{0, -2, 0.001, 250, inf, nan} {
			_, err := Endurance(Litres(500), LitresPerMinute(f))
			supplyWantRange(t, err, "oxygen flow", "L/min")
		}
	})

	t.Run("temperature", func(t *testing.T) {
		atm := Atmospheres(1)
		for _, g := range []Pressure{Bar(-1), Bar(301), Pressure(nan)} {
			_, err := GaugeAtTemperature(g, Celsius(20), Celsius(0), atm)
			supplyWantRange(t, err, "gauge pressure", "bar")
		}
		for _, tk := range []Temperature{Celsius(-80), Celsius(100), Kelvin(0), Kelvin(-5), Temperature(nan), Temperature(inf)} {
			_, err := GaugeAtTemperature(Bar(200), tk, Celsius(20), atm)
			supplyWantRange(t, err, "cylinder temperature (from)", "°C")
			_, err = GaugeAtTemperature(Bar(200), Celsius(20), tk, atm)
			supplyWantRange(t, err, "cylinder temperature (to)", "°C")
		}
		for _, a := range []Pressure{0, Kilopascals(-101), Kilopascals(1), Bar(2), Pressure(nan)} {
			_, err := GaugeAtTemperature(Bar(200), Celsius(20), Celsius(0), a)
			supplyWantRange(t, err, "ambient pressure", "kPa")
		}
	})
}

func TestGaugeAtTemperature(t *testing.T) {
	// Gay-Lussac on absolute pressure. Oracle: GNU units evaluating the same
	// law with its own unit definitions and °C offset.
	tests := []struct {
		gauge    Pressure
		from, to Temperature
		ambient  Pressure
		expr     string
		unit     string
	}{
		{Psi(2000), Celsius(20), Celsius(-20), Atmospheres(1),
			"(2000 psi + 1 atm) * (253.15/293.15) - 1 atm", "psi"},
		{Bar(200), Celsius(15), Celsius(45), Atmospheres(1),
			"(200 bar + 1 atm) * (318.15/288.15) - 1 atm", "bar"},
		// Warmed in an 8 000 ft cabin (75.262 kPa, REFERENCES §1 [calc]).
		{Bar(137), Celsius(-10), Celsius(22), Kilopascals(75.262),
			"(137 bar + 75.262 kPa) * (295.15/263.15) - 75.262 kPa", "bar"},
	}
	for _, tc := range tests {
		got, err := GaugeAtTemperature(tc.gauge, tc.from, tc.to, tc.ambient)
		if err != nil {
			t.Fatal(err)
		}
		want := supplyUnits(t, tc.expr, tc.unit)
		gotIn := got.Psi()
		if tc.unit == "bar" {
			gotIn = got.Bar()
		}
		if !supplyClose(gotIn, want, 1e-6) {
			t.Errorf("GaugeAtTemperature: %v %s, GNU units %q = %v", gotIn, tc.unit, tc.expr, want)
		}
	}
	// A cold cylinder reads low; same temperature, same reading.
	cold, _ := GaugeAtTemperature(Bar(200), Celsius(20), Celsius(-20), Atmospheres(1))
	if !(cold < Bar(200)) {
		t.Errorf("a cold cylinder should read low, got %v bar", cold.Bar())
	}
	same, _ := GaugeAtTemperature(Bar(200), Celsius(20), Celsius(20), Atmospheres(1))
	if !supplyClose(same.Bar(), 200, 1e-12) {
		t.Errorf("no temperature change moved the gauge to %v bar", same.Bar())
	}
	// Using gauge instead of absolute pressure would differ: the ambient
	// term matters (here 1 atm × (1 − 253.15/293.15) ≈ 0.138 bar).
	naive := 200 * 253.15 / 293.15
	c2, _ := GaugeAtTemperature(Bar(200), Celsius(20), Celsius(-20), Atmospheres(1))
	if math.Abs(c2.Bar()-naive) < 0.1 {
		t.Errorf("GaugeAtTemperature seems to work on gauge, not absolute pressure: %v vs naive %v", c2.Bar(), naive)
	}
}

func TestEnduranceRoundsSafe(t *testing.T) {
	// Durations shown go DOWN: a displayed minute count never exceeds the
	// computed endurance.
	for _, tc := range []struct{ litres, flow float64 }{{504, 10}, {100, 3}, {680, 15}, {1, 0.025}} {
		d, err := Endurance(Litres(tc.litres), LitresPerMinute(tc.flow))
		if err != nil {
			t.Fatal(err)
		}
		shown, _ := Round(d.Minutes(), 0, RoundDown)
		if f, _ := shown.Float64(); f > tc.litres/tc.flow {
			t.Errorf("%v L at %v L/min: shown %v min > %v min", tc.litres, tc.flow, shown, tc.litres/tc.flow)
		}
		if d > time.Duration(tc.litres/tc.flow*float64(time.Minute))+1 {
			t.Errorf("Endurance %v longer than %v min", d, tc.litres/tc.flow)
		}
	}
}
