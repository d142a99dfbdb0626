package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// screen is one entry of the app's navigation: its route, the name on its
// tab, and the constructor of its component.
type screen struct {
	Path string
	Name string
	New  func() app.UI
}

// screens in tab order. Each screen's component lives in its own file
// (brief.go, supply.go, ...) behind a newXxx constructor.
var screens = []screen{
	{Path: "/", Name: "Brief", New: func() app.UI { return newBrief() }},
	{Path: "/supply", Name: "Supply", New: func() app.UI { return newSupply() }},
	{Path: "/altitude", Name: "Altitude", New: func() app.UI { return newAltitude() }},
	{Path: "/logbook", Name: "Logbook", New: func() app.UI { return newLogbook() }},
	{Path: "/review", Name: "Review", New: func() app.UI { return newReview() }},
	{Path: "/settings", Name: "Settings", New: func() app.UI { return newSettingsScreen() }},
}

// Paths returns every route, in tab order.
func Paths() []string {
	out := make([]string, len(screens))
	for i, s := range screens {
		out[i] = s.Path
	}
	return out
}

// Register routes every screen to the app frame. Call it once, before
// app.RunWhenOnBrowser (in the browser) and before building a handler or
// the static site (natively: the server prerenders routed pages only).
func Register() {
	for _, s := range screens {
		path := s.Path
		app.Route(path, func() app.Composer { return newFrame(path) })
	}
}

func screenFor(path string) screen {
	for _, s := range screens {
		if s.Path == path {
			return s
		}
	}
	return screens[0]
}

// Mark leaves a named mark on the page's performance timeline (in the
// browser only), so start-up can be taken apart (make bench's -probe).
func Mark(name string) {
	if app.IsClient {
		app.Window().Get("performance").Call("mark", name)
	}
}
