// Package ui holds Alvea's go-app components: the app frame (tabs, update
// offer, theme), the clinical caution, shared field and card helpers, the
// Settings screen, and one file per screen (brief.go, supply.go,
// altitude.go, logbook.go, review.go, settingsscreen.go). Components hold
// no formulas and no crypto: they call physio and app/logbook.
//
// # Adding a screen
//
// Each screen is a component in its own file with a constructor named in
// routes.go (newBrief, newSupply, ...). The frame renders the header, the
// update offer and the footer, and puts the screen's component in <main>.
// A screen renders a <section class="alv-screen"> whose first child is its
// <h1>, then newCaution("") if it shows any clinical number.
//
// # Settings
//
// Read them with LoadSettings(ctx) in OnMount and follow changes with
// ctx.ObserveState(SettingsKey, &field). Display units are
// Settings.PressureUnit (psi|bar), AltitudeUnit (ft|m), GasUnit (mmHg|kPa).
package ui
