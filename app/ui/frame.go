package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// ReadyAttr is set on <html> (to "wasm") when the app has mounted in the
// browser. The server prerenders every page, so tests wait for this marker
// rather than for text the prerender already holds.
const ReadyAttr = "data-alvea"

// frame is the app shell around every screen: the header with the tabs and,
// while the logbook is unlocked, its Lock button; the update offer; the
// screen itself in <main>; and the footer with the version. It applies the
// theme and the logbook's auto-lock time from the settings, and any tap or
// key anywhere in it counts as use of the logbook (postponing the lock).
type frame struct {
	app.Compo

	// Path is the route of the screen shown.
	Path string

	session       *vaultSession
	unsub         func()
	unlocked      bool // the logbook is unlocked: offer the Lock button
	settings      Settings
	updateWaiting bool
	updateLater   bool
}

// newFrame returns the frame of a screen, with the saved settings read
// before its first render (its theme and the auto-lock time are then
// right from the start; OnMount loads them again the usual way).
func newFrame(path string) *frame {
	f := newFrameOn(path, theVault)
	if st, ok := preloadSettings(); ok {
		f.settings = st
	}
	return f
}

// newFrameOn returns the frame on a given vault session (tests).
func newFrameOn(path string, session *vaultSession) *frame {
	return &frame{Path: path, session: session, settings: DefaultSettings()}
}

func (f *frame) OnMount(ctx app.Context) {
	Mark("alvea:mount")
	f.settings = LoadSettings(ctx)
	ctx.ObserveState(SettingsKey, &f.settings).OnChange(func() {
		applyTheme(f.settings.Theme)
		f.applyAutoLock()
	})
	applyTheme(f.settings.Theme)
	f.follow(ctx)
	f.updateWaiting = updateWaiting()
	// Deferred: set after the frame that renders what the screens loaded in
	// their own OnMount (children mount first), so a test that sees the
	// marker sees the loaded values.
	ctx.Defer(func(app.Context) {
		app.Window().Get("document").Get("documentElement").Call("setAttribute", ReadyAttr, "wasm")
	})
	// Ask the browser to look for a new version now; one found is offered,
	// never applied by itself.
	app.TryUpdate()
}

// OnDismount stops following the vault session.
func (f *frame) OnDismount() {
	if f.unsub != nil {
		f.unsub()
		f.unsub = nil
	}
}

// follow applies the auto-lock time and tracks whether the logbook is
// unlocked, for the Lock button.
func (f *frame) follow(ctx app.Context) {
	f.applyAutoLock()
	f.unsub = f.session.Subscribe(func() {
		ctx.Dispatch(func(ctx app.Context) { f.syncVault() })
	})
	f.syncVault()
}

func (f *frame) applyAutoLock() { f.session.SetIdle(f.settings.AutoLock()) }

func (f *frame) syncVault() {
	phase, _ := f.session.Phase()
	f.unlocked = phase == phaseUnlocked
}

// touch postpones the auto-lock: any tap or key in the app is use. The
// session may wait for the vault (busy with storage), so it runs aside.
func (f *frame) touch(ctx app.Context, e app.Event) {
	ctx.PreventUpdate()
	session := f.session
	ctx.Async(session.Touch)
}

// lock drops the logbook's key now (the vault zeroes it).
func (f *frame) lock(ctx app.Context, e app.Event) {
	f.session.Lock()
	f.syncVault()
}

// OnAppUpdate runs when a new version has been downloaded. It only offers it.
func (f *frame) OnAppUpdate(ctx app.Context) {
	f.updateWaiting = updateWaiting()
}

func (f *frame) Render() app.UI {
	current := screenFor(f.Path)
	tabs := make([]app.UI, 0, len(screens))
	for _, s := range screens {
		a := app.A().Href(s.Path).Class("alv-tab").ID("tab-" + tabID(s)).Text(s.Name)
		if s.Path == current.Path {
			a = a.Aria("current", "page")
		}
		tabs = append(tabs, app.Li().Body(a))
	}
	return app.Div().Class("alv-app").DataSet("theme", f.settings.Theme).
		On("pointerdown", f.touch).OnKeyDown(f.touch).Body(
		app.A().Class("alv-skip").Href("#main").Text("Skip to content"),
		app.Header().Class("alv-header").Body(
			app.Div().Class("alv-brand").Body(
				app.Img().Src("/web/icon.svg").Attr("role", "presentation").Alt("").Class("alv-brand-icon").Width(32).Height(32),
				app.Span().Text("Alvea"),
			),
			app.Nav().Aria("label", "Screens").Body(
				app.Ul().Class("alv-tabs").Body(tabs...),
			),
			// Short visible text so the six tabs still fit a portrait
			// tablet; the accessible name starts with it (WCAG 2.5.3).
			app.If(f.unlocked, func() app.UI {
				return app.Button().ID("frame-lock").Type("button").Class("alv-button alv-frame-lock").
					Aria("label", "Lock logbook").Title("Lock the logbook now: its key is dropped, the Brief stays on screen").
					Text("Lock").OnClick(f.lock)
			}),
		),
		app.If(f.updateWaiting && !f.updateLater, func() app.UI {
			return updateBanner(f.later)
		}),
		app.Main().ID("main").Class("alv-main").Body(current.New()),
		app.Footer().Class("alv-footer").Body(
			app.Span().Text("Alvea — planning aid"),
			app.Span().Body(
				app.Text("Version "),
				app.Span().ID("alvea-version").Text(app.Getenv("GOAPP_VERSION")),
			),
		),
	)
}

func (f *frame) later(ctx app.Context, e app.Event) { f.updateLater = true }

func tabID(s screen) string {
	if s.Path == "/" {
		return "brief"
	}
	return s.Path[1:]
}

// applyTheme sets the theme on <html> too, so the page behind the frame
// (overscroll, margins) is dim at night as well.
func applyTheme(theme string) {
	app.Window().Get("document").Get("documentElement").Call("setAttribute", "data-theme", theme)
}

// updateWaiting asks the page script (web/alvea.js) whether a new version is
// installed and waiting.
func updateWaiting() bool {
	fn := app.Window().Get("alveaUpdateWaiting")
	if !fn.Truthy() {
		return false
	}
	return app.Window().Call("alveaUpdateWaiting").Bool()
}
