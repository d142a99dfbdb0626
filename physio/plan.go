package physio

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"

	"github.com/shopspring/decimal"
)

// EngineVersion is the version of the plan computation, reported in every
// PlanResult so that a stored result can be traced to the engine that made
// it. It changes whenever a formula, default or rounding of the plan does.
const EngineVersion = "1.0.0"

// DefaultSpO2TargetPercent is the lowest expected SpO2 a plan accepts
// without a warning when the policy sets none: 94 %, the lower end of the
// usual target range 94–98 % of the BTS guideline for oxygen use in adults
// (Thorax 2017;72(Suppl 1)). Patients at risk of hypercapnic failure have a
// lower target (88–92 %): set policy.spo2_target_percent.
const DefaultSpO2TargetPercent = 94.0

// Defaults for a patient value the document does not give. Each use is
// reported as a PlanAssumption.
const (
	DefaultPlanTemperatureC = 37.0 // normal body temperature
	DefaultPlanPaCO2MmHg    = 40.0 // middle of the normal 35–45 mmHg (common practice)
)

// Worked trapped-gas examples shown with every plan: a tube cuff filled
// with air and a small pneumothorax (volumes of our own choosing, for
// illustration).
const (
	planCuffMl         = 10.0
	planPneumothoraxMl = 500.0
)

// The worked volumes as the result shows them, made once (decimals are
// never changed in place; see planZeros).
var (
	planCuffNumber         = num(planCuffMl, 0, RoundNearest)
	planPneumothoraxNumber = num(planPneumothoraxMl, 0, RoundNearest)
)

// PlanCaution is the caution shown with every plan.
const PlanCaution = "Planning aid only: verify against the gauges and the device's own figures; local protocol and medical direction decide."

// TrappedGasCaution is the caution shown with the trapped-gas figures.
const TrappedGasCaution = "Gas trapped in the body or equipment expands as the pressure falls (Boyle's law). " +
	"An air-filled tube cuff cannot grow freely, so its pressure rises instead: check cuff pressure with a manometer after the climb and in flight " +
	"(mucosal perfusion is compromised near 30 cmH2O, Mann 2007). An undrained pneumothorax grows by the same ratio. " +
	"Local protocol and medical direction decide how to manage them."

// Sources named in the figures.
const (
	srcISA      = "U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562)"
	srcCabin    = "pressure balance on the U.S. Standard Atmosphere 1976"
	srcPilot    = "stated in the plan (route.cabin_altitude_ft)"
	srcAlveolar = "alveolar gas equation, simplified form (Egan's Fundamentals of Respiratory Care)"
	srcWater    = "Wagner W, Pruss A, J Phys Chem Ref Data 1993;22:783 (IAPWS saturation pressure)"
	srcWater47  = "alveolar gas equation convention, 47 mmHg at 37 °C (common practice)"
	srcInspired = "constant inspired PO2 (common practice in aeromedical transport)"
	srcAA       = "constant a/A ratio (common practice in aeromedical planning)"
	srcSev      = "Severinghaus JW, J Appl Physiol 1979;46:599-602, eq. 1"
	srcSevInv   = "exact inverse of Severinghaus JW, J Appl Physiol 1979;46:599-602, eq. 1"
	srcBTS      = "BTS guideline for oxygen use in adults, Thorax 2017;72(Suppl 1)"
	srcBlend    = "oxygen share of a blended flow (common practice)"
	srcVent     = "ventilator oxygen use (common practice; the device's own figure wins)"
	srcCylinder = "cylinder factor or water capacity (common practice)"
	srcReserve  = "reserve policy (common practice; local protocol decides)"
	srcBoyle    = "Boyle's law"
	srcMann     = "Boyle's law; Mann C et al., Emerg Med J 2007;24:165-7"
	srcContent  = "oxygen content (common practice; Huefner 1.34 mL/g)"
	srcAaAge    = "age/4 + 4 mmHg (common practice, a rule of thumb)"
	srcPlan     = "this plan"
)

// ComputePlan runs the whole transport chain on a document: altitudes and
// pressures of every leg and the cabin; the patient's ground state (PAO2,
// a/A ratio); PAO2, expected PaO2 and SpO2 and the FiO2 needed on every
// leg; whether each leg's set-up delivers it, with options if not; the
// limits where FiO2 1.0 still holds the ground state; oxygen per leg, the
// need with reserve, usable litres, margin, cylinder changes and the minute
// the supply runs out; trapped-gas expansion; and coded warnings.
//
// Method notes (also reported as assumptions in the result): PaCO2, the
// respiratory quotient and the a/A ratio are held at their ground values;
// the alveolar gas equation is the simplified form (the cautious one); a
// low-flow device is planned at the low end of its FiO2 range; water vapour
// is the conventional 47 mmHg of the alveolar gas equation at 37 °C, and
// the IAPWS saturation pressure at any other body temperature (47 is that
// curve's 47.12 rounded, so the step at 37 °C keeps it rising); reserve
// minutes are counted at the highest leg flow; cylinders are used in
// the order listed, each to its residual.
//
// Rounding is on the safe side and named in each Figure: oxygen needed,
// FiO2 needed, altitudes reached and expansion up; usable oxygen, PAO2,
// PaO2, SpO2, pressures, limits and minutes down.
//
// Errors: a document that fails Validate, or whose patient values
// contradict each other (PaO2 above the alveolar PO2), returns PlanErrors;
// anything else is a wrapped physio error.
func ComputePlan(doc *PlanDocument) (*PlanResult, error) {
	if err := doc.Validate(); err != nil {
		return nil, err
	}
	cylinders := 0
	for _, s := range doc.Supply {
		cylinders += planCount(s)
	}
	// Slices and maps are made at the size the plan will fill (the Brief
	// computes a plan on every keystroke, and in wasm each growth is an
	// allocation and a copy).
	legs := len(doc.Legs)
	ground := planGroundFigureCount(&doc.Patient)
	ex := newExplainArena(3+legs+cylinders,
		planExplainFigures+ground+planLegFigures*legs+cylinders+planTrappedGasFigures)
	c := &planComputer{doc: doc, ex: ex, res: &PlanResult{
		EngineVersion:   EngineVersion,
		DocumentVersion: doc.Version,
		Title:           doc.Title,
		Caution:         PlanCaution,
		Assumptions:     make([]PlanAssumption, 0, planAssumptionsUsual),
		Warnings:        []PlanWarning{},
		Legs:            make([]PlanLegResult, 0, legs),
		Cylinders:       make([]PlanCylinderResult, 0, cylinders),
	}}
	c.res.Explain = c.ex.newExplanation(planExplainFigures)
	c.perLeg = make([]planLegState, 0, legs)
	c.numbers = make([]Number, 0, planOptionalNumbers+legs+2*cylinders)
	c.ints = make([]int, 0, cylinders+legs)
	c.inputs = make([]FigureInput, 0, planInputsFixed+planInputsPerLeg*legs+planInputsPerCylinder*cylinders)
	c.run()
	if c.err != nil {
		return nil, c.err
	}
	return c.res, nil
}

// Sizes a plan's result is made at: the figures in PlanResult.Explain,
// each PlanLegResult.Explain and PlanTrappedGasResult.Explain at most; the
// assumptions of a document that gives no optional value but the
// patient's; and the figure inputs of the plan as a whole, of each leg and
// of each cylinder at most. Each is only a size hint: a plan that needs
// more grows as before.
const (
	planExplainFigures    = 11
	planLegFigures        = 11
	planTrappedGasFigures = 4
	planAssumptionsUsual  = 8
	planInputsFixed       = 48
	planInputsPerLeg      = 23
	planInputsPerCylinder = 2
)

type planComputer struct {
	doc *PlanDocument
	res *PlanResult
	ex  explainArena // where the result's Explanations are made
	err error

	// inputs is the backing array every figure's inputs are copied into:
	// one allocation per plan instead of one per figure.
	inputs []FigureInput

	origin, destination Altitude
	cabin               *Altitude
	dp                  Pressure
	ph2o                Pressure
	paco2               Pressure
	rq                  float64
	groundFiO2          Fraction
	groundPB            Pressure
	aaRatio             float64
	perLeg              []planLegState

	// numbers and ints hold what the result's *Number and *int fields
	// point to (optional figures, cylinder minutes, a warning's leg): one
	// array per plan instead of one allocation per pointer. Each pointer
	// is to its own element; a full array is replaced, never grown, so
	// no pointer moves.
	numbers []Number
	ints    []int
}

// planLegState is what the later steps use of each leg.
type planLegState struct {
	alt     Altitude
	pb      Pressure
	minutes float64
	lpm     float64 // oxygen flow, set by leg
}

// planOptionalNumbers is the number of optional figures a plan holds
// besides those of its legs and cylinders (cabin and max cruise altitude,
// supply exhausted, expected A-a gradient, ground oxygen content).
const planOptionalNumbers = 5

// planOptionsUsual is how many options a leg usually has: the same device
// at the FiO2 needed, the three low-flow devices, a Venturi setting and
// two high-flow totals.
const planOptionsUsual = 7

// optional returns a pointer to a copy of n, for a *Number field.
func (c *planComputer) optional(n Number) *Number {
	if len(c.numbers) == cap(c.numbers) {
		c.numbers = make([]Number, 0, planOptionalNumbers)
	}
	c.numbers = append(c.numbers, n)
	return &c.numbers[len(c.numbers)-1]
}

// optionalInt returns a pointer to a copy of i, for an *int field.
func (c *planComputer) optionalInt(i int) *int {
	if len(c.ints) == cap(c.ints) {
		c.ints = make([]int, 0, planOptionalNumbers)
	}
	c.ints = append(c.ints, i)
	return &c.ints[len(c.ints)-1]
}

// stepErr records the first failure of a step.
func (c *planComputer) stepErr(step string, err error) {
	if c.err == nil && err != nil {
		c.err = fmt.Errorf("physio: plan: %s: %w", step, err)
	}
}

// legErr records the first failure of a step of leg i. The step's name
// ("legs[1] PAO2") is written only on a failure: a leg has a dozen steps.
func (c *planComputer) legErr(i int, step string, err error) {
	if c.err == nil && err != nil {
		c.stepErr("legs["+strconv.Itoa(i)+"] "+step, err)
	}
}

func (c *planComputer) docErr(path, format string, args ...any) {
	if c.err == nil {
		c.err = PlanErrors{{Path: path, Message: fmt.Sprintf(format, args...), Err: ErrImpossible}}
	}
}

// figure rounds x, records its Figure under key in ex, and returns the
// rounded number.
func (c *planComputer) figure(ex Explanation, key string, x float64, places int32, r Rounding,
	unit, formula, source string, inputs ...FigureInput) Number {
	d, ok := planRound(x, places, r)
	if !ok {
		c.stepErr(key, fmt.Errorf("result is not a finite number: %w", ErrImpossible))
	}
	n := Number{d}
	ex.set(key, Figure{Value: n, Unit: unit, Formula: formula, Inputs: c.keep(inputs), Source: source, Rounding: r.String()})
	return n
}

// keep copies a figure's inputs into the plan's inputs array and returns
// them there (nil for none, as the variadic call gives). figure does not
// hold the caller's slice, so each call's inputs stay on its stack. The
// returned slice is capped at its own length: an append to one figure's
// inputs can never write into the next one's.
func (c *planComputer) keep(inputs []FigureInput) []FigureInput {
	if len(inputs) == 0 {
		return nil
	}
	if cap(c.inputs)-len(c.inputs) < len(inputs) {
		// Full: start a new array; the figures already made keep theirs.
		c.inputs = make([]FigureInput, 0, max(planInputsFixed, len(inputs)))
	}
	start := len(c.inputs)
	c.inputs = append(c.inputs, inputs...)
	return c.inputs[start:len(c.inputs):len(c.inputs)]
}

func in(name string, x float64, unit string) FigureInput {
	v := math.Round(x*1e4) / 1e4
	if math.IsNaN(v) || math.IsInf(v, 0) {
		v = 0 // inputs are validated finite; never let a non-number reach JSON
	}
	return FigureInput{Name: name, Value: v, Unit: unit}
}

func num(x float64, places int32, r Rounding) Number {
	d, _ := planRound(x, places, r)
	return Number{d}
}

// planRound rounds x to places decimals in direction r, like Round, after
// first dropping binary noise below 10⁻⁶ of the last place, so that a value
// meant to be exact (5 400 ft read back from metres, 0.28 − 0.04) is not
// pushed a whole step by a 1e-16 error. The safe-side direction applies to
// every real difference. It works on the scaled integer (much faster than a
// decimal conversion: a plan rounds about a hundred numbers).
func planRound(x float64, places int32, r Rounding) (decimal.Decimal, bool) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return decimal.Zero, false
	}
	v, ok := planScaled(x, places, r)
	if !ok {
		return Round(x, places, r)
	}
	if v == 0 && places >= 0 && int(places) < len(planZeros) {
		return planZeros[places], true
	}
	return decimal.New(v, -places), true
}

// planScaled is planRound's result as a whole number of 10^-places, where
// it is one (ok false for a non-number, or a scaled value beyond 10¹², which
// planRound hands to Round).
func planScaled(x float64, places int32, r Rounding) (int64, bool) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, false
	}
	s := x * math.Pow10(int(places))
	if math.Abs(s) > 1e12 {
		return 0, false
	}
	s = math.Round(s*1e6) / 1e6
	switch r {
	case RoundDown:
		s = math.Floor(s)
	case RoundUp:
		s = math.Ceil(s)
	default:
		s = math.Round(s)
	}
	return int64(s), true
}

// planZeros is zero at 0 to 3 places, as planRound makes it. A decimal is
// never changed in place (every operation and accessor of decimal.Decimal
// copies its big.Int), so one zero per exponent serves every plan; nothing
// writes to these after package start, so concurrent plans share them
// safely. A plan has a few zeros (start minutes, margins).
var planZeros = [...]decimal.Decimal{decimal.New(0, 0), decimal.New(0, -1), decimal.New(0, -2), decimal.New(0, -3)}

// planCmpRounded compares n with x rounded as num(x, places, r) would (-1,
// 0, +1, like Cmp), without making that decimal when n is a whole number of
// 10^-places: the options and the cabin limit compare many values they
// never keep.
func planCmpRounded(n Number, x float64, places int32, r Rounding) int {
	if v, ok := planScaled(x, places, r); ok && n.Exponent() == -places && n.NumDigits() <= 18 {
		return cmp.Compare(n.CoefficientInt64(), v)
	}
	return n.Cmp(num(x, places, r).Decimal)
}

func (c *planComputer) assume(path, value, reason string) {
	c.res.Assumptions = append(c.res.Assumptions, PlanAssumption{Path: path, Value: value, Reason: reason})
}

// warn records a warning. Messages are built by concatenation, not fmt
// (numbers by Number.String, strconv.Itoa for %d, strconv.FormatFloat 'f'
// for %.1f: the same text): a plan is computed on every keystroke.
func (c *planComputer) warn(code, severity string, leg int, msg string) {
	w := PlanWarning{Code: code, Severity: severity, Message: msg}
	if leg >= 0 {
		w.Leg = c.optionalInt(leg)
	}
	c.res.Warnings = append(c.res.Warnings, w)
}

func (c *planComputer) run() {
	steps := []func(){c.route, c.ground, c.legs, c.limits, c.oxygen, c.trappedGas}
	for _, step := range steps {
		if c.err != nil {
			return
		}
		step()
	}
	if c.err != nil {
		return
	}
	c.res.Status = StatusGo
	for _, w := range c.res.Warnings {
		switch w.Severity {
		case SeverityNoGo:
			c.res.Status = StatusNoGo
		case SeverityCaution:
			if c.res.Status == StatusGo {
				c.res.Status = StatusCaution
			}
		}
	}
	c.res.Go = c.res.Status != StatusNoGo
}

func (c *planComputer) pressure(step string, h Altitude) Pressure {
	p, err := PressureAtAltitude(h)
	c.stepErr(step, err)
	return p
}

// route: field altitudes and the cabin.
func (c *planComputer) route() {
	r := c.doc.Route
	c.origin = Feet(*r.OriginElevationFt)
	c.destination = Feet(*r.DestinationElevationFt)
	if r.MaxDifferentialPsi != nil {
		c.dp = Psi(*r.MaxDifferentialPsi)
	}
	c.res.Pressurised = c.dp > 0
	switch {
	case r.CabinAltitudeFt != nil:
		h := Feet(*r.CabinAltitudeFt)
		c.cabin = &h
		n := c.figure(c.res.Explain, "cabin_altitude_ft", h.Feet(), 0, RoundUp, "ft",
			"cabin altitude as stated", srcPilot, in("stated cabin altitude", *r.CabinAltitudeFt, "ft"))
		c.res.CabinAltitudeFt = c.optional(n)
	case r.CruiseAltitudeFt != nil:
		h, err := CabinAltitude(Feet(*r.CruiseAltitudeFt), c.dp, c.origin)
		if err != nil {
			c.stepErr("cabin altitude", err)
			return
		}
		c.cabin = &h
		formula := "unpressurised: cabin = cruise"
		if c.dp > 0 {
			formula = "P_cabin = P(cruise) + max differential; cabin = H(P_cabin), not below the origin field"
		}
		n := c.figure(c.res.Explain, "cabin_altitude_ft", h.Feet(), 0, RoundUp, "ft", formula, srcCabin,
			in("cruise altitude", *r.CruiseAltitudeFt, "ft"), in("max differential", c.dp.Psi(), "psi"),
			in("origin elevation", *r.OriginElevationFt, "ft"))
		c.res.CabinAltitudeFt = c.optional(n)
	}
	for i, leg := range c.doc.Legs {
		var h Altitude
		switch leg.Where {
		case WhereOrigin:
			h = c.origin
		case WhereDestination:
			h = c.destination
		default:
			h = *c.cabin
		}
		p, err := PressureAtAltitude(h)
		c.legErr(i, "pressure", err)
		c.perLeg = append(c.perLeg, planLegState{alt: h, pb: p, minutes: *leg.Minutes})
	}
	best := 0
	for i, l := range c.perLeg {
		if l.alt > c.perLeg[best].alt {
			best = i
		}
	}
	c.res.HighestLeg = best
	c.res.HighestAltitudeFt = c.figure(c.res.Explain, "highest_altitude_ft", c.perLeg[best].alt.Feet(), 0, RoundUp, "ft",
		"highest of the legs' altitudes (origin, cabin, destination)", srcPlan,
		in("origin elevation", c.origin.Feet(), "ft"), in("destination elevation", c.destination.Feet(), "ft"))
}

// ground: the patient's state where it was measured.
func (c *planComputer) ground() {
	pt := c.doc.Patient
	g := &c.res.Ground
	g.Explain = c.ex.newExplanation(planGroundFigureCount(&c.doc.Patient))
	g.MeasuredAt = pt.MeasuredAt
	if g.MeasuredAt == "" {
		g.MeasuredAt = WhereOrigin
		c.assume("patient.measured_at", WhereOrigin, "not given: the ground state is taken as measured at the origin field")
	}
	groundAlt := c.origin
	if g.MeasuredAt == WhereDestination {
		groundAlt = c.destination
	}
	temp := DefaultPlanTemperatureC
	if pt.TemperatureC != nil {
		temp = *pt.TemperatureC
	} else {
		c.assume("patient.temperature_c", "37", "not given: normal body temperature")
	}
	c.paco2 = MmHg(DefaultPlanPaCO2MmHg)
	if pt.PaCO2MmHg != nil {
		c.paco2 = MmHg(*pt.PaCO2MmHg)
	} else {
		c.assume("patient.paco2_mmhg", "40", "not given: middle of the normal range 35-45 mmHg (common practice); give the measured value")
	}
	c.rq = DefaultRQ
	if pt.RQ != nil {
		c.rq = *pt.RQ
	} else {
		c.assume("patient.rq", "0.8", "not given: respiratory quotient 0.8 (common practice)")
	}
	c.assume("method", "constant PaCO2, RQ and a/A ratio", "PaCO2, RQ and the a/A ratio measured on the ground are held on every leg (no allowance for hyperventilation or a changing shunt)")

	var err error
	ph2oFormula, ph2oSource := "saturation vapour pressure of water at body temperature", srcWater
	if temp == DefaultPlanTemperatureC {
		// The figure the method is taught and checked with (issue 2 §4,
		// REFERENCES §3), and the one the other screens use.
		c.ph2o = ConventionalWaterVapourPressure
		ph2oFormula, ph2oSource = "water vapour at 37 °C, the conventional 47 mmHg", srcWater47
	} else if c.ph2o, err = WaterVapourPressure(Celsius(temp)); err != nil {
		c.stepErr("water vapour pressure", err)
		return
	}
	c.groundFiO2 = Fraction(*pt.FiO2)
	c.groundPB = c.pressure("ground pressure", groundAlt)
	if c.err != nil {
		return
	}
	g.AltitudeFt = num(groundAlt.Feet(), 0, RoundNearest)
	g.PressureMmHg = c.figure(g.Explain, "pressure_mmhg", c.groundPB.MmHg(), 1, RoundNearest, "mmHg",
		"P(H), standard atmosphere", srcISA, in("altitude", groundAlt.Feet(), "ft"))
	g.WaterVapourMmHg = c.figure(g.Explain, "water_vapour_mmhg", c.ph2o.MmHg(), 2, RoundUp, "mmHg",
		ph2oFormula, ph2oSource, in("temperature", temp, "°C"))
	g.FiO2 = num(*pt.FiO2, 2, RoundNearest)
	g.PaCO2MmHg = num(c.paco2.MmHg(), 1, RoundNearest)
	g.RQ = num(c.rq, 2, RoundNearest)

	alv, err := AlveolarPO2(c.groundFiO2, c.groundPB, c.ph2o, c.paco2, c.rq)
	if err != nil || alv.MmHg() < 1 {
		if errors.Is(err, ErrImpossible) || err == nil {
			c.docErr("patient.paco2_mmhg", "%s mmHg with FiO2 %s at %.1f mmHg leaves no alveolar oxygen; check paco2_mmhg and fio2",
				fmtPlanNum(c.paco2.MmHg()), fmtPlanNum(*pt.FiO2), c.groundPB.MmHg())
		} else {
			c.stepErr("ground PAO2", err)
		}
		return
	}
	g.AlveolarPO2MmHg = c.figure(g.Explain, "pao2_alveolar_mmhg", alv.MmHg(), 1, RoundDown, "mmHg",
		"PAO2 = FiO2·(PB − PH2O) − PaCO2/R", srcAlveolar,
		in("FiO2", *pt.FiO2, ""), in("PB", c.groundPB.MmHg(), "mmHg"), in("PH2O", c.ph2o.MmHg(), "mmHg"),
		in("PaCO2", c.paco2.MmHg(), "mmHg"), in("R", c.rq, ""))

	var pao2 Pressure
	path := "patient.pao2_mmhg"
	if pt.PaO2MmHg != nil {
		pao2 = MmHg(*pt.PaO2MmHg)
		g.PaO2Source = "measured"
		g.PaO2MmHg = num(*pt.PaO2MmHg, 1, RoundNearest)
	} else {
		path = "patient.spo2_percent"
		pao2, err = PO2AtSaturation(Percent(*pt.SpO2Percent))
		if err != nil {
			c.docErr(path, "%s %% lies on the flat top of the dissociation curve, where SpO2 cannot give a PaO2; give pao2_mmhg",
				fmtPlanNum(*pt.SpO2Percent))
			return
		}
		g.PaO2Source = "from_spo2"
		g.PaO2MmHg = c.figure(g.Explain, "pao2_arterial_mmhg", pao2.MmHg(), 1, RoundDown, "mmHg",
			"PaO2 at SpO2 on the standard dissociation curve", srcSevInv, in("SpO2", *pt.SpO2Percent, "%"))
		spo2 := fmtPlanNum(*pt.SpO2Percent)
		c.warn(WarnPaO2FromSpO2, SeverityInfo, -1, "PaO2 "+g.PaO2MmHg.String()+" mmHg estimated from SpO2 "+spo2+" % on the standard curve (37 °C, pH 7.40); a measured PaO2 is better")
		if *pt.SpO2Percent > 97 {
			c.warn(WarnOutsideValidity, SeverityCaution, -1, "SpO2 "+spo2+" % is on the flat top of the dissociation curve: the PaO2 estimated from it ("+g.PaO2MmHg.String()+" mmHg) is unreliable; give a measured PaO2")
		}
	}
	ratio, err := AARatio(pao2, alv)
	if err != nil {
		if errors.Is(err, ErrImpossible) {
			c.docErr(path, "PaO2 %.1f mmHg is above the alveolar PO2 of %.1f mmHg at FiO2 %s and %.1f mmHg; check fio2, pao2_mmhg, spo2_percent and paco2_mmhg",
				pao2.MmHg(), alv.MmHg(), fmtPlanNum(*pt.FiO2), c.groundPB.MmHg())
		} else {
			c.stepErr("a/A ratio", err)
		}
		return
	}
	c.aaRatio = ratio
	g.AARatio = c.figure(g.Explain, "aa_ratio", ratio, 3, RoundDown, "",
		"a/A = PaO2/PAO2", srcAA, in("PaO2", pao2.MmHg(), "mmHg"), in("PAO2", alv.MmHg(), "mmHg"))
	grad, err := AaGradient(alv, pao2)
	c.stepErr("A-a gradient", err)
	g.AaGradientMmHg = c.figure(g.Explain, "aa_gradient_mmhg", grad.MmHg(), 1, RoundUp, "mmHg",
		"A-a gradient = PAO2 − PaO2", srcAA, in("PAO2", alv.MmHg(), "mmHg"), in("PaO2", pao2.MmHg(), "mmHg"))
	if pt.AgeYears != nil {
		e, err := ExpectedAaGradient(*pt.AgeYears)
		c.stepErr("expected A-a gradient", err)
		n := c.figure(g.Explain, "expected_aa_gradient_mmhg", e.MmHg(), 1, RoundUp, "mmHg",
			"upper normal A-a gradient breathing air = age/4 + 4", srcAaAge, in("age", *pt.AgeYears, "years"))
		g.ExpectedAaGradient = c.optional(n)
	}

	sat, err := Saturation(pao2)
	c.stepErr("ground saturation", err)
	if pt.SpO2Percent != nil {
		g.SpO2Source = "measured"
		g.SpO2Percent = num(*pt.SpO2Percent, 1, RoundNearest)
		if pt.PaO2MmHg != nil && math.Abs(sat.Percent()-*pt.SpO2Percent) > planSpO2Disagreement {
			c.warn(WarnSpO2PaO2Disagree, SeverityCaution, -1, "SpO2 "+fmtPlanNum(*pt.SpO2Percent)+" % and PaO2 "+fmtPlanNum(*pt.PaO2MmHg)+
				" mmHg disagree: the standard curve gives "+strconv.FormatFloat(sat.Percent(), 'f', 1, 64)+" % at that PaO2; the plan uses the PaO2 — check both")
		}
	} else {
		g.SpO2Source = "from_pao2"
		g.SpO2Percent = c.figure(g.Explain, "spo2_percent", sat.Percent(), 1, RoundDown, "%",
			"S = 1/(23400/(PO2³ + 150·PO2) + 1)", srcSev, in("PaO2", pao2.MmHg(), "mmHg"))
	}
	if math.Abs(temp-37) > 1 {
		c.warn(WarnOutsideValidity, SeverityCaution, -1, "body temperature "+fmtPlanNum(temp)+" °C: the saturation curve used is the standard one (37 °C, pH 7.40), so expected SpO2 values are approximate")
	}
	if pt.HbGPerDL != nil {
		ct, err := OxygenContent(*pt.HbGPerDL, sat, pao2, DefaultHufner)
		c.stepErr("ground oxygen content", err)
		n := c.figure(g.Explain, "cao2_ml_dl", ct, 1, RoundDown, "mL/dL", "CaO2 = 1.34·Hb·SaO2 + 0.003·PaO2", srcContent,
			in("Hb", *pt.HbGPerDL, "g/dL"), in("SaO2", sat.Value(), ""), in("PaO2", pao2.MmHg(), "mmHg"))
		g.ContentMLPerDL = c.optional(n)
	}
}

// planGroundFigureCount is the number of figures ground records for pt,
// exactly: a map of up to 8 is a single group, half the memory of the next
// size, and the usual ground state has 7.
func planGroundFigureCount(pt *PlanPatient) int {
	n := 5 // pressure, water vapour, PAO2, a/A ratio, A-a gradient
	for _, p := range []*float64{pt.PaO2MmHg, pt.SpO2Percent} {
		if p == nil {
			n++ // PaO2 from SpO2, or SpO2 from PaO2
		}
	}
	for _, p := range []*float64{pt.AgeYears, pt.HbGPerDL} {
		if p != nil {
			n++ // expected A-a gradient, oxygen content
		}
	}
	return n
}

// planSpO2Disagreement is how far, in SpO2 points, a measured SpO2 may lie
// from the standard curve at the measured PaO2 before Alvea flags it.
// Alvea's threshold: pulse oximeters read a few points off the curve.
const planSpO2Disagreement = 4.0

// legs: per-leg gas chain and oxygen flow.
func (c *planComputer) legs() {
	target := DefaultSpO2TargetPercent
	if c.doc.Policy != nil && c.doc.Policy.SpO2TargetPercent != nil {
		target = *c.doc.Policy.SpO2TargetPercent
	} else {
		c.assume("policy.spo2_target_percent", fmtPlanNum(DefaultSpO2TargetPercent), "not given: lower end of the usual 94-98 % target (BTS 2017); 88-92 % for patients at risk of hypercapnia")
	}
	c.res.SpO2TargetPercent = num(target, 1, RoundNearest)
	start := 0.0
	for i, leg := range c.doc.Legs {
		lr := c.leg(i, leg, target)
		lr.StartMinute = num(start, 0, RoundDown)
		start += c.perLeg[i].minutes
		c.res.Legs = append(c.res.Legs, lr)
		if c.err != nil {
			return
		}
	}
	c.res.TransportMinutes = num(start, 0, RoundUp)
}

func (c *planComputer) leg(i int, leg PlanLeg, target float64) PlanLegResult {
	o := leg.Oxygen
	ex := c.ex.newExplanation(planLegFigures)
	lr := PlanLegResult{Index: i, Label: leg.Label, Where: leg.Where, Device: o.Device, Explain: ex,
		Minutes: num(c.perLeg[i].minutes, 2, RoundNearest), Options: []PlanOption{}}
	h, pb, minutes := c.perLeg[i].alt, c.perLeg[i].pb, c.perLeg[i].minutes
	lr.AltitudeFt = c.figure(ex, "altitude_ft", h.Feet(), 0, RoundUp, "ft", planAltitudeOf(leg.Where), srcPlan)
	lr.PressureMmHg = c.figure(ex, "pressure_mmhg", pb.MmHg(), 1, RoundNearest, "mmHg", "P(H), standard atmosphere", srcISA,
		in("altitude", h.Feet(), "ft"))

	// FiO2 the set-up delivers, and the oxygen it draws.
	var rng FiO2Range
	var lpm float64
	var err error
	rngSource, lpmFormula, lpmSource := "set on the device", "oxygen flow as set", srcPlan
	var lpmInputs []FigureInput
	switch o.Device {
	case RoomAir:
		rng = FiO2Range{Low: 0.21, High: 0.21}
		rngSource, lpmFormula = "room air", "no supplemental oxygen"
	case NasalCannula, SimpleMask, NonRebreather:
		rng, err = DeviceFiO2(o.Device, Flow(*o.FlowLpm))
		c.legErr(i, "device FiO2", err)
		rngSource = srcBTS
		lpm = *o.FlowLpm
		lpmInputs = []FigureInput{in("flow", lpm, "L/min")}
	case Venturi:
		rng = FiO2Range{Low: Fraction(*o.FiO2), High: Fraction(*o.FiO2)}
		lpm = *o.FlowLpm
		lpmFormula = "oxygen flow to the Venturi valve"
		lpmInputs = []FigureInput{in("flow", lpm, "L/min")}
	case Blender, HighFlow:
		rng = FiO2Range{Low: Fraction(*o.FiO2), High: Fraction(*o.FiO2)}
		var f Flow
		if o.Device == Blender {
			f, err = OxygenShareOfBlend(Flow(*o.FlowLpm), Fraction(*o.FiO2))
		} else {
			f, err = HighFlowOxygen(Flow(*o.FlowLpm), Fraction(*o.FiO2))
		}
		c.legErr(i, "oxygen share", err)
		lpm = float64(f)
		lpmFormula, lpmSource = "Q_O2 = Q_total·(FiO2 − 0.21)/0.79", srcBlend
		lpmInputs = []FigureInput{in("total flow", *o.FlowLpm, "L/min"), in("FiO2", *o.FiO2, "")}
	case Ventilator:
		rng = FiO2Range{Low: Fraction(*o.FiO2), High: Fraction(*o.FiO2)}
		bias, leak, drive := c.ventDefault(i, "bias_flow_lpm", o.BiasFlowLpm), c.ventDefault(i, "leak_lpm", o.LeakLpm), c.ventDefault(i, "drive_gas_lpm", o.DriveGasLpm)
		f, err := VentilatorOxygen(o.Drive, Flow(*o.MinuteVolumeLpm), Flow(bias), Flow(leak), Flow(drive), Fraction(*o.FiO2))
		c.legErr(i, "ventilator oxygen", err)
		lpm = float64(f)
		lpmFormula, lpmSource = "(V̇E + bias + leak)·(FiO2 − 0.21)/0.79 + drive gas", srcVent
		if o.Drive == DriveOxygen {
			lpmFormula = "(V̇E + bias + leak)·FiO2 + drive gas"
		}
		lpmInputs = []FigureInput{in("minute volume", *o.MinuteVolumeLpm, "L/min"), in("bias flow", bias, "L/min"),
			in("leak", leak, "L/min"), in("drive gas", drive, "L/min"), in("FiO2", *o.FiO2, "")}
		c.warn(WarnVentilatorEstimate, SeverityInfo, i, "leg "+strconv.Itoa(i+1)+": ventilator oxygen use "+strconv.FormatFloat(lpm, 'f', 1, 64)+
			" L/min is an estimate ("+string(o.Drive)+" drive); the ventilator's own consumption figure wins")
	}
	if c.err != nil {
		return lr
	}
	lr.FiO2DeliveredLow = c.figure(ex, "fio2_delivered_low", float64(rng.Low), 2, RoundDown, "", "low end of the set-up's FiO2", rngSource)
	lr.FiO2DeliveredHigh = c.figure(ex, "fio2_delivered_high", float64(rng.High), 2, RoundUp, "", "high end of the set-up's FiO2", rngSource)
	c.perLeg[i].lpm = lpm
	lr.OxygenLpm = c.figure(ex, "oxygen_lpm", lpm, 2, RoundUp, "L/min", lpmFormula, lpmSource, lpmInputs...)
	lr.OxygenL = c.figure(ex, "oxygen_l", lpm*minutes, 0, RoundUp, "L", "oxygen flow × minutes", srcPlan,
		in("oxygen flow", lpm, "L/min"), in("minutes", minutes, "min"))

	// Alveolar, arterial and saturation at the low end of the set-up.
	alv, err := AlveolarPO2(rng.Low, pb, c.ph2o, c.paco2, c.rq)
	if err != nil {
		if !errors.Is(err, ErrImpossible) {
			c.legErr(i, "PAO2", err)
			return lr
		}
		alv = 0
		c.warn(WarnNoAlveolarOxygen, SeverityNoGo, i, planLegWhere(i, leg.Where, lr.AltitudeFt)+": at FiO2 "+lr.FiO2DeliveredLow.String()+
			" no oxygen reaches the alveoli (PAO2 below zero)")
	}
	lr.PAO2MmHg = c.figure(ex, "pao2_mmhg", alv.MmHg(), 1, RoundDown, "mmHg", "PAO2 = FiO2·(PB − PH2O) − PaCO2/R", srcAlveolar,
		in("FiO2 (low end)", float64(rng.Low), ""), in("PB", pb.MmHg(), "mmHg"), in("PH2O", c.ph2o.MmHg(), "mmHg"),
		in("PaCO2", c.paco2.MmHg(), "mmHg"), in("R", c.rq, ""))
	pao2, err := PaO2ByAARatio(c.aaRatio, alv)
	c.legErr(i, "PaO2", err)
	lr.PaO2ExpectedMmHg = c.figure(ex, "pao2_expected_mmhg", pao2.MmHg(), 1, RoundDown, "mmHg", "PaO2 = (a/A)·PAO2", srcAA,
		in("a/A", c.aaRatio, ""), in("PAO2", alv.MmHg(), "mmHg"))
	sat, err := Saturation(pao2)
	c.legErr(i, "saturation", err)
	lr.SpO2ExpectedPercent = c.figure(ex, "spo2_expected_percent", sat.Percent(), 1, RoundDown, "%",
		"S = 1/(23400/(PO2³ + 150·PO2) + 1)", srcSev, in("PaO2", pao2.MmHg(), "mmHg"))
	if hb := c.doc.Patient.HbGPerDL; hb != nil {
		ct, err := OxygenContent(*hb, sat, pao2, DefaultHufner)
		c.legErr(i, "oxygen content", err)
		n := c.figure(ex, "cao2_expected_ml_dl", ct, 1, RoundDown, "mL/dL", "CaO2 = 1.34·Hb·SaO2 + 0.003·PaO2", srcContent,
			in("Hb", *hb, "g/dL"), in("SaO2", sat.Value(), ""), in("PaO2", pao2.MmHg(), "mmHg"))
		lr.ContentMLPerDL = c.optional(n)
	}

	// FiO2 needed to hold the ground state.
	need, err := FiO2ToMatch(c.groundFiO2, c.groundPB, pb, c.ph2o)
	if err != nil && !errors.Is(err, ErrImpossible) {
		c.legErr(i, "FiO2 needed", err)
		return lr
	}
	lr.FiO2Needed = c.figure(ex, "fio2_needed", float64(need), 2, RoundUp, "",
		"FiO2 = FiO2_ground·(PB_ground − PH2O)/(PB − PH2O)", srcInspired,
		in("FiO2 ground", float64(c.groundFiO2), ""), in("PB ground", c.groundPB.MmHg(), "mmHg"),
		in("PB", pb.MmHg(), "mmHg"), in("PH2O", c.ph2o.MmHg(), "mmHg"))
	lr.FiO2Possible = err == nil && lr.FiO2Needed.Cmp(planFiO2Pure) <= 0
	lr.Delivers = lr.FiO2Possible && lr.FiO2DeliveredLow.Cmp(lr.FiO2Needed.Decimal) >= 0
	switch {
	case !lr.FiO2Possible:
		c.warn(WarnFiO2Unreachable, SeverityNoGo, i, planLegWhere(i, leg.Where, lr.AltitudeFt)+": FiO2 "+lr.FiO2Needed.String()+
			" would be needed to hold the ground state; even FiO2 1.0 cannot")
	case !lr.Delivers:
		lr.Options = planOptions(o, lr.FiO2Needed)
		c.warn(WarnSetUpBelowNeed, SeverityNoGo, i, planLegWhere(i, leg.Where, lr.AltitudeFt)+": "+string(o.Device)+" may deliver FiO2 "+lr.FiO2DeliveredLow.String()+
			", below the "+lr.FiO2Needed.String()+" needed to hold the ground state; "+strconv.Itoa(len(lr.Options))+" option(s) listed")
	}
	if lr.SpO2ExpectedPercent.InexactFloat64() < target {
		c.warn(WarnSpO2BelowTarget, SeverityCaution, i, planLegWhere(i, leg.Where, lr.AltitudeFt)+": expected SpO2 "+lr.SpO2ExpectedPercent.String()+
			" % is below the "+fmtPlanNum(target)+" % target")
	}
	return lr
}

// planFiO2Pure is FiO2 1.0 at the two places FiO2 is rounded to, so that
// comparing a rounded FiO2 with it needs no rescaling (Cmp would allocate).
// Nothing writes to it.
var planFiO2Pure = decimal.New(100, -2)

// planLegWhere names leg i in a warning: "leg 2 (cabin, 7111 ft)".
func planLegWhere(i int, where string, altitudeFt Number) string {
	return "leg " + strconv.Itoa(i+1) + " (" + where + ", " + altitudeFt.String() + " ft)"
}

func (c *planComputer) ventDefault(leg int, key string, p *float64) float64 {
	if p != nil {
		return *p
	}
	c.assume("legs["+strconv.Itoa(leg)+"].oxygen."+key, "0", "not given: taken as 0 L/min")
	return 0
}

// planOptions lists the set-ups that deliver needed by the same rule a leg
// is judged by (the low end of the FiO2 range, rounded down, at or above
// the need, rounded up), so that no option would itself fall short. Where
// the leg's device has its FiO2 set on it (ventilator, blender, high-flow),
// the first option is that device with only its FiO2 raised. A ventilated
// patient gets only that option: masks and cannulas are no alternative to
// the ventilator. The others, sorted by oxygen flow: each low-flow device
// at the lowest whole L/min whose range starts at or above the need (BTS
// 2017 ranges, DeviceFiO2), the lowest Venturi setting at or above the need
// at its minimum flow, and high-flow at 30 and 60 L/min total set to the
// need.
func planOptions(o *PlanOxygen, needed Number) []PlanOption {
	n := needed.InexactFloat64()
	// Sized for the usual count (the same device, three low-flow devices,
	// a Venturi, two high-flow totals): no growth on a keystroke.
	out := make([]PlanOption, 0, planOptionsUsual)
	var sameTotal float64
	switch o.Device {
	case Ventilator:
		ve, bias, leak, drive := *o.MinuteVolumeLpm, planOr0(o.BiasFlowLpm), planOr0(o.LeakLpm), planOr0(o.DriveGasLpm)
		f, err := VentilatorOxygen(o.Drive, Flow(ve), Flow(bias), Flow(leak), Flow(drive), Fraction(n))
		if err == nil {
			op := PlanOption{Device: Ventilator, OxygenLpm: num(float64(f), 1, RoundUp), TotalLpm: num(ve+bias+leak, 1, RoundNearest),
				FiO2Low: needed, FiO2High: needed}
			op.Label = "option: ventilator FiO2 raised to " + needed.String() + ", other settings unchanged: " + op.OxygenLpm.String() + " L/min oxygen (" + string(o.Drive) + " drive)"
			out = append(out, op)
		}
		return out
	case Blender, HighFlow:
		sameTotal = *o.FlowLpm
		var f Flow
		var err error
		if o.Device == Blender {
			f, err = OxygenShareOfBlend(Flow(sameTotal), Fraction(n))
		} else {
			f, err = HighFlowOxygen(Flow(sameTotal), Fraction(n))
		}
		if err == nil {
			op := PlanOption{Device: o.Device, OxygenLpm: num(float64(f), 1, RoundUp), TotalLpm: num(sameTotal, 1, RoundNearest),
				FiO2Low: needed, FiO2High: needed}
			op.Label = "option: " + string(o.Device) + " FiO2 raised to " + needed.String() + " at the same " + op.TotalLpm.String() + " L/min total: " + op.OxygenLpm.String() + " L/min oxygen"
			out = append(out, op)
		}
	}
	others := make([]SetUp, 0, planOptionsUsual)
	for _, d := range []Device{NasalCannula, SimpleMask, NonRebreather} {
		lo, hi, _ := DeviceFlowRange(d)
		for f := float64(lo); f <= float64(hi); f++ {
			r, err := DeviceFiO2(d, Flow(f))
			if err == nil && planCmpRounded(needed, float64(r.Low), 2, RoundDown) <= 0 {
				others = append(others, SetUp{Device: d, Flow: Flow(f), FiO2: r, TotalFlow: Flow(f)})
				break
			}
		}
	}
	for _, v := range VenturiSettings {
		if planCmpRounded(needed, float64(v), 2, RoundDown) <= 0 {
			if min, err := VenturiMinimumFlow(v); err == nil {
				if total, err := VenturiTotalFlow(min, v); err == nil {
					others = append(others, SetUp{Device: Venturi, Flow: min, FiO2: FiO2Range{v, v}, TotalFlow: total})
				}
			}
			break
		}
	}
	for _, total := range []Flow{30, HighFlowMaxTotal} {
		if o.Device == HighFlow && math.Abs(float64(total)-sameTotal) < 1e-9 {
			continue // already offered first
		}
		if f, err := HighFlowOxygen(total, Fraction(n)); err == nil {
			others = append(others, SetUp{Device: HighFlow, Flow: f, FiO2: FiO2Range{Fraction(n), Fraction(n)}, TotalFlow: total})
		}
	}
	slices.SortStableFunc(others, func(a, b SetUp) int { return cmp.Compare(a.Flow, b.Flow) })
	for _, s := range others {
		out = append(out, planOption(s))
	}
	return out
}

func planOr0(p *float64) float64 {
	if p == nil {
		return 0
	}
	return *p
}

func planOption(s SetUp) PlanOption {
	op := PlanOption{Device: s.Device, OxygenLpm: num(float64(s.Flow), 1, RoundUp), TotalLpm: num(float64(s.TotalFlow), 1, RoundNearest),
		FiO2Low: num(float64(s.FiO2.Low), 2, RoundDown), FiO2High: num(float64(s.FiO2.High), 2, RoundUp)}
	// Appended into one buffer, not by fmt or string by string: the Brief
	// computes the options on every keystroke, and this makes one string.
	var buf [128]byte
	b := append(buf[:0], "option: "...)
	b = append(b, s.Device...)
	b = append(b, " at "...)
	b = op.OxygenLpm.AppendText(b)
	b = append(b, " L/min oxygen"...)
	if s.TotalFlow != s.Flow {
		b = append(b, ", "...)
		b = op.TotalLpm.AppendText(b)
		b = append(b, " L/min total"...)
	}
	b = append(b, " (FiO2 "...)
	b = op.FiO2Low.AppendText(b)
	if op.FiO2High.Cmp(op.FiO2Low.Decimal) != 0 {
		b = append(b, '-')
		b = op.FiO2High.AppendText(b)
	}
	op.Label = string(append(b, ')'))
	return op
}

// limits: highest-leg FiO2, the altitude limits of FiO2 1.0, altitude warnings.
func (c *planComputer) limits() {
	r := c.res
	possible := true
	worst := 0
	for i, l := range r.Legs {
		if !l.FiO2Possible {
			possible = false
		}
		if l.FiO2Needed.Cmp(r.Legs[worst].FiO2Needed.Decimal) > 0 {
			worst = i
		}
	}
	r.FiO2Possible = possible
	r.FiO2Needed = r.Legs[worst].FiO2Needed
	worstFiO2, _ := r.Legs[worst].Explain.Get("fio2_needed")
	r.Explain.set("fio2_needed", worstFiO2)

	maxCabin, err := MaxAltitudeForFiO2(c.groundFiO2, c.groundPB, 1, c.ph2o)
	if err != nil && !errors.Is(err, ErrOutOfRange) {
		c.stepErr("highest altitude for FiO2 1.0", err)
		return
	}
	r.MaxCabinAltitudeFt = c.figure(r.Explain, "max_cabin_altitude_ft", maxCabin.Feet(), 0, RoundDown, "ft",
		"PB = PH2O + FiO2_ground·(PB_ground − PH2O)/1.0; H = H(PB)", srcInspired,
		in("FiO2 ground", float64(c.groundFiO2), ""), in("PB ground", c.groundPB.MmHg(), "mmHg"), in("PH2O", c.ph2o.MmHg(), "mmHg"))
	if c.res.Pressurised {
		cruise, err := MaxCruiseAltitude(maxCabin, c.dp)
		const cruiseFormula = "H_cruise = H(P(max cabin) − max differential)"
		formula := cruiseFormula
		if err != nil {
			if !errors.Is(err, ErrOutOfRange) {
				c.stepErr("highest cruise altitude", err)
				return
			}
			formula = cruiseFormula + "; limited by the model ceiling (20 000 m)"
			r.MaxCruiseAtCeiling = true
		}
		n := c.figure(r.Explain, "max_cruise_altitude_ft", cruise.Feet(), 0, RoundDown, "ft", formula, srcCabin,
			in("max cabin altitude", maxCabin.Feet(), "ft"), in("max differential", c.dp.Psi(), "psi"))
		r.MaxCruiseAltitudeFt = c.optional(n)
	}
	if !possible {
		msg := "FiO2 1.0 holds the ground state up to " + r.MaxCabinAltitudeFt.String() + " ft"
		if r.MaxCruiseAltitudeFt != nil {
			msg += " of cabin altitude, that is a cruise at or below " + r.MaxCruiseAltitudeFt.String() + " ft with this aircraft"
		}
		for _, l := range r.Legs {
			if !l.FiO2Possible && l.Where != WhereCabin {
				msg += "; the " + l.Where + " field (" + l.AltitudeFt.String() + " ft) is itself above that: no cabin setting helps there"
				break
			}
		}
		c.warn(WarnFiO2Unreachable, SeverityNoGo, -1, msg)
	}

	c.unplannedFields()
	c.cabinBelowFields()

	limitFt := CabinAltitudeLimit.Feet()
	cabinWarned, fieldWarned := false, map[string]bool{}
	for i, l := range r.Legs {
		if planCmpRounded(l.AltitudeFt, limitFt, 0, RoundNearest) <= 0 {
			continue
		}
		if l.Where == WhereCabin && !cabinWarned {
			cabinWarned = true
			c.warn(WarnCabinAbove8000Ft, SeverityCaution, i, "cabin altitude "+l.AltitudeFt.String()+" ft is above the 8000 ft limit of normal operation (14 CFR 25.841(a))")
		}
		if l.Where != WhereCabin && !fieldWarned[l.Where] {
			fieldWarned[l.Where] = true
			c.warn(WarnFieldAbove8000Ft, SeverityCaution, i, "the "+l.Where+" field at "+l.AltitudeFt.String()+" ft is above 8000 ft")
		}
	}
}

// unplannedFields warns when the origin or destination field has no leg of
// its own and lies above every planned leg: the patient is on the ground
// there, before the first leg or after the last, so the highest leg is not
// the highest exposure. The field where the ground state was measured is
// skipped (the ground FiO2 holds there by definition).
func (c *planComputer) unplannedFields() {
	r := c.res
	highest := c.perLeg[r.HighestLeg].alt
	for _, f := range []struct {
		where string
		alt   Altitude
	}{{WhereOrigin, c.origin}, {WhereDestination, c.destination}} {
		if f.where == r.Ground.MeasuredAt || !(f.alt > highest) {
			continue
		}
		planned := false
		for _, l := range c.doc.Legs {
			if l.Where == f.where {
				planned = true
			}
		}
		if planned {
			continue
		}
		pb := c.pressure(f.where+" field pressure", f.alt)
		if c.err != nil {
			return
		}
		need, err := FiO2ToMatch(c.groundFiO2, c.groundPB, pb, c.ph2o)
		if err != nil && !errors.Is(err, ErrImpossible) {
			c.stepErr(f.where+" field FiO2 needed", err)
			return
		}
		needed := num(float64(need), 2, RoundUp)
		ft := num(f.alt.Feet(), 0, RoundUp)
		field := "the " + f.where + " field (" + ft.String() + " ft) has no leg in the plan and is higher than every leg: FiO2 " + needed.String()
		if err != nil || needed.Cmp(planFiO2Pure) > 0 {
			r.FiO2Possible = false
			c.warn(WarnFiO2Unreachable, SeverityNoGo, -1, field+" would be needed there to hold the ground state; even FiO2 1.0 cannot")
			continue
		}
		c.warn(WarnFieldAboveLegs, SeverityCaution, -1, field+" is needed there to hold the ground state; add a "+f.where+" leg with its set-up")
	}
}

// cabinBelowFields cautions when the flight's cabin altitude (from the
// cruise, or a cabin altitude stated) lies below both
// fields. A flight between two fields can dip below both (down a valley),
// but a figure below both is more often a slip: a wrong digit, a sign,
// metres typed as feet. The FiO2 the flight legs need is computed at that
// altitude, so a slip there under-states it. The numbers are not changed:
// the crew checks the figure. A pressurised cabin is held at or above the
// origin, so it is below both only when the cruise itself is.
func (c *planComputer) cabinBelowFields() {
	if c.cabin == nil || !(*c.cabin < min(c.origin, c.destination)) {
		return
	}
	leg := -1
	for i, l := range c.doc.Legs {
		if l.Where == WhereCabin {
			leg = i
			break
		}
	}
	if leg < 0 {
		return // no flight leg: nothing is computed at the cabin altitude
	}
	what := "the cruise altitude and its unit"
	if c.doc.Route.CabinAltitudeFt != nil {
		what = "the stated cabin altitude and its unit"
	}
	cabin := num(c.cabin.Feet(), 0, RoundUp).String()
	c.warn(WarnCabinBelowFields, SeverityCaution, leg, "cabin altitude "+cabin+" ft is below both fields (origin "+
		num(c.origin.Feet(), 0, RoundUp).String()+" ft, destination "+num(c.destination.Feet(), 0, RoundUp).String()+
		" ft): check "+what+"; the flight legs are computed at "+cabin+" ft")
}

// oxygen: need with reserve, usable supply, margin, cylinder changes.
func (c *planComputer) oxygen() {
	r := c.res
	pol := c.doc.Policy
	if pol == nil {
		pol = &PlanPolicy{}
	}
	policy := DefaultReservePolicy
	switch {
	case pol.ResidualPsi != nil:
		policy.Residual = Psi(*pol.ResidualPsi)
	case pol.ResidualBar != nil:
		policy.Residual = Bar(*pol.ResidualBar)
	default:
		c.assume("policy.residual_psi", fmtPlanNum(math.Round(DefaultReservePolicy.Residual.Psi())), "not given: safe residual 200 psi in each cylinder (common practice)")
	}
	if pol.ReserveFactor != nil {
		policy.Factor = *pol.ReserveFactor
	} else {
		c.assume("policy.reserve_factor", fmtPlanNum(DefaultReservePolicy.Factor), "not given: 1.5 times the calculated need (common practice)")
	}
	reserveMin := DefaultReservePolicy.AddedMinutes.Minutes()
	if pol.ReserveMinutes != nil {
		reserveMin = *pol.ReserveMinutes
		policy.AddedMinutes = Minutes(reserveMin)
	} else {
		c.assume("policy.reserve_minutes", fmtPlanNum(reserveMin), "not given: no added minutes")
	}
	r.ReserveFactor = num(policy.Factor, 2, RoundNearest)
	r.ReserveMinutes = num(reserveMin, 0, RoundNearest)
	r.ResidualPsi = num(policy.Residual.Psi(), 0, RoundNearest)
	r.ResidualBar = num(policy.Residual.Bar(), 1, RoundNearest)

	calc, maxFlow, lastFlow := 0.0, 0.0, 0.0
	for _, l := range c.perLeg {
		calc += l.lpm * l.minutes
		maxFlow = math.Max(maxFlow, l.lpm)
		lastFlow = l.lpm
	}
	r.OxygenCalculatedL = c.figure(r.Explain, "oxygen_calculated_l", calc, 0, RoundUp, "L", "sum over legs of oxygen flow × minutes", srcPlan)
	need, err := policy.Required(Litres(calc), Flow(maxFlow))
	if err != nil {
		c.stepErr("reserve", err)
		return
	}
	r.OxygenNeededL = c.figure(r.Explain, "oxygen_needed_l", need.Litres(), 0, RoundUp, "L",
		"calculated need × reserve factor + reserve minutes × highest leg flow", srcReserve,
		in("calculated need", calc, "L"), in("reserve factor", policy.Factor, ""), in("reserve minutes", reserveMin, "min"),
		in("highest leg flow", maxFlow, "L/min"))

	// Cylinders in the order listed, each line's count in turn.
	usable := make([]float64, 0, cap(r.Cylinders))
	total := 0.0
	for si, s := range c.doc.Supply {
		cyl, gauge := planCylinder(s)
		count := planCount(s)
		if s.Count == nil {
			c.assume("supply["+strconv.Itoa(si)+"].count", "1", "not given: one cylinder")
		}
		u, err := cyl.Usable(gauge, policy.Residual)
		if err != nil {
			if c.err == nil {
				c.err = PlanErrors{{Path: "supply[" + strconv.Itoa(si) + "]", Message: trimPrefix(err), Err: ErrOutOfRange}}
			}
			return
		}
		lineName := s.Name
		if lineName == "" {
			lineName = planCylinderDesc(s)
		}
		formula := planUsableFormula(cyl.Method())
		for k := 0; k < count; k++ {
			ex := c.ex.newExplanation(1)
			name := lineName
			if count > 1 {
				name += " #" + strconv.Itoa(k+1)
			}
			cr := PlanCylinderResult{Order: len(r.Cylinders) + 1, Supply: si, Copy: k + 1, Name: name, Explain: ex}
			cr.UsableL = c.figure(ex, "usable_l", u.Litres(), 0, RoundDown, "L", formula, srcCylinder,
				in("gauge", gaugeValue(s), gaugeUnit(s)), in("residual", policy.Residual.Psi(), "psi"))
			usable = append(usable, cr.UsableL.InexactFloat64())
			total += cr.UsableL.InexactFloat64()
			if u <= 0 {
				residual := r.ResidualPsi.String() + " psi"
				if pol.ResidualBar != nil {
					residual = r.ResidualBar.String() + " bar"
				}
				c.warn(WarnCylinderAtResidual, SeverityCaution, -1, name+" is at or below the "+residual+" residual: no usable oxygen")
			}
			r.Cylinders = append(r.Cylinders, cr)
		}
	}
	r.OxygenUsableL = c.figure(r.Explain, "oxygen_usable_l", total, 0, RoundDown, "L",
		"sum of each cylinder's usable litres (each rounded down)", srcCylinder, in("residual", policy.Residual.Psi(), "psi"))
	r.OxygenMarginL = c.figure(r.Explain, "oxygen_margin_l", planDifference(r.OxygenUsableL, r.OxygenNeededL), 0, RoundDown, "L",
		"usable − needed with reserve", srcPlan, in("usable", r.OxygenUsableL.InexactFloat64(), "L"), in("needed", r.OxygenNeededL.InexactFloat64(), "L"))
	if r.OxygenMarginL.Sign() < 0 {
		calcN := r.OxygenCalculatedL
		cover := "does not cover even the calculated need"
		if r.OxygenUsableL.Cmp(calcN.Decimal) >= 0 {
			cover = "covers the calculated need but not the reserve"
		}
		c.warn(WarnSupplyShort, SeverityNoGo, -1, "supply short by "+r.OxygenMarginL.Neg().String()+" L: "+r.OxygenNeededL.String()+
			" L needed with reserve, "+r.OxygenUsableL.String()+" L usable above the residual ("+cover+")")
	}
	c.timeline(usable, lastFlow)
}

// timeline walks the legs minute by minute of flow, using the cylinders in
// order, and records when each is opened and reaches its residual.
func (c *planComputer) timeline(usable []float64, lastFlow float64) {
	r := c.res
	idx, left, t := 0, 0.0, 0.0
	if len(usable) > 0 {
		left = usable[0]
		r.Cylinders[0].StartMinute = c.optional(num(0, 0, RoundDown))
	}
	change := func(leg int) {
		m := num(t, 0, RoundDown)
		r.Cylinders[idx].ChangeMinute = c.optional(m)
		r.Cylinders[idx].ChangeLeg = c.optionalInt(leg)
		if leg >= 0 && c.doc.Legs[leg].Where == WhereCabin && idx+1 < len(usable) {
			c.warn(WarnChangeInFlight, SeverityInfo, leg, r.Cylinders[idx].Name+" reaches its residual at minute "+m.String()+", in flight (leg "+strconv.Itoa(leg+1)+"): have the next cylinder ready")
		}
		idx++
		if idx < len(usable) {
			left = usable[idx]
			r.Cylinders[idx].StartMinute = c.optional(m)
		}
	}
	// Cylinders with nothing usable are passed over at the start.
	for idx < len(usable) && left <= 0 {
		change(0)
	}
	exhausted := false
	for i, l := range c.perLeg {
		lpm, remaining := l.lpm, l.minutes
		for remaining > 0 {
			if lpm <= 0 || idx >= len(usable) {
				if lpm > 0 && !exhausted {
					exhausted = true
					m := c.figure(r.Explain, "supply_exhausted_minute", t, 0, RoundDown, "min",
						"minute the last cylinder reaches its residual, legs' flows in order", srcPlan)
					r.SupplyExhaustedMin = c.optional(m)
				}
				t += remaining
				break
			}
			dt := math.Min(remaining, left/lpm)
			t += dt
			remaining -= dt
			left -= dt * lpm
			if left <= 1e-9 {
				change(i)
				for idx < len(usable) && left <= 0 {
					change(i)
				}
			}
		}
	}
	if !exhausted && idx < len(usable) && lastFlow > 0 {
		rest := left
		for k := idx + 1; k < len(usable); k++ {
			rest += usable[k]
		}
		m := c.figure(r.Explain, "supply_exhausted_minute", t+rest/lastFlow, 0, RoundDown, "min",
			"end of the transport + remaining usable litres / last leg's flow", srcPlan,
			in("end of transport", t, "min"), in("remaining usable", rest, "L"), in("last leg's flow", lastFlow, "L/min"))
		r.SupplyExhaustedMin = c.optional(m)
	}
}

// planCylinder returns a supply line's cylinder and gauge reading.
func planCylinder(s PlanSupply) (Cylinder, Pressure) {
	var cyl Cylinder
	switch {
	case s.Size != "":
		cyl, _ = FactorCylinder(s.Size)
	case s.WaterCapacityL != nil:
		cyl, _ = WaterCapacityCylinder(Litres(*s.WaterCapacityL))
	default:
		cyl, _ = LabelledCylinder(Litres(*s.LabelContentsL), Bar(*s.LabelPressureBar))
	}
	if s.PressurePsi != nil {
		return cyl, Psi(*s.PressurePsi)
	}
	return cyl, Bar(*s.PressureBar)
}

// planCylinderDesc names a supply line that has no name of its own: "E
// cylinder at 1900 psi". Made only then, not for every line.
func planCylinderDesc(s PlanSupply) string {
	var desc string
	switch {
	case s.Size != "":
		desc = string(s.Size) + " cylinder"
	case s.WaterCapacityL != nil:
		desc = fmtPlanNum(*s.WaterCapacityL) + " L cylinder"
	default:
		desc = fmtPlanNum(*s.LabelContentsL) + " L (label) cylinder"
	}
	if s.PressurePsi != nil {
		return desc + " at " + fmtPlanNum(*s.PressurePsi) + " psi"
	}
	return desc + " at " + fmtPlanNum(*s.PressureBar) + " bar"
}

// planAltitudeOf is a leg's altitude formula: "altitude of cabin". The
// texts are constants, not concatenated per leg.
func planAltitudeOf(where string) string {
	switch where {
	case WhereOrigin:
		return "altitude of " + WhereOrigin
	case WhereCabin:
		return "altitude of " + WhereCabin
	case WhereDestination:
		return "altitude of " + WhereDestination
	}
	return "altitude of " + where
}

// planUsableFormula is a cylinder's usable-litres formula: its method,
// "above the residual". The texts are constants, not concatenated per
// cylinder.
func planUsableFormula(method string) string {
	const above = ", above the residual"
	switch method {
	case CylinderMethodFactor:
		return CylinderMethodFactor + above
	case CylinderMethodWaterCapacity:
		return CylinderMethodWaterCapacity + above
	case CylinderMethodLabel:
		return CylinderMethodLabel + above
	}
	return method + above
}

// planCount is the number of cylinders of a supply line (1 when not given).
func planCount(s PlanSupply) int {
	if s.Count != nil {
		return *s.Count
	}
	return 1
}

// planDifference returns a − b as a.Sub(b).InexactFloat64() does, without
// making the decimal when both are whole numbers below 10¹⁵ (every plan's
// litres): float64 holds them, and their difference, exactly.
func planDifference(a, b Number) float64 {
	if a.Exponent() == 0 && b.Exponent() == 0 && a.NumDigits() <= 15 && b.NumDigits() <= 15 {
		return float64(a.CoefficientInt64()) - float64(b.CoefficientInt64())
	}
	return a.Sub(b.Decimal).InexactFloat64()
}

func gaugeValue(s PlanSupply) float64 {
	if s.PressurePsi != nil {
		return *s.PressurePsi
	}
	return *s.PressureBar
}

func gaugeUnit(s PlanSupply) string {
	if s.PressurePsi != nil {
		return "psi"
	}
	return "bar"
}

// trappedGas: Boyle's-law expansion from the origin to the highest leg.
func (c *planComputer) trappedGas() {
	r := c.res
	tg := &r.TrappedGas
	tg.Explain = c.ex.newExplanation(planTrappedGasFigures)
	tg.Caution = TrappedGasCaution
	from, to := c.pressure("origin pressure", c.origin), c.perLeg[r.HighestLeg].pb
	if c.err != nil {
		return
	}
	if r.Ground.MeasuredAt == WhereOrigin {
		tg.FromAltitudeFt = r.Ground.AltitudeFt // the same rounding of the same altitude
	} else {
		tg.FromAltitudeFt = num(c.origin.Feet(), 0, RoundNearest)
	}
	tg.ToAltitudeFt = r.HighestAltitudeFt
	ratio, err := ExpansionRatio(from, to)
	c.stepErr("expansion ratio", err)
	pOrigin, pHighest := in("P origin", from.MmHg(), "mmHg"), in("P highest", to.MmHg(), "mmHg")
	tg.Ratio = c.figure(tg.Explain, "ratio", ratio, 3, RoundUp, "", "V2/V1 = P1/P2", srcBoyle, pOrigin, pHighest)
	r.GasExpansionRatio = tg.Ratio
	ratioFig, _ := tg.Explain.Get("ratio")
	r.Explain.set("gas_expansion_ratio", ratioFig)
	tg.CuffMl = planCuffNumber
	cuff, err := ExpandedVolume(Millilitres(planCuffMl), from, to)
	c.stepErr("cuff expansion", err)
	tg.CuffAtAltitudeMl = c.figure(tg.Explain, "cuff_at_altitude_ml", cuff.Millilitres(), 1, RoundUp, "mL",
		"V2 = V1·P1/P2 (a free pocket; a cuff's pressure rises instead)", srcMann, pOrigin, pHighest, in("V1", planCuffMl, "mL"))
	tg.PneumothoraxMl = planPneumothoraxNumber
	ptx, err := ExpandedVolume(Millilitres(planPneumothoraxMl), from, to)
	c.stepErr("pneumothorax expansion", err)
	tg.PneumothoraxAltitudeMl = c.figure(tg.Explain, "pneumothorax_at_altitude_ml", ptx.Millilitres(), 0, RoundUp, "mL",
		"V2 = V1·P1/P2", srcBoyle, pOrigin, pHighest, in("V1", planPneumothoraxMl, "mL"))
	over, err := RigidSpaceOverpressure(0, from, to)
	c.stepErr("rigid space overpressure", err)
	tg.RigidOverpressureCmH2O = c.figure(tg.Explain, "rigid_overpressure_cmh2o", over.CmH2O(), 0, RoundUp, "cmH2O",
		"overpressure = P1 − P2 (sealed rigid space, upper bound)", srcBoyle, pOrigin, pHighest)
}
