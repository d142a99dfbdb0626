package ui

import (
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// saveAltitudeState keeps, through go-app as the screens do, settings in
// metres, kPa and bar, and the Brief draft of briefDraftFor (its patient
// block held by the vault session in memory, as the Brief leaves it).
func saveAltitudeState(t *testing.T, ctx app.Context, e app.TestEngine, vault *vaultSession) {
	t.Helper()
	st := DefaultSettings()
	st.AltitudeUnit, st.GasUnit, st.PressureUnit = UnitM, UnitKPa, UnitBar
	if err := SaveSettings(ctx, st); err != nil {
		t.Fatal(err)
	}
	d := briefDraftFor()
	if err := (localDraftStore{}).Save(ctx, d); err != nil {
		t.Fatal(err)
	}
	vault.KeepDraftPatient(d.Patient)
	e.ConsumeAll()
}

// useDraftVault makes OnMount read the Brief draft's patient block from
// vault for the rest of the test.
func useDraftVault(t *testing.T, vault *vaultSession) {
	t.Helper()
	was := draftPlan
	draftPlan = func(ctx app.Context) (draftParts, bool) {
		return draftPlanFrom(ctx.LocalStorage(), LoadSettings(ctx), vault)
	}
	t.Cleanup(func() { draftPlan = was })
}

// Altitude's first render, read before it (preload), already shows the
// saved display units and the Brief draft's route and patient; OnMount's
// load then finds nothing different and the screen stays as drawn.
// Expected values: 24 000 ft = 7315.2 m (1 ft = 0.3048 m exactly, NIST
// SP 811), to the nearest metre 7315; 3000 ft = 914.4 m, 914; 5.5 psi =
// 0.379 bar (1 psi = 6894.757 Pa, NIST SP 811), to 0.01 bar 0.38; PaCO2
// 40 mmHg (the plan's default) = 5.333 kPa (1 mmHg = 133.322 Pa, NIST
// SP 811), to 0.1 kPa 5.3; PaO2 80 mmHg = 10.666 kPa, 10.7. GNU units
// gives 7315.2, 914.4, 0.37921165, 5.3328955 and 10.665791.
func TestAltitudeFirstRenderShowsSaved(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	vault := testSession(logbook.NewMemStore())
	saveAltitudeState(t, ctx, e, vault)

	a := newAltitude()
	a.preloadFrom(ctx.LocalStorage(), vault)
	first := rendered(t, a)
	for id, want := range map[string]string{
		FieldAltCruise: "7315", FieldAltDest: "914", FieldAltDiff: "0.38", FieldAltPaCO2: "5.3", FieldAltPaO2: "10.7", FieldAltFiO2: "0.21",
	} {
		if got := inputValue(first, id); got != want {
			t.Errorf("first render: %s holds %q, want %q", id, got, want)
		}
	}
	for id, want := range map[string]string{
		FieldAltCruise + "-unit": UnitM, FieldAltDiff + "-unit": UnitBar, FieldAltPaCO2 + "-unit": UnitKPa,
	} {
		if got := htmlText(first, id); got != want {
			t.Errorf("first render: %s = %q, want %q", id, got, want)
		}
	}
	if !a.routeFrom || !a.patientFrom {
		t.Errorf("first render: route from the Brief %v, patient %v; want both", a.routeFrom, a.patientFrom)
	}

	// OnMount, on the component mounted with that first render, reading
	// the same vault session.
	useDraftVault(t, vault)
	p.ctx.Dispatch(func(app.Context) { p.child = a })
	e.ConsumeAll()
	if got := htmlText(app.HTMLString(p), FieldAltCruise+"-unit"); got != UnitM {
		t.Fatalf("the mounted Altitude shows the cruise in %q, want m", got)
	}
	parts, found := draftPlan(ctx)
	if a.restore(LoadSettings(ctx), parts, found) {
		t.Error("OnMount's load finds something the first render did not show")
	}
	before := sortedAttrs(rendered(t, a))
	a.OnMount(p.ctx)
	e.ConsumeAll()
	if after := sortedAttrs(rendered(t, a)); after != before {
		t.Errorf("OnMount changed the screen:\nbefore %s\nafter %s", before, after)
	}

	// Without the preload (as before), OnMount's load changes what the
	// first render showed; with it, the screen equals one loaded by OnMount.
	old := newAltitude()
	if !old.restore(LoadSettings(ctx), parts, found) {
		t.Error("a screen drawn with the defaults is not changed by OnMount's load")
	}
	if got, want := sortedAttrs(rendered(t, a)), sortedAttrs(rendered(t, old)); got != want {
		t.Errorf("preloaded screen:\n%s\nwant, as OnMount loads it:\n%s", got, want)
	}
}

// With nothing saved the first render is the defaults, and OnMount's load
// draws nothing again; something saved after the first render is still
// taken by OnMount's load.
func TestAltitudeMountTakesLaterChange(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	vault := testSession(logbook.NewMemStore())
	a := newAltitude()
	a.preloadFrom(ctx.LocalStorage(), vault)
	if got := htmlText(rendered(t, a), FieldAltCruise+"-unit"); got != UnitFeet {
		t.Fatalf("nothing saved: cruise unit %q, want the default ft", got)
	}
	parts, found := draftPlanFrom(ctx.LocalStorage(), LoadSettings(ctx), vault)
	if a.restore(LoadSettings(ctx), parts, found) {
		t.Error("nothing saved: OnMount's load finds something the first render did not show")
	}
	saveAltitudeState(t, ctx, e, vault)
	parts, found = draftPlanFrom(ctx.LocalStorage(), LoadSettings(ctx), vault)
	if !a.restore(LoadSettings(ctx), parts, found) {
		t.Fatal("OnMount's load did not take the settings saved after the first render")
	}
	if got := inputValue(rendered(t, a), FieldAltCruise); got != "7315" {
		t.Errorf("after OnMount's load: cruise %q, want 7315 (m)", got)
	}
}
