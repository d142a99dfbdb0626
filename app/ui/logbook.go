package ui

import (
	"context"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// logbookScreen is the Logbook screen: create or unlock the encrypted vault
// (or import a bundle into an empty one), the list of transports, one
// transport's timeline with its one-tap entries, starting a transport from
// the current Brief, and the vault's own controls (lock, storage, change of
// passphrase, export, check).
//
// Rendering is split by topic: logbook_access.go (create, unlock, import),
// logbook_list.go, logbook_record.go (timeline and entries),
// logbook_start.go, logbook_manage.go; user sentences for errors are in
// logbook_text.go. Everything that touches the vault runs in ctx.Async
// through run: the store and the key derivation block.
type logbookScreen struct {
	app.Compo

	session *vaultSession
	unsub   func()
	// mctx is the component's own context from OnMount. Work that outlives
	// the element whose event started it (a form that disappears once the
	// vault unlocks) reports back through it: a Dispatch on a removed
	// element's context is dropped.
	mctx app.Context

	phase    vaultPhase
	phaseErr error
	busy     string // what is running, shown with a spinner; "" when idle
	status   string // the last outcome, announced (role=status)
	problem  string // the last refusal or failure, announced (role=alert)
	view     string // viewList, viewRecord, viewStart, viewManage
	stale    bool   // the list must be read again once the screen is idle

	access  accessForm
	list    listState
	record  recordState
	start   startForm
	manage  manageForm
	storage *logbook.StorageStatus
	units   Settings

	held *heldForms // what the crew had typed when the logbook locked
}

// heldForms is the view the crew was in when the logbook locked (the Lock
// button or the idle time), and the start form being filled in; a
// transport's unsaved entries go to the session (stashUnsaved). All of it
// stays in memory only, is not shown while locked, and comes back at the
// next unlock, so a lock in the middle of an entry loses nothing; a
// reload clears it, as it clears the Brief's patient values while locked.
// Nothing decrypted from the vault is held.
type heldForms struct {
	view  string
	id    logbook.TransportID // the transport shown
	start startForm
}

// Views once unlocked.
const (
	viewList   = "list"
	viewRecord = "record"
	viewStart  = "start"
	viewManage = "manage"
)

func newLogbook() *logbookScreen { return newLogbookWith(theVault) }

// newLogbookWith returns the screen on a given session (tests use one on a
// memory store).
func newLogbookWith(s *vaultSession) *logbookScreen {
	return &logbookScreen{session: s, view: viewList, units: DefaultSettings()}
}

func (l *logbookScreen) OnMount(ctx app.Context) {
	l.mctx = ctx
	l.units = LoadSettings(ctx)
	ctx.ObserveState(SettingsKey, &l.units)
	l.unsub = l.session.Subscribe(func() {
		ctx.Dispatch(func(ctx app.Context) { l.sync(ctx) })
	})
	l.phase, l.phaseErr = l.session.Phase()
	if l.phase == phaseUnlocked {
		l.refresh(ctx)
		return
	}
	l.run(ctx, "Opening the logbook…", func(c context.Context) error {
		return l.session.Load(c)
	}, func(ctx app.Context, err error) {
		l.sync(ctx)
	})
}

func (l *logbookScreen) OnDismount() {
	l.stashUnsaved()
	if l.unsub != nil {
		l.unsub()
		l.unsub = nil
	}
}

// sync follows the session's phase. A lock (button or idle time) drops
// everything decrypted the screen holds.
func (l *logbookScreen) sync(ctx app.Context) {
	was := l.phase
	l.phase, l.phaseErr = l.session.Phase()
	if l.phase != phaseUnlocked {
		if was == phaseUnlocked {
			l.status = "The logbook is locked."
			if l.hold() {
				l.status += " The entry you had not saved comes back when you unlock (a reload clears it)."
			}
		}
		l.forget()
		return
	}
	if was != phaseUnlocked {
		l.restoreHeld()
		l.stale = true
		if l.busy == "" {
			l.refresh(ctx)
		}
	}
}

// hold keeps the view and forms of a transport or a start being typed
// (heldForms), and reports whether any of it holds unsaved typing.
func (l *logbookScreen) hold() bool {
	switch l.view {
	case viewRecord:
		typed := l.record.typed()
		l.held = &heldForms{view: viewRecord, id: l.record.id}
		l.stashUnsaved()
		return typed
	case viewStart:
		l.held = &heldForms{view: viewStart, start: l.start}
		return l.start.typed()
	}
	return false
}

// restoreHeld puts back what hold kept; refresh then reads the transport.
func (l *logbookScreen) restoreHeld() {
	h := l.held
	l.held = nil
	if h == nil {
		return
	}
	l.view, l.start = h.view, h.start
	if h.view == viewRecord {
		l.record = recordState{id: h.id}
		l.takeUnsaved()
	}
}

// stashUnsaved keeps the record view's unsaved typing in the session as
// the crew leaves it (another view, another transport, another screen, a
// lock); takeUnsaved puts it back when that transport opens again. A start
// of transport being typed is kept the same way, and prepareStart puts it
// back over the Brief as it is then.
func (l *logbookScreen) stashUnsaved() {
	if l.view == viewStart && l.start.typed() {
		l.session.keepStart(l.start)
		l.start = startForm{}
		return
	}
	if l.view != viewRecord || l.record.id == "" || !l.record.typed() {
		return
	}
	r := l.record
	r.transport, r.saving = nil, ""
	l.session.keepUnsaved(r)
	l.record = recordState{id: r.id}
}

// takeUnsaved puts back what stashUnsaved kept for the transport in
// l.record, and says so.
func (l *logbookScreen) takeUnsaved() {
	if r, ok := l.session.takeUnsaved(l.record.id); ok {
		l.record = r
		l.status = "What you had typed and not saved for this transport is back in its fields."
	}
}

// forget drops decrypted content and the passphrase fields.
func (l *logbookScreen) forget() {
	l.list = listState{}
	l.record = recordState{}
	l.start = startForm{}
	l.manage = manageForm{}
	l.access.clearSecrets()
	l.view = viewList
}

// run does work in a goroutine (the vault blocks on storage) with the
// screen marked busy, then done on the UI goroutine.
func (l *logbookScreen) run(ctx app.Context, busy string, work func(context.Context) error, done func(ctx app.Context, err error)) {
	l.runWith(ctx, busy, 0, work, done)
}

// runPainted is run for work that holds the CPU (a key derivation): it
// first lets the browser paint the busy state, since Go runs on the page's
// one thread.
func (l *logbookScreen) runPainted(ctx app.Context, busy string, work func(context.Context) error, done func(ctx app.Context, err error)) {
	l.runWith(ctx, busy, 40*time.Millisecond, work, done)
}

func (l *logbookScreen) runWith(ctx app.Context, busy string, paint time.Duration, work func(context.Context) error, done func(ctx app.Context, err error)) {
	if l.busy != "" {
		return
	}
	l.busy, l.problem = busy, ""
	if l.Mounted() {
		ctx = l.mctx
	}
	ctx.Async(func() {
		if paint > 0 {
			time.Sleep(paint)
		}
		err := work(context.Background())
		ctx.Dispatch(func(ctx app.Context) {
			l.busy = ""
			done(ctx, err)
			if l.stale && l.busy == "" && l.phase == phaseUnlocked {
				l.refresh(ctx)
			}
		})
	})
}

// refresh reloads the list (and the open transport) from the vault, then
// the storage status.
func (l *logbookScreen) refresh(ctx app.Context) {
	var listing *logbook.Listing
	var tr *logbook.Transport
	id := l.record.id
	l.stale = false
	l.run(ctx, "Reading the logbook…", func(c context.Context) error {
		v, err := l.session.Vault()
		if err != nil {
			return err
		}
		if listing, err = v.List(c); err != nil {
			return err
		}
		if id != "" {
			if tr, err = v.Transport(c, id); err != nil {
				return err
			}
		}
		return nil
	}, func(ctx app.Context, err error) {
		if err != nil {
			l.problem = vaultActionMessage(err)
			return
		}
		l.list.listing = listing
		if tr != nil {
			l.record.transport = tr
		}
		l.readStorage(ctx)
	})
}

// readStorage asks for persistent storage and reads the usage, without
// holding the screen busy (the browser may take its time to answer).
func (l *logbookScreen) readStorage(ctx app.Context) {
	if l.Mounted() {
		ctx = l.mctx
	}
	ctx.Async(func() {
		c, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		defer cancel()
		st, err := l.session.Storage(c)
		ctx.Dispatch(func(ctx app.Context) {
			if err == nil {
				l.storage = &st
			}
		})
	})
}

// touch postpones the auto-lock on any input on the screen.
func (l *logbookScreen) touch(ctx app.Context, e app.Event) {
	ctx.PreventUpdate()
	l.session.Touch()
}

func (l *logbookScreen) Render() app.UI {
	return app.Section().Class("alv-screen lb-screen").Aria("labelledby", "logbook-title").
		OnKeyDown(l.touch).On("pointerdown", l.touch).
		Body(
			app.Div().Class("lb-head").Body(
				app.H1().ID("logbook-title").Text("Logbook"),
				app.If(l.phase == phaseUnlocked, func() app.UI {
					return app.Button().ID("lb-lock").Type("button").Class("alv-button lb-lock").
						Text("Lock").OnClick(l.lockNow)
				}),
			),
			newCaution(""),
			app.P().ID("lb-status").Class("lb-status").Attr("role", "status").Body(
				app.If(l.busy != "", func() app.UI { return app.Span().Class("lb-busy").Text(l.busy) }).
					Else(func() app.UI { return app.Text(l.status) }),
			),
			// Always present, so that the forms after it keep their DOM
			// (and a chosen file) when a message comes or goes.
			app.Div().Class("lb-alerts").Body(
				app.If(l.problem != "", func() app.UI {
					return app.P().ID("lb-problem").Class("alv-error lb-problem").Attr("role", "alert").Text(l.problem)
				}),
			),
			l.renderPhase(),
		)
}

func (l *logbookScreen) renderPhase() app.UI {
	switch l.phase {
	case phaseUnknown:
		if l.session.OpenWaiting() {
			return app.Div().ID("lb-waiting").Class("alv-card").Attr("role", "alert").Body(
				app.H2().Class("alv-card-title").Text("The browser is holding the logbook"),
				app.P().Text("Alvea may be open in another tab or window of this browser: close other Alvea tabs. The logbook opens here by itself once they are closed; nothing is lost."),
			)
		}
		return app.P().Class("alv-lead").Text("Opening the logbook on this device…")
	case phaseUnavailable:
		return app.Div().Class("alv-card").Body(
			app.H2().Class("alv-card-title").Text("The logbook cannot be kept on this device"),
			app.P().Text(unavailableMessage(l.phaseErr)),
		)
	case phaseEmpty:
		return l.renderEmpty()
	case phaseLocked:
		return l.renderLocked()
	}
	switch l.view {
	case viewRecord:
		return l.renderRecord()
	case viewStart:
		return l.renderStart()
	case viewManage:
		return l.renderManage()
	}
	return l.renderList()
}

func (l *logbookScreen) lockNow(ctx app.Context, e app.Event) {
	l.session.Lock()
	l.sync(ctx)
}

func (l *logbookScreen) show(ctx app.Context, view string) {
	if view != l.view {
		l.stashUnsaved()
	}
	l.view, l.problem, l.status = view, "", ""
}

// nav renders the row of views once unlocked.
func (l *logbookScreen) nav() app.UI {
	item := func(view, label string) app.UI {
		b := app.Button().ID("lb-nav-"+view).Type("button").Class("alv-seg-btn").
			Aria("pressed", ariaBool(l.view == view)).Text(label).
			OnClick(func(ctx app.Context, e app.Event) {
				l.show(ctx, view)
				if view == viewList {
					l.refresh(ctx)
				}
				if view == viewStart {
					l.prepareStart(ctx)
				}
			})
		return b
	}
	return app.Nav().Class("lb-nav alv-seg").Aria("label", "Logbook").Body(
		item(viewList, "Transports"),
		item(viewStart, "Start transport"),
		item(viewManage, "Vault"),
	)
}
