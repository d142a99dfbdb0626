package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// supply is the Supply screen. PLACEHOLDER: the screen itself is built in a
// later step; this file is replaced whole, keeping newSupply as the
// constructor the frame calls (see routes.go).
type supply struct{ app.Compo }

func newSupply() *supply { return &supply{} }

func (s *supply) Render() app.UI {
	return app.Section().Class("alv-screen").Aria("labelledby", "supply-title").Body(
		app.H1().ID("supply-title").Text("Supply"),
		newCaution(""),
		app.Div().Class("alv-card alv-placeholder").Body(
			app.H2().Class("alv-card-title").Text("Not built yet"),
			app.P().Text("The cylinders on board and the live countdown from gauge readings, with a plot of oxygen remaining."),
		),
	)
}
