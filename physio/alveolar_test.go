package physio

import (
	"errors"
	"math"
	"testing"
)

func TestWaterVapourPressure(t *testing.T) {
	tests := []struct {
		celsius float64
		want    Pressure
		tol     float64
		src     string
	}{
		// Conventional 47 mmHg at 37 °C [practice]; the equation gives 47.12.
		{37, MmHg(47), tolPub, "alveolar gas convention [practice]"},
		// Saturation pressure of water, steam tables from IAPWS-95 (e.g.
		// Çengel & Boles, Thermodynamics, Table A-4), 5 significant digits
		// [memory: recalled, not re-read].
		{25, Kilopascals(3.1698), 1e-4, "IAPWS-95 steam table [memory]"},
		{30, Kilopascals(4.2469), 1e-4, "IAPWS-95 steam table [memory]"},
		{35, Kilopascals(5.6291), 1e-4, "IAPWS-95 steam table [memory]"},
		{40, Kilopascals(7.3851), 1e-4, "IAPWS-95 steam table [memory]"},
		{45, Kilopascals(9.5953), 1e-4, "IAPWS-95 steam table [memory]"},
	}
	for _, tt := range tests {
		got, err := WaterVapourPressure(Celsius(tt.celsius))
		if err != nil || !gasClose(float64(got), float64(tt.want), tt.tol) {
			t.Errorf("WaterVapourPressure(%v °C) = %.2f Pa, %v; want %.2f Pa (%s)",
				tt.celsius, float64(got), err, float64(tt.want), tt.src)
		}
	}
	// The documented difference from the convention at 37 °C.
	got, _ := WaterVapourPressure(Celsius(37))
	if math.Abs(got.MmHg()-47.12) > 0.005 {
		t.Errorf("WaterVapourPressure(37 °C) = %.4f mmHg, doc says 47.12", got.MmHg())
	}
	if ConventionalWaterVapourPressure.MmHg() != 47 {
		t.Errorf("ConventionalWaterVapourPressure = %v mmHg", ConventionalWaterVapourPressure.MmHg())
	}
}

// The Wagner–Pruß equation's own fixed points, stated in the IAPWS release
// on saturation properties: 611.657 Pa at the triple point (273.16 K) and
// 101 325 Pa at the normal boiling point (373.124 K on ITS-90) [memory].
func TestWaterSaturationFixedPoints(t *testing.T) {
	if got := waterSaturationPressure(273.16); !gasClose(got, 611.657, 1e-5) {
		t.Errorf("triple point: %v Pa, want 611.657", got)
	}
	if got := waterSaturationPressure(373.124); !gasClose(got, 101325, 1e-4) {
		t.Errorf("boiling point: %v Pa, want 101325", got)
	}
}

func TestAlveolarPO2Reference(t *testing.T) {
	p8000, _ := PressureAtAltitude(Feet(8000))
	tests := []struct {
		name         string
		full         bool
		fio2         Fraction
		pb, ph2o, co Pressure
		rq           float64
		want         float64 // mmHg
		tol          float64 // relative
	}{
		// Egan's Fundamentals of Respiratory Care workbook [pub-example]:
		// (760 − 47)·0.21 − 40/0.8 = 99.7 mmHg.
		{"Egan sea level", false, 0.21, MmHg(760), MmHg(47), MmHg(40), 0.8, 99.7, tolPub},
		// REFERENCES.md §3 [calc], given to 0.1 mmHg: 8 000 ft cabin, air.
		{"8000 ft air", false, 0.21, p8000, MmHg(47), MmHg(40), 0.8, 58.7, 0.05 / 58.7},
		// Full form worked by hand from the equation [calc]:
		// 149.73 − 40·(1 − 0.21·0.2)/0.8 = 149.73 − 47.9 = 101.83 mmHg.
		{"full sea level", true, 0.21, MmHg(760), MmHg(47), MmHg(40), 0.8, 101.83, tolCalc},
		// Full form on oxygen reduces to PB − PH2O − PaCO2 [calc]: 760 − 47 − 40.
		{"full on oxygen", true, 1, MmHg(760), MmHg(47), MmHg(40), 0.8, 673, tolCalc},
		// With R = 1 both forms are PB·F − PH2O·F − PaCO2 [calc]: 149.73 − 40.
		{"simplified R 1", false, 0.21, MmHg(760), MmHg(47), MmHg(40), 1, 109.73, tolCalc},
		{"full R 1", true, 0.21, MmHg(760), MmHg(47), MmHg(40), 1, 109.73, tolCalc},
	}
	for _, tt := range tests {
		f := AlveolarPO2
		if tt.full {
			f = AlveolarPO2Full
		}
		got, err := f(tt.fio2, tt.pb, tt.ph2o, tt.co, tt.rq)
		if err != nil || !gasClose(got.MmHg(), tt.want, tt.tol) {
			t.Errorf("%s: PAO2 = %.3f mmHg, %v; want %v", tt.name, got.MmHg(), err, tt.want)
		}
	}
}

func TestAlveolarImpossible(t *testing.T) {
	// Air at 150 mmHg (about 14 km): 0.21·103 − 50 < 0.
	for _, f := range []func(Fraction, Pressure, Pressure, Pressure, float64) (Pressure, error){AlveolarPO2, AlveolarPO2Full} {
		got, err := f(0.21, MmHg(150), MmHg(47), MmHg(40), 0.8)
		var ie *ImpossibleError
		if !errors.As(err, &ie) || !errors.Is(err, ErrImpossible) || got != 0 {
			t.Errorf("want 0 and *ImpossibleError, got %v, %v", got, err)
		}
	}
}

func TestAlveolarBadInput(t *testing.T) {
	nan := math.NaN()
	type args struct {
		fio2         Fraction
		pb, ph2o, co Pressure
		rq           float64
	}
	ok := args{0.21, MmHg(760), MmHg(47), MmHg(40), 0.8}
	tests := []struct {
		q string
		a args
	}{
		{"FiO2", args{-0.1, ok.pb, ok.ph2o, ok.co, ok.rq}},
		{"FiO2", args{21, ok.pb, ok.ph2o, ok.co, ok.rq}}, // a percentage passed as a fraction
		{"FiO2", args{Fraction(nan), ok.pb, ok.ph2o, ok.co, ok.rq}},
		{"barometric pressure", args{ok.fio2, -1, ok.ph2o, ok.co, ok.rq}},
		{"barometric pressure", args{ok.fio2, Atmospheres(10), ok.ph2o, ok.co, ok.rq}},
		{"barometric pressure", args{ok.fio2, Pressure(math.Inf(1)), ok.ph2o, ok.co, ok.rq}},
		{"water vapour pressure", args{ok.fio2, ok.pb, MmHg(-1), ok.co, ok.rq}},
		{"water vapour pressure", args{ok.fio2, ok.pb, MmHg(470), ok.co, ok.rq}},
		{"PaCO2", args{ok.fio2, ok.pb, ok.ph2o, MmHg(-40), ok.rq}},
		{"PaCO2", args{ok.fio2, ok.pb, ok.ph2o, Kilopascals(400), ok.rq}},
		{"respiratory quotient", args{ok.fio2, ok.pb, ok.ph2o, ok.co, 0}},
		{"respiratory quotient", args{ok.fio2, ok.pb, ok.ph2o, ok.co, 8}},
		{"respiratory quotient", args{ok.fio2, ok.pb, ok.ph2o, ok.co, nan}},
	}
	for _, tt := range tests {
		_, err := AlveolarPO2(tt.a.fio2, tt.a.pb, tt.a.ph2o, tt.a.co, tt.a.rq)
		gasWantRange(t, err, tt.q)
		_, err = AlveolarPO2Full(tt.a.fio2, tt.a.pb, tt.a.ph2o, tt.a.co, tt.a.rq)
		gasWantRange(t, err, tt.q)
	}
	for _, c := range []float64{24.9, 45.1, -273, 1e9, nan} {
		_, err := WaterVapourPressure(Celsius(c))
		gasWantRange(t, err, "body temperature")
	}
}
