package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// altitude is the Altitude screen. PLACEHOLDER: the screen itself is built in a
// later step; this file is replaced whole, keeping newAltitude as the
// constructor the frame calls (see routes.go).
type altitude struct{ app.Compo }

func newAltitude() *altitude { return &altitude{} }

func (s *altitude) Render() app.UI {
	return app.Section().Class("alv-screen").Aria("labelledby", "altitude-title").Body(
		app.H1().ID("altitude-title").Text("Altitude"),
		newCaution(""),
		app.Div().Class("alv-card alv-placeholder").Body(
			app.H2().Class("alv-card-title").Text("Not built yet"),
			app.P().Text("Cabin altitude, alveolar oxygen and expected SpO2 against altitude, and trapped-gas expansion."),
		),
	)
}
