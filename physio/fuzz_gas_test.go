package physio

import (
	"errors"
	"math"
	"strconv"
	"testing"
	"time"
)

// gasFinite fails the test if v is NaN or Inf.
func gasFinite(t *testing.T, what string, v float64) {
	t.Helper()
	if math.IsNaN(v) || math.IsInf(v, 0) {
		t.Fatalf("%s returned %v", what, v)
	}
}

// gasTypedErr fails unless err is one of the package's typed errors.
func gasTypedErr(t *testing.T, what string, err error) {
	t.Helper()
	if err == nil {
		return
	}
	var re *RangeError
	var pe *ParseError
	var ie *ImpossibleError
	if !errors.As(err, &re) && !errors.As(err, &pe) && !errors.As(err, &ie) {
		t.Fatalf("%s: untyped error %v", what, err)
	}
	if re != nil {
		gasFinite(t, what+" RangeError.Min", re.Min)
		gasFinite(t, what+" RangeError.Max", re.Max)
	}
}

var parseSeeds = []string{
	"2000 psi", "137 bar", "8000 ft", "2438 m", "75.3 kPa", "40 mmHg", "0.4", "40 %",
	"15 L/min", "500 mL/min", "680 L", "37 °C", "98.6 °F", "1 h 30 min", "45 min",
	"2000", "40", "NaN psi", "1e3 psi", "2,000 psi", "-5 psi", "99999999999999999999 bar",
	"5 Mbar", "40 mmHg kPa", "", " ", "1:30", "\xff",
}

func FuzzParsePressure(f *testing.F) {
	for _, s := range parseSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, err := ParsePressure(s)
		gasTypedErr(t, "ParsePressure", err)
		gasFinite(t, "ParsePressure", float64(p))
		if err != nil {
			return
		}
		if p < 0 || p > 1e8 {
			t.Fatalf("ParsePressure(%q) = %v outside its documented range", s, float64(p))
		}
		// Unit round trip: print in kPa and psi, read back.
		for _, u := range []struct {
			unit string
			v    float64
		}{{"kPa", p.Kilopascals()}, {"psi", p.Psi()}, {"mmHg", p.MmHg()}} {
			text := strconv.FormatFloat(u.v, 'f', -1, 64) + " " + u.unit
			if len(text) > maxInputLen { // a tiny value printed in full
				continue
			}
			q, err := ParsePressure(text)
			if err != nil && !errors.Is(err, ErrOutOfRange) { // rounding at the range's edge
				t.Fatalf("round trip of %q via %s: %v", s, u.unit, err)
			}
			if err == nil && !gasClose(float64(q), float64(p), 1e-12) && math.Abs(float64(q-p)) > 1e-9 {
				t.Fatalf("round trip of %q via %s: %v Pa → %v Pa", s, u.unit, float64(p), float64(q))
			}
		}
	})
}

func FuzzParseAltitude(f *testing.F) {
	for _, s := range parseSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		h, err := ParseAltitude(s)
		gasTypedErr(t, "ParseAltitude", err)
		gasFinite(t, "ParseAltitude", float64(h))
		if err != nil {
			return
		}
		if h < MinModelAltitude || h > MaxModelAltitude {
			t.Fatalf("ParseAltitude(%q) = %v outside the model", s, float64(h))
		}
		q, err := ParseAltitude(strconv.FormatFloat(h.Feet(), 'f', -1, 64) + " ft")
		if err == nil && math.Abs(float64(q-h)) > 1e-9 {
			t.Fatalf("ft round trip of %q: %v → %v", s, float64(h), float64(q))
		}
		// Everything the parser accepts, the atmosphere accepts.
		if _, err := PressureAtAltitude(h); err != nil {
			t.Fatalf("parsed altitude %v refused by the model: %v", float64(h), err)
		}
	})
}

func FuzzParseFraction(f *testing.F) {
	for _, s := range parseSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := ParseFraction(s)
		gasTypedErr(t, "ParseFraction", err)
		gasFinite(t, "ParseFraction", float64(v))
		if err != nil {
			return
		}
		if v < 0 || v > 1 {
			t.Fatalf("ParseFraction(%q) = %v", s, float64(v))
		}
		q, err := ParseFraction(strconv.FormatFloat(v.Percent(), 'f', -1, 64) + " %")
		if err == nil && math.Abs(float64(q-v)) > 1e-15 {
			t.Fatalf("percent round trip of %q: %v → %v", s, float64(v), float64(q))
		}
	})
}

func FuzzParseOther(f *testing.F) {
	for _, s := range parseSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		fl, err := ParseFlow(s)
		gasTypedErr(t, "ParseFlow", err)
		gasFinite(t, "ParseFlow", float64(fl))
		if err == nil && (fl < 0 || fl > 200) {
			t.Fatalf("ParseFlow(%q) = %v", s, float64(fl))
		}
		v, err := ParseVolume(s)
		gasTypedErr(t, "ParseVolume", err)
		gasFinite(t, "ParseVolume", float64(v))
		if err == nil && (v < 0 || v > 1e5) {
			t.Fatalf("ParseVolume(%q) = %v", s, float64(v))
		}
		k, err := ParseTemperature(s)
		gasTypedErr(t, "ParseTemperature", err)
		gasFinite(t, "ParseTemperature", float64(k))
		if err == nil {
			if k < 173.15 || k > 373.15 {
				t.Fatalf("ParseTemperature(%q) = %v K", s, float64(k))
			}
			q, err := ParseTemperature(strconv.FormatFloat(k.Celsius(), 'f', -1, 64) + " °C")
			if err == nil && math.Abs(float64(q-k)) > 1e-9 {
				t.Fatalf("°C round trip of %q: %v → %v", s, float64(k), float64(q))
			}
		}
	})
}

func FuzzParseDuration(f *testing.F) {
	for _, s := range parseSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		d, err := ParseDuration(s)
		gasTypedErr(t, "ParseDuration", err)
		if err != nil {
			if d != 0 {
				t.Fatalf("value with error")
			}
			return
		}
		if d < 0 || d > 30*24*time.Hour {
			t.Fatalf("ParseDuration(%q) = %v", s, d)
		}
		q, err := ParseDuration(strconv.FormatFloat(d.Minutes(), 'f', -1, 64) + " min")
		if err != nil || absDuration(q-d) > time.Microsecond {
			t.Fatalf("min round trip of %q: %v → %v, %v", s, d, q, err)
		}
	})
}

func absDuration(d time.Duration) time.Duration {
	if d < 0 {
		return -d
	}
	return d
}

func FuzzAtmosphere(f *testing.F) {
	for _, h := range []float64{-610, 0, 1000, 2438.4, 3000, 11000, 19999.9, 20000, -611, 20001, math.NaN()} {
		f.Add(h, 10.0)
	}
	f.Fuzz(func(t *testing.T, h, step float64) {
		p, err := PressureAtAltitude(Altitude(h))
		gasTypedErr(t, "PressureAtAltitude", err)
		gasFinite(t, "PressureAtAltitude", float64(p))
		if err != nil {
			return
		}
		// Pressure falls as altitude rises.
		if step = math.Abs(step); step > 0 && !math.IsInf(step, 0) && h+step <= 20000 {
			q, err := PressureAtAltitude(Altitude(h + step))
			if err == nil && q > p {
				t.Fatalf("P(%v) = %v < P(%v) = %v", h, float64(p), h+step, float64(q))
			}
		}
		// Inverse ∘ forward ≈ identity.
		back, err := AltitudeAtPressure(p)
		if err != nil || math.Abs(float64(back)-h) > 1e-6 {
			t.Fatalf("H(P(%v)) = %v, %v", h, float64(back), err)
		}
		// A cabin altitude shown rounded up is never below the exact one.
		up, ok := Round(back.Feet(), 0, RoundUp)
		if !ok || up.InexactFloat64() < back.Feet()-1e-9 {
			t.Fatalf("rounded up %v below %v", up, back.Feet())
		}
	})
}

func FuzzCabin(f *testing.F) {
	f.Add(12497.0, 59295.0, 0.0) // 41 000 ft, 8.6 psi
	f.Add(3000.0, 0.0, 1000.0)
	f.Add(1000.0, 30000.0, 2000.0)
	f.Add(15240.0, 63774.0, 0.0)
	f.Add(-700.0, -1.0, 1e300)
	f.Fuzz(func(t *testing.T, cruise, dp, floor float64) {
		cabin, err := CabinAltitude(Altitude(cruise), Pressure(dp), Altitude(floor))
		gasTypedErr(t, "CabinAltitude", err)
		gasFinite(t, "CabinAltitude", float64(cabin))
		if err != nil {
			return
		}
		if cabin > Altitude(cruise) {
			t.Fatalf("cabin %v above the aircraft %v", float64(cabin), cruise)
		}
		if dp > 0 && cruise > floor && cabin < Altitude(floor) {
			t.Fatalf("cabin %v below floor %v", float64(cabin), floor)
		}
		// Higher cruise, same differential: the cabin does not go down.
		if cruise+50 <= 20000 {
			c2, err := CabinAltitude(Altitude(cruise+50), Pressure(dp), Altitude(floor))
			if err == nil && c2 < cabin-1e-9 {
				t.Fatalf("cabin fell from %v to %v as cruise rose", float64(cabin), float64(c2))
			}
		}
		hi, err := MaxCruiseAltitude(Altitude(cruise), Pressure(dp))
		gasTypedErr(t, "MaxCruiseAltitude", err)
		gasFinite(t, "MaxCruiseAltitude", float64(hi))
		if err == nil && hi < Altitude(cruise)-1e-9 {
			t.Fatalf("MaxCruiseAltitude %v below the cabin limit %v", float64(hi), cruise)
		}
		// Max cruise shown rounded down is never above the exact limit.
		down, ok := Round(hi.Feet(), -2, RoundDown)
		if !ok || down.InexactFloat64() > hi.Feet()+1e-9 {
			t.Fatalf("rounded down %v above %v", down, hi.Feet())
		}
	})
}

func FuzzAlveolar(f *testing.F) {
	f.Add(0.21, 101325.0, 6266.0, 5333.0, 0.8)
	f.Add(1.0, 75262.0, 6282.0, 5333.0, 0.8)
	f.Add(0.21, 20000.0, 6266.0, 5333.0, 0.8)
	f.Add(0.5, 101325.0, 6266.0, 5333.0, 1.0)
	f.Add(-1.0, math.Inf(1), math.NaN(), 0.0, 0.0)
	f.Fuzz(func(t *testing.T, fio2, pb, ph2o, paco2, rq float64) {
		s, errS := AlveolarPO2(Fraction(fio2), Pressure(pb), Pressure(ph2o), Pressure(paco2), rq)
		gasTypedErr(t, "AlveolarPO2", errS)
		gasFinite(t, "AlveolarPO2", float64(s))
		full, errF := AlveolarPO2Full(Fraction(fio2), Pressure(pb), Pressure(ph2o), Pressure(paco2), rq)
		gasTypedErr(t, "AlveolarPO2Full", errF)
		gasFinite(t, "AlveolarPO2Full", float64(full))
		if s < 0 || full < 0 {
			t.Fatalf("negative PAO2 returned: %v, %v", s, full)
		}
		// With R ≤ 1 the full form subtracts less: never below the simplified.
		if errS == nil && errF == nil && rq <= 1 && full < s-1e-9 {
			t.Fatalf("full %v below simplified %v", float64(full), float64(s))
		}
		// More oxygen in, more in the alveoli.
		if errS == nil && fio2+0.01 <= 1 {
			s2, err := AlveolarPO2(Fraction(fio2+0.01), Pressure(pb), Pressure(ph2o), Pressure(paco2), rq)
			if err == nil && pb > ph2o && s2 < s {
				t.Fatalf("PAO2 fell as FiO2 rose: %v → %v", float64(s), float64(s2))
			}
		}
	})
}

func FuzzFiO2(f *testing.F) {
	f.Add(0.21, 101325.0, 75262.0, 6266.0, 1.0)
	f.Add(0.40, 101325.0, 75262.0, 6266.0, 0.6)
	f.Add(0.90, 101325.0, 75262.0, 6266.0, 1.0)
	f.Add(0.01, 101325.0, 5000.0, 0.0, 1.0)
	f.Add(1.0, 202650.0, 101325.0, 6266.0, 1.0)
	f.Fuzz(func(t *testing.T, from, pbFrom, pbTo, ph2o, max float64) {
		need, err := FiO2ToMatch(Fraction(from), Pressure(pbFrom), Pressure(pbTo), Pressure(ph2o))
		gasTypedErr(t, "FiO2ToMatch", err)
		gasFinite(t, "FiO2ToMatch", float64(need))
		if err == nil {
			if need < 0 || need > 1 {
				t.Fatalf("FiO2ToMatch = %v without an error", float64(need))
			}
			up, ok := Round(float64(need), 2, RoundUp)
			if !ok || up.InexactFloat64() < float64(need) {
				t.Fatalf("FiO2 needed %v rounded to %v", float64(need), up)
			}
		}
		h, err := MaxAltitudeForFiO2(Fraction(from), Pressure(pbFrom), Fraction(max), Pressure(ph2o))
		gasTypedErr(t, "MaxAltitudeForFiO2", err)
		gasFinite(t, "MaxAltitudeForFiO2", float64(h))
		if err == nil && from > 0 { // from 0 needs no oxygen anywhere: the bound is PB = PH2O
			p, _ := PressureAtAltitude(h)
			again, err := FiO2ToMatch(Fraction(from), Pressure(pbFrom), p, Pressure(ph2o))
			if err == nil && !gasClose(float64(again), max, 1e-9) {
				t.Fatalf("FiO2 needed at the max altitude = %v, want %v", float64(again), max)
			}
		}
	})
}

func FuzzSaturation(f *testing.F) {
	for _, p := range []float64{0, 20, 26.8, 40, 60, 80, 100, 600, 3000, -1, 3001, math.Inf(1)} {
		f.Add(p, 1.0)
	}
	f.Fuzz(func(t *testing.T, mmHg, step float64) {
		s, err := Saturation(MmHg(mmHg))
		gasTypedErr(t, "Saturation", err)
		gasFinite(t, "Saturation", float64(s))
		if err != nil {
			return
		}
		if s < 0 || s >= 1 {
			t.Fatalf("Saturation(%v) = %v", mmHg, float64(s))
		}
		if step = math.Abs(step); !math.IsInf(step, 0) && mmHg+step <= 3000 {
			s2, err := Saturation(MmHg(mmHg + step))
			if err == nil && s2 < s {
				t.Fatalf("saturation fell as PO2 rose: %v → %v", float64(s), float64(s2))
			}
		}
		p, err := PO2AtSaturation(s)
		if err != nil {
			t.Fatalf("PO2AtSaturation(%v): %v", float64(s), err)
		}
		gasFinite(t, "PO2AtSaturation", float64(p))
		if mmHg < 300 && !gasClose(p.MmHg(), mmHg, 1e-9) && math.Abs(p.MmHg()-mmHg) > 1e-9 {
			t.Fatalf("PO2(S(%v)) = %v", mmHg, p.MmHg())
		}
		// An expected SpO2 shown rounded down never exceeds the curve.
		down, ok := Round(s.Percent(), 0, RoundDown)
		if !ok || down.InexactFloat64() > s.Percent() {
			t.Fatalf("rounded down %v above %v", down, s.Percent())
		}
	})
}

func FuzzArterialContent(f *testing.F) {
	f.Add(90.0, 99.7, 0.9, 40.0, 30.0, 15.0, 0.98, 1.34, 5.0)
	f.Add(-1.0, 0.0, 2.0, -1.0, math.NaN(), 150.0, 98.0, 0.0, math.Inf(1))
	f.Fuzz(func(t *testing.T, pao2, pAO2, ratio, age, fev1, hb, sao2, hufner, co float64) {
		r, err := AARatio(MmHg(pao2), MmHg(pAO2))
		gasTypedErr(t, "AARatio", err)
		gasFinite(t, "AARatio", r)
		p, err := PaO2ByAARatio(ratio, MmHg(pAO2))
		gasTypedErr(t, "PaO2ByAARatio", err)
		gasFinite(t, "PaO2ByAARatio", float64(p))
		if err == nil && p > MmHg(pAO2)+1e-9 {
			t.Fatalf("PaO2 %v above PAO2 %v", p.MmHg(), pAO2)
		}
		g, err := AaGradient(MmHg(pAO2), MmHg(pao2))
		gasTypedErr(t, "AaGradient", err)
		gasFinite(t, "AaGradient", float64(g))
		e, err := ExpectedAaGradient(age)
		gasTypedErr(t, "ExpectedAaGradient", err)
		gasFinite(t, "ExpectedAaGradient", float64(e))
		d, err := DillardPaO2(MmHg(pao2), fev1)
		gasTypedErr(t, "DillardPaO2", err)
		gasFinite(t, "DillardPaO2", float64(d))
		c, err := OxygenContent(hb, Fraction(sao2), MmHg(pao2), hufner)
		gasTypedErr(t, "OxygenContent", err)
		gasFinite(t, "OxygenContent", c)
		if err == nil {
			do2, err := OxygenDelivery(LitresPerMinute(co), c)
			gasTypedErr(t, "OxygenDelivery", err)
			gasFinite(t, "OxygenDelivery", do2)
			if err == nil && do2 < 0 {
				t.Fatalf("negative delivery %v", do2)
			}
		}
	})
}
