package physio_test

import (
	"fmt"

	"alvea/physio"
)

func ExampleVentilatorOxygen() {
	lpm := physio.LitresPerMinute
	o2, _ := physio.VentilatorOxygen(physio.DriveBlending, lpm(8), lpm(2), lpm(0), lpm(0), physio.FractionOf(0.5))
	shown, _ := physio.Round(o2.LitresPerMinute(), 1, physio.RoundUp) // oxygen used: up
	fmt.Println(shown, "L/min O2")
	// Output: 3.7 L/min O2
}
