package ui

import (
	"reflect"
	"regexp"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// inputValue returns the value attribute of the element with id in html
// ("" if none).
func inputValue(html, id string) string {
	i := strings.Index(html, `id="`+id+`"`)
	if i < 0 {
		return ""
	}
	start := strings.LastIndex(html[:i], "<")
	end := i + strings.Index(html[i:], ">")
	tag := html[start:end]
	j := strings.Index(tag, ` value="`)
	if j < 0 {
		return ""
	}
	v := tag[j+len(` value="`):]
	return v[:strings.Index(v, `"`)]
}

// sortedAttrs writes html with the attributes of each tag in order (go-app
// writes them in map order), so that two renderings can be compared.
func sortedAttrs(html string) string {
	return tagAttrs.ReplaceAllStringFunc(html, func(tag string) string {
		m := tagAttrs.FindStringSubmatch(tag)
		attrs := oneAttr.FindAllString(m[2], -1)
		sort.Strings(attrs)
		return "<" + m[1] + " " + strings.Join(attrs, " ") + ">"
	})
}

var (
	tagAttrs = regexp.MustCompile(`<([a-z0-9]+) ([^<>]*)>`)
	oneAttr  = regexp.MustCompile(`[A-Za-z0-9:_-]+(="[^"]*")?`)
)

// stoppedSupply is a Supply screen as newSupply makes it, with a stopped
// clock at 09:00 local, no ticker and no Logbook.
func stoppedSupply() *supply {
	now := time.Date(2030, 5, 6, 9, 0, 0, 0, time.Local)
	s := &supply{tick: 0}
	s.now = func() time.Time { return now }
	s.load(DefaultSettings(), defaultSupplySession())
	return s
}

// saveSupplyState keeps, through go-app as the screens do, settings in bar,
// a session with one reading of 2000 psi at 4 L/min (saved to a logbook
// record), and a Brief draft with two E cylinders (demo values of our own).
func saveSupplyState(t *testing.T, ctx app.Context, e app.TestEngine) {
	t.Helper()
	st := DefaultSettings()
	st.PressureUnit = UnitBar
	if err := SaveSettings(ctx, st); err != nil {
		t.Fatal(err)
	}
	session := defaultSupplySession()
	session.Readings = []SupplyReading{{AtUnixMilli: time.Date(2030, 5, 6, 8, 55, 0, 0, time.Local).UnixMilli(),
		Gauge: "2000", GaugeUnit: UnitPsi, Flow: "4", Log: &SupplyLogMark{Transport: "t1", Seq: 3}}}
	saveSupplySession(ctx, session)
	if err := (localDraftStore{}).Save(ctx, briefDraftFor()); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
}

// Supply reads its session before its first render without a Context
// (supplySessionFrom), from go-app's persisted form of the state: the two
// readings agree, with nothing saved and with a saved session. A session
// go-app keeps encrypted or with an expiry is not read this way.
func TestSupplySessionReadBeforeFirstRender(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	if got, ok := supplySessionFrom(ctx.LocalStorage()); !ok || !reflect.DeepEqual(got, loadSupplySession(ctx)) {
		t.Errorf("nothing saved: read %+v (ok %v), loadSupplySession %+v", got, ok, loadSupplySession(ctx))
	}
	saveSupplyState(t, ctx, e)
	got, ok := supplySessionFrom(ctx.LocalStorage())
	if want := loadSupplySession(ctx); !ok || !reflect.DeepEqual(got, want) {
		t.Errorf("saved: read %+v (ok %v), loadSupplySession %+v", got, ok, want)
	}
	if r, found := got.lastReading(); !found || r.Gauge != "2000" || r.Log == nil || r.Log.Seq != 3 {
		t.Errorf("read %+v, want the saved reading of 2000 psi, logged as record 3", got)
	}
	ls := ctx.LocalStorage()
	for _, stored := range []persistedState{
		{EncryptedValue: []byte{1, 2, 3}},
		{Value: []byte(`{"schema":1}`), ExpiresAt: time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC)},
	} {
		if err := ls.Set(SupplyKey, stored); err != nil {
			t.Fatal(err)
		}
		if _, ok := supplySessionFrom(ls); ok {
			t.Errorf("%+v: read without a Context, want left to go-app", stored)
		}
	}
}

// Supply's first render, read before it (preload), already shows the
// saved display unit, reading and the Brief draft's cylinders; OnMount's
// load then finds nothing different and the screen stays as drawn. The
// gauge of 2000 psi shows as 137.8 bar: 2000 psi = 137.895 bar (NIST SP 811,
// 1 psi = 6894.757 Pa; GNU units gives 137.89515), rounded down to 0.1 bar.
func TestSupplyFirstRenderShowsSaved(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	saveSupplyState(t, ctx, e)

	s := stoppedSupply()
	s.preloadFrom(ctx.LocalStorage(), nil)
	first := rendered(t, s)
	for id, want := range map[string]string{"supply-gauge-unit": UnitBar, "supply-flow-unit": "L/min"} {
		if got := htmlText(first, id); got != want {
			t.Errorf("first render: %s = %q, want %q", id, got, want)
		}
	}
	for id, want := range map[string]string{FieldSupplyGauge: "137.8", FieldSupplyFlow: "4"} {
		if got := inputValue(first, id); got != want {
			t.Errorf("first render: %s holds %q, want %q", id, got, want)
		}
	}
	if !s.fromPlan || len(s.session.Cylinders) != 2 {
		t.Errorf("first render: cylinders %+v (from the Brief %v), want the draft's two E", s.session.Cylinders, s.fromPlan)
	}

	// OnMount, on the component mounted with that first render.
	useDraftVault(t, nil)
	p.ctx.Dispatch(func(app.Context) { p.child = s })
	e.ConsumeAll()
	if got := htmlText(app.HTMLString(p), "supply-gauge-unit"); got != UnitBar {
		t.Fatalf("the mounted Supply shows the gauge in %q, want bar", got)
	}
	parts, found := draftPlan(ctx)
	if s.restore(LoadSettings(ctx), loadSupplySession(ctx), parts, found) {
		t.Error("OnMount's load finds something the first render did not show")
	}
	before := sortedAttrs(rendered(t, s))
	s.OnMount(p.ctx)
	e.ConsumeAll()
	if after := sortedAttrs(rendered(t, s)); after != before {
		t.Errorf("OnMount changed the screen:\nbefore %s\nafter %s", before, after)
	}

	// Without the preload (as before), OnMount's load changes what the
	// first render showed; with it, the screen equals one loaded by OnMount.
	old := stoppedSupply()
	if !old.restore(LoadSettings(ctx), loadSupplySession(ctx), parts, found) {
		t.Error("a screen drawn with the defaults is not changed by OnMount's load")
	}
	if got, want := sortedAttrs(rendered(t, s)), sortedAttrs(rendered(t, old)); got != want {
		t.Errorf("preloaded screen:\n%s\nwant, as OnMount loads it:\n%s", got, want)
	}
}

// Something saved after the first render (another tab, or the settings
// changed meanwhile) is still taken by OnMount's load.
func TestSupplyMountTakesLaterChange(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	s := stoppedSupply()
	s.preloadFrom(ctx.LocalStorage(), nil)
	if got := htmlText(rendered(t, s), "supply-gauge-unit"); got != UnitPsi {
		t.Fatalf("nothing saved: gauge unit %q, want the default psi", got)
	}
	saveSupplyState(t, ctx, e)
	parts, found := draftPlanFrom(ctx.LocalStorage(), LoadSettings(ctx), nil)
	if !s.restore(LoadSettings(ctx), loadSupplySession(ctx), parts, found) {
		t.Fatal("OnMount's load did not take the settings saved after the first render")
	}
	if got := htmlText(rendered(t, s), "supply-gauge-unit"); got != UnitBar {
		t.Errorf("after OnMount's load: gauge unit %q, want bar", got)
	}
}
