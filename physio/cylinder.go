package physio

import (
	"strings"
	"time"
)

// CylinderSize is a North American CGA letter size, used with the cylinder
// factor method.
type CylinderSize string

// CGA letter sizes with a cylinder factor. K is accepted as a synonym of H
// (the same factor).
const (
	SizeD CylinderSize = "D"
	SizeE CylinderSize = "E"
	SizeM CylinderSize = "M"
	SizeG CylinderSize = "G"
	SizeH CylinderSize = "H"
	SizeK CylinderSize = "K"
)

// cylinderFactors holds litres of free oxygen per psi of gauge pressure for
// each CGA letter size (common practice; the figures taught in North
// American respiratory and transport training).
var cylinderFactors = map[CylinderSize]float64{
	SizeD: 0.16,
	SizeE: 0.28,
	SizeM: 1.56,
	SizeG: 2.41,
	SizeH: 3.14,
	SizeK: 3.14,
}

// cylinderSizeList names the accepted sizes for error messages.
const cylinderSizeList = "D, E, M, G, H (or K)"

// Plausible ranges for cylinder inputs. Beyond them the number is almost
// certainly a typing or unit mistake (psi typed as bar, mL as L), and a
// plan built on it would be dangerous.
const (
	// CGA aluminium and steel medical cylinders are filled to about
	// 2 000–2 200 psi; 3 000 psi covers the high-pressure kinds.
	cylinderMaxFactorPsi = 3000.0
	// ISO/European cylinders are filled to 137–300 bar.
	cylinderMaxWaterBar = 300.0
	// Water capacity of one cylinder, litres (the smallest medical
	// cylinders hold about 0.2 L of water; the largest single cylinders 50 L).
	cylinderMinWaterLitres = 0.1
	cylinderMaxWaterLitres = 100.0
	// A label's nominal contents, litres of free gas.
	cylinderMinLabelLitres = 1.0
	cylinderMaxLabelLitres = 30000.0
	// A label's nominal filling pressure, bar.
	cylinderMinLabelBar = 10.0
)

// DefaultResidualPsi is the pressure commonly left in a cylinder as a safe
// residual: the cylinder is changed when the gauge reaches it (common
// practice, 200 psi ≈ 13.8 bar). Local protocol may set another.
var DefaultResidualPsi = Psi(200)

// CylinderFactor returns the cylinder factor of a CGA letter size in litres
// of free oxygen per psi: D 0.16, E 0.28, M 1.56, G 2.41, H and K 3.14
// (common practice). Lower-case letters and surrounding spaces are accepted.
// An unknown size returns a *ParseError that unwraps to ErrSyntax.
func CylinderFactor(size CylinderSize) (float64, error) {
	f, ok := cylinderFactors[cylinderNormalSize(size)]
	if !ok {
		return 0, &ParseError{Quantity: "cylinder size", Input: string(size), Want: cylinderSizeList, Err: ErrSyntax}
	}
	return f, nil
}

func cylinderNormalSize(size CylinderSize) CylinderSize {
	return CylinderSize(strings.ToUpper(strings.TrimSpace(string(size))))
}

// Cylinder is one oxygen cylinder, defined in exactly one of three ways:
//
//   - Size: a CGA letter size, counted by the cylinder factor method
//     (free litres = gauge psi × factor);
//   - WaterCapacity: the internal volume in litres of water, counted by the
//     water-capacity method (free litres ≈ water capacity × gauge bar);
//   - NominalContents at NominalPressure: the contents printed on the label,
//     scaled by gauge/nominal pressure.
//
// The methods are never mixed: a Cylinder with more than one definition is
// invalid (Validate says which fields clash). Build one with
// FactorCylinder, WaterCapacityCylinder or LabelledCylinder.
type Cylinder struct {
	Size            CylinderSize // factor method (North American), or
	WaterCapacity   Volume       // water-capacity method: free L ≈ WC × gauge bar, or
	NominalContents Volume       // the label's nominal contents at NominalPressure
	NominalPressure Pressure
}

// cylinderKind is the method a valid Cylinder uses.
type cylinderKind int

const (
	cylinderKindNone cylinderKind = iota
	cylinderKindFactor
	cylinderKindWater
	cylinderKindLabel
)

// Cylinder method names returned by Method.
const (
	CylinderMethodFactor        = "cylinder factor"
	CylinderMethodWaterCapacity = "water capacity"
	CylinderMethodLabel         = "label contents"
)

// FactorCylinder returns a cylinder counted by the cylinder factor of a CGA
// letter size. An unknown size returns a *ParseError.
func FactorCylinder(size CylinderSize) (Cylinder, error) {
	if _, err := CylinderFactor(size); err != nil {
		return Cylinder{}, err
	}
	return Cylinder{Size: cylinderNormalSize(size)}, nil
}

// WaterCapacityCylinder returns a cylinder counted by the water-capacity
// method. wc is the water capacity in litres, 0.1–100 L; outside: a
// *RangeError.
func WaterCapacityCylinder(wc Volume) (Cylinder, error) {
	c := Cylinder{WaterCapacity: wc}
	return c, c.Validate()
}

// LabelledCylinder returns a cylinder counted from the nominal contents on
// its label (1–30 000 L of free gas) at the nominal filling pressure
// (10–300 bar, any pressure unit). Outside those: a *RangeError.
func LabelledCylinder(contents Volume, atPressure Pressure) (Cylinder, error) {
	c := Cylinder{NominalContents: contents, NominalPressure: atPressure}
	return c, c.Validate()
}

// Validate reports whether the cylinder has exactly one valid definition.
// Mixed or missing definitions return an *ImpossibleError; a value out of
// its plausible range a *RangeError; an unknown size a *ParseError.
func (c Cylinder) Validate() error {
	_, err := c.kind()
	return err
}

func (c Cylinder) kind() (cylinderKind, error) {
	hasSize := c.Size != ""
	hasWater := c.WaterCapacity != 0
	hasLabel := c.NominalContents != 0 || c.NominalPressure != 0
	switch cylinderCount(hasSize, hasWater, hasLabel) {
	case 0:
		return cylinderKindNone, &ImpossibleError{What: "cylinder", Reason: "no definition: give a size, a water capacity, or the label's contents and pressure"}
	case 1:
	default:
		var used []string
		if hasSize {
			used = append(used, "size")
		}
		if hasWater {
			used = append(used, "water capacity")
		}
		if hasLabel {
			used = append(used, "label contents")
		}
		return cylinderKindNone, &ImpossibleError{What: "cylinder", Reason: "more than one definition (" + strings.Join(used, ", ") + "): use exactly one method"}
	}
	switch {
	case c.Size != "":
		if _, err := CylinderFactor(c.Size); err != nil {
			return cylinderKindNone, err
		}
		return cylinderKindFactor, nil
	case c.WaterCapacity != 0:
		if err := checkRange("water capacity", c.WaterCapacity.Litres(), cylinderMinWaterLitres, cylinderMaxWaterLitres, "L"); err != nil {
			return cylinderKindNone, err
		}
		return cylinderKindWater, nil
	default:
		if err := checkRange("nominal contents", c.NominalContents.Litres(), cylinderMinLabelLitres, cylinderMaxLabelLitres, "L"); err != nil {
			return cylinderKindNone, err
		}
		if err := checkRange("nominal pressure", c.NominalPressure.Bar(), cylinderMinLabelBar, cylinderMaxWaterBar, "bar"); err != nil {
			return cylinderKindNone, err
		}
		return cylinderKindLabel, nil
	}
}

func cylinderCount(flags ...bool) int {
	n := 0
	for _, f := range flags {
		if f {
			n++
		}
	}
	return n
}

// Method returns the name of the counting method the cylinder uses
// (CylinderMethodFactor, CylinderMethodWaterCapacity or CylinderMethodLabel),
// or "" for an invalid cylinder.
func (c Cylinder) Method() string {
	k, _ := c.kind()
	switch k {
	case cylinderKindFactor:
		return CylinderMethodFactor
	case cylinderKindWater:
		return CylinderMethodWaterCapacity
	case cylinderKindLabel:
		return CylinderMethodLabel
	}
	return ""
}

// MaxPressure returns the highest gauge reading accepted for this kind of
// cylinder: 3 000 psi for a CGA letter size, 300 bar for a water-capacity
// or labelled cylinder. It returns 0 for an invalid cylinder.
func (c Cylinder) MaxPressure() Pressure {
	k, _ := c.kind()
	switch k {
	case cylinderKindFactor:
		return Psi(cylinderMaxFactorPsi)
	case cylinderKindWater, cylinderKindLabel:
		return Bar(cylinderMaxWaterBar)
	}
	return 0
}

// checkGauge validates a gauge pressure for cylinder kind k, reporting it in
// the unit the method counts in (psi for CGA sizes, bar otherwise).
func (c Cylinder) checkGauge(quantity string, gauge Pressure, k cylinderKind) error {
	if k == cylinderKindFactor {
		return checkRange(quantity, gauge.Psi(), 0, cylinderMaxFactorPsi, "psi")
	}
	return checkRange(quantity, gauge.Bar(), 0, cylinderMaxWaterBar, "bar")
}

// Contents returns the free oxygen in litres the cylinder holds at a gauge
// reading (gauge pressure, above ambient):
//
//	factor method:          litres = gauge psi × cylinder factor
//	water-capacity method:  litres = water capacity L × gauge bar
//	label:                  litres = nominal contents × gauge / nominal pressure
//
// Methods: cylinder factor and water capacity (common practice). The
// water-capacity product V×P is the conservative plan value: oxygen is not
// an ideal gas at filling pressure (compressibility factor Z ≈ 0.93 at
// 150–230 bar), so a full cylinder really holds about 6 % more (10 L at
// 200 bar and 15 °C ≈ 2 128 L by the Schmidt–Wagner equation of state,
// against 2 000 L here). No real-gas figure is offered: Alvea carries no
// sourced equation of state for oxygen that it could test. A label's
// nominal contents usually include that real-gas excess at the filling
// pressure, so scaling them linearly to a part-full gauge overstates the
// contents by up to a few percent; the residual absorbs that, and the
// water-capacity method avoids it.
//
// Valid gauge: 0–3 000 psi (CGA sizes) or 0–300 bar (others); outside, or an
// invalid cylinder: an error. The result is unrounded: round DOWN
// (RoundDown) before showing or planning with it.
func (c Cylinder) Contents(gauge Pressure) (Volume, error) {
	k, err := c.kind()
	if err != nil {
		return 0, err
	}
	if err := c.checkGauge("gauge pressure", gauge, k); err != nil {
		return 0, err
	}
	return c.contents(gauge, k), nil
}

func (c Cylinder) contents(gauge Pressure, k cylinderKind) Volume {
	switch k {
	case cylinderKindFactor:
		return Litres(gauge.Psi() * cylinderFactors[cylinderNormalSize(c.Size)])
	case cylinderKindWater:
		return Litres(c.WaterCapacity.Litres() * gauge.Bar())
	default:
		return Litres(c.NominalContents.Litres() * float64(gauge) / float64(c.NominalPressure))
	}
}

// Usable returns the free oxygen in litres above the safe residual:
// Contents(gauge) − Contents(residual), and exactly 0 (not an error) when
// gauge ≤ residual — the cylinder is due for change. Both pressures are
// gauge readings in the cylinder's accepted range (see MaxPressure);
// outside: a *RangeError naming "gauge pressure" or "residual pressure".
// DefaultResidualPsi is the common-practice residual.
//
// The result is unrounded: round DOWN (RoundDown) before showing it.
func (c Cylinder) Usable(gauge, residual Pressure) (Volume, error) {
	k, err := c.kind()
	if err != nil {
		return 0, err
	}
	if err := c.checkGauge("gauge pressure", gauge, k); err != nil {
		return 0, err
	}
	if err := c.checkGauge("residual pressure", residual, k); err != nil {
		return 0, err
	}
	if gauge <= residual {
		return 0, nil
	}
	return c.contents(gauge, k) - c.contents(residual, k), nil
}

// Plausible ranges for Endurance.
const (
	cylinderMaxUsableLitres = 100000.0
	cylinderMinFlow         = 0.01 // L/min; neonatal low-flow cannulas go to about 0.025
	cylinderMaxFlow         = 200.0
)

// Endurance returns how long usable litres last at a steady oxygen flow:
//
//	minutes = usable L / flow L/min
//
// (with the factor method this is the common-practice
// (gauge psi − residual psi) × factor / flow). usable 0–100 000 L; flow
// 0.01–200 L/min — a flow of 0 has no endurance and returns a *RangeError.
// The result is truncated to the nanosecond and otherwise unrounded: round
// DOWN (for example to whole minutes with Duration.Truncate or Round with
// RoundDown) before showing it.
func Endurance(usable Volume, flow Flow) (time.Duration, error) {
	if err := checkRange("usable oxygen", usable.Litres(), 0, cylinderMaxUsableLitres, "L"); err != nil {
		return 0, err
	}
	if err := checkRange("oxygen flow", flow.LitresPerMinute(), cylinderMinFlow, cylinderMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	return Minutes(usable.Litres() / flow.LitresPerMinute()), nil
}

// Plausible ranges for GaugeAtTemperature.
const (
	cylinderMinCelsius    = -60.0 // cold-soaked aircraft hold
	cylinderMaxCelsius    = 65.0  // upper storage limit commonly given for gas cylinders
	cylinderMinAmbientKPa = 5.0   // about 20 km in the standard atmosphere
	cylinderMaxAmbientKPa = 110.0 // deepest inhabited depressions, high weather
)

// GaugeAtTemperature returns the gauge reading after the gas in a sealed
// cylinder changes temperature, by Gay-Lussac's law on ABSOLUTE pressure:
//
//	(gauge_to + ambient) = (gauge + ambient) × T_to / T_from
//
// A cold cylinder reads low; its contents (the amount of gas) are
// unchanged, and they read back when it warms. Plan with the reading at the
// temperature the cylinder will be used at.
//
// gauge 0–300 bar; from, to −60 to +65 °C (in kelvin or Celsius); ambient
// 5–110 kPa absolute. Outside: a *RangeError. Special case: a cylinder at
// 0 gauge that cools reads slightly below zero (a partial vacuum), which is
// returned as it is. Unrounded: the reading is informational, round to
// nearest (or DOWN where a plan rests on it).
func GaugeAtTemperature(gauge Pressure, from, to Temperature, ambient Pressure) (Pressure, error) {
	if err := checkRange("gauge pressure", gauge.Bar(), 0, cylinderMaxWaterBar, "bar"); err != nil {
		return 0, err
	}
	if err := checkRange("cylinder temperature (from)", from.Celsius(), cylinderMinCelsius, cylinderMaxCelsius, "°C"); err != nil {
		return 0, err
	}
	if err := checkRange("cylinder temperature (to)", to.Celsius(), cylinderMinCelsius, cylinderMaxCelsius, "°C"); err != nil {
		return 0, err
	}
	if err := checkRange("ambient pressure", ambient.Kilopascals(), cylinderMinAmbientKPa, cylinderMaxAmbientKPa, "kPa"); err != nil {
		return 0, err
	}
	absolute := float64(gauge+ambient) * to.Kelvin() / from.Kelvin()
	return Pressure(absolute) - ambient, nil
}
