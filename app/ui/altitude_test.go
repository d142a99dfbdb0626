package ui

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

func mountAltitude(t *testing.T) *altitude {
	t.Helper()
	a := newAltitude()
	mount(t, a)
	return a
}

func shownNumber(t *testing.T, html, id string) float64 {
	t.Helper()
	s := strings.TrimPrefix(htmlText(html, id), "×")
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("%s shows %q, not a number", id, s)
	}
	return v
}

// At 50 000 ft about 9.25 psi holds an 8 000 ft cabin (McGraw-Hill
// Illustrated Dictionary of Aviation 2005; REFERENCES §2 [calc] 9.234 psi).
// Both directions are checked within the rounding of 9.234.
func TestAltitudeCabinBothWays(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "50000")
	a.edit(FieldAltDiff, "9.234")
	html := rendered(t, a)
	if v := shownNumber(t, html, "alt-cabin"); v < 7990 || v > 8010 {
		t.Errorf("cabin = %v ft, want about 8000", v)
	}
	if v := shownNumber(t, html, "alt-max-cruise"); v < 49950 || v > 50050 {
		t.Errorf("highest cruise for an 8000 ft cabin = %v ft, want about 50000", v)
	}
}

// An unpressurised 8 000 ft cabin from sea level on air, PaCO2 40:
// PAO2 58.7 mmHg (REFERENCES §3 [calc]) shown rounded down as 58; a free
// pocket of gas grows ×1.346 (REFERENCES §10 [calc]), shown rounded up as
// ×1.35; a 10 mL cuff → 13.46 mL → 13.5; a rigid cuff set at 25 cmH2O rises
// by (760 − 564.51) mmHg = 265.8 cmH2O (REFERENCES §1 [calc], 1 cmH2O =
// 98.0665 Pa) to 290.8 → 291 cmH2O, above the 30 cmH2O limit (Mann 2007).
func TestAltitudeOxygenAndTrappedGas(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "8000")
	a.edit(FieldAltDiff, "0")
	html := rendered(t, a)
	want := map[string]string{
		"alt-cabin":    "8000",
		"alt-pao2-alv": "58",
		"alt-ratio":    "×1.35",
		"alt-cuff-vol": "13.5",
		// 500 mL × 101325/75262 Pa (REFERENCES §1: 8000 ft = 75.262 kPa) = 673.1 → 674
		"alt-ptx-vol":   "674",
		"alt-cuff-rise": "291",
	}
	for id, w := range want {
		if got := htmlText(html, id); got != w {
			t.Errorf("%s = %q, want %q", id, got, w)
		}
	}
	if !strings.Contains(html, `id="alt-cuff-warn"`) {
		t.Error("no warning for a cuff above 30 cmH2O")
	}
	for _, id := range []string{"alt-gas-plot", "alt-spo2-plot"} {
		if !strings.Contains(html, `id="`+id+`"`) {
			t.Errorf("plot %s missing", id)
		}
	}
	for _, mark := range []string{">Origin 0<", ">Cabin 8000<", ">Destination 0<"} {
		if !strings.Contains(html, mark) {
			t.Errorf("plot mark %q missing", mark)
		}
	}
}

// A cruise altitude above the model's domain shows its message with the
// range and unit, and no figure.
func TestAltitudeBadValue(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "70000")
	html := rendered(t, a)
	msg := htmlText(html, FieldAltCruise+"-msg")
	if !strings.Contains(msg, "Cruise altitude") || !strings.Contains(msg, "between -2000 and 65000 ft") {
		t.Errorf("message = %q", msg)
	}
	for _, id := range []string{"alt-cabin", "alt-max-cruise", "alt-pao2-alv", "alt-ratio"} {
		if htmlText(html, id) != "" {
			t.Errorf("%s shown while a field is invalid", id)
		}
	}
	if strings.Contains(html, "alt-gas-plot") {
		t.Error("plot drawn while a field is invalid")
	}
}

// In metres: 8 000 ft = 2 438.4 m exactly (1 ft = 0.3048 m), the cabin
// rounded up to 2439 m; inputs are converted to the nearest metre.
func TestAltitudeUnits(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "8000")
	a.edit(FieldAltDiff, "0")
	st := a.settings
	st.AltitudeUnit, st.GasUnit = UnitM, UnitKPa
	a.settings = st
	a.showUnits()
	html := rendered(t, a)
	if a.text[FieldAltCruise] != "2438" {
		t.Errorf("cruise shown as %q m, want 2438", a.text[FieldAltCruise])
	}
	if got := htmlText(html, "alt-cabin"); got != "2438" && got != "2439" {
		t.Errorf("cabin = %q m, want 2438 or 2439 (2438 m typed back, rounded up)", got)
	}
	// 58.7 mmHg = 7.83 kPa (1 mmHg = 133.322 Pa) → 7.8 rounded down.
	if got := htmlText(html, "alt-pao2-alv"); got != "7.8" {
		t.Errorf("PAO2 = %q kPa, want 7.8", got)
	}
	if a.text[FieldAltPaCO2] != "5.3" {
		t.Errorf("PaCO2 shown as %q kPa, want 5.3 (40 mmHg)", a.text[FieldAltPaCO2])
	}
}

// briefDraftFor is a Brief draft of our own (invented): sea level to
// 3000 ft, a 5.5 psi aircraft at 24 000 ft, the patient on air, three legs
// (the flight on room air), two E cylinders.
func briefDraftFor() BriefDraft {
	d := NewBriefDraft()
	d.Route = RouteDraft{Origin: Entry{T: "0", U: UnitFeet}, Destination: Entry{T: "3000", U: UnitFeet},
		Cruise: Entry{T: "24000", U: UnitFeet}, Cabin: CabinPressurised, Differential: Entry{T: "5.5", U: UnitPsi}}
	d.Legs = []LegDraft{
		{Where: "origin", Minutes: Entry{T: "10"}, Device: "room_air"},
		{Where: "cabin", Minutes: Entry{T: "60"}, Device: "room_air"},
		{Where: "destination", Minutes: Entry{T: "10"}, Device: "room_air"},
	}
	d.Patient = PatientDraft{FiO2: Entry{T: "0.21"}, PaO2: Entry{T: "80", U: UnitMmHg}, MeasuredAt: "origin"}
	d.Supply = []SupplyDraft{{Kind: "E", Pressure: Entry{T: "2000", U: UnitPsi}, Count: Entry{T: "2"}}}
	return d
}

// Altitude takes the route and the patient of a complete draft (PaCO2, RQ
// and temperature the plan's defaults when the Brief leaves them out) and
// shows physio.ComputePlan's cabin altitude and flight-leg oxygen for it.
func TestAltitudeAdoptsDraft(t *testing.T) {
	parts := readDraftParts(briefDraftFor(), DefaultSettings())
	if parts.result == nil || !parts.route || !parts.patient {
		t.Fatalf("the draft is not complete: %+v", parts)
	}
	a := mountAltitude(t)
	a.adoptParts(parts)
	for id, want := range map[string]string{FieldAltOrigin: "0", FieldAltDest: "3000", FieldAltCruise: "24000", FieldAltDiff: "5.5",
		FieldAltFiO2: "0.21", FieldAltPaO2: "80", FieldAltPaCO2: "40", FieldAltRQ: "0.8", FieldAltTemp: "37", FieldAltCabinStat: ""} {
		if a.text[id] != want {
			t.Errorf("%s = %q, want %q", id, a.text[id], want)
		}
	}
	html := rendered(t, a)
	flight := parts.result.Legs[1]
	for id, want := range map[string]string{
		"alt-cabin":    parts.result.CabinAltitudeFt.String(),
		"alt-pao2-alv": flight.PAO2MmHg.Decimal.RoundFloor(0).String(),
		"alt-pao2-art": flight.PaO2ExpectedMmHg.Decimal.RoundFloor(0).String(),
		"alt-spo2":     flight.SpO2ExpectedPercent.Decimal.RoundFloor(0).String(),
	} {
		if got := htmlText(html, id); got != want {
			t.Errorf("%s = %q, want %q (physio.ComputePlan)", id, got, want)
		}
	}
	if !strings.Contains(html, "Route and patient from the Brief") {
		t.Error("the screen does not say where its values come from")
	}
}

// A patient given by SpO2 only: the PaO2 field takes physio's PaO2 at that
// SpO2 on the standard curve, rounded down to 0.1 mmHg, and says so; a
// draft whose patient is incomplete leaves the example patient and says
// that too. A stated cabin altitude is used as it is, the cruise may then be
// empty.
func TestAltitudeDraftPartsAndStatedCabin(t *testing.T) {
	d := briefDraftFor()
	d.Patient.PaO2, d.Patient.SpO2 = Entry{}, Entry{T: "92"}
	parts := readDraftParts(d, DefaultSettings())
	a := mountAltitude(t)
	a.adoptParts(parts)
	p, err := physio.PO2AtSaturation(physio.Percent(92))
	if err != nil {
		t.Fatal(err)
	}
	want, _ := physio.Round(p.MmHg(), 1, physio.RoundDown)
	if a.text[FieldAltPaO2] != want.String() || !strings.Contains(a.pao2Note, "SpO2 of 92 %") {
		t.Errorf("PaO2 %q (note %q), want %s from SpO2 92 %%", a.text[FieldAltPaO2], a.pao2Note, want)
	}
	// Severinghaus 1979: SpO2 92 % is about 64 mmHg (standard curve; from
	// memory, within 1 mmHg).
	if v := p.MmHg(); v < 63 || v > 65.5 {
		t.Errorf("PaO2 at 92 %% = %v mmHg, want about 64", v)
	}

	d = briefDraftFor()
	d.Patient.FiO2 = Entry{}
	d.Route.Cabin, d.Route.Cruise, d.Route.CabinAltitude = CabinStated, Entry{}, Entry{T: "6500", U: UnitFeet}
	parts = readDraftParts(d, DefaultSettings())
	if parts.patient || !parts.route || parts.result != nil {
		t.Fatalf("parts: route %v patient %v", parts.route, parts.patient)
	}
	a = mountAltitude(t)
	a.adoptParts(parts)
	if a.text[FieldAltFiO2] != "0.21" || a.text[FieldAltPaO2] != "95" {
		t.Errorf("the example patient was replaced by an incomplete one: %q %q", a.text[FieldAltFiO2], a.text[FieldAltPaO2])
	}
	html := rendered(t, a)
	if !strings.Contains(html, "the patient values are an example") {
		t.Error("the screen does not say the patient is an example")
	}
	if a.text[FieldAltCruise] != "" || htmlText(html, "alt-cabin") != "6500" || !strings.Contains(html, "stated by the pilot") {
		t.Errorf("stated cabin: cruise %q, cabin %q", a.text[FieldAltCruise], htmlText(html, "alt-cabin"))
	}
	if htmlText(html, FieldAltCruise+"-msg") != "" {
		t.Error("an empty cruise is refused while a cabin altitude is stated")
	}
}

// Supply takes the cylinders, legs and reserve policy of a draft with no
// patient.
func TestSupplyAdoptsDraftWithoutPatient(t *testing.T) {
	d := briefDraftFor()
	d.Patient = NewBriefDraft().Patient
	d.Policy = PolicyDraft{Override: true, Residual: Entry{T: "20", U: UnitBar}, Factor: Entry{T: "1"}, Minutes: Entry{T: "15"}, SpO2Target: Entry{T: "94"}}
	d.Legs[1].Device = "" // a set-up still to choose: the legs' minutes are enough here
	parts := readDraftParts(d, DefaultSettings())
	if parts.result != nil || parts.patient || !parts.supply || parts.legs || !parts.policy {
		t.Fatalf("parts: %+v", parts)
	}
	s, _, _, _ := mountSupply(t)
	s.adoptParts(parts)
	if len(s.session.Cylinders) != 2 || !s.fromPlan {
		t.Fatalf("cylinders %+v", s.session.Cylinders)
	}
	if len(s.legs) != 3 || s.legs[1].Start != 10 || s.legs[1].Minutes != 60 || s.legs[2].Start != 70 {
		t.Errorf("legs %+v, want 0–10, 10–70, 70–80 min", s.legs)
	}
	res, added, msg := s.residual()
	if msg != "" || math.Abs(res.Bar()-20) > 1e-12 || added != 15*time.Minute {
		t.Errorf("residual %v bar, reserve %v (%q), want the Brief's 20 bar and 15 min", res.Bar(), added, msg)
	}
}
