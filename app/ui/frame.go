package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// ReadyAttr is set on <html> (to "wasm") when the app has mounted in the
// browser. The server prerenders every page, so tests wait for this marker
// rather than for text the prerender already holds.
const ReadyAttr = "data-alvea"

// frame is the app shell around every screen: the header with the tabs, the
// update offer, the screen itself in <main>, and the footer with the version.
// It applies the theme from the settings.
type frame struct {
	app.Compo

	// Path is the route of the screen shown.
	Path string

	settings      Settings
	updateWaiting bool
	updateLater   bool
}

func newFrame(path string) *frame { return &frame{Path: path, settings: DefaultSettings()} }

func (f *frame) OnMount(ctx app.Context) {
	f.settings = LoadSettings(ctx)
	ctx.ObserveState(SettingsKey, &f.settings).OnChange(func() { applyTheme(f.settings.Theme) })
	applyTheme(f.settings.Theme)
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
	return app.Div().Class("alv-app").DataSet("theme", f.settings.Theme).Body(
		app.A().Class("alv-skip").Href("#main").Text("Skip to content"),
		app.Header().Class("alv-header").Body(
			app.Div().Class("alv-brand").Body(
				app.Img().Src("/web/icon.svg").Attr("role", "presentation").Alt("").Class("alv-brand-icon").Width(32).Height(32),
				app.Span().Text("Alvea"),
			),
			app.Nav().Aria("label", "Screens").Body(
				app.Ul().Class("alv-tabs").Body(tabs...),
			),
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
