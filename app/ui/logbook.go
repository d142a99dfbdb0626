package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// logbookScreen is the Logbook screen. PLACEHOLDER: the screen itself is built in a
// later step; this file is replaced whole, keeping newLogbook as the
// constructor the frame calls (see routes.go).
type logbookScreen struct{ app.Compo }

func newLogbook() *logbookScreen { return &logbookScreen{} }

func (s *logbookScreen) Render() app.UI {
	return app.Section().Class("alv-screen").Aria("labelledby", "logbook-title").Body(
		app.H1().ID("logbook-title").Text("Logbook"),
		newCaution(""),
		app.Div().Class("alv-card alv-placeholder").Body(
			app.H2().Class("alv-card-title").Text("Not built yet"),
			app.P().Text("The encrypted transport log: unlock, list and open transports."),
		),
	)
}
