package ui

import (
	"errors"
	"fmt"
	"regexp"
	"strings"
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// validDoc is a complete plan document of our own (invented) that physio
// accepts, used as the base for the limit checks.
func validDoc() *physio.PlanDocument {
	v := physio.PlanValue
	one := 1
	return &physio.PlanDocument{
		Version: physio.PlanDocumentVersion,
		Route:   physio.PlanRoute{OriginElevationFt: v(0), DestinationElevationFt: v(0), CruiseAltitudeFt: v(8000)},
		Legs: []physio.PlanLeg{
			{Where: "cabin", Minutes: v(60), Oxygen: &physio.PlanOxygen{Device: physio.Blender, FlowLpm: v(10), FiO2: v(0.4)}},
			{Where: "origin", Minutes: v(10), Oxygen: &physio.PlanOxygen{Device: physio.Ventilator, MinuteVolumeLpm: v(8), FiO2: v(0.4),
				Drive: physio.DriveBlending, BiasFlowLpm: v(2), LeakLpm: v(1), DriveGasLpm: v(0)}},
		},
		Patient: physio.PlanPatient{FiO2: v(0.3), PaO2MmHg: v(80), SpO2Percent: v(95), PaCO2MmHg: v(40), RQ: v(0.8),
			TemperatureC: v(37), HbGPerDL: v(12), AgeYears: v(50)},
		Supply: []physio.PlanSupply{{WaterCapacityL: v(10), PressureBar: v(150), Count: &one}},
		Policy: &physio.PlanPolicy{ResidualPsi: v(200), ReserveFactor: v(1.5), ReserveMinutes: v(30), SpO2TargetPercent: v(94)},
	}
}

// The Brief's ranges mirror physio's plan document limits: each limit is
// accepted by physio's own validation and a step beyond it is refused at
// the same path. A change of a limit in physio fails here.
func TestBriefLimitsMatchPhysio(t *testing.T) {
	type target struct {
		spec fieldSpec
		path string
		set  func(d *physio.PlanDocument, x float64)
		bar  bool
	}
	p := physio.PlanValue
	targets := []target{
		{specOrigin, "route.origin_elevation_ft", func(d *physio.PlanDocument, x float64) { d.Route.OriginElevationFt = p(x) }, false},
		{specDestination, "route.destination_elevation_ft", func(d *physio.PlanDocument, x float64) { d.Route.DestinationElevationFt = p(x) }, false},
		{specCruise, "route.cruise_altitude_ft", func(d *physio.PlanDocument, x float64) { d.Route.CruiseAltitudeFt = p(x) }, false},
		{specCabin, "route.cabin_altitude_ft", func(d *physio.PlanDocument, x float64) {
			d.Route.CruiseAltitudeFt = nil
			d.Route.CabinAltitudeFt = p(x)
		}, false},
		{specDiff, "route.max_differential_psi", func(d *physio.PlanDocument, x float64) { d.Route.MaxDifferentialPsi = p(x) }, false},
		{specMinutes, "legs[0].minutes", func(d *physio.PlanDocument, x float64) { d.Legs[0].Minutes = p(x) }, false},
		{specLegFiO2, "legs[0].oxygen.fio2", func(d *physio.PlanDocument, x float64) { d.Legs[0].Oxygen.FiO2 = p(x) }, false},
		{specBlendFlow, "legs[0].oxygen.flow_lpm", func(d *physio.PlanDocument, x float64) { d.Legs[0].Oxygen.FlowLpm = p(x) }, false},
		{specMinuteVol, "legs[1].oxygen.minute_volume_lpm", func(d *physio.PlanDocument, x float64) { d.Legs[1].Oxygen.MinuteVolumeLpm = p(x) }, false},
		{specBias, "legs[1].oxygen.bias_flow_lpm", func(d *physio.PlanDocument, x float64) { d.Legs[1].Oxygen.BiasFlowLpm = p(x) }, false},
		{specLeak, "legs[1].oxygen.leak_lpm", func(d *physio.PlanDocument, x float64) { d.Legs[1].Oxygen.LeakLpm = p(x) }, false},
		{specDriveGas, "legs[1].oxygen.drive_gas_lpm", func(d *physio.PlanDocument, x float64) { d.Legs[1].Oxygen.DriveGasLpm = p(x) }, false},
		{specPtFiO2, "patient.fio2", func(d *physio.PlanDocument, x float64) { d.Patient.FiO2 = p(x) }, false},
		{specPaO2, "patient.pao2_mmhg", func(d *physio.PlanDocument, x float64) { d.Patient.PaO2MmHg = p(x) }, false},
		{specSpO2, "patient.spo2_percent", func(d *physio.PlanDocument, x float64) { d.Patient.SpO2Percent = p(x) }, false},
		{specPaCO2, "patient.paco2_mmhg", func(d *physio.PlanDocument, x float64) { d.Patient.PaCO2MmHg = p(x) }, false},
		{specRQ, "patient.rq", func(d *physio.PlanDocument, x float64) { d.Patient.RQ = p(x) }, false},
		{specTemp, "patient.temperature_c", func(d *physio.PlanDocument, x float64) { d.Patient.TemperatureC = p(x) }, false},
		{specHb, "patient.hb_g_dl", func(d *physio.PlanDocument, x float64) { d.Patient.HbGPerDL = p(x) }, false},
		{specAge, "patient.age_years", func(d *physio.PlanDocument, x float64) { d.Patient.AgeYears = p(x) }, false},
		{specWaterCap, "supply[0].water_capacity_l", func(d *physio.PlanDocument, x float64) {
			d.Supply[0].WaterCapacityL = p(x)
			d.Supply[0].PressureBar = p(0)
		}, false},
		{specCount, "supply[0].count", func(d *physio.PlanDocument, x float64) { n := int(x); d.Supply[0].Count = &n }, false},
		{specResidual, "policy.residual_psi", func(d *physio.PlanDocument, x float64) { d.Policy.ResidualPsi = p(x) }, false},
		{specResidual, "policy.residual_bar", func(d *physio.PlanDocument, x float64) { d.Policy.ResidualPsi = nil; d.Policy.ResidualBar = p(x) }, true},
		{specFactor, "policy.reserve_factor", func(d *physio.PlanDocument, x float64) { d.Policy.ReserveFactor = p(x) }, false},
		{specResMinutes, "policy.reserve_minutes", func(d *physio.PlanDocument, x float64) { d.Policy.ReserveMinutes = p(x) }, false},
		{specSpO2Target, "policy.spo2_target_percent", func(d *physio.PlanDocument, x float64) { d.Policy.SpO2TargetPercent = p(x) }, false},
	}
	if err := validDoc().Validate(); err != nil {
		t.Fatalf("base document: %v", err)
	}
	refusedAt := func(err error, path string) bool {
		var pe physio.PlanErrors
		if !errors.As(err, &pe) {
			return false
		}
		for _, fe := range pe {
			if fe.Path == path {
				return true
			}
		}
		return false
	}
	for _, tg := range targets {
		lo, hi := tg.spec.Min, tg.spec.Max
		if tg.bar {
			lo, hi = tg.spec.MinBar, tg.spec.MaxBar
		}
		step := 0.01
		if tg.spec.Whole {
			step = 1
		}
		for _, c := range []struct {
			x    float64
			good bool
		}{{lo, true}, {hi, true}, {lo - step, false}, {hi + step, false}} {
			d := validDoc()
			tg.set(d, c.x)
			err := d.Validate()
			if c.good && refusedAt(err, tg.path) {
				t.Errorf("%s = %v: the Brief allows it, physio refuses it: %v", tg.path, c.x, err)
			}
			if !c.good && !refusedAt(err, tg.path) {
				t.Errorf("%s = %v: the Brief refuses it, physio accepts it (err %v)", tg.path, c.x, err)
			}
		}
	}
}

// Reading fields: a bare number takes the displayed unit, a number with a
// unit keeps its own, ranges are stated in the displayed unit, rounded
// inward. 1 ft = 0.3048 m exactly (international foot, 1959); 1 psi =
// 6894.757 Pa and 1 mmHg = 133.322 Pa (NIST SP 811, appendix B).
func TestReadEntryUnits(t *testing.T) {
	cases := []struct {
		name     string
		spec     fieldSpec
		e        Entry
		disp     string
		want     float64
		unit     string
		tol      float64
		msgParts []string // non-empty: a message is expected with these parts
	}{
		{"ft as shown", specOrigin, Entry{T: "8000", U: "ft"}, "ft", 8000, "ft", 0, nil},
		{"m as shown", specOrigin, Entry{T: "2438.4", U: "m"}, "m", 8000, "ft", 1e-9, nil},
		{"unit typed", specOrigin, Entry{T: "2438.4 m", U: "ft"}, "ft", 8000, "ft", 1e-9, nil},
		{"limit in m", specOrigin, Entry{T: "5486.4", U: "m"}, "m", 18000, "ft", 1e-9, nil},
		{"above in m", specOrigin, Entry{T: "6000", U: "m"}, "m", 0, "", 0, []string{"between -609 and 5486 m", "6000 m"}},
		{"above in ft", specOrigin, Entry{T: "30000", U: "ft"}, "ft", 0, "", 0, []string{"between -2000 and 18000 ft", "30000 ft"}},
		{"not a number", specOrigin, Entry{T: "abc"}, "ft", 0, "", 0, []string{"not a number", "ft"}},
		{"required", specOrigin, Entry{}, "ft", 0, "", 0, []string{"required", "-2000 and 18000 ft"}},
		{"kPa", specPaO2, Entry{T: "10.6", U: "kPa"}, "kPa", 10.6 * 1000 / 133.322387415, "mmHg", 1e-9, nil},
		{"kPa range", specPaO2, Entry{T: "100", U: "kPa"}, "kPa", 0, "", 0, []string{"between 2.7 and 93.3 kPa"}},
		{"gauge bar", gaugeSpec(mustFactor(t, physio.SizeE)), Entry{T: "137", U: "bar"}, "bar", 137, "bar", 0, nil},
		{"gauge psi", gaugeSpec(mustFactor(t, physio.SizeE)), Entry{T: "2000", U: "psi"}, "psi", 2000, "psi", 0, nil},
		{"diff in bar", specDiff, Entry{T: "0.5", U: "bar"}, "bar", 0.5 * 100000 / 6894.757293168, "psi", 1e-9, nil},
		{"fio2 fraction", specPtFiO2, Entry{T: "0.4"}, "", 0.4, "", 0, nil},
		{"fio2 percent", specPtFiO2, Entry{T: "40 %"}, "", 0.4, "", 0, nil},
		{"fio2 bare 40", specPtFiO2, Entry{T: "40"}, "", 0, "", 0, []string{"FiO2 when measured", "0.21 and 1"}},
		{"duration", specMinutes, Entry{T: "1 h 30 min"}, "min", 90, "min", 0, nil},
		{"count whole", specCount, Entry{T: "1.5"}, "cyl.", 0, "", 0, []string{"whole number"}},
		{"exponent refused", specHb, Entry{T: "1e1"}, "g/dL", 0, "", 0, []string{"not a number"}},
	}
	for _, c := range cases {
		r := readEntry(c.spec, c.e, c.disp, true)
		if len(c.msgParts) > 0 {
			if r.Msg == "" {
				t.Errorf("%s: no message for %q", c.name, c.e.T)
			}
			for _, part := range c.msgParts {
				if !strings.Contains(r.Msg, part) {
					t.Errorf("%s: message %q lacks %q", c.name, r.Msg, part)
				}
			}
			continue
		}
		if r.Msg != "" || !r.Present {
			t.Errorf("%s: %q refused: %q", c.name, c.e.T, r.Msg)
			continue
		}
		if d := r.Value - c.want; d > c.tol*c.want+c.tol || d < -(c.tol*c.want+c.tol) || r.Unit != c.unit {
			t.Errorf("%s: %q read as %v %s, want %v %s", c.name, c.e.T, r.Value, r.Unit, c.want, c.unit)
		}
	}
}

func mustFactor(t *testing.T, s physio.CylinderSize) physio.Cylinder {
	t.Helper()
	c, err := physio.FactorCylinder(s)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// scenarioDraft is the same transport as validDoc's first leg, typed as a
// crew would: a pressurised aircraft, blender in flight.
func scenarioDraft() BriefDraft {
	d := NewBriefDraft()
	d.Route = RouteDraft{Origin: Entry{"500", "ft"}, Destination: Entry{"3000", "ft"}, Cruise: Entry{"22000", "ft"},
		Cabin: CabinPressurised, Differential: Entry{"6", "psi"}}
	d.Legs = []LegDraft{
		{Where: "origin", Minutes: Entry{T: "15"}, Device: "nasal_cannula", Flow: Entry{T: "2"}},
		{Where: "cabin", Minutes: Entry{T: "120"}, Device: "venturi", Flow: Entry{T: "8"}, FiO2: Entry{T: "0.35"}},
		{Where: "destination", Minutes: Entry{T: "10"}, Device: "nasal_cannula", Flow: Entry{T: "2"}},
	}
	d.Patient = PatientDraft{FiO2: Entry{T: "0.28"}, SpO2: Entry{T: "94"}, PaCO2: Entry{"40", "mmHg"}, MeasuredAt: "origin"}
	d.Supply = []SupplyDraft{{Kind: "D", Pressure: Entry{"1800", "psi"}, Count: Entry{T: "3"}}}
	return d
}

// The same transport written directly as a plan document.
func scenarioDoc() *physio.PlanDocument {
	v := physio.PlanValue
	three := 3
	return &physio.PlanDocument{
		Version: physio.PlanDocumentVersion,
		Route:   physio.PlanRoute{OriginElevationFt: v(500), DestinationElevationFt: v(3000), CruiseAltitudeFt: v(22000), MaxDifferentialPsi: v(6)},
		Legs: []physio.PlanLeg{
			{Where: "origin", Minutes: v(15), Oxygen: &physio.PlanOxygen{Device: physio.NasalCannula, FlowLpm: v(2)}},
			{Where: "cabin", Minutes: v(120), Oxygen: &physio.PlanOxygen{Device: physio.Venturi, FlowLpm: v(8), FiO2: v(0.35)}},
			{Where: "destination", Minutes: v(10), Oxygen: &physio.PlanOxygen{Device: physio.NasalCannula, FlowLpm: v(2)}},
		},
		Patient: physio.PlanPatient{FiO2: v(0.28), SpO2Percent: v(94), PaCO2MmHg: v(40), MeasuredAt: "origin"},
		Supply:  []physio.PlanSupply{{Size: physio.SizeD, PressurePsi: v(1800), Count: &three}},
		Policy:  &physio.PlanPolicy{ResidualPsi: v(200), ReserveFactor: v(1.5), ReserveMinutes: v(30), SpO2TargetPercent: v(94)},
	}
}

// The Brief mounted in go-app's test engine loads its draft from the store,
// shows what physio computes for the same document, and with one invalid
// field shows what to fix and no figure at all.
func TestBriefComponent(t *testing.T) {
	want, err := physio.ComputePlan(scenarioDoc())
	if err != nil {
		t.Fatal(err)
	}
	d := scenarioDraft()
	store := &memDraftStore{draft: &d}
	b := newBriefWith(store)
	p, e := mount(t, b)
	b.load(p.ctx) // OnMount runs in the browser only
	e.ConsumeAll()
	if !b.s.model.ok() {
		t.Fatalf("the scenario did not compute: %v %v", b.s.model.msgs, b.s.model.other)
	}
	html := app.HTMLString(&briefResult{Rev: b.s.rev, s: b.s})
	for id, n := range map[string]physio.Number{
		"b-r-cabin-v": *want.CabinAltitudeFt, "b-r-fio2-v": want.FiO2Needed, "b-r-need-v": want.OxygenNeededL,
		"b-r-usable-v": want.OxygenUsableL, "b-r-margin-v": want.OxygenMarginL,
	} {
		if !regexp.MustCompile(`id="` + id + `"[^>]*>` + regexp.QuoteMeta(n.String()) + `<`).MatchString(html) {
			t.Errorf("%s: physio gives %s; not found in the rendered Brief", id, n)
		}
	}
	if !strings.Contains(html, `data-status="`+want.Status+`"`) {
		t.Errorf("status %s not rendered", want.Status)
	}

	// One invalid field: the message with range and unit beside it, and
	// not a single figure in the result area.
	b.s.draft.Route.Origin = Entry{"25000", "ft"}
	b.s.recompute()
	if b.s.model.ok() {
		t.Fatal("a plan was computed with an invalid origin")
	}
	if msg := b.s.model.msgs[fidOrigin]; !strings.Contains(msg, "between -2000 and 18000 ft") {
		t.Errorf("origin message = %q", msg)
	}
	res := app.HTMLString(&briefResult{Rev: b.s.rev, s: b.s})
	for _, bad := range []string{"alv-num", "b-fig", want.OxygenNeededL.String() + " L", "NaN", "Inf"} {
		if strings.Contains(res, bad) {
			t.Errorf("result area with an invalid field contains %q", bad)
		}
	}
	if !strings.Contains(res, `data-status="incomplete"`) || !strings.Contains(res, "Origin field elevation must be") {
		t.Errorf("result area does not say what to fix: %s", res)
	}
	route := app.HTMLString(&briefRoute{s: b.s})
	if !strings.Contains(route, `aria-describedby="b-rt-origin-unit b-rt-origin-msg"`) || !strings.Contains(route, `id="b-rt-origin-msg"`) {
		t.Errorf("the origin field does not carry its message: %s", route)
	}
}

// The plain draft store keeps route, legs, supply and policy, and never the
// patient block: not beside the rest, not under a key of its own.
func TestLocalDraftStoreRoundTrip(t *testing.T) {
	c := &draftProbe{}
	e := app.NewTestEngine()
	if err := e.Load(c); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if c.err != nil {
		t.Fatal(c.err)
	}
	if c.got.Route.Cruise != (Entry{"22000", "ft"}) || len(c.got.Legs) != 3 || c.got.Legs[1].FiO2.T != "0.35" {
		t.Errorf("route/legs not kept: %+v", c.got)
	}
	if !patientEmpty(c.got.Patient) || c.got.Patient.MeasuredAt != "origin" {
		t.Errorf("patient values came back from plain storage: %+v", c.got.Patient)
	}
	if c.mainHasPatient || c.patientKey {
		t.Error("the patient block is stored in plain localStorage")
	}
}

type draftProbe struct {
	app.Compo
	got            BriefDraft
	mainHasPatient bool
	patientKey     bool
	err            error
}

func (p *draftProbe) OnPreRender(ctx app.Context) {
	st := localDraftStore{}
	if err := st.Save(ctx, scenarioDraft()); err != nil {
		p.err = err
		return
	}
	var raw map[string]any
	ctx.LocalStorage().Get(draftKey, &raw)
	_, p.mainHasPatient = raw["patient"]
	p.patientKey = ctx.LocalStorage().Contains(draftPatientKey)
	d, found, err := st.Load(ctx)
	if err != nil || !found {
		p.err = fmt.Errorf("load: found=%v err=%v", found, err)
		return
	}
	p.got = d
}

func (p *draftProbe) Render() app.UI { return app.Div() }

// Recompute cost per keystroke (read every field, compute the plan).
func BenchmarkBriefRecompute(b *testing.B) {
	d := scenarioDraft()
	st := DefaultSettings()
	for i := 0; i < b.N; i++ {
		if m := buildBrief(d, st); !m.ok() {
			b.Fatal("scenario invalid")
		}
	}
}
