package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// updateBanner offers a downloaded new version. Nothing changes until the
// crew taps "Update now": the page then tells the waiting service worker to
// take over and reloads once it has. "Later" hides the offer until the next
// reload; the running version stays in every tab meanwhile.
//
// It is rendered by the frame (not a component of its own) so that "Later"
// updates the frame that owns the offer.
func updateBanner(onLater app.EventHandler) app.UI {
	return app.Section().ID("update-banner").Class("alv-update").Aria("label", "Update available").Body(
		app.P().Body(
			app.Strong().Text("A new version of Alvea is ready. "),
			app.Text("It is not used until you choose. Update between transports, not during one."),
		),
		app.Div().Class("alv-update-actions").Body(
			app.Button().ID("update-accept").Type("button").Class("alv-button alv-primary").
				Text("Update now").
				OnClick(acceptUpdate),
			app.Button().ID("update-later").Type("button").Class("alv-button").
				Text("Later").
				OnClick(onLater),
		),
	)
}

// acceptUpdate asks the page script to activate the waiting version; the
// script reloads the page once the new version has taken over.
func acceptUpdate(ctx app.Context, e app.Event) {
	if fn := app.Window().Get("alveaApplyUpdate"); fn.Truthy() {
		app.Window().Call("alveaApplyUpdate")
	}
}
