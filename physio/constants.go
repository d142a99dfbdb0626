package physio

// Unit definitions, exact by definition unless noted.
const (
	pascalsPerPsi       = 6894.757293168 // 1 lbf/in², from 1 lb = 0.45359237 kg, 1 in = 0.0254 m, g0
	pascalsPerBar       = 100000.0
	pascalsPerAtm       = 101325.0
	pascalsPerMmHg      = 133.322387415 // conventional millimetre of mercury
	pascalsPerCmH2O     = 98.0665
	pascalsPerInHg      = 3386.389 // conventional inch of mercury, 4 decimals of published value
	metresPerFoot       = 0.3048
	kelvinAtZeroC       = 273.15
	millilitresPerLitre = 1000.0
)
