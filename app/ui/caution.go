package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// CautionText is the short caution every screen that shows a clinical
// number carries.
const CautionText = "Planning aid only. Verify against the gauges and the device's own figures; local protocol and medical direction decide."

// caution shows the clinical caution. Text replaces the standard sentence
// when a screen needs a more specific one.
type caution struct {
	app.Compo
	Text string
}

func newCaution(text string) *caution { return &caution{Text: text} }

func (c *caution) Render() app.UI {
	text := c.Text
	if text == "" {
		text = CautionText
	}
	return app.Aside().Class("alv-caution").Aria("label", "Caution").Body(
		app.Span().Class("alv-caution-mark").Aria("hidden", "true").Text("!"),
		app.P().Text(text),
	)
}
