package ui

import (
	"fmt"
	"math"

	"alvea/physio"
)

// The Altitude screen's figures, all from physio. This file holds no
// formula: it checks inputs, calls physio, and samples curves by calling
// physio once per point.

// altitudeInputs are the checked inputs of the Altitude screen, in physio
// quantities.
type altitudeInputs struct {
	Origin, Destination, Cruise, CabinLimit physio.Altitude
	Differential                            physio.Pressure
	Stated                                  *physio.Altitude // cabin altitude stated by the pilot; nil: computed
	FiO2                                    physio.Fraction
	PaCO2, PaO2                             physio.Pressure // arterial, measured on the ground
	RQ                                      float64         // respiratory quotient
	TemperatureC                            float64         // body temperature
	AtDestination                           bool            // the ground values were measured at the destination
	CuffMl, PneumothoraxMl                  float64
	CuffGauge                               physio.Pressure // cuff pressure set at the origin
}

// altitudeResult is what the screen shows.
type altitudeResult struct {
	Cabin, Highest    physio.Altitude
	CabinStated       bool // the cabin altitude is the pilot's, not computed
	MaxCruise         physio.Altitude
	MaxCruiseCeiling  bool // the differential holds the limit above the model's ceiling
	AARatio           float64
	PAO2Cabin         physio.Pressure
	PaO2Cabin         physio.Pressure
	SpO2Cabin         physio.Fraction
	Ratio             float64
	CuffMl, PtxMl     float64
	CuffPressure      physio.Pressure // gauge inside a cuff that cannot stretch, at the highest altitude
	CuffAboveLimit    bool
	PressureOrigin    physio.Pressure
	PressureHighest   physio.Pressure
	OriginIsHighest   bool
	HighestPlace      string
	Curve             []altitudeSample
	CurveMin, CurveMx physio.Altitude
}

// altitudeSample is one point of the curves.
type altitudeSample struct {
	At         physio.Altitude
	PAO2, PaO2 physio.Pressure
	SpO2       physio.Fraction
}

// alveolar returns PAO2 at altitude h for the patient (simplified alveolar
// gas equation) with the water vapour pressure ph2o.
func alveolar(in altitudeInputs, ph2o physio.Pressure, h physio.Altitude) (physio.Pressure, error) {
	pb, err := physio.PressureAtAltitude(h)
	if err != nil {
		return 0, err
	}
	return physio.AlveolarPO2(in.FiO2, pb, ph2o, in.PaCO2, in.RQ)
}

// waterVapour is the alveolar water vapour pressure at the body
// temperature: the conventional 47 mmHg at 37 °C (the figure the method is
// taught with, and the one the plan engine uses there), otherwise
// physio's saturation vapour pressure at that temperature — the same
// choice as physio.ComputePlan, so both give the same figures.
func waterVapour(tempC float64) (physio.Pressure, error) {
	if tempC == physio.DefaultPlanTemperatureC {
		return physio.ConventionalWaterVapourPressure, nil
	}
	return physio.WaterVapourPressure(physio.Celsius(tempC))
}

// computeAltitude computes every figure of the Altitude screen. An error
// is returned as the sentence the crew reads.
func computeAltitude(in altitudeInputs) (altitudeResult, string) {
	var r altitudeResult
	var err error
	if in.Stated != nil {
		r.Cabin, r.CabinStated = *in.Stated, true
	} else if r.Cabin, err = physio.CabinAltitude(in.Cruise, in.Differential, in.Origin); err != nil {
		return r, fmt.Sprintf("Cabin altitude: %v.", err)
	}
	r.MaxCruise, err = physio.MaxCruiseAltitude(in.CabinLimit, in.Differential)
	if err != nil {
		if r.MaxCruise == physio.MaxModelAltitude {
			r.MaxCruiseCeiling = true
		} else {
			return r, fmt.Sprintf("Highest cruise altitude: %v.", err)
		}
	}
	r.Highest, r.HighestPlace = in.Origin, "origin"
	if r.Cabin > r.Highest {
		r.Highest, r.HighestPlace = r.Cabin, "cabin"
	}
	if in.Destination > r.Highest {
		r.Highest, r.HighestPlace = in.Destination, "destination"
	}
	if r.PressureOrigin, err = physio.PressureAtAltitude(in.Origin); err != nil {
		return r, fmt.Sprintf("Origin: %v.", err)
	}
	if r.PressureHighest, err = physio.PressureAtAltitude(r.Highest); err != nil {
		return r, fmt.Sprintf("Highest altitude: %v.", err)
	}

	// Patient: a/A ratio where the ground values were measured, held
	// constant on the way.
	ph2o, err := waterVapour(in.TemperatureC)
	if err != nil {
		return r, fmt.Sprintf("Water vapour at the body temperature: %v.", err)
	}
	ground, groundName := in.Origin, "origin"
	if in.AtDestination {
		ground, groundName = in.Destination, "destination"
	}
	pAO2Ground, err := alveolar(in, ph2o, ground)
	if err != nil {
		return r, fmt.Sprintf("Alveolar PO2 at the %s: %v.", groundName, err)
	}
	if r.AARatio, err = physio.AARatio(in.PaO2, pAO2Ground); err != nil {
		return r, fmt.Sprintf("Arterial PaO2 is above the alveolar PO2 at the %s (%v): check FiO2, PaO2 and PaCO2.", groundName, err)
	}
	sample := func(h physio.Altitude) (altitudeSample, error) {
		pA, err := alveolar(in, ph2o, h)
		if err != nil {
			return altitudeSample{}, err
		}
		pa, err := physio.PaO2ByAARatio(r.AARatio, pA)
		if err != nil {
			return altitudeSample{}, err
		}
		s, err := physio.Saturation(pa)
		if err != nil {
			return altitudeSample{}, err
		}
		return altitudeSample{At: h, PAO2: pA, PaO2: pa, SpO2: s}, nil
	}
	cabin, err := sample(r.Cabin)
	if err != nil {
		return r, fmt.Sprintf("Oxygen at the cabin altitude: %v.", err)
	}
	r.PAO2Cabin, r.PaO2Cabin, r.SpO2Cabin = cabin.PAO2, cabin.PaO2, cabin.SpO2

	// Curves from the lowest place to a little above the highest, at least
	// to 10 000 ft so the shape of the curve shows.
	lo := math.Min(0, math.Min(in.Origin.Metres(), in.Destination.Metres()))
	hi := math.Max(r.Highest.Metres(), physio.Feet(10000).Metres()) * 1.15
	hi = math.Min(hi, physio.MaxModelAltitude.Metres())
	r.CurveMin, r.CurveMx = physio.Metres(lo), physio.Metres(hi)
	const n = 48
	for i := 0; i <= n; i++ {
		h := physio.Metres(lo + (hi-lo)*float64(i)/n)
		s, err := sample(h)
		if err != nil {
			// A point the patient's figures cannot reach (no oxygen in the
			// alveoli) ends the curve: nothing beyond it is drawn.
			break
		}
		r.Curve = append(r.Curve, s)
	}

	// Trapped gas from the origin to the highest altitude.
	if r.Ratio, err = physio.ExpansionRatio(r.PressureOrigin, r.PressureHighest); err != nil {
		return r, fmt.Sprintf("Gas expansion: %v.", err)
	}
	cuff, err := physio.ExpandedVolume(physio.Millilitres(in.CuffMl), r.PressureOrigin, r.PressureHighest)
	if err != nil {
		return r, fmt.Sprintf("Cuff volume: %v.", err)
	}
	r.CuffMl = cuff.Millilitres()
	ptx, err := physio.ExpandedVolume(physio.Millilitres(in.PneumothoraxMl), r.PressureOrigin, r.PressureHighest)
	if err != nil {
		return r, fmt.Sprintf("Pneumothorax volume: %v.", err)
	}
	r.PtxMl = ptx.Millilitres()
	if r.CuffPressure, err = physio.RigidSpaceOverpressure(in.CuffGauge, r.PressureOrigin, r.PressureHighest); err != nil {
		return r, fmt.Sprintf("Cuff pressure: %v.", err)
	}
	r.CuffAboveLimit = r.CuffPressure > physio.TubeCuffPerfusionLimit
	r.OriginIsHighest = r.HighestPlace == "origin"
	return r, ""
}
