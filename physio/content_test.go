package physio

import (
	"math"
	"testing"
)

func TestOxygenContentReference(t *testing.T) {
	// e-Learning for Healthcare anaesthesia module [pub-example]: Hb 150 g/L,
	// SaO2 0.98, PaO2 13 kPa → CaO2 ≈ 200 mL/L (20 mL/dL); CO 5 L/min →
	// DO2 ≈ 1000 mL/min. Published rounded: ±0.5 %.
	ca, err := OxygenContent(15, 0.98, Kilopascals(13), DefaultHufner)
	if err != nil || !gasClose(ca, 20, tolPub) {
		t.Errorf("OxygenContent = %v mL/dL, %v; want about 20", ca, err)
	}
	do2, err := OxygenDelivery(LitresPerMinute(5), ca)
	if err != nil || !gasClose(do2, 1000, tolPub) {
		t.Errorf("OxygenDelivery = %v mL/min, %v; want about 1000", do2, err)
	}
	// The same by the equation [calc]: 1.34·15·0.98 + 0.003·(13 000/133.322387415).
	want := 1.34*15*0.98 + 0.003*13000/133.322387415
	if !gasClose(ca, want, 1e-12) {
		t.Errorf("OxygenContent = %v, want %v [calc]", ca, want)
	}
	// The Hüfner constant is settable [practice: 1.34, 1.36, 1.39 in use].
	ca139, _ := OxygenContent(15, 0.98, Kilopascals(13), 1.39)
	if !gasClose(ca139-ca, 0.05*15*0.98, 1e-9) {
		t.Errorf("Hüfner 1.39 adds %v mL/dL, want %v", ca139-ca, 0.05*15*0.98)
	}
	if DefaultHufner != 1.34 || OxygenSolubility != 0.003 {
		t.Errorf("constants changed: %v, %v", DefaultHufner, OxygenSolubility)
	}
}

func TestOxygenContentBadInput(t *testing.T) {
	nan := math.NaN()
	_, err := OxygenContent(-1, 0.98, MmHg(90), DefaultHufner)
	gasWantRange(t, err, "haemoglobin")
	_, err = OxygenContent(150, 0.98, MmHg(90), DefaultHufner) // g/L passed as g/dL
	gasWantRange(t, err, "haemoglobin")
	_, err = OxygenContent(nan, 0.98, MmHg(90), DefaultHufner)
	gasWantRange(t, err, "haemoglobin")
	_, err = OxygenContent(15, 98, MmHg(90), DefaultHufner) // percent passed as fraction
	gasWantRange(t, err, "SaO2")
	_, err = OxygenContent(15, 0.98, MmHg(-90), DefaultHufner)
	gasWantRange(t, err, "PaO2")
	_, err = OxygenContent(15, 0.98, MmHg(90), 0)
	gasWantRange(t, err, "Hüfner constant")
	_, err = OxygenContent(15, 0.98, MmHg(90), math.Inf(1))
	gasWantRange(t, err, "Hüfner constant")
	_, err = OxygenDelivery(-5, 20)
	gasWantRange(t, err, "cardiac output")
	_, err = OxygenDelivery(Flow(nan), 20)
	gasWantRange(t, err, "cardiac output")
	_, err = OxygenDelivery(5, 200) // mL/L passed as mL/dL
	gasWantRange(t, err, "oxygen content")
	_, err = OxygenDelivery(5, -1)
	gasWantRange(t, err, "oxygen content")
}
