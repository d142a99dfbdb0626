package physio

import "time"

// Pressure is an absolute or differential pressure in pascals.
type Pressure float64

// Pressure constructors.
func Pascals(v float64) Pressure     { return Pressure(v) }
func Kilopascals(v float64) Pressure { return Pressure(v * 1000) }
func MmHg(v float64) Pressure        { return Pressure(v * pascalsPerMmHg) }
func Psi(v float64) Pressure         { return Pressure(v * pascalsPerPsi) }
func Bar(v float64) Pressure         { return Pressure(v * pascalsPerBar) }
func CmH2O(v float64) Pressure       { return Pressure(v * pascalsPerCmH2O) }
func InHg(v float64) Pressure        { return Pressure(v * pascalsPerInHg) }
func Atmospheres(v float64) Pressure { return Pressure(v * pascalsPerAtm) }

// Pressure accessors.
func (p Pressure) Pascals() float64     { return float64(p) }
func (p Pressure) Kilopascals() float64 { return float64(p) / 1000 }
func (p Pressure) MmHg() float64        { return float64(p) / pascalsPerMmHg }
func (p Pressure) Psi() float64         { return float64(p) / pascalsPerPsi }
func (p Pressure) Bar() float64         { return float64(p) / pascalsPerBar }
func (p Pressure) CmH2O() float64       { return float64(p) / pascalsPerCmH2O }
func (p Pressure) InHg() float64        { return float64(p) / pascalsPerInHg }

// Altitude is a geopotential altitude in metres (the standard atmosphere's
// altitude variable; below 20 km it differs from geometric height by less
// than 0.4 %).
type Altitude float64

// Altitude constructors and accessors. 1 ft = 0.3048 m exactly.
func Metres(v float64) Altitude    { return Altitude(v) }
func Feet(v float64) Altitude      { return Altitude(v * metresPerFoot) }
func (a Altitude) Metres() float64 { return float64(a) }
func (a Altitude) Feet() float64   { return float64(a) / metresPerFoot }

// Flow is a gas flow in litres per minute.
type Flow float64

func LitresPerMinute(v float64) Flow    { return Flow(v) }
func (f Flow) LitresPerMinute() float64 { return float64(f) }

// Volume is a gas volume in litres.
type Volume float64

func Litres(v float64) Volume         { return Volume(v) }
func Millilitres(v float64) Volume    { return Volume(v / millilitresPerLitre) }
func (v Volume) Litres() float64      { return float64(v) }
func (v Volume) Millilitres() float64 { return float64(v) * millilitresPerLitre }

// Fraction is a dimensionless fraction, 0–1 (FiO2, SpO2 as a fraction).
type Fraction float64

// FractionOf builds a Fraction from a value 0–1; Percent from 0–100.
func FractionOf(v float64) Fraction { return Fraction(v) }
func Percent(v float64) Fraction    { return Fraction(v / 100) }
func (f Fraction) Value() float64   { return float64(f) }
func (f Fraction) Percent() float64 { return float64(f) * 100 }

// Temperature is a thermodynamic temperature in kelvin. Celsius is an offset
// scale: it goes through these functions, never a multiplying constant.
type Temperature float64

func Kelvin(v float64) Temperature     { return Temperature(v) }
func Celsius(v float64) Temperature    { return Temperature(v + kelvinAtZeroC) }
func (t Temperature) Kelvin() float64  { return float64(t) }
func (t Temperature) Celsius() float64 { return float64(t) - kelvinAtZeroC }

// Minutes converts a float count of minutes to a time.Duration, truncated to
// the nanosecond.
func Minutes(v float64) time.Duration { return time.Duration(v * float64(time.Minute)) }
