// Package physio is Alvea's computation engine: the standard atmosphere,
// cabin altitude, the alveolar gas equation, oxygen needs at altitude,
// oxyhaemoglobin saturation, oxygen content, cylinders, delivery devices,
// ventilators, reserves, trapped-gas expansion, and the transport plan that
// chains them.
//
// # Scope
//
// Pure computation: the standard library and shopspring/decimal only. No
// user interface, storage or browser code is ever imported here, so the
// package builds and tests natively anywhere.
//
// # Units
//
// Every quantity is a named type holding one canonical unit, built by unit
// constructors and read by unit accessors, as time.Duration is:
//
//	Pressure     pascal            Pascals, Kilopascals, MmHg, Psi, Bar, CmH2O, InHg
//	Altitude     metre (geopotential)  Metres, Feet
//	Flow         litre per minute  LitresPerMinute
//	Volume       litre             Litres, Millilitres
//	Fraction     0–1               FractionOf, Percent
//	Temperature  kelvin            Kelvin, Celsius (offset scale, via functions)
//
// Durations use time.Duration. Text from people is parsed with decimal (see
// ParsePressure and friends); a unit is required wherever a bare number
// would be ambiguous.
//
// # Numbers and rounding
//
// Formulas compute in float64 and return unrounded values so that chains do
// not accumulate rounding. Values that reach a person are rounded with Round
// on the safe side, and each output's doc comment says which way: durations
// and usable oxygen down; oxygen needed, FiO2 needed and cabin altitude up.
// Invalid input returns a typed error (*RangeError, *ParseError,
// *ImpossibleError); no function returns NaN or Inf for input it accepted.
//
// # Sources
//
// Each formula's doc comment cites its method. The list:
//
//   - U.S. Standard Atmosphere, 1976 (NOAA-S/T 76-1562); ICAO Doc 7488/3.
//     Domain −610 m to 20 000 m geopotential (fields below sea level exist).
//     Checked against Samuels MP, Arch Dis Child 2004;89:448–455, Table 1,
//     and against GNU units' stdatmPH.
//   - Water vapour saturation pressure: Wagner W, Pruß A, J Phys Chem Ref
//     Data 1993;22:783 (IAPWS).
//   - 14 CFR 25.841(a): 8 000 ft cabin altitude in normal operation.
//   - Alveolar gas equation, simplified and full forms (Fenn, Rahn and Otis
//     1946; as given in Egan's Fundamentals of Respiratory Care).
//   - Constant a/A ratio for PaO2 at altitude; Dillard TA et al., Ann Intern
//     Med 1989;111:362–7.
//   - Severinghaus JW, J Appl Physiol 1979;46:599–602 (saturation curve).
//   - Oxygen content and delivery (Hüfner constant 1.34 mL/g, common
//     practice; settable).
//   - Cylinder factors for CGA letter sizes and free-gas volume of water
//     capacity cylinders (common practice); Gay-Lussac's law.
//   - BTS guideline for oxygen use in adults, Thorax 2017;72(Suppl 1)
//     (device FiO2 ranges); Venturi entrainment (common practice).
//   - Boyle's law for trapped gas; Mann C et al., Emerg Med J 2007;24:165–7.
package physio
