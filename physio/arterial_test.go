package physio

import (
	"errors"
	"math"
	"testing"
)

func TestArterialReference(t *testing.T) {
	// Constant a/A ratio, REFERENCES.md §4, worked from the equations [calc]:
	// ground PaO2 90, PAO2 99.7 mmHg (Egan's example) → ratio 0.9027; at an
	// 8 000 ft cabin PAO2 58.68 mmHg → PaO2 52.97 mmHg.
	ratio, err := AARatio(MmHg(90), MmHg(99.7))
	if err != nil || !gasClose(ratio, 90/99.7, 1e-12) {
		t.Errorf("AARatio = %v, %v", ratio, err)
	}
	p8000, _ := PressureAtAltitude(Feet(8000))
	pAO2, _ := AlveolarPO2(0.21, p8000, MmHg(47), MmHg(40), DefaultRQ)
	pao2, err := PaO2ByAARatio(ratio, pAO2)
	if err != nil || !gasClose(pao2.MmHg(), 52.97, tolCalc) {
		t.Errorf("PaO2ByAARatio = %.3f mmHg, %v; want 52.97 [calc]", pao2.MmHg(), err)
	}
	// A–a gradient, same example [calc]: 99.7 − 90 = 9.7 mmHg.
	g, err := AaGradient(MmHg(99.7), MmHg(90))
	if err != nil || !gasClose(g.MmHg(), 9.7, 1e-9) {
		t.Errorf("AaGradient = %v mmHg, %v", g.MmHg(), err)
	}
	// Age-expected gradient, age/4 + 4 mmHg [practice].
	for _, tt := range []struct{ age, want float64 }{{20, 9}, {40, 14}, {80, 24}} {
		got, err := ExpectedAaGradient(tt.age)
		if err != nil || !gasClose(got.MmHg(), tt.want, 1e-12) {
			t.Errorf("ExpectedAaGradient(%v) = %v, %v; want %v", tt.age, got.MmHg(), err, tt.want)
		}
	}
	// Dillard 1989 regression [pub], worked [calc]: 0.453·68 + 0.386·30 + 2.44.
	d, err := DillardPaO2(MmHg(68), 30)
	if err != nil || !gasClose(d.MmHg(), 44.824, 1e-9) {
		t.Errorf("DillardPaO2(68, 30) = %v, %v; want 44.824", d.MmHg(), err)
	}
}

func TestArterialImpossible(t *testing.T) {
	r, err := AARatio(MmHg(110), MmHg(100))
	if !errors.Is(err, ErrImpossible) || !gasClose(r, 1.1, 1e-12) {
		t.Errorf("AARatio above 1 = %v, %v", r, err)
	}
	g, err := AaGradient(MmHg(100), MmHg(110))
	if !errors.Is(err, ErrImpossible) || !gasClose(g.MmHg(), -10, 1e-9) {
		t.Errorf("negative AaGradient = %v, %v", g.MmHg(), err)
	}
}

func TestArterialBadInput(t *testing.T) {
	nan := math.NaN()
	_, err := AARatio(MmHg(-1), MmHg(100))
	gasWantRange(t, err, "PaO2")
	_, err = AARatio(MmHg(90), 0) // divides by PAO2
	gasWantRange(t, err, "PAO2")
	_, err = AARatio(MmHg(90), Pressure(nan))
	gasWantRange(t, err, "PAO2")
	_, err = PaO2ByAARatio(1.5, MmHg(100))
	gasWantRange(t, err, "a/A ratio")
	_, err = PaO2ByAARatio(-0.1, MmHg(100))
	gasWantRange(t, err, "a/A ratio")
	_, err = PaO2ByAARatio(0.9, MmHg(1e6))
	gasWantRange(t, err, "PAO2")
	_, err = AaGradient(MmHg(-100), MmHg(90))
	gasWantRange(t, err, "PAO2")
	_, err = AaGradient(MmHg(100), Pressure(math.Inf(1)))
	gasWantRange(t, err, "PaO2")
	for _, age := range []float64{-1, 121, 1e300, nan} {
		_, err = ExpectedAaGradient(age)
		gasWantRange(t, err, "age")
	}
	_, err = DillardPaO2(MmHg(10), 30)
	gasWantRange(t, err, "PaO2 on the ground")
	_, err = DillardPaO2(Kilopascals(300), 30)
	gasWantRange(t, err, "PaO2 on the ground")
	_, err = DillardPaO2(MmHg(68), -5)
	gasWantRange(t, err, "FEV1")
	_, err = DillardPaO2(MmHg(68), nan)
	gasWantRange(t, err, "FEV1")
}
