package physio_test

import (
	"fmt"

	"alvea/physio"
)

func ExampleExpansionRatio() {
	r, _ := physio.ExpansionRatio(physio.Pascals(101325), physio.Pascals(75262))
	shown, _ := physio.Round(r, 3, physio.RoundUp) // expansion: up
	fmt.Println("×" + shown.String())
	// Output: ×1.347
}

func ExampleExpandedVolume() {
	v, _ := physio.ExpandedVolume(physio.Millilitres(500), physio.Pascals(101325), physio.Pascals(75262))
	shown, _ := physio.Round(v.Millilitres(), 0, physio.RoundUp)
	fmt.Println(shown, "mL")
	// Output: 674 mL
}

func ExampleRigidSpaceOverpressure() {
	over, _ := physio.RigidSpaceOverpressure(physio.CmH2O(25), physio.Pascals(101325), physio.Pascals(75262))
	shown, _ := physio.Round(over.CmH2O(), 0, physio.RoundUp)
	fmt.Printf("up to %s cmH2O; limit %.0f cmH2O\n", shown, physio.TubeCuffPerfusionLimit.CmH2O())
	// Output: up to 291 cmH2O; limit 30 cmH2O
}
