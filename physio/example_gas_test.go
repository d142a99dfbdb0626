package physio_test

import (
	"errors"
	"fmt"

	"alvea/physio"
)

// The scenarios below are invented for illustration.

func ExampleParsePressure() {
	p, err := physio.ParsePressure("2000 psi")
	fmt.Printf("%.1f bar %v\n", p.Bar(), err)
	_, err = physio.ParsePressure("2000")
	fmt.Println(err)
	// Output:
	// 137.9 bar <nil>
	// physio: pressure "2000": missing or wrong unit: a unit is required (units: Pa, kPa, MPa, hPa, mmHg, Torr, psi, bar, mbar, cmH2O, inHg, atm)
}

func ExampleParseAltitude() {
	h, _ := physio.ParseAltitude("8000 ft")
	fmt.Printf("%.1f m\n", h.Metres())
	// Output:
	// 2438.4 m
}

func ExampleParseFlow() {
	f, _ := physio.ParseFlow("500 mL/min")
	fmt.Printf("%.1f L/min\n", f.LitresPerMinute())
	// Output:
	// 0.5 L/min
}

func ExampleParseVolume() {
	v, _ := physio.ParseVolume("680 L")
	fmt.Printf("%.0f L\n", v.Litres())
	// Output:
	// 680 L
}

func ExampleParseTemperature() {
	t, _ := physio.ParseTemperature("98.6 °F")
	fmt.Printf("%.2f °C\n", t.Celsius())
	// Output:
	// 37.00 °C
}

func ExampleParseFraction() {
	a, _ := physio.ParseFraction("0.4")
	b, _ := physio.ParseFraction("40 %")
	_, err := physio.ParseFraction("40")
	fmt.Println(a, b)
	fmt.Println(errors.Is(err, physio.ErrUnit))
	// Output:
	// 0.4 0.4
	// true
}

func ExampleParseDuration() {
	d, _ := physio.ParseDuration("1 h 30 min")
	fmt.Println(d)
	// Output:
	// 1h30m0s
}

func ExamplePressureAtAltitude() {
	p, _ := physio.PressureAtAltitude(physio.Feet(8000))
	fmt.Printf("%.2f mmHg = %.3f kPa\n", p.MmHg(), p.Kilopascals())
	// Output:
	// 564.51 mmHg = 75.262 kPa
}

func ExampleAltitudeAtPressure() {
	h, _ := physio.AltitudeAtPressure(physio.MmHg(564.51))
	up, _ := physio.Round(h.Feet(), 0, physio.RoundUp) // a cabin altitude rounds up
	fmt.Println(up, "ft")
	// Output:
	// 8001 ft
}

func ExampleCabinAltitude() {
	cabin, _ := physio.CabinAltitude(physio.Feet(41000), physio.Psi(8.6), 0)
	up, _ := physio.Round(cabin.Feet(), -2, physio.RoundUp)
	fmt.Println(up, "ft")
	// Output:
	// 7400 ft
}

func ExampleMaxCruiseAltitude() {
	h, _ := physio.MaxCruiseAltitude(physio.CabinAltitudeLimit, physio.Psi(8.6))
	down, _ := physio.Round(h.Feet(), -2, physio.RoundDown) // the cautious side
	fmt.Println(down, "ft")
	// Output:
	// 43300 ft
}

func ExampleWaterVapourPressure() {
	p, _ := physio.WaterVapourPressure(physio.Celsius(37))
	fmt.Printf("%.2f mmHg\n", p.MmHg())
	// Output:
	// 47.12 mmHg
}

func ExampleAlveolarPO2() {
	// Egan's textbook example: air at sea level, PaCO2 40 mmHg.
	p, _ := physio.AlveolarPO2(0.21, physio.MmHg(760), physio.MmHg(47), physio.MmHg(40), physio.DefaultRQ)
	fmt.Printf("%.1f mmHg\n", p.MmHg())
	// Output:
	// 99.7 mmHg
}

func ExampleAlveolarPO2Full() {
	p, _ := physio.AlveolarPO2Full(0.21, physio.MmHg(760), physio.MmHg(47), physio.MmHg(40), physio.DefaultRQ)
	fmt.Printf("%.1f mmHg\n", p.MmHg())
	// Output:
	// 101.8 mmHg
}

func ExampleFiO2ToMatch() {
	cabin, _ := physio.PressureAtAltitude(physio.Feet(8000))
	f, _ := physio.FiO2ToMatch(0.40, physio.SeaLevelPressure, cabin, physio.MmHg(47))
	need, _ := physio.Round(f.Value(), 2, physio.RoundUp) // FiO2 needed rounds up
	fmt.Println(need)
	_, err := physio.FiO2ToMatch(0.90, physio.SeaLevelPressure, cabin, physio.MmHg(47))
	fmt.Println(err)
	// Output:
	// 0.56
	// physio: FiO2 needed not achievable: 1.240 is above 1.0
}

func ExampleMaxAltitudeForFiO2() {
	h, _ := physio.MaxAltitudeForFiO2(0.90, physio.SeaLevelPressure, 1.0, physio.MmHg(47))
	down, _ := physio.Round(h.Feet(), -2, physio.RoundDown)
	fmt.Println(down, "ft")
	// Output:
	// 2700 ft
}

func ExampleAARatio() {
	r, _ := physio.AARatio(physio.MmHg(90), physio.MmHg(99.7))
	fmt.Printf("%.3f\n", r)
	// Output:
	// 0.903
}

func ExamplePaO2ByAARatio() {
	pao2, _ := physio.PaO2ByAARatio(0.90, physio.MmHg(58.7))
	down, _ := physio.Round(pao2.MmHg(), 0, physio.RoundDown)
	fmt.Println(down, "mmHg")
	// Output:
	// 52 mmHg
}

func ExampleAaGradient() {
	g, _ := physio.AaGradient(physio.MmHg(99.7), physio.MmHg(80))
	fmt.Printf("%.1f mmHg\n", g.MmHg())
	// Output:
	// 19.7 mmHg
}

func ExampleExpectedAaGradient() {
	g, _ := physio.ExpectedAaGradient(60)
	fmt.Printf("%.0f mmHg\n", g.MmHg())
	// Output:
	// 19 mmHg
}

func ExampleDillardPaO2() {
	p, _ := physio.DillardPaO2(physio.MmHg(68), 30)
	fmt.Printf("%.1f mmHg\n", p.MmHg())
	// Output:
	// 44.8 mmHg
}

func ExampleSaturation() {
	s, _ := physio.Saturation(physio.MmHg(60))
	down, _ := physio.Round(s.Percent(), 1, physio.RoundDown)
	fmt.Println(down, "%")
	// Output:
	// 90.5 %
}

func ExamplePO2AtSaturation() {
	p, _ := physio.PO2AtSaturation(physio.Percent(90))
	up, _ := physio.Round(p.MmHg(), 1, physio.RoundUp)
	fmt.Println(up, "mmHg")
	// Output:
	// 58.7 mmHg
}

func ExampleOxygenContent() {
	ca, _ := physio.OxygenContent(15, 0.98, physio.Kilopascals(13), physio.DefaultHufner)
	fmt.Printf("%.1f mL/dL\n", ca)
	// Output:
	// 20.0 mL/dL
}

func ExampleOxygenDelivery() {
	do2, _ := physio.OxygenDelivery(physio.LitresPerMinute(5), 19.99)
	fmt.Printf("%.0f mL/min\n", do2)
	// Output:
	// 999 mL/min
}
