package physio_test

import (
	"fmt"

	"alvea/physio"
)

func ExampleDeviceFiO2() {
	r, _ := physio.DeviceFiO2(physio.NasalCannula, physio.LitresPerMinute(3))
	low, _ := physio.Round(r.Low.Percent(), 0, physio.RoundDown) // keep the range wide
	high, _ := physio.Round(r.High.Percent(), 0, physio.RoundUp)
	fmt.Printf("cannula 3 L/min: %s–%s %%\n", low, high)
	// Output: cannula 3 L/min: 28–36 %
}

func ExampleDeviceFlowRange() {
	min, max, ok := physio.DeviceFlowRange(physio.SimpleMask)
	fmt.Println(min.LitresPerMinute(), "to", max.LitresPerMinute(), "L/min", ok)
	// Output: 5 to 10 L/min true
}

func ExampleVenturiMinimumFlow() {
	f, _ := physio.VenturiMinimumFlow(physio.Percent(28))
	fmt.Println(f.LitresPerMinute(), "L/min")
	// Output: 4 L/min
}

func ExampleVenturiEntrainmentRatio() {
	r, _ := physio.VenturiEntrainmentRatio(physio.FractionOf(0.40))
	shown, _ := physio.Round(r, 2, physio.RoundNearest)
	fmt.Printf("%s:1 air:O2\n", shown)
	// Output: 3.16:1 air:O2
}

func ExampleVenturiTotalFlow() {
	total, _ := physio.VenturiTotalFlow(physio.LitresPerMinute(10), physio.FractionOf(0.40))
	shown, _ := physio.Round(total.LitresPerMinute(), 1, physio.RoundDown) // delivered total: down
	fmt.Println(shown, "L/min")
	// Output: 41.5 L/min
}

func ExampleBlendFiO2() {
	f, _ := physio.BlendFiO2(physio.LitresPerMinute(5), physio.LitresPerMinute(5))
	fmt.Printf("%.3f\n", f.Value())
	// Output: 0.605
}

func ExampleOxygenShareOfBlend() {
	o2, _ := physio.OxygenShareOfBlend(physio.LitresPerMinute(50), physio.FractionOf(0.60))
	shown, _ := physio.Round(o2.LitresPerMinute(), 1, physio.RoundUp) // oxygen used: up
	fmt.Println(shown, "L/min O2")
	// Output: 24.7 L/min O2
}

func ExampleHighFlowOxygen() {
	o2, _ := physio.HighFlowOxygen(physio.LitresPerMinute(40), physio.FractionOf(0.50))
	shown, _ := physio.Round(o2.LitresPerMinute(), 1, physio.RoundUp)
	fmt.Println(shown, "L/min O2")
	// Output: 14.7 L/min O2
}

func ExampleSetUpsFor() {
	for _, s := range physio.SetUpsFor(physio.FractionOf(0.29)) {
		o2, _ := physio.Round(s.Flow.LitresPerMinute(), 1, physio.RoundUp)
		fmt.Printf("%s %s L/min O2, FiO2 %.2f–%.2f\n", s.Device, o2, s.FiO2.Low.Value(), s.FiO2.High.Value())
	}
	// Output:
	// nasal_cannula 2 L/min O2, FiO2 0.24–0.32
	// nasal_cannula 3 L/min O2, FiO2 0.28–0.36
	// high_flow 3.1 L/min O2, FiO2 0.29–0.29
	// venturi 6 L/min O2, FiO2 0.31–0.31
	// high_flow 6.1 L/min O2, FiO2 0.29–0.29
}
