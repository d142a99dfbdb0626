package physio

import "testing"

// Benchmarks for the supply formulas; results go in sinks so the compiler
// keeps the calls.
var (
	supplyBenchVolume   Volume
	supplyBenchFlow     Flow
	supplyBenchFloat    float64
	supplyBenchPressure Pressure
	supplyBenchRange    FiO2Range
	supplyBenchSetUps   []SetUp
)

func BenchmarkCylinderUsableFactor(b *testing.B) {
	c, _ := FactorCylinder(SizeE)
	for b.Loop() {
		supplyBenchVolume, _ = c.Usable(Psi(2000), DefaultResidualPsi)
	}
}

func BenchmarkCylinderUsableWaterCapacity(b *testing.B) {
	c, _ := WaterCapacityCylinder(Litres(10))
	for b.Loop() {
		supplyBenchVolume, _ = c.Usable(Bar(200), Psi(200))
	}
}

func BenchmarkEndurance(b *testing.B) {
	for b.Loop() {
		d, _ := Endurance(Litres(504), LitresPerMinute(10))
		supplyBenchFloat = float64(d)
	}
}

func BenchmarkGaugeAtTemperature(b *testing.B) {
	for b.Loop() {
		supplyBenchPressure, _ = GaugeAtTemperature(Bar(200), Celsius(20), Celsius(-20), Atmospheres(1))
	}
}

func BenchmarkDeviceFiO2(b *testing.B) {
	for b.Loop() {
		supplyBenchRange, _ = DeviceFiO2(NasalCannula, LitresPerMinute(3))
	}
}

func BenchmarkVenturiTotalFlow(b *testing.B) {
	for b.Loop() {
		supplyBenchFlow, _ = VenturiTotalFlow(LitresPerMinute(10), 0.40)
	}
}

func BenchmarkHighFlowOxygen(b *testing.B) {
	for b.Loop() {
		supplyBenchFlow, _ = HighFlowOxygen(LitresPerMinute(40), 0.5)
	}
}

func BenchmarkSetUpsFor(b *testing.B) {
	for b.Loop() {
		supplyBenchSetUps = SetUpsFor(0.289)
	}
}

func BenchmarkVentilatorOxygen(b *testing.B) {
	for b.Loop() {
		supplyBenchFlow, _ = VentilatorOxygen(DriveBlending, 8, 2, 1, 0, 0.5)
	}
}

func BenchmarkReserveRequired(b *testing.B) {
	for b.Loop() {
		supplyBenchVolume, _ = DefaultReservePolicy.Required(Litres(600), LitresPerMinute(4))
	}
}

func BenchmarkRigidSpaceOverpressure(b *testing.B) {
	for b.Loop() {
		supplyBenchPressure, _ = RigidSpaceOverpressure(CmH2O(25), Pascals(101325), Pascals(75262))
	}
}
