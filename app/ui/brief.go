package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// brief is the Brief screen. PLACEHOLDER: the screen itself is built in a
// later step; this file is replaced whole, keeping newBrief as the
// constructor the frame calls (see routes.go).
type brief struct{ app.Compo }

func newBrief() *brief { return &brief{} }

func (s *brief) Render() app.UI {
	return app.Section().Class("alv-screen").Aria("labelledby", "brief-title").Body(
		app.H1().ID("brief-title").Text("Brief"),
		newCaution(""),
		app.Div().Class("alv-card alv-placeholder").Body(
			app.H2().Class("alv-card-title").Text("Not built yet"),
			app.P().Text("The pre-flight oxygen chain: route and aircraft, legs, patient, oxygen set-ups and cylinders, ending in the go / no-go summary."),
		),
	)
}
