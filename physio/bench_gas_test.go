package physio

import "testing"

// Benchmarks for the gas formulas and parsers (`make bench`). Results are
// kept in package-level sinks so the calls are not optimised away.

var (
	gasSinkP Pressure
	gasSinkH Altitude
	gasSinkF Fraction
	gasSinkX float64
)

func BenchmarkParsePressure(b *testing.B) {
	for b.Loop() {
		gasSinkP, _ = ParsePressure("2000 psi")
	}
}

func BenchmarkParseDuration(b *testing.B) {
	for b.Loop() {
		d, _ := ParseDuration("1 h 30 min")
		gasSinkX = float64(d)
	}
}

func BenchmarkPressureAtAltitude(b *testing.B) {
	for b.Loop() {
		gasSinkP, _ = PressureAtAltitude(2438.4)
	}
}

func BenchmarkAltitudeAtPressure(b *testing.B) {
	for b.Loop() {
		gasSinkH, _ = AltitudeAtPressure(75262)
	}
}

func BenchmarkCabinAltitude(b *testing.B) {
	for b.Loop() {
		gasSinkH, _ = CabinAltitude(12497, Psi(8.6), 0)
	}
}

func BenchmarkMaxCruiseAltitude(b *testing.B) {
	for b.Loop() {
		gasSinkH, _ = MaxCruiseAltitude(2438.4, Psi(8.6))
	}
}

func BenchmarkWaterVapourPressure(b *testing.B) {
	for b.Loop() {
		gasSinkP, _ = WaterVapourPressure(310.15)
	}
}

func BenchmarkAlveolarPO2Full(b *testing.B) {
	for b.Loop() {
		gasSinkP, _ = AlveolarPO2Full(0.21, 75262, MmHg(47), MmHg(40), DefaultRQ)
	}
}

func BenchmarkFiO2ToMatch(b *testing.B) {
	for b.Loop() {
		gasSinkF, _ = FiO2ToMatch(0.4, 101325, 75262, MmHg(47))
	}
}

func BenchmarkMaxAltitudeForFiO2(b *testing.B) {
	for b.Loop() {
		gasSinkH, _ = MaxAltitudeForFiO2(0.4, 101325, 1, MmHg(47))
	}
}

func BenchmarkPaO2ByAARatio(b *testing.B) {
	for b.Loop() {
		gasSinkP, _ = PaO2ByAARatio(0.9, MmHg(58.7))
	}
}

func BenchmarkSaturation(b *testing.B) {
	for b.Loop() {
		gasSinkF, _ = Saturation(MmHg(60))
	}
}

func BenchmarkPO2AtSaturation(b *testing.B) {
	for b.Loop() {
		gasSinkP, _ = PO2AtSaturation(0.9)
	}
}

func BenchmarkOxygenContent(b *testing.B) {
	for b.Loop() {
		gasSinkX, _ = OxygenContent(15, 0.98, MmHg(97.5), DefaultHufner)
	}
}
