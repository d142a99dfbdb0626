package physio_test

import (
	"errors"
	"fmt"

	"alvea/physio"
)

func ExampleCylinderFactor() {
	f, _ := physio.CylinderFactor(physio.SizeE)
	fmt.Printf("E: %.2f L/psi\n", f)
	// Output: E: 0.28 L/psi
}

func ExampleFactorCylinder() {
	e, _ := physio.FactorCylinder("e")
	litres, _ := e.Contents(physio.Psi(1500))
	shown, _ := physio.Round(litres.Litres(), 0, physio.RoundDown) // contents: down
	fmt.Println(e.Size, "at 1500 psi:", shown, "L")
	// Output: E at 1500 psi: 420 L
}

func ExampleWaterCapacityCylinder() {
	c, _ := physio.WaterCapacityCylinder(physio.Litres(10))
	litres, _ := c.Contents(physio.Bar(200))
	shown, _ := physio.Round(litres.Litres(), 0, physio.RoundDown)
	fmt.Println("10 L at 200 bar:", shown, "L")
	// Output: 10 L at 200 bar: 2000 L
}

func ExampleLabelledCylinder() {
	// A label reading 340 L at 13 700 kPa, gauge at 9 000 kPa.
	c, _ := physio.LabelledCylinder(physio.Litres(340), physio.Kilopascals(13700))
	litres, _ := c.Contents(physio.Kilopascals(9000))
	shown, _ := physio.Round(litres.Litres(), 0, physio.RoundDown)
	fmt.Println(shown, "L")
	// Output: 223 L
}

func ExampleCylinder_Validate() {
	mixed := physio.Cylinder{Size: physio.SizeE, WaterCapacity: physio.Litres(10)}
	err := mixed.Validate()
	fmt.Println(errors.Is(err, physio.ErrImpossible))
	fmt.Println(err)
	// Output:
	// true
	// physio: cylinder not achievable: more than one definition (size, water capacity): use exactly one method
}

func ExampleCylinder_MaxPressure() {
	e, _ := physio.FactorCylinder(physio.SizeE)
	w, _ := physio.WaterCapacityCylinder(physio.Litres(2))
	fmt.Printf("%.0f psi, %.0f bar\n", e.MaxPressure().Psi(), w.MaxPressure().Bar())
	// Output: 3000 psi, 300 bar
}

func ExampleCylinder_Method() {
	w, _ := physio.WaterCapacityCylinder(physio.Litres(2))
	fmt.Println(w.Method())
	// Output: water capacity
}

func ExampleCylinder_Contents() {
	d, _ := physio.FactorCylinder(physio.SizeD)
	litres, _ := d.Contents(physio.Psi(1900))
	shown, _ := physio.Round(litres.Litres(), 0, physio.RoundDown)
	fmt.Println("D at 1900 psi:", shown, "L")
	// Output: D at 1900 psi: 304 L
}

func ExampleCylinder_Usable() {
	e, _ := physio.FactorCylinder(physio.SizeE)
	usable, _ := e.Usable(physio.Psi(2000), physio.DefaultResidualPsi)
	shown, _ := physio.Round(usable.Litres(), 0, physio.RoundDown) // usable: down
	low, _ := e.Usable(physio.Psi(150), physio.DefaultResidualPsi)
	fmt.Println(shown, "L;", low.Litres(), "L below the residual")
	// Output: 504 L; 0 L below the residual
}

func ExampleEndurance() {
	d, _ := physio.Endurance(physio.Litres(504), physio.LitresPerMinute(10))
	shown, _ := physio.Round(d.Minutes(), 0, physio.RoundDown) // time left: down
	fmt.Println(shown, "min")
	// Output: 50 min
}

func ExampleGaugeAtTemperature() {
	// Filled to 2000 psi in a 20 °C store, read on a −20 °C ramp: the
	// gauge reads low, the contents are unchanged.
	g, _ := physio.GaugeAtTemperature(physio.Psi(2000), physio.Celsius(20), physio.Celsius(-20), physio.Atmospheres(1))
	shown, _ := physio.Round(g.Psi(), 0, physio.RoundNearest)
	fmt.Println(shown, "psi")
	// Output: 1725 psi
}
