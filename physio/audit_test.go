package physio

import (
	"errors"
	"math"
	"testing"
)

// Check values from an independent audit of the engine against
// REFERENCES.md §1–10 and its Units section: inputs chosen away from the
// ones the other tests use (band edges of the standard atmosphere, the
// ends of the accepted ranges, other differentials, devices and cylinder
// units). [calc] values were computed from the published formula in
// double precision outside this package (Python); GNU units values are
// quoted with the command that gives them.

func auditClose(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.IsInf(got, 0) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (±%g relative)", what, got, want, rel)
	}
}

// §1: the standard atmosphere at the edges of its domain and of its layers.
func TestAuditAtmosphere(t *testing.T) {
	// GNU units 3.x `units -t 'stdatmPH(H)' Pa` (the 1976 troposphere; its
	// constants differ from the standard's in the 7th digit: 2e-6).
	for _, c := range []struct {
		h    Altitude
		want float64
	}{
		{Feet(-2000), 108865.73},   // stdatmPH(-2000 ft)
		{Metres(-610), 108870.82},  // stdatmPH(-610 m), the model's floor
		{Feet(1), 101321.34},       // stdatmPH(1 ft)
		{Feet(5400), 83052.847},    // stdatmPH(5400 ft)
		{Feet(10500), 68340.205},   // stdatmPH(10500 ft)
		{Feet(18000), 50599.815},   // stdatmPH(18000 ft), the highest field accepted
		{Feet(25000), 37600.884},   // stdatmPH(25000 ft), the highest stated cabin
		{Metres(5000), 54019.882},  // stdatmPH(5000 m)
		{Metres(8000), 35599.779},  // stdatmPH(8000 m)
		{Metres(10999), 22635.603}, // stdatmPH(10999 m), just below the tropopause
	} {
		p, err := PressureAtAltitude(c.h)
		if err != nil {
			t.Fatalf("PressureAtAltitude(%v m): %v", c.h.Metres(), err)
		}
		auditClose(t, "P("+fmtNum(c.h.Metres())+" m)", p.Pascals(), c.want, 2e-6)
	}
	// The isothermal layer, P = P11·exp(−g0·M0·(H − 11 000)/(R*·T11))
	// (REFERENCES §1) [calc], which GNU units does not cover.
	for _, c := range []struct{ h, want float64 }{
		{12000, 19330.405048553755},
		{18000, 7504.844668052516},
		{20000, 5474.888669677779}, // the model's ceiling
	} {
		p, err := PressureAtAltitude(Metres(c.h))
		if err != nil {
			t.Fatal(err)
		}
		auditClose(t, "P("+fmtNum(c.h)+" m)", p.Pascals(), c.want, 1e-9)
	}
	// Inverse: GNU units `units -t '~stdatmPH(90000 Pa)' m` → 988.49991.
	h, err := AltitudeAtPressure(Pascals(90000))
	if err != nil {
		t.Fatal(err)
	}
	auditClose(t, "H(90000 Pa)", h.Metres(), 988.49991, 2e-6)
	// [pub] Samuels MP, Arch Dis Child 2004;89:448, Table 1 (rounded to the
	// mmHg): 5 000 m 405 mmHg, 8 000 m 267 mmHg; ±0.5 %.
	for _, c := range []struct{ h, mmHg float64 }{{5000, 405}, {8000, 267}} {
		p, _ := PressureAtAltitude(Metres(c.h))
		auditClose(t, "Samuels P("+fmtNum(c.h)+" m)", p.MmHg(), c.mmHg, 0.005)
	}
	// Just outside the domain: refused, in metres.
	for _, h := range []Altitude{Metres(-610.01), Metres(20000.01)} {
		_, err := PressureAtAltitude(h)
		supplyWantRange(t, err, "altitude", "m")
	}
}

// §2: cabin altitude by pressure balance, other aircraft and floors [calc].
func TestAuditCabin(t *testing.T) {
	for _, c := range []struct{ cruiseFt, dpPsi, floorFt, want float64 }{
		{41000, 8.6, 0, 7344.304418048244},
		{35000, 7.5, 0, 7899.187147522203},
		{45000, 8.9, -1000, 7706.47185848479},
		{18000, 3, 1000, 9412.8217786627},
		{30000, 4, 5400, 14789.505172275436},
		{28000, 11, 5400, 5400}, // the differential would hold below the field: the floor
		{15000, 0, 0, 15000},    // unpressurised: the cabin is at cruise
	} {
		h, err := CabinAltitude(Feet(c.cruiseFt), Psi(c.dpPsi), Feet(c.floorFt))
		if err != nil {
			t.Fatal(err)
		}
		auditClose(t, "cabin", h.Feet(), c.want, 1e-9)
	}
	for _, c := range []struct{ cabinFt, dpPsi, want float64 }{
		{6000, 7.5, 30442.04296536915},
		{8000, 5.5, 25158.720887428823},
		{-2000, 4, 5971.5616221070795},
	} {
		h, err := MaxCruiseAltitude(Feet(c.cabinFt), Psi(c.dpPsi))
		if err != nil {
			t.Fatal(err)
		}
		auditClose(t, "max cruise", h.Feet(), c.want, 1e-9)
	}
}

// §3–§5 at other pressures, FiO2s and the ends of the curve [calc].
func TestAuditGas(t *testing.T) {
	pb := MmHg(816.5599421974414) // P(−2 000 ft), §1 [calc]
	s, _ := AlveolarPO2(0.21, pb, MmHg(47), MmHg(40), 0.8)
	f, _ := AlveolarPO2Full(0.21, pb, MmHg(47), MmHg(40), 0.8)
	auditClose(t, "PAO2 simplified at −2000 ft", s.MmHg(), 111.60758786146269, 1e-9)
	auditClose(t, "PAO2 full at −2000 ft", f.MmHg(), 113.70758786146268, 1e-9)
	// Full form at FiO2 1.0 reduces to PB − PH2O − PaCO2 (§3).
	f, _ = AlveolarPO2Full(1, MmHg(760), MmHg(47), MmHg(40), 0.8)
	auditClose(t, "PAO2 full at FiO2 1", f.MmHg(), 673, 1e-12)
	// Below zero: no alveolar oxygen, an ImpossibleError (20 000 m, FiO2 1).
	if _, err := AlveolarPO2(1, Pascals(5474.888669677779), MmHg(47), MmHg(20), 0.8); !errors.Is(err, ErrImpossible) {
		t.Errorf("PAO2 below zero: err %v, want ErrImpossible", err)
	}

	for _, c := range []struct{ fio2, fromFt, toFt, want float64 }{
		{0.21, -2000, 8000, 0.3122766469446746},
		{0.35, 18000, 0, 0.1632335443999858},
		{0.6, 0, 18000, 1.2865002764714715}, // above 1.0: returned with ErrImpossible
	} {
		from, _ := PressureAtAltitude(Feet(c.fromFt))
		to, _ := PressureAtAltitude(Feet(c.toFt))
		got, err := FiO2ToMatch(Fraction(c.fio2), from, to, MmHg(47))
		if (c.want > 1) != errors.Is(err, ErrImpossible) {
			t.Errorf("FiO2ToMatch(%v, %v→%v ft): err %v", c.fio2, c.fromFt, c.toFt, err)
		}
		auditClose(t, "FiO2 to match", got.Value(), c.want, 1e-9)
	}
	h, _ := MaxAltitudeForFiO2(0.21, MmHg(760), 1, MmHg(47))
	auditClose(t, "highest altitude, air → FiO2 1.0", h.Feet(), 32977.349477928714, 1e-9)
	h, _ = MaxAltitudeForFiO2(0.4, MmHg(760), 0.6, MmHg(47))
	auditClose(t, "highest altitude, 0.4 → 0.6", h.Feet(), 10015.881424179155, 1e-9)

	// Severinghaus eq. 1 at the ends of the curve [calc].
	for _, c := range []struct{ po2, want float64 }{
		{0.5, 0.32001959520982315}, {5, 3.604531410916581},
		{300, 99.91355233408697}, {3000, 99.99991333485286},
	} {
		sat, _ := Saturation(MmHg(c.po2))
		auditClose(t, "S("+fmtNum(c.po2)+" mmHg)", sat.Percent(), c.want, 1e-9)
		back, err := PO2AtSaturation(sat)
		if err != nil {
			t.Fatal(err)
		}
		auditClose(t, "PO2 at S("+fmtNum(c.po2)+" mmHg)", back.MmHg(), c.po2, 1e-7)
	}
	if _, err := PO2AtSaturation(1); !errors.Is(err, ErrOutOfRange) {
		t.Errorf("PO2AtSaturation(1): err %v, want a range error (S = 1 needs infinite PO2)", err)
	}
}

// §7–§9: cylinders in other sizes and units, devices at their limits,
// ventilators and the reserve [calc from the §7–§9 formulas].
func TestAuditSupplyAndDevices(t *testing.T) {
	usable := func(c Cylinder, gauge, residual Pressure) float64 {
		t.Helper()
		v, err := c.Usable(gauge, residual)
		if err != nil {
			t.Fatal(err)
		}
		return v.Litres()
	}
	m, _ := FactorCylinder("M")
	k, _ := FactorCylinder("k")
	e, _ := FactorCylinder("E")
	auditClose(t, "M 2200/200 psi", usable(m, Psi(2200), Psi(200)), 3120, 1e-12) // 2000 × 1.56
	auditClose(t, "K 3000/0 psi", usable(k, Psi(3000), 0), 9420, 1e-12)          // 3000 × 3.14
	// E read in bar: (137 − 13.8) bar in psi × 0.28; `units -t '123.2 bar' psi`
	// → 1786.8649.
	auditClose(t, "E 137/13.8 bar", usable(e, Bar(137), Bar(13.8)), 1786.8649*0.28, 1e-7)
	wc2, _ := WaterCapacityCylinder(2)
	auditClose(t, "2 L at 15 000/1 000 kPa", usable(wc2, Kilopascals(15000), Kilopascals(1000)), 280, 1e-12)
	wc10, _ := WaterCapacityCylinder(10)
	// 10 L × (2900 − 200) psi in bar; `units -t '2700 psi' bar` → 186.15845.
	auditClose(t, "10 L 2900/200 psi", usable(wc10, Psi(2900), Psi(200)), 1861.5845, 1e-7)

	for _, c := range []struct {
		d         Device
		flow      float64
		low, high float64
	}{
		{NasalCannula, 6, 0.40, 0.44},   // BTS 2017: 6 L/min ≈ 0.44, capped there
		{SimpleMask, 7.5, 0.46, 0.54},   // BTS 2017: 5–10 L/min 0.40–0.60, linear
		{NonRebreather, 15, 0.86, 0.90}, // BTS 2017: 15 L/min 0.90, capped there
		{Venturi, 14.9, 0.24, 0.40},     // 0.60 needs 15 L/min [practice, memory]
	} {
		r, err := DeviceFiO2(c.d, LitresPerMinute(c.flow))
		if err != nil {
			t.Fatal(err)
		}
		auditClose(t, string(c.d)+" low", r.Low.Value(), c.low, 1e-9)
		auditClose(t, string(c.d)+" high", r.High.Value(), c.high, 1e-9)
	}
	ratio, _ := VenturiEntrainmentRatio(0.35) // (1 − 0.35)/(0.35 − 0.21) §8
	auditClose(t, "air:O2 at 0.35", ratio, 4.642857142857143, 1e-12)
	share, _ := OxygenShareOfBlend(120, 0.35) // 120·0.14/0.79 §8
	auditClose(t, "O2 share 120 L/min at 0.35", share.LitresPerMinute(), 21.265822784810126, 1e-12)

	v, _ := VentilatorOxygen(DriveBlending, 10, 5, 3, 2, 0.6) // 18·0.39/0.79 + 2 §9
	auditClose(t, "ventilator blending", v.LitresPerMinute(), 10.88607594936709, 1e-12)
	v, _ = VentilatorOxygen(DriveOxygen, 12, 3, 2, 10, 0.4) // 17·0.4 + 10 §9
	auditClose(t, "ventilator oxygen drive", v.LitresPerMinute(), 16.8, 1e-12)

	req, _ := ReservePolicy{Residual: Psi(200), Factor: 3, AddedMinutes: Minutes(240)}.Required(1000, 15)
	auditClose(t, "reserve ×3 + 240 min at 15 L/min", req.Litres(), 6600, 1e-12) // §9
}

// §10: Boyle at several altitudes [calc: P1/P2 from §1].
func TestAuditBoyle(t *testing.T) {
	for _, c := range []struct{ fromFt, toFt, want float64 }{
		{-2000, 8000, 1.4464826471292582},
		{0, 18000, 2.002476470061757},
		{0, 25000, 2.6947481428297926},
		{5400, 10500, 1.2152851034602046},
		{1000, 0, 0.9643875609484929}, // a descent: the pocket shrinks
	} {
		p1, _ := PressureAtAltitude(Feet(c.fromFt))
		p2, _ := PressureAtAltitude(Feet(c.toFt))
		r, err := ExpansionRatio(p1, p2)
		if err != nil {
			t.Fatal(err)
		}
		auditClose(t, "Boyle ratio", r, c.want, 1e-9)
	}
	p1, _ := PressureAtAltitude(0)
	p2, _ := PressureAtAltitude(Feet(8000))
	over, _ := RigidSpaceOverpressure(0, p1, p2) // (P1 − P2)/98.0665 Pa
	auditClose(t, "rigid space 0 → 8000 ft", over.CmH2O(), 265.76480178223915, 1e-9)
}

// A residual the plan document accepts (up to 70 bar, README's table and
// plan_validate.go) must not fail inside the engine. Before the fix, 69
// and 70 bar (above 1 000 psi) ended in an engine error from the reserve
// policy's 0–1 000 psi check.
//
// E at 2 000 psi with a 70 bar residual: (2000 psi − 70 bar) in psi ×
// 0.28 L/psi (§7 [practice]); `units -t '(2000 psi - 70 bar)/psi'` →
// 984.73584, × 0.28 = 275.726 → 275 L usable (rounded down).
func TestAuditPlanResidualAtBarLimit(t *testing.T) {
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 60, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90},
 "supply": [{"size": "E", "pressure_psi": 2000}, {"size": "E", "pressure_psi": 1000}],
 "policy": {"residual_bar": 70}}`)
	exact(t, "usable of the first E", r.Cylinders[0].UsableL, "275")
	exact(t, "usable of the second E (below the residual)", r.Cylinders[1].UsableL, "0")
	exact(t, "residual_bar", r.ResidualBar, "70")
	if !hasWarning(r, WarnCylinderAtResidual) {
		t.Error("want CYLINDER_AT_RESIDUAL for the E at 1000 psi")
	}
	// The policy itself accepts 70 bar, and refuses a step above it, in psi.
	if err := (ReservePolicy{Residual: Bar(70), Factor: 1}).Validate(); err != nil {
		t.Errorf("70 bar residual refused: %v", err)
	}
	supplyWantRange(t, ReservePolicy{Residual: Bar(70.01), Factor: 1}.Validate(), "reserve residual", "psi")
}

// A long transport the document accepts (three legs of the 2 880 min
// maximum on a blender at 120 L/min, FiO2 1.0) is a plan short of oxygen,
// not an engine error. Before the fix, its need (over 10⁶ L) failed the
// reserve's plausibility check.
//
// Blender share at FiO2 1.0: 120·(1 − 0.21)/0.79 = 120 L/min (§8); need
// 3 × 2880 × 120 = 1 036 800 L; × 1.5 (default reserve, §9 [practice]) =
// 1 555 200 L; one H at 2 200 psi: (2200 − 200)·3.14 = 6 280 L (§7).
func TestAuditPlanVeryLongTransport(t *testing.T) {
	leg := `{"where": "origin", "minutes": 2880, "oxygen": {"device": "blender", "flow_lpm": 120, "fio2": 1}}`
	r := mustPlan(t, `{"version": 1,
 "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [`+leg+`, `+leg+`, `+leg+`],
 "patient": {"fio2": 1, "pao2_mmhg": 400},
 "supply": [{"size": "H", "pressure_psi": 2200}]}`)
	exact(t, "oxygen_calculated_l", r.OxygenCalculatedL, "1036800")
	exact(t, "oxygen_needed_l", r.OxygenNeededL, "1555200")
	exact(t, "oxygen_usable_l", r.OxygenUsableL, "6280")
	exact(t, "oxygen_margin_l", r.OxygenMarginL, "-1548920")
	if r.Go || !hasWarning(r, WarnSupplyShort) {
		t.Errorf("go %v, warnings %+v: want NO-GO with SUPPLY_SHORT", r.Go, r.Warnings)
	}
}
