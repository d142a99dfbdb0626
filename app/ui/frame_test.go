package ui

import (
	"strings"
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// ctxProbe mounts a component and keeps the context go-app gives it, so a
// test can call the component's handlers as an event would. Natively the
// engine calls OnPreRender (OnMount runs in the browser only).
type ctxProbe struct {
	app.Compo
	child app.UI
	ctx   app.Context
	ready bool
}

func (p *ctxProbe) OnPreRender(ctx app.Context) { p.ctx, p.ready = ctx, true }
func (p *ctxProbe) Render() app.UI              { return app.Div().Body(p.child) }

func mount(t *testing.T, c app.UI) (*ctxProbe, app.TestEngine) {
	t.Helper()
	e := app.NewTestEngine()
	p := &ctxProbe{child: c}
	if err := e.Load(p); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if !p.ready {
		t.Fatal("probe not mounted")
	}
	return p, e
}

// The frame shows the six tabs in order, marks the current one, holds the
// screen in <main>, and shows no update offer while none is waiting.
func TestFrameTabsAndCurrent(t *testing.T) {
	for _, s := range screens {
		f := newFrame(s.Path)
		_, e := mount(t, f)
		e.ConsumeAll()
		html := app.HTMLString(f)
		last := -1
		for _, other := range screens {
			i := strings.Index(html, `href="`+other.Path+`"`)
			if i < 0 {
				t.Errorf("%s: no tab for %s", s.Path, other.Path)
			}
			if i < last {
				t.Errorf("%s: tab %s out of order", s.Path, other.Path)
			}
			last = i
		}
		if strings.Count(html, `aria-current="page"`) != 1 {
			t.Errorf("%s: want exactly one current tab", s.Path)
		}
		current := `id="tab-` + tabID(s) + `"`
		i := strings.Index(html, current)
		if i < 0 || !strings.Contains(html[max(0, i-120):min(len(html), i+120)], `aria-current="page"`) {
			t.Errorf("%s: the current tab is not %s", s.Path, s.Name)
		}
		if !strings.Contains(html, `<main`) || !strings.Contains(html, ">"+s.Name+"</h1>") {
			t.Errorf("%s: main does not hold the %s screen", s.Path, s.Name)
		}
		if strings.Contains(html, "update-banner") {
			t.Errorf("%s: update offered with none waiting", s.Path)
		}
	}
}

// Screens that show clinical numbers carry the caution.
func TestScreensCarryCaution(t *testing.T) {
	for _, s := range screens {
		if s.Path == "/settings" {
			continue
		}
		c := s.New()
		mount(t, c)
		if html := app.HTMLString(c); !strings.Contains(html, "alv-caution") || !strings.Contains(html, "local protocol and medical direction") {
			t.Errorf("%s: no caution", s.Path)
		}
	}
}

// The update offer, when shown, has both choices as buttons.
func TestUpdateBanner(t *testing.T) {
	html := app.HTMLString(updateBanner(func(app.Context, app.Event) {}))
	for _, want := range []string{`id="update-accept"`, `id="update-later"`, "Update now", "Later", "not used until you choose"} {
		if !strings.Contains(html, want) {
			t.Errorf("banner lacks %q", want)
		}
	}
}

// Typing a bad value shows its message beside the field and saves nothing;
// a good value clears the message and is saved; a unit switch converts the
// display of the stored residual.
func TestSettingsScreenEdits(t *testing.T) {
	s := newSettingsScreen()
	p, e := mount(t, s)
	ctx := p.ctx

	s.edit(ctx, FieldSafeResidual, "5000")
	e.ConsumeAll()
	if msg := s.messages[FieldSafeResidual]; !strings.Contains(msg, "between 0 and 1000 psi") {
		t.Errorf("message = %q", msg)
	}
	html := app.HTMLString(s.Render())
	if !strings.Contains(html, `id="set-residual-msg"`) || !strings.Contains(html, `aria-describedby="set-residual-unit set-residual-msg"`) {
		t.Errorf("the message is not rendered beside the field")
	}
	if got := LoadSettings(ctx).SafeResidual; got != "200" {
		t.Errorf("an invalid value was saved: %q", got)
	}

	s.edit(ctx, FieldSafeResidual, "250")
	e.ConsumeAll()
	if _, still := s.messages[FieldSafeResidual]; still {
		t.Error("message kept after a valid value")
	}
	if got := LoadSettings(ctx); got.SafeResidual != "250" || got.SafeResidualUnit != UnitPsi {
		t.Errorf("saved residual = %s %s, want 250 psi", got.SafeResidual, got.SafeResidualUnit)
	}

	s.pick(ctx, "pressure", UnitBar)
	e.ConsumeAll()
	// 250 psi = 17.236893 bar (GNU units), rounded up to 0.1 bar.
	if got := s.text[FieldSafeResidual]; got != "17.3" {
		t.Errorf("residual shown in bar = %q, want 17.3", got)
	}
	if got := LoadSettings(ctx); got.PressureUnit != UnitBar || got.SafeResidual != "250" {
		t.Errorf("after switching: %+v", got)
	}

	s.newCyl = CustomCylinder{Name: "Clinic", WaterCapacity: "10", FullPressure: "200", PressureUnit: UnitBar}
	s.addCylinder(ctx, app.Event{})
	s.newCyl = CustomCylinder{Name: "clinic", WaterCapacity: "5", FullPressure: "200", PressureUnit: UnitBar}
	s.addCylinder(ctx, app.Event{})
	if !strings.Contains(s.cylMsgs[FieldCylName], "already in the catalogue") {
		t.Errorf("duplicate name accepted: %v", s.cylMsgs)
	}
	if got := LoadSettings(ctx).Cylinders; len(got) != 1 || got[0].Name != "Clinic" {
		t.Errorf("catalogue = %+v", got)
	}
	s.removeCylinder(ctx, 0)
	if got := LoadSettings(ctx).Cylinders; len(got) != 0 {
		t.Errorf("catalogue after remove = %+v", got)
	}
}
