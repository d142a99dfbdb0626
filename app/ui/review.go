package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// review is the Review screen. PLACEHOLDER: the screen itself is built in a
// later step; this file is replaced whole, keeping newReview as the
// constructor the frame calls (see routes.go).
type review struct{ app.Compo }

func newReview() *review { return &review{} }

func (s *review) Render() app.UI {
	return app.Section().Class("alv-screen").Aria("labelledby", "review-title").Body(
		app.H1().ID("review-title").Text("Review"),
		newCaution(""),
		app.Div().Class("alv-card alv-placeholder").Body(
			app.H2().Class("alv-card-title").Text("Not built yet"),
			app.P().Text("The audit of each transport: what was planned against what was used."),
		),
	)
}
