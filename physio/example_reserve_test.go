package physio_test

import (
	"fmt"
	"time"

	"alvea/physio"
)

func ExampleReservePolicy_Required() {
	p := physio.ReservePolicy{Residual: physio.Psi(200), Factor: 1.5, AddedMinutes: 30 * time.Minute}
	need, _ := p.Required(physio.Litres(410), physio.LitresPerMinute(4))
	shown, _ := physio.Round(need.Litres(), 0, physio.RoundUp) // oxygen needed: up
	fmt.Println(shown, "L")
	// Output: 735 L
}

func ExampleReservePolicy_Validate() {
	err := physio.ReservePolicy{Factor: 0.5}.Validate()
	fmt.Println(err)
	// Output: physio: reserve factor 0.5 is outside 1 to 3
}
