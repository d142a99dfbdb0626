package ui

import (
	"bytes"
	"context"
	"errors"
	"sync"
	"time"

	"alvea/app/logbook"
)

// The vault session: one encrypted Logbook vault per app, shared by the
// screens. It opens the browser store (IndexedDB; memory in native tests),
// knows whether a vault exists and whether it is unlocked, locks itself
// after the idle time, and tells the mounted screens when any of that
// changes so they redraw.
//
// Every method that touches the store or derives a key blocks: call it from
// a goroutine (ctx.Async), never from an event handler directly (blocking
// inside a browser callback deadlocks the Go runtime in the browser).

// vaultPhase is where the session stands.
type vaultPhase int

const (
	phaseUnknown     vaultPhase = iota // the store has not been opened yet
	phaseUnavailable                   // the browser offers no storage (see Err)
	phaseEmpty                         // no vault yet: create one or import a bundle
	phaseLocked                        // a vault exists and is locked
	phaseUnlocked                      // the vault is unlocked
)

// vaultSession is safe for concurrent use.
type vaultSession struct {
	openStore func(context.Context) (logbook.Store, error)
	kdf       logbook.KDFParams

	mu      sync.Mutex
	store   logbook.Store
	vault   *logbook.Vault
	phase   vaultPhase
	err     error // why the store is unavailable
	idle    time.Duration
	subs    map[int]func()
	nextSub int
	rev     int              // bumped at every change of phase or content
	now     func() time.Time // the vaults' clock (nil: time.Now); tests set it

	// loading is closed when the open in flight ends (nil: none): two
	// screens loading at once share one open. openWait is set when that
	// open has taken longer than patience (the browser holds the database
	// for another tab), so the screens can say so rather than spin.
	loading  chan struct{}
	openWait bool
	patience time.Duration

	// The Brief's patient block, held in memory for the life of the page
	// and written into the vault's draft slot while it is unlocked
	// (vault_draft.go). patientGen counts changes; savedGen is the
	// change last written to the vault.
	patient    PatientDraft
	patientSet bool
	patientGen uint64
	savedGen   uint64
	draftErr   error      // how the last write of the block failed; nil: it did not
	draftMu    sync.Mutex // one draft-slot write at a time, the newest last

	// Entries typed in the Logbook and not saved, by transport: kept in
	// memory (never stored) while the crew is on another view or screen,
	// or the logbook is locked, and put back when that transport opens.
	unsaved map[logbook.TransportID]recordState
	// The start of a transport being typed, kept the same way while the
	// crew looks at the Brief or another view (nil: none).
	unsavedStart *startForm
}

// keepStart holds a start form being typed until takeStart.
func (s *vaultSession) keepStart(f startForm) {
	s.mu.Lock()
	defer s.mu.Unlock()
	s.unsavedStart = &f
}

// takeStart returns and forgets the start form held, if any.
func (s *vaultSession) takeStart() (startForm, bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	f := s.unsavedStart
	s.unsavedStart = nil
	if f == nil {
		return startForm{}, false
	}
	return *f, true
}

// keepUnsaved holds r's forms (r.id is the transport) until takeUnsaved.
func (s *vaultSession) keepUnsaved(r recordState) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.unsaved == nil {
		s.unsaved = map[logbook.TransportID]recordState{}
	}
	s.unsaved[r.id] = r
}

// takeUnsaved returns and forgets the forms held for transport id.
func (s *vaultSession) takeUnsaved(id logbook.TransportID) (recordState, bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	r, ok := s.unsaved[id]
	delete(s.unsaved, id)
	return r, ok
}

// theVault is the app's one vault session. The store opener and the key
// derivation are the platform's (vault_store_*.go).
var theVault = newVaultSession(openBrowserStore, logbook.DefaultKDF)

func newVaultSession(open func(context.Context) (logbook.Store, error), kdf logbook.KDFParams) *vaultSession {
	return &vaultSession{openStore: open, kdf: kdf, idle: logbook.DefaultIdleLock, subs: map[int]func(){}, patience: openPatience}
}

// Subscribe registers fn, called (from any goroutine) after every change
// of phase or content. It returns the function that cancels it.
func (s *vaultSession) Subscribe(fn func()) (cancel func()) {
	s.mu.Lock()
	defer s.mu.Unlock()
	id := s.nextSub
	s.nextSub++
	s.subs[id] = fn
	return func() {
		s.mu.Lock()
		defer s.mu.Unlock()
		delete(s.subs, id)
	}
}

// changed bumps the revision and calls the subscribers, outside the lock.
func (s *vaultSession) changed() {
	s.mu.Lock()
	s.rev++
	s.mu.Unlock()
	s.notify()
}

// notify calls the subscribers for a change that is neither of phase nor
// of the vault's content (the screens that key on Rev reload nothing).
func (s *vaultSession) notify() {
	s.mu.Lock()
	fns := make([]func(), 0, len(s.subs))
	for _, fn := range s.subs {
		fns = append(fns, fn)
	}
	s.mu.Unlock()
	for _, fn := range fns {
		fn()
	}
}

// Phase returns the session's phase and, when unavailable, why.
func (s *vaultSession) Phase() (vaultPhase, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.phase == phaseUnlocked && s.vault.Locked() {
		s.phase = phaseLocked
	}
	return s.phase, s.err
}

// Rev returns a number that changes with every change of phase or content.
func (s *vaultSession) Rev() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.rev
}

// openPatience is how long an open may take before the screens say the
// browser is holding the logbook (an open normally takes well under a
// second: GOAPP-NOTES measured 50–330 ms).
const openPatience = 5 * time.Second

// OpenWaiting reports whether the store's open has been waiting longer
// than it should (another tab holds the database).
func (s *vaultSession) OpenWaiting() bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.openWait
}

// Load opens the store (once) and finds out whether it holds a vault. It is
// cheap after the first call; calls made while an open is in flight wait
// for that open.
func (s *vaultSession) Load(ctx context.Context) error {
	for {
		s.mu.Lock()
		if s.phase != phaseUnknown && s.phase != phaseUnavailable {
			s.mu.Unlock()
			return nil
		}
		wait := s.loading
		if wait == nil {
			s.loading = make(chan struct{})
			s.mu.Unlock()
			break
		}
		s.mu.Unlock()
		select {
		case <-wait:
		case <-ctx.Done():
			return ctx.Err()
		}
		s.mu.Lock()
		phase, err := s.phase, s.err
		s.mu.Unlock()
		if phase == phaseUnavailable {
			return err
		}
	}
	slow := time.AfterFunc(s.patience, func() {
		s.mu.Lock()
		s.openWait = true
		s.mu.Unlock()
		s.changed()
	})
	defer func() {
		slow.Stop()
		s.mu.Lock()
		close(s.loading)
		s.loading, s.openWait = nil, false
		s.mu.Unlock()
	}()
	return s.load(ctx)
}

func (s *vaultSession) load(ctx context.Context) error {
	store, err := s.openStore(ctx)
	if err != nil {
		s.mu.Lock()
		s.phase, s.err = phaseUnavailable, err
		s.mu.Unlock()
		s.changed()
		return err
	}
	v, err := logbook.Open(ctx, store)
	s.mu.Lock()
	s.store, s.err = store, nil
	switch {
	case errors.Is(err, logbook.ErrNoVault):
		s.phase = phaseEmpty
		err = nil
	case err != nil:
		s.phase, s.err = phaseUnavailable, err
	default:
		s.vault, s.phase = v, phaseLocked
	}
	s.mu.Unlock()
	s.changed()
	return err
}

// adopt installs an unlocked vault and its auto-lock, then brings the
// Brief's patient block and the vault's draft slot together (restoring the
// saved block, or saving the one on screen) before telling the screens.
func (s *vaultSession) adopt(ctx context.Context, v *logbook.Vault) {
	s.mu.Lock()
	s.vault, s.phase = v, phaseUnlocked
	idle, now := s.idle, s.now
	s.mu.Unlock()
	if now != nil {
		v.SetClock(now)
	}
	v.SetAutoLock(idle, s.onLock)
	s.restoreDraftPatient(ctx, v)
	s.changed()
}

// onLock runs after any lock of the vault (button or idle time). The
// patient block on the Brief stays in memory (vault_draft.go says why); it
// is no longer saved until the vault is unlocked again.
func (s *vaultSession) onLock() {
	s.mu.Lock()
	if s.phase == phaseUnlocked {
		s.phase = phaseLocked
	}
	s.mu.Unlock()
	s.changed()
}

// Create makes a new vault with passphrase (checked by
// logbook.CheckPassphrase) and leaves it unlocked.
func (s *vaultSession) Create(ctx context.Context, passphrase string) error {
	if err := s.Load(ctx); err != nil {
		return err
	}
	s.mu.Lock()
	store := s.store
	s.mu.Unlock()
	v, err := logbook.Create(ctx, store, passphrase, s.kdf)
	if err != nil {
		return err
	}
	s.adopt(ctx, v)
	return nil
}

// Unlock unlocks the vault. A wrong passphrase gives logbook.ErrUnlock and
// changes nothing, in the store or in the session.
func (s *vaultSession) Unlock(ctx context.Context, passphrase string) error {
	if err := s.Load(ctx); err != nil {
		return err
	}
	s.mu.Lock()
	v := s.vault
	s.mu.Unlock()
	if v == nil {
		return logbook.ErrNoVault
	}
	if err := v.Unlock(ctx, passphrase); err != nil {
		return err
	}
	s.adopt(ctx, v)
	return nil
}

// Import writes a bundle into the empty store, after logbook.Import has
// verified all of it, and leaves the vault unlocked.
func (s *vaultSession) Import(ctx context.Context, bundle []byte, passphrase string) error {
	if err := s.Load(ctx); err != nil {
		return err
	}
	s.mu.Lock()
	store := s.store
	s.mu.Unlock()
	v, err := logbook.Import(ctx, store, bundle, passphrase)
	if err != nil {
		return err
	}
	s.adopt(ctx, v)
	return nil
}

// Lock drops the keys (the vault zeroes them) and everything decrypted the
// session holds.
func (s *vaultSession) Lock() {
	s.mu.Lock()
	v := s.vault
	s.mu.Unlock()
	if v != nil {
		v.Lock() // calls onLock when it was unlocked
	}
}

// IdleLock returns the auto-lock time the session applies (0 or less:
// never).
func (s *vaultSession) IdleLock() time.Duration {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.idle
}

// Touch postpones the auto-lock: the crew is using the app.
func (s *vaultSession) Touch() {
	if v := s.unlocked(); v != nil {
		v.Touch()
	}
}

// SetIdle sets the auto-lock time (0 or less: never), for the vault now
// unlocked and those unlocked later.
func (s *vaultSession) SetIdle(idle time.Duration) {
	s.mu.Lock()
	s.idle = idle
	v, unlocked := s.vault, s.phase == phaseUnlocked
	s.mu.Unlock()
	if unlocked {
		v.SetAutoLock(idle, s.onLock)
	}
}

// unlocked returns the vault when it is unlocked, else nil.
func (s *vaultSession) unlocked() *logbook.Vault {
	s.mu.Lock()
	v := s.vault
	s.mu.Unlock()
	if v == nil || v.Locked() {
		return nil
	}
	return v
}

// Vault returns the unlocked vault or logbook.ErrLocked.
func (s *vaultSession) Vault() (*logbook.Vault, error) {
	if v := s.unlocked(); v != nil {
		return v, nil
	}
	return nil, logbook.ErrLocked
}

// Append saves one entry and returns only when the store has it (for
// IndexedDB: its transaction completed). On error nothing was saved.
func (s *vaultSession) Append(ctx context.Context, e *logbook.Entry) (logbook.IndexEntry, error) {
	v, err := s.Vault()
	if err != nil {
		return logbook.IndexEntry{}, err
	}
	ie, err := v.Append(ctx, e)
	if err == nil {
		s.changed()
	}
	return ie, err
}

// Export returns the whole vault as one bundle.
func (s *vaultSession) Export(ctx context.Context) ([]byte, error) {
	v, err := s.Vault()
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	if err := v.Export(ctx, &b); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// ChangePassphrase re-wraps the data key under next with the session's key
// derivation settings (never below the vault's own).
func (s *vaultSession) ChangePassphrase(ctx context.Context, current, next string) error {
	v, err := s.Vault()
	if err != nil {
		return err
	}
	kdf := s.kdf
	if old := v.KDF(); old.Algorithm == kdf.Algorithm && (old.MemoryKiB > kdf.MemoryKiB || old.Time > kdf.Time) {
		kdf = old
	}
	return v.ChangePassphrase(ctx, current, next, kdf)
}

// Storage asks for persistent storage and reports usage.
func (s *vaultSession) Storage(ctx context.Context) (logbook.StorageStatus, error) {
	if err := s.Load(ctx); err != nil {
		return logbook.StorageStatus{}, err
	}
	s.mu.Lock()
	store := s.store
	s.mu.Unlock()
	return logbook.Storage(ctx, store)
}
