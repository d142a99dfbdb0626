package ui

import (
	"context"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// review is the Review screen: the audit of the transports kept in the
// unlocked Logbook vault, per transport (planned against used oxygen,
// reserve at arrival, patient course on a timeline, deviations) and across
// transports (filters, table, totals, distributions, CSV export), with a
// print view.
//
// Every figure comes from app/logbook (AuditVault, BuildReport, WriteCSV):
// the same functions `alvea audit` prints, so the screen and the CLI show
// the same numbers for the same vault. The screen only lays them out and
// converts gauge pressures and altitudes to the display units of Settings.
//
// The audit is decrypted content: it is held only while the vault is
// unlocked and dropped when it locks (button or idle time). Unlocking is
// done on the Logbook screen, which this screen points to.
//
// Rendering is split by topic: review_transport.go (one transport),
// review_across.go (the table, totals, distributions, CSV),
// review_plot.go (plot data), review_text.go (sentences and formatting).
type review struct {
	app.Compo

	session *vaultSession
	unsub   func()
	units   Settings

	phase    vaultPhase
	phaseErr error
	busy     bool
	problem  string
	// auditedRev is the session revision the audit was read at; a change
	// of content (a new entry) reads it again.
	auditedRev int

	all       *logbook.AuditReport // every transport, as AuditVault gave it
	shown     *logbook.AuditReport // the filtered report (nil while the filter is invalid)
	form      rvFilterForm
	filterMsg string
	include   map[string]bool // identifying CSV columns the auditor ticked in
	csvStatus string
	selected  logbook.TransportID // "" shows the across-transport view
}

func newReview() *review { return newReviewWith(theVault) }

// newReviewWith returns the screen on a given session (tests use one on a
// memory store).
func newReviewWith(s *vaultSession) *review {
	return &review{session: s, units: DefaultSettings(), include: map[string]bool{}}
}

func (r *review) OnMount(ctx app.Context) {
	r.units = LoadSettings(ctx)
	ctx.ObserveState(SettingsKey, &r.units)
	r.unsub = r.session.Subscribe(func() {
		ctx.Dispatch(func(ctx app.Context) { r.sync(ctx) })
	})
	r.phase, r.phaseErr = r.session.Phase()
	if r.phase == phaseUnlocked {
		r.load(ctx)
		return
	}
	ctx.Async(func() {
		r.session.Load(context.Background())
		ctx.Dispatch(func(ctx app.Context) { r.sync(ctx) })
	})
}

func (r *review) OnDismount() {
	if r.unsub != nil {
		r.unsub()
		r.unsub = nil
	}
}

// sync follows the session: a lock drops the audit; new content (or a
// fresh unlock) reads it again.
func (r *review) sync(ctx app.Context) {
	r.phase, r.phaseErr = r.session.Phase()
	if r.phase != phaseUnlocked {
		r.forget()
		return
	}
	if r.all == nil || r.session.Rev() != r.auditedRev {
		r.load(ctx)
	}
}

// forget drops everything decrypted the screen holds.
func (r *review) forget() {
	r.all, r.shown, r.selected, r.csvStatus, r.problem = nil, nil, "", "", ""
}

// load audits the whole vault in a goroutine (the vault reads and
// decrypts every record) and shows it when done.
func (r *review) load(ctx app.Context) {
	if r.busy {
		return
	}
	r.busy, r.problem = true, ""
	rev := r.session.Rev()
	ctx.Async(func() {
		rep, err := r.audit(context.Background())
		ctx.Dispatch(func(ctx app.Context) {
			r.busy = false
			r.adopt(rep, rev, err)
			// An entry appended while the audit was read: read it again.
			if err == nil && r.session.Rev() != rev {
				r.sync(ctx)
			}
		})
	})
}

// audit reads the audit of every transport from the unlocked vault, with
// the default audit options (those of `alvea audit` without options).
func (r *review) audit(c context.Context) (*logbook.AuditReport, error) {
	v, err := r.session.Vault()
	if err != nil {
		return nil, err
	}
	return logbook.AuditVault(c, v, logbook.AuditOptions{}, logbook.AuditFilter{})
}

// adopt installs a fresh audit (or the reason there is none).
func (r *review) adopt(rep *logbook.AuditReport, rev int, err error) {
	if err != nil {
		r.all, r.shown = nil, nil
		r.problem = rvMessage(err)
		return
	}
	r.all, r.auditedRev = rep, rev
	if r.selected != "" && r.transport(r.selected) == nil {
		r.selected = ""
	}
	r.applyFilter()
}

// transport returns the audit of id, or nil.
func (r *review) transport(id logbook.TransportID) *logbook.TransportAudit {
	if r.all == nil {
		return nil
	}
	for i := range r.all.Transports {
		if r.all.Transports[i].ID == id {
			return &r.all.Transports[i]
		}
	}
	return nil
}

// touch postpones the auto-lock on any input on the screen.
func (r *review) touch(ctx app.Context, e app.Event) {
	ctx.PreventUpdate()
	r.session.Touch()
}

// print opens the browser's print dialog; the print style sheet
// (web/review.css) leaves out the navigation and the controls.
func (r *review) print(ctx app.Context, e app.Event) {
	r.session.Touch()
	app.Window().Call("print")
}

func (r *review) open(ctx app.Context, id logbook.TransportID) {
	r.selectTransport(id)
	ctx.Defer(func(app.Context) { app.Window().Call("scrollTo", 0, 0) })
}

// selectTransport shows the review of one transport.
func (r *review) selectTransport(id logbook.TransportID) { r.selected, r.csvStatus = id, "" }

func (r *review) back(ctx app.Context, e app.Event) {
	id := r.selected
	r.selected = ""
	// Back at the table, on the row just left.
	ctx.Defer(func(app.Context) {
		if el := app.Window().GetElementByID("rv-row-" + string(id)); el.Truthy() {
			el.Call("focus")
		}
	})
}

func (r *review) Render() app.UI {
	ready := r.phase == phaseUnlocked && r.all != nil
	return app.Section().Class("alv-screen rv-screen").Aria("labelledby", "review-title").
		OnKeyDown(r.touch).On("pointerdown", r.touch).
		Body(
			app.Div().Class("rv-head").Body(
				app.H1().ID("review-title").Text("Review"),
				app.If(ready, func() app.UI {
					return app.Button().ID("rv-print").Type("button").Class("alv-button rv-noprint").
						Text("Print").OnClick(r.print)
				}),
			),
			newCaution(""),
			app.P().ID("rv-status").Class("rv-status rv-noprint").Attr("role", "status").Body(
				app.If(r.busy, func() app.UI { return app.Span().Class("rv-busy").Text("Auditing the logbook…") }),
			),
			app.If(r.problem != "", func() app.UI {
				return app.P().ID("rv-problem").Class("alv-error rv-problem").Attr("role", "alert").Text(r.problem)
			}),
			r.renderPhase(),
		)
}

func (r *review) renderPhase() app.UI {
	switch r.phase {
	case phaseUnknown:
		return app.P().Class("alv-lead").Text("Opening the logbook on this device…")
	case phaseUnavailable:
		return app.Div().Class("alv-card").Body(
			app.H2().Class("alv-card-title").Text("The logbook cannot be kept on this device"),
			app.P().Text(unavailableMessage(r.phaseErr)),
		)
	case phaseEmpty:
		return r.pointToLogbook("No logbook on this device yet",
			"The Review audits the transports of the Logbook. Create the logbook, or import a bundle, on the Logbook screen.")
	case phaseLocked:
		return r.pointToLogbook("The logbook is locked",
			"The Review reads the transports from the unlocked logbook. Unlock it on the Logbook screen, then come back here. The audit is dropped from the screen whenever the logbook locks.")
	}
	if r.all == nil {
		return app.P().Class("alv-lead").Text("Auditing the logbook…")
	}
	if a := r.transport(r.selected); a != nil {
		return r.renderTransport(a)
	}
	return r.renderAcross()
}

// pointToLogbook is the card shown when there is nothing to audit yet.
func (r *review) pointToLogbook(title, text string) app.UI {
	return app.Div().ID("rv-locked").Class("alv-card rv-narrow").Body(
		app.H2().Class("alv-card-title").Text(title),
		app.P().Text(text),
		app.A().ID("rv-to-logbook").Class("alv-button alv-primary rv-link-button").Href("/logbook").Text("Go to the Logbook"),
	)
}
