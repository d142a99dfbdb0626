package physio

import (
	"math"
	"testing"
)

func TestSaturationReference(t *testing.T) {
	// Severinghaus JW, J Appl Physiol 1979;46:599–602, Table 1 [pub]
	// (standard curve, percent). Eq. 1 fits the table within 0.5 %.
	tests := []struct{ po2, wantPercent float64 }{
		{20, 32.12}, {40, 74.69}, {60, 90.85}, {80, 95.84},
	}
	for _, tt := range tests {
		got, err := Saturation(MmHg(tt.po2))
		if err != nil || !gasClose(got.Percent(), tt.wantPercent, tolPub) {
			t.Errorf("Saturation(%v mmHg) = %.3f %%, %v; want %v %% (Severinghaus 1979 Table 1)",
				tt.po2, got.Percent(), err, tt.wantPercent)
		}
	}
	// Standard P50 ≈ 26.8 mmHg [practice].
	p50, err := PO2AtSaturation(0.5)
	if err != nil || !gasClose(p50.MmHg(), 26.8, tolPub) {
		t.Errorf("P50 = %.3f mmHg, %v; want about 26.8", p50.MmHg(), err)
	}
	// Eq. 1 worked by hand [calc]: PO2 100 → 1/(23400/1015000 + 1) = 0.977466.
	s, _ := Saturation(MmHg(100))
	if !gasClose(float64(s), 1/(23400.0/1015000+1), 1e-12) {
		t.Errorf("Saturation(100 mmHg) = %v", float64(s))
	}
	if s0, err := Saturation(0); s0 != 0 || err != nil {
		t.Errorf("Saturation(0) = %v, %v", s0, err)
	}
	if p0, err := PO2AtSaturation(0); p0 != 0 || err != nil {
		t.Errorf("PO2AtSaturation(0) = %v, %v", p0, err)
	}
}

func TestSaturationInverse(t *testing.T) {
	// The inverse is exact: S(PO2(S)) = S and PO2(S(P)) = P.
	for p := 0.01; p <= 3000; p *= 1.07 {
		s, err := Saturation(MmHg(p))
		if err != nil {
			t.Fatal(err)
		}
		back, err := PO2AtSaturation(s)
		if err != nil {
			t.Fatalf("PO2AtSaturation(%v): %v", float64(s), err)
		}
		// Above ~500 mmHg S is within 1e-6 of 1, so S itself carries only
		// ~10 significant digits of P; the tolerance follows dP/dS.
		tol := 1e-11
		if p > 300 {
			tol = 1e-6
		}
		if !gasClose(back.MmHg(), p, tol) {
			t.Errorf("PO2(S(%v mmHg)) = %v mmHg", p, back.MmHg())
		}
	}
	for s := 0.001; s < 0.9999; s += 0.0137 {
		p, err := PO2AtSaturation(Fraction(s))
		if err != nil {
			t.Fatal(err)
		}
		back, _ := Saturation(p)
		if !gasClose(float64(back), s, 1e-13) {
			t.Errorf("S(PO2(%v)) = %v", s, float64(back))
		}
	}
	// The top of the domain maps to the top of Saturation's domain.
	p, err := PO2AtSaturation(Fraction(maxSaturation))
	if err != nil || !gasClose(p.MmHg(), maxPartialMmHg, 1e-6) {
		t.Errorf("PO2AtSaturation(max) = %v, %v", p.MmHg(), err)
	}
}

func TestSaturationBadInput(t *testing.T) {
	for _, p := range []Pressure{MmHg(-1), MmHg(3001), Pressure(math.NaN()), Pressure(math.Inf(1))} {
		_, err := Saturation(p)
		gasWantRange(t, err, "PO2")
	}
	for _, s := range []Fraction{-0.01, 1, 1.5, 95, Fraction(math.NaN()), Fraction(math.Inf(-1))} {
		_, err := PO2AtSaturation(s)
		gasWantRange(t, err, "saturation")
	}
}
