package ui

import (
	"context"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// brief is the Brief screen: the whole plan chain as a form — route and
// aircraft, legs with their oxygen set-ups, patient, cylinders on board,
// reserve policy — recomputed by physio as the crew types, ending in the
// go / no-go summary.
//
// Rendering is split so that a keystroke redraws little: each numeric
// field is its own component (briefNum), and a keystroke that changes no
// field's message redraws no part of the form — neither the Brief nor the
// frame above it — only the result panel (briefState.typed). When the
// plan's shape is the one on screen, its texts are written straight into
// the panel and go-app draws nothing (the direct path, brief_result.go).
// Otherwise, in the panel, each figure, each leg and the slower-changing
// parts are components keyed by the text they show, so the unchanged
// ones are passed over. An edit that changes the form's shape or a
// message redraws the Brief; its cards redraw when their Rev or messages
// changed.
type brief struct {
	app.Compo

	store   DraftStore
	session *vaultSession // where the patient block is kept; nil: store only
	s       *briefState
	ctx     app.Context // from OnMount, to save the draft when leaving
	leave   app.Func    // saves the draft when the page is hidden or closed
	saveFn  app.Func    // the page timer's callback: saves the draft
	timer   app.Value   // the page timer armed for the save, or nil
	unsub   func()      // stops following the vault session
}

// briefState is shared by the Brief and its cards.
type briefState struct {
	draft    BriefDraft
	settings Settings
	model    *briefModel
	store    DraftStore

	rev     int // the plan changed: the result panel redraws
	formRev int // the whole form must redraw (draft loaded, units changed)
	// patientNote is the note on the patient card while its values are
	// kept in memory only (the vault locked or absent, or its last write
	// failed); "" when they are saved in the vault.
	patientNote     string
	patientUnlocked bool // the session was unlocked when last heard
	saveGen         int
	pending         bool            // an edit not yet saved
	open            map[string]bool // "How" disclosures the crew opened

	// saveLater, set while the Brief is mounted in a browser, arms the
	// page's timer for the save (see changed); nil: go-app's After.
	saveLater func()

	// Narrow updates (see typed). briefCtx and resultCtx are the contexts
	// of the mounted Brief and result panel; shownMsgs is the messages of
	// every field as the Brief last rendered them.
	briefCtx, resultCtx app.Context
	mounted, resultUp   bool
	shownMsgs           string
	setters             map[string]func(Entry) // numeric field id → where it writes

	// The direct path (brief_result.go): the packed panel and the last
	// one sent (buffers reused); caps the places the panel keeps for its
	// lists; shownShape the shape of the panel on screen (empty: not
	// known), sentShown whether sent has that shape; direct reports that
	// the last recompute is on screen in full already. writeTexts, when
	// set, replaces the page script (tests).
	panel      panelPack // packed, not yet sent
	sent       panelPack // the last sent in full or in part
	sentOK     bool      // sent is on screen, every record written
	sentShown  bool
	diff       []byte // the records of panel that differ from sent
	scratch    []byte // a shape being compared
	caps       panelCaps
	shownShape []byte
	direct     bool
	syncQueued bool
	writeTexts func(packed string) bool
}

// saveDelay gathers a burst of keystrokes into one save of the draft.
const saveDelay = 300 * time.Millisecond

func newBrief() *brief { return newBriefOn(theVault) }

// newBriefOn returns a Brief whose patient block is kept by the vault
// session (vault_draft.go), the rest of the draft in localStorage.
func newBriefOn(session *vaultSession) *brief {
	// The plan is read when the Brief first renders (or loads), not here:
	// the frame makes a Brief each time it renders.
	store := draftStoreFor(session)
	b := &brief{store: store, s: newBriefState(store)}
	b.session = session
	b.s.patientNote = patientNoteFor(session)
	phase, _ := session.Phase()
	b.s.patientUnlocked = phase == phaseUnlocked
	return b
}

// newBriefWith returns a Brief keeping its whole draft in store (tests).
func newBriefWith(store DraftStore) *brief {
	s := newBriefState(store)
	s.recompute()
	return &brief{store: store, s: s}
}

func newBriefState(store DraftStore) *briefState {
	return &briefState{draft: NewBriefDraft(), settings: DefaultSettings(), store: store, open: map[string]bool{}}
}

// Notes on the patient card while its values are not saved (our wording).
const (
	notePatientLocked  = "Patient values stay only in memory until the logbook is unlocked: a reload clears them. Unlock the logbook to keep them across a reload."
	notePatientNoVault = "Patient values stay only in memory: a reload clears them. Create the logbook to keep them across a reload."
	notePatientNoStore = "Patient values stay only in memory: this browser gives the logbook no storage, so a reload clears them."
	notePatientFull    = "The device's storage is full: the patient values were NOT saved in the logbook and stay only in memory, so a reload clears them. Free some space on the device; the next change saves them."
	notePatientFailed  = "The patient values could not be saved in the logbook (%s): they stay only in memory, so a reload clears them. The next change tries again."
)

// patientNoteFor returns the patient card's note for the session's phase.
func patientNoteFor(session *vaultSession) string {
	if session == nil {
		return ""
	}
	switch phase, _ := session.Phase(); phase {
	case phaseUnlocked:
		switch err := session.DraftErr(); {
		case err == nil:
			return ""
		case errors.Is(err, logbook.ErrQuota):
			return notePatientFull
		default:
			// The vault's and the store's errors carry no patient value.
			return fmt.Sprintf(notePatientFailed, err)
		}
	case phaseEmpty:
		return notePatientNoVault
	case phaseUnavailable:
		return notePatientNoStore
	}
	return notePatientLocked
}

func (b *brief) OnMount(ctx app.Context) {
	b.s.briefCtx, b.s.mounted = ctx, true
	b.load(ctx)
	b.follow(ctx)
	// A reload or a closed tab within the save delay must not lose the
	// last edit: save when the page is hidden.
	b.ctx = ctx
	b.leave = app.FuncOf(func(this app.Value, args []app.Value) any {
		b.s.flush(b.ctx)
		return nil
	})
	app.Window().Call("addEventListener", "pagehide", b.leave)
	app.Window().Call("addEventListener", "visibilitychange", b.leave)
	if app.IsClient {
		b.saveFn = app.FuncOf(func(this app.Value, args []app.Value) any {
			b.timer = nil
			b.ctx.Dispatch(func(ctx app.Context) {
				// Saving changes nothing on screen: no redraw for it.
				ctx.PreventUpdate()
				b.s.flush(ctx)
			})
			return nil
		})
		b.s.saveLater = func() {
			w := app.Window()
			if b.timer != nil {
				w.Call("clearTimeout", b.timer)
			}
			b.timer = w.Call("setTimeout", b.saveFn, saveDelay.Milliseconds())
		}
	}
}

// OnDismount saves an edit still waiting (the crew switched screens within
// the save delay).
func (b *brief) OnDismount() {
	if b.leave == nil { // never mounted in a browser
		return
	}
	if b.saveFn != nil {
		if b.timer != nil {
			app.Window().Call("clearTimeout", b.timer)
			b.timer = nil
		}
		b.s.saveLater = nil
		b.saveFn.Release()
		b.saveFn = nil
	}
	b.s.flush(b.ctx)
	b.s.mounted = false
	if b.unsub != nil {
		b.unsub()
		b.unsub = nil
	}
	app.Window().Call("removeEventListener", "pagehide", b.leave)
	app.Window().Call("removeEventListener", "visibilitychange", b.leave)
	b.leave.Release()
	b.leave = nil
}

// load reads the settings and the stored draft, and follows Settings.
// When the first render already showed them (read before it, see
// preload.go), nothing is drawn again.
func (b *brief) load(ctx app.Context) {
	s := b.s
	settings := LoadSettings(ctx)
	same := s.model != nil && reflect.DeepEqual(settings, s.settings)
	s.settings = settings
	ctx.ObserveState(SettingsKey, &s.settings).OnChange(func() {
		s.recompute()
		s.formRev++
	})
	draft := NewBriefDraft()
	if d, found, err := s.store.Load(ctx); err != nil {
		app.Log(err)
		draft = s.draft
	} else if found {
		draft = d
	}
	if same && reflect.DeepEqual(draft, s.draft) {
		return
	}
	s.draft = draft
	s.recompute()
	s.formRev++
}

// follow listens to the vault session: an unlock after the Brief mounted
// brings the saved patient block (or saves the one on screen), a lock
// brings the note back. It also opens the store, so the note can tell a
// locked logbook from none.
func (b *brief) follow(ctx app.Context) {
	if b.session == nil {
		return
	}
	session := b.session
	b.unsub = session.Subscribe(func() {
		ctx.Dispatch(func(ctx app.Context) { b.vaultChanged(ctx) })
	})
	ctx.Async(func() {
		session.Load(context.Background()) // a failure shows in the note
	})
}

// vaultChanged follows a change of the session's phase.
func (b *brief) vaultChanged(ctx app.Context) {
	s := b.s
	was := s.patientUnlocked
	phase, _ := b.session.Phase()
	s.patientUnlocked = phase == phaseUnlocked
	s.patientNote = patientNoteFor(b.session)
	if !s.patientUnlocked || was {
		return
	}
	// Just unlocked. The session restored the saved block into memory if
	// none was held; an edit not yet saved stays and is saved now.
	if s.pending {
		s.flush(ctx)
		return
	}
	if p, ok := b.session.DraftPatient(); ok && p != s.draft.Patient {
		s.draft.Patient = p
		s.recompute()
		s.formRev++
	}
}

// recompute reads the fields and, when all are valid, computes the plan,
// then writes the plan's texts into the result panel on screen (so the
// screen holds the current plan whichever way the panel is updated).
func (s *briefState) recompute() {
	s.model = buildBrief(s.draft, s.settings)
	s.rev++
	s.direct = s.showPlan()
}

// changed is called after every edit: recompute now, save a moment later.
//
// In a browser the save waits on the page's own timer, re-armed by each
// edit, not on a Go timer (go-app's After, one goroutine and one timer per
// keystroke). The Go runtime runs every Go timer that is due in whichever
// turn of the program comes next, and the page takes a keystroke before a
// timer that came due at the same moment, so the timers of earlier
// keystrokes ran inside later ones; the page's timer runs as a turn of its
// own. Measured with both ways in one app.wasm (DEVELOPERS.md): with the
// machine loaded, the Brief bench's p95 was lower this way in each of four
// pairs (17–34 ms against 34–220 ms); on a quiet machine the two were
// alike (p95 10.6–13.5 against 10.2–30 ms).
func (s *briefState) changed(ctx app.Context) {
	s.recompute()
	s.pending = true
	if s.saveLater != nil {
		s.saveLater()
		return
	}
	s.saveGen++
	gen := s.saveGen
	ctx.After(saveDelay, func(ctx app.Context) {
		// Saving changes nothing on screen: no redraw for it.
		ctx.PreventUpdate()
		if gen == s.saveGen {
			s.flush(ctx)
		}
	})
}

// flush saves the draft if an edit is waiting.
func (s *briefState) flush(ctx app.Context) {
	if !s.pending || s.store == nil {
		return
	}
	s.pending = false
	if err := s.store.Save(ctx, s.draft.clone()); err != nil {
		app.Log(err)
	}
}

// restructured is changed for edits that add or remove form parts.
func (s *briefState) restructured(ctx app.Context) {
	s.formRev++
	s.changed(ctx)
}

// typed is called after a keystroke in a numeric field, once the plan is
// recomputed. go-app flags the field's component and every component
// above it (its card, the Brief, the frame) for an update. When no field's
// message changed, nothing of the form needs to redraw (the text is on
// screen already), so those flags are taken back. The result panel is
// then flagged alone, unless recompute wrote the whole new plan into it
// already (the direct path: same shape). Otherwise the whole Brief
// redraws.
func (s *briefState) typed(ctx app.Context) {
	if !s.mounted || !s.resultUp || s.allMsgs() != s.shownMsgs {
		return
	}
	ctx.PreventUpdate()
	if s.direct {
		return
	}
	brief := s.briefCtx
	s.resultCtx.Dispatch(func(app.Context) { brief.PreventUpdate() })
}

// allMsgs is the messages of every field, in form order.
func (s *briefState) allMsgs() string {
	n := 0
	for _, id := range s.model.order {
		n += len(id) + len(s.model.msgs[id]) + 2
	}
	var b strings.Builder
	b.Grow(n)
	for _, id := range s.model.order {
		b.WriteString(id)
		b.WriteByte('=')
		b.WriteString(s.model.msgs[id])
		b.WriteByte(';')
	}
	return b.String()
}

func (b *brief) Render() app.UI {
	s := b.s
	if s.model == nil {
		s.preload()
		s.recompute()
	}
	s.shownMsgs = s.allMsgs()
	return app.Section().Class("alv-screen alv-brief").Aria("labelledby", "brief-title").Body(
		app.H1().ID("brief-title").Text("Brief"),
		newCaution(""),
		app.Div().Class("b-layout").Body(
			app.Div().Class("b-form").Body(
				&briefRoute{Rev: s.formRev, Msgs: s.msgSig("b-rt-"), s: s},
				&briefLegs{Rev: s.formRev, Msgs: s.msgSig("b-leg"), s: s},
				&briefPatient{Rev: s.formRev, Msgs: s.msgSig("b-pt-"), Note: s.patientNote, s: s},
				&briefSupply{Rev: s.formRev, Msgs: s.msgSig("b-sup"), s: s},
				&briefPolicy{Rev: s.formRev, Msgs: s.msgSig("b-pol-"), s: s},
			),
			&briefResult{Rev: s.rev, s: s},
		),
	)
}
