package ui

import (
	"context"
	"fmt"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// manageForm holds the vault controls' fields.
type manageForm struct {
	current, next, again string
	nextMsg, againMsg    string
	checked              string // the last check's outcome
}

func (l *logbookScreen) renderManage() app.UI {
	m := &l.manage
	return app.Div().Class("lb-body").Body(
		l.nav(),
		app.Div().Class("alv-grid").Body(
			l.renderStorage(),
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Export and check"),
				app.P().Class("alv-note").Text("Export writes the whole logbook as one encrypted bundle file, opened with the same passphrase (for an auditor, or to move to another device)."),
				app.Div().Class("alv-update-actions").Body(
					app.Button().Type("button").ID("lb-export").Class("alv-button alv-primary").Text("Export bundle").
						Disabled(l.busy != "").OnClick(l.export),
					app.Button().Type("button").ID("lb-verify").Class("alv-button").Text("Check every record").
						Disabled(l.busy != "").OnClick(l.verify),
				),
				app.If(m.checked != "", func() app.UI { return app.P().ID("lb-verify-result").Class("alv-note").Text(m.checked) }),
			),
			app.Form().ID("lb-change").Class("alv-card").OnSubmit(l.changePassphrase).Body(
				app.H2().Class("alv-card-title").Text("Change passphrase"),
				lbPasswordField("lb-cur-pass", "Current passphrase", m.current, "", "", "current-password", func(ctx app.Context, t string) { m.current = t }),
				lbPasswordField("lb-next-pass", "New passphrase", m.next, lbPassphraseHint, m.nextMsg, "new-password", func(ctx app.Context, t string) { m.next, m.nextMsg = t, "" }),
				lbPasswordField("lb-next-again", "New passphrase again", m.again, "", m.againMsg, "new-password", func(ctx app.Context, t string) { m.again, m.againMsg = t, "" }),
				app.Button().Type("submit").ID("lb-change-go").Class("alv-button").Text("Change passphrase").Disabled(l.busy != ""),
			),
		),
	)
}

func (l *logbookScreen) renderStorage() app.UI {
	st := l.storage
	var lines []app.UI
	switch {
	case st == nil:
		lines = append(lines, app.P().Text("Storage status not read yet."))
	case !st.Known:
		lines = append(lines, app.P().Text("This browser does not report its storage."))
	default:
		persist := "Persistent storage: granted — the browser will not clear the logbook to free space."
		if !st.Persistent {
			persist = "Persistent storage: NOT granted — the browser may clear site data when the device runs short of space. Export bundles regularly; installing the app to the home screen usually allows it."
		}
		lines = append(lines,
			app.P().ID("lb-persist").Text(persist),
			app.P().ID("lb-usage").Text(fmt.Sprintf("Used: %s of %s available to this app.", lbBytesText(st.Usage), lbBytesText(st.Quota))),
		)
	}
	kdf := ""
	if v, err := l.session.Vault(); err == nil {
		kdf = "Key derivation: " + v.KDF().String() + "."
	}
	return app.Div().ID("lb-storage").Class("alv-card").Body(
		append([]app.UI{app.H2().Class("alv-card-title").Text("Storage on this device")},
			append(lines, app.P().Class("alv-note").Text(kdf))...)...,
	)
}

func (l *logbookScreen) export(ctx app.Context, e app.Event) {
	l.run(ctx, "Exporting…", func(c context.Context) error {
		data, err := l.session.Export(c)
		if err != nil {
			return err
		}
		name := "alvea-logbook-" + time.Now().Format("20060102-1504") + logbook.BundleExt
		return lbDownload(name, data)
	}, func(ctx app.Context, err error) {
		if err != nil {
			l.problem = vaultActionMessage(err)
			return
		}
		l.status = "Bundle exported (a download). It opens only with this logbook's passphrase."
	})
}

func (l *logbookScreen) verify(ctx app.Context, e app.Event) {
	var problems []logbook.Problem
	l.run(ctx, "Checking every record…", func(c context.Context) error {
		v, err := l.session.Vault()
		if err != nil {
			return err
		}
		problems, err = v.Verify(c)
		return err
	}, func(ctx app.Context, err error) {
		switch {
		case err != nil:
			l.problem = vaultActionMessage(err)
		case len(problems) == 0:
			l.manage.checked = "Every record checked: no problem found."
		default:
			found := "1 problem found"
			if len(problems) != 1 {
				found = fmt.Sprintf("%d problems found", len(problems))
			}
			l.manage.checked = fmt.Sprintf("%s. First: %s.", found, problems[0].String())
		}
	})
}

func (l *logbookScreen) changePassphrase(ctx app.Context, e app.Event) {
	e.PreventDefault()
	m := &l.manage
	if err := logbook.CheckPassphrase(m.next); err != nil {
		m.nextMsg = vaultActionMessage(err)
		return
	}
	if m.again != m.next {
		m.againMsg = "The two new passphrases differ. Type the same passphrase twice."
		return
	}
	cur, next := m.current, m.next
	l.runPainted(ctx, "Changing the passphrase (deriving keys)…", func(c context.Context) error {
		return l.session.ChangePassphrase(c, cur, next)
	}, func(ctx app.Context, err error) {
		m.current = ""
		lbClearInputs("lb-cur-pass")
		if err != nil {
			l.problem = vaultActionMessage(err)
			return
		}
		m.next, m.again = "", ""
		lbClearInputs("lb-next-pass", "lb-next-again")
		l.status = "Passphrase changed. Use the new one from now on."
	})
}
