package ui

import (
	"context"
	"errors"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// accessForm holds what the create, unlock and import forms typed.
type accessForm struct {
	pass, again   string // create
	unlock        string
	importPass    string
	importName    string // the chosen file's name, shown back
	createMessage string // beside the passphrase fields
	againMessage  string
}

func (a *accessForm) clearSecrets() {
	name := a.importName
	*a = accessForm{importName: name}
}

// lbPasswordField renders a labelled passphrase input (never autocompleted
// into a browser's password store, never spell-checked).
func lbPasswordField(id, label, value, hint, message, autocomplete string, onInput func(ctx app.Context, text string)) app.UI {
	described := ""
	if hint != "" {
		described = id + "-hint"
	}
	if message != "" {
		described += " " + id + "-msg"
	}
	input := app.Input().ID(id).Class("alv-input lb-pass").Type("password").
		Attr("autocomplete", autocomplete).Attr("spellcheck", "false").
		Value(value).Aria("invalid", ariaBool(message != "")).
		OnInput(func(ctx app.Context, e app.Event) { onInput(ctx, ctx.JSSrc().Get("value").String()) })
	if described != "" {
		input = input.Aria("describedby", described)
	}
	return app.Div().Class("alv-field").Body(
		app.Label().For(id).Text(label),
		app.Div().Class("alv-input-row").Body(input),
		app.If(hint != "", func() app.UI { return app.P().ID(id + "-hint").Class("alv-note").Text(hint) }),
		app.If(message != "", func() app.UI {
			return app.P().ID(id+"-msg").Class("alv-error").Attr("role", "alert").Text(message)
		}),
	)
}

const lbPassphraseHint = "At least 10 characters. A few unrelated words work well. Common passwords, keyboard runs and repeated characters are refused. There is no way to recover a forgotten passphrase."

func (l *logbookScreen) renderEmpty() app.UI {
	a := &l.access
	return app.Div().Class("alv-grid").Body(
		app.Form().ID("lb-create").Class("alv-card").OnSubmit(l.create).Body(
			app.H2().Class("alv-card-title").Text("Create the logbook"),
			app.P().Class("alv-note").Text("Transports are kept on this device, encrypted with a key that only this passphrase unlocks."),
			lbPasswordField("lb-new-pass", "Passphrase", a.pass, lbPassphraseHint, a.createMessage, "new-password",
				func(ctx app.Context, t string) { a.pass, a.createMessage = t, "" }),
			lbPasswordField("lb-new-again", "Passphrase again", a.again, "", a.againMessage, "new-password",
				func(ctx app.Context, t string) { a.again, a.againMessage = t, "" }),
			app.Button().ID("lb-create-go").Type("submit").Class("alv-button alv-primary").Text("Create").Disabled(l.busy != ""),
		),
		app.Form().ID("lb-import").Class("alv-card").OnSubmit(l.importBundle).Body(
			app.H2().Class("alv-card-title").Text("Or import a bundle"),
			app.P().Class("alv-note").Text("A bundle exported from another device, with its passphrase. It is checked completely before anything is written."),
			app.Div().Class("alv-field").Body(
				app.Label().For("lb-import-file").Text("Bundle file"),
				app.Input().ID("lb-import-file").Class("lb-file").Type("file").Accept(logbook.BundleExt+",application/octet-stream").
					OnChange(func(ctx app.Context, e app.Event) { a.importName = lbFileName("lb-import-file") }),
			),
			lbPasswordField("lb-import-pass", "Passphrase of the bundle", a.importPass, "", "", "off",
				func(ctx app.Context, t string) { a.importPass = t }),
			app.Button().ID("lb-import-go").Type("submit").Class("alv-button").Text("Import").Disabled(l.busy != ""),
		),
	)
}

func (l *logbookScreen) renderLocked() app.UI {
	a := &l.access
	return app.Form().ID("lb-unlock").Class("alv-card lb-narrow").OnSubmit(l.unlock).Body(
		app.H2().Class("alv-card-title").Text("Unlock the logbook"),
		lbPasswordField("lb-pass", "Passphrase", a.unlock, "", "", "current-password",
			func(ctx app.Context, t string) { a.unlock = t }),
		app.Button().ID("lb-unlock-go").Type("submit").Class("alv-button alv-primary").Text("Unlock").Disabled(l.busy != ""),
		app.P().Class("alv-note").Text("The logbook locks itself after some minutes without use, and when you tap Lock."),
	)
}

func (l *logbookScreen) create(ctx app.Context, e app.Event) {
	e.PreventDefault()
	a := &l.access
	if err := logbook.CheckPassphrase(a.pass); err != nil {
		a.createMessage = vaultMessage(err)
		return
	}
	if a.again != a.pass {
		a.againMessage = "The two passphrases differ. Type the same passphrase twice."
		return
	}
	pass := a.pass
	l.runPainted(ctx, "Creating the logbook (deriving the key)…", func(c context.Context) error {
		return l.session.Create(c, pass)
	}, func(ctx app.Context, err error) {
		if err != nil {
			l.problem = vaultActionMessage(err)
			return
		}
		l.access.clearSecrets()
		l.status = "Logbook created and unlocked."
		l.sync(ctx)
	})
}

func (l *logbookScreen) unlock(ctx app.Context, e app.Event) {
	e.PreventDefault()
	pass := l.access.unlock
	l.runPainted(ctx, "Unlocking (deriving the key)…", func(c context.Context) error {
		return l.session.Unlock(c, pass)
	}, func(ctx app.Context, err error) {
		l.access.unlock = ""
		lbClearInputs("lb-pass")
		if err != nil {
			l.problem = vaultActionMessage(err)
			return
		}
		l.status = "Unlocked."
		l.sync(ctx)
	})
}

func (l *logbookScreen) importBundle(ctx app.Context, e app.Event) {
	e.PreventDefault()
	pass := l.access.importPass
	l.runPainted(ctx, "Checking the bundle…", func(c context.Context) error {
		data, err := lbReadFile(c, "lb-import-file")
		if err != nil {
			return err
		}
		return l.session.Import(c, data, pass)
	}, func(ctx app.Context, err error) {
		l.access.importPass = ""
		lbClearInputs("lb-import-pass")
		switch {
		case errors.Is(err, lbErrNoFile):
			l.problem = "Choose a bundle file first."
		case err != nil:
			l.problem = vaultActionMessage(err)
		default:
			l.access.clearSecrets()
			l.status = "Bundle checked and imported; the logbook is unlocked."
			l.sync(ctx)
		}
	})
}
