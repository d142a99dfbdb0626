package logbook

import (
	"bytes"
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/json"
	"errors"
	"fmt"
	"sync"
	"time"
)

// DefaultIdleLock is how long a vault stays unlocked without use.
const DefaultIdleLock = 5 * time.Minute

// Vault is an encrypted, append-only, hash-chained transport log in a
// Store. A Vault is safe for concurrent use. It starts locked (Open) or
// unlocked (Create, Import); Lock drops the keys.
type Vault struct {
	mu    sync.Mutex
	store Store
	raw   []byte  // header bytes as stored
	hdr   *header // nil until the header parses at Unlock
	keys  *keys   // nil while locked

	// Chain state, loaded from the index after unlock.
	loaded   bool
	entries  []IndexEntry
	bySeq    map[uint64]int // seq → position in entries
	problems []Problem
	headSeq  uint64
	nextSeq  uint64
	last     link

	idle    time.Duration
	lastUse time.Time
	timer   *time.Timer
	onLock  func()
	now     func() time.Time
}

// Create makes a new vault in an empty store, protected by passphrase
// (checked with CheckPassphrase) with key derivation kdf (use DefaultKDF).
// The vault is returned unlocked.
func Create(ctx context.Context, store Store, passphrase string, kdf KDFParams) (*Vault, error) {
	if err := CheckPassphrase(passphrase); err != nil {
		return nil, err
	}
	if err := kdf.Validate(); err != nil {
		return nil, err
	}
	if _, _, err := store.Meta(ctx); err == nil {
		return nil, ErrVaultExists
	} else if !errors.Is(err, ErrNoVault) {
		return nil, err
	}
	h := &header{version: formatVersion}
	rand.Read(h.vaultID[:])
	dataKey := make([]byte, keyLen)
	rand.Read(dataKey)
	if err := h.wrap([]byte(passphrase), kdf, dataKey); err != nil {
		return nil, err
	}
	raw := h.encode()
	if err := store.PutHeader(ctx, raw); err != nil {
		return nil, err
	}
	k, err := deriveKeys(dataKey)
	if err != nil {
		return nil, err
	}
	v := newVault(store, raw)
	v.hdr = h
	v.setKeys(k)
	return v, nil
}

// Open reads the vault header from store and returns the vault locked. It
// returns ErrNoVault for an empty store. A damaged header is not reported
// here: Unlock gives the one vague ErrUnlock for it.
func Open(ctx context.Context, store Store) (*Vault, error) {
	raw, _, err := store.Meta(ctx)
	if err != nil {
		return nil, err
	}
	return newVault(store, raw), nil
}

func newVault(store Store, raw []byte) *Vault {
	return &Vault{store: store, raw: raw, idle: DefaultIdleLock, now: time.Now}
}

// Unlock derives the passphrase key and unwraps the data key. A wrong
// passphrase and a damaged header both return ErrUnlock, and change
// nothing.
func (v *Vault) Unlock(ctx context.Context, passphrase string) error {
	h, dataKey, err := v.openHeader(passphrase)
	if err != nil {
		return err
	}
	k, err := deriveKeys(dataKey)
	if err != nil {
		return ErrUnlock
	}
	v.mu.Lock()
	defer v.mu.Unlock()
	v.keys.wipe()
	v.hdr = h
	v.setKeys(k)
	return nil
}

// openHeader parses the stored header and unwraps its data key with the
// passphrase. Every failure is ErrUnlock: a wrong passphrase and a damaged
// header must not be told apart.
func (v *Vault) openHeader(passphrase string) (*header, []byte, error) {
	v.mu.Lock()
	raw := v.raw
	v.mu.Unlock()
	h, err := parseHeader(raw)
	if err != nil {
		return nil, nil, ErrUnlock
	}
	dataKey, err := h.unwrap([]byte(passphrase))
	if err != nil {
		return nil, nil, ErrUnlock
	}
	return h, dataKey, nil
}

// setKeys installs keys, resets the chain cache and starts the idle timer.
// Called with v.mu held (or before v is shared).
func (v *Vault) setKeys(k *keys) {
	v.keys = k
	v.loaded = false
	v.lastUse = v.now()
	v.armTimer()
}

// Locked reports whether the vault is locked.
func (v *Vault) Locked() bool {
	v.mu.Lock()
	defer v.mu.Unlock()
	return v.keys == nil
}

// Lock zeroes the keys and drops everything decrypted that the vault
// holds. It is safe to call at any time, and calls the OnLock hook if the
// vault was unlocked.
func (v *Vault) Lock() {
	v.mu.Lock()
	hook := v.lockLocked()
	v.mu.Unlock()
	if hook != nil {
		hook()
	}
}

func (v *Vault) lockLocked() func() {
	if v.keys == nil {
		return nil
	}
	v.keys.wipe()
	v.keys = nil
	v.loaded, v.entries, v.bySeq, v.problems = false, nil, nil, nil
	if v.timer != nil {
		v.timer.Stop()
		v.timer = nil
	}
	return v.onLock
}

// SetAutoLock sets the idle time after which the vault locks itself (0 or
// less: never) and a hook called after any lock (for the UI to return to
// the unlock screen). The default is DefaultIdleLock and no hook.
func (v *Vault) SetAutoLock(idle time.Duration, onLock func()) {
	v.mu.Lock()
	defer v.mu.Unlock()
	v.idle, v.onLock = idle, onLock
	v.armTimer()
}

// Touch records user activity, postponing the auto-lock. Vault operations
// touch it themselves; the UI calls Touch on input events.
func (v *Vault) Touch() {
	v.mu.Lock()
	defer v.mu.Unlock()
	v.lastUse = v.now()
}

// LockIfIdle locks the vault if it has been idle for the auto-lock time at
// now, and reports whether it did. The internal timer calls it; tests call it
// with chosen times.
func (v *Vault) LockIfIdle(now time.Time) bool {
	v.mu.Lock()
	if v.keys == nil || v.idle <= 0 || now.Sub(v.lastUse) < v.idle {
		v.armTimer()
		v.mu.Unlock()
		return false
	}
	hook := v.lockLocked()
	v.mu.Unlock()
	if hook != nil {
		hook()
	}
	return true
}

func (v *Vault) armTimer() {
	if v.timer != nil {
		v.timer.Stop()
		v.timer = nil
	}
	if v.keys == nil || v.idle <= 0 {
		return
	}
	wait := v.lastUse.Add(v.idle).Sub(v.now())
	if wait < time.Second {
		wait = time.Second
	}
	now := v.now
	v.timer = time.AfterFunc(wait, func() { v.LockIfIdle(now()) })
}

// SetClock replaces the clock the vault reads for its idle time (tests and
// simulations drive the auto-lock with it; the default is time.Now). The
// internal timer still waits in real time, then asks this clock.
func (v *Vault) SetClock(now func() time.Time) {
	if now == nil {
		now = time.Now
	}
	v.mu.Lock()
	defer v.mu.Unlock()
	v.now = now
	v.lastUse = now()
	v.armTimer()
}

// IdleLock returns the auto-lock time in force (0 or less: never).
func (v *Vault) IdleLock() time.Duration {
	v.mu.Lock()
	defer v.mu.Unlock()
	return v.idle
}

// KDF returns the key-derivation settings in the header (zero until the
// header has parsed at Unlock or Create).
func (v *Vault) KDF() KDFParams {
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.hdr == nil {
		return KDFParams{}
	}
	return v.hdr.kdf
}

// ChangePassphrase checks current, then re-wraps the same data key under
// next with a fresh salt and the settings kdf (pass DefaultKDF, or the
// vault's KDF()). Records are not touched. A wrong current passphrase
// returns ErrUnlock; a weak next one a *PassphraseError.
func (v *Vault) ChangePassphrase(ctx context.Context, current, next string, kdf KDFParams) error {
	if err := CheckPassphrase(next); err != nil {
		return err
	}
	if err := kdf.Validate(); err != nil {
		return err
	}
	h, dataKey, err := v.openHeader(current)
	if err != nil {
		return err
	}
	defer clear(dataKey)
	nh := &header{version: formatVersion, vaultID: h.vaultID}
	if err := nh.wrap([]byte(next), kdf, dataKey); err != nil {
		return err
	}
	nraw := nh.encode()
	if err := v.store.PutHeader(ctx, nraw); err != nil {
		return err
	}
	v.mu.Lock()
	defer v.mu.Unlock()
	v.raw, v.hdr = nraw, nh
	v.lastUse = v.now()
	return nil
}

// load reads and verifies the whole index. Called with v.mu held and keys
// present.
func (v *Vault) load(ctx context.Context) error {
	items, err := v.store.Index(ctx)
	if err != nil {
		return err
	}
	_, head, err := v.store.Meta(ctx)
	if err != nil {
		return err
	}
	v.verifyIndex(items, head)
	return nil
}

// verifyIndex opens every index and checks the chain and the head,
// filling the chain state and problems. Problems are named by record.
func (v *Vault) verifyIndex(items []IndexItem, head []byte) {
	id := v.hdr.vaultID
	v.entries = make([]IndexEntry, 0, len(items))
	v.bySeq = make(map[uint64]int, len(items))
	v.problems = nil
	prev, prevKnown := genesis(id), true
	expect := uint64(1)
	var lastSeq uint64
	for _, it := range items {
		if it.Seq == 0 || it.Seq < expect {
			v.problems = append(v.problems, Problem{Seq: it.Seq, Kind: Unexpected, Detail: "record number out of order or repeated"})
			continue
		}
		if it.Seq > expect {
			v.problems = append(v.problems, missing(expect, it.Seq-1, "not in the store"))
			prevKnown = false
		}
		expect, lastSeq = it.Seq+1, it.Seq
		plain, err := open(v.keys.seal, adIndex, id, it.Seq, it.Index)
		var e IndexEntry
		if err == nil {
			e, err = parseIndex(it.Seq, plain)
		}
		if err != nil {
			v.problems = append(v.problems, Problem{Seq: it.Seq, Kind: Damaged, Detail: "index fails authentication: changed, or moved from another position"})
			prevKnown = false
			continue
		}
		if prevKnown && e.prev != prev {
			v.problems = append(v.problems, Problem{Seq: it.Seq, Kind: ChainBroken, Detail: "does not follow " + RecordName(it.Seq-1) + ": a record before it was removed, replaced or reordered"})
		}
		prev, prevKnown = nextLink(e.prev, it.Seq, it.Index), true
		v.bySeq[it.Seq] = len(v.entries)
		v.entries = append(v.entries, e)
	}
	v.last = prev
	if !prevKnown && len(v.entries) > 0 {
		v.last = link{} // unknown: the next append will not chain to a readable record
	}
	v.headSeq = 0
	switch {
	case head == nil && len(items) == 0:
	case head == nil:
		v.problems = append(v.problems, Problem{Kind: HeadDamaged, Detail: "records present but no head"})
	default:
		hs, hl, ok := parseHead(v.keys.head, id, head)
		if !ok {
			v.problems = append(v.problems, Problem{Kind: HeadDamaged, Detail: "head fails authentication; truncation cannot be ruled out"})
			break
		}
		v.headSeq = hs
		switch {
		case hs > lastSeq:
			v.problems = append(v.problems, missing(lastSeq+1, hs, "after the last stored record: truncated"))
			v.last = hl
		case hs < lastSeq:
			for _, it := range items {
				if it.Seq > hs {
					v.problems = append(v.problems, Problem{Seq: it.Seq, Kind: Unexpected, Detail: "after the authenticated head " + RecordName(hs)})
				}
			}
		case prevKnown && hl != prev:
			v.problems = append(v.problems, Problem{Seq: hs, Kind: ChainBroken, Detail: "does not match the authenticated head"})
		}
	}
	v.nextSeq = max(lastSeq, v.headSeq) + 1
	v.loaded = true
}

func missing(from, to uint64, why string) Problem {
	d := RecordName(from)
	if to > from {
		d += " to " + RecordName(to)
	}
	return Problem{Seq: from, Kind: Missing, Detail: d + " missing " + why}
}

// List reads the index from the store, verifies the chain and returns the
// transports, newest first. Problems do not stop it: every readable entry
// is listed and each problem is named by record in Listing.Problems.
func (v *Vault) List(ctx context.Context) (*Listing, error) {
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.keys == nil {
		return nil, ErrLocked
	}
	v.lastUse = v.now()
	if err := v.load(ctx); err != nil {
		return nil, err
	}
	return v.listing(), nil
}

func (v *Vault) listing() *Listing {
	l := &Listing{
		Entries:  append([]IndexEntry(nil), v.entries...),
		Problems: append([]Problem(nil), v.problems...),
		Head:     v.headSeq,
	}
	l.Transports = summarise(l.Entries)
	return l
}

// Append validates e, seals it as the next record and stores it with the new
// head. It returns the record's index entry only once the store reports
// the write durable; on any error nothing is saved and the caller keeps the
// entry (ErrQuota: storage full). Append sets e.Seq and e.Written, and
// truncates e.At to the millisecond.
//
// Consistency rules: an open entry starts a new transport id; every other
// entry needs its transport opened in this vault; an amendment must name an
// earlier, readable, non-amendment entry of the same transport and carry a
// payload of the same kind (or Void).
func (v *Vault) Append(ctx context.Context, e *Entry) (IndexEntry, error) {
	e.At = e.At.UTC().Truncate(time.Millisecond)
	if err := e.Validate(); err != nil {
		return IndexEntry{}, err
	}
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.keys == nil {
		return IndexEntry{}, ErrLocked
	}
	v.lastUse = v.now()
	if !v.loaded {
		if err := v.load(ctx); err != nil {
			return IndexEntry{}, err
		}
	}
	ie, err := v.appendLocked(ctx, e)
	if errors.Is(err, ErrSeqExists) {
		// Another window appended first: re-read the chain and try once more.
		if err := v.load(ctx); err != nil {
			return IndexEntry{}, err
		}
		ie, err = v.appendLocked(ctx, e)
	}
	return ie, err
}

func (v *Vault) appendLocked(ctx context.Context, e *Entry) (IndexEntry, error) {
	of, err := v.checkConsistency(e)
	if err != nil {
		return IndexEntry{}, err
	}
	e.Seq = v.nextSeq
	e.Written = v.now().UTC().Truncate(time.Millisecond)
	plain, err := json.Marshal(e)
	if err != nil {
		return IndexEntry{}, fmt.Errorf("logbook: encode entry: %w", err)
	}
	id := v.hdr.vaultID
	body := seal(v.keys.seal, adBody, id, e.Seq, plain)
	ie := indexOf(e, of)
	ie.prev = v.last
	ie.bodyHash = sha256.Sum256(body)
	sealedIndex := seal(v.keys.seal, adIndex, id, e.Seq, ie.encode())
	l := nextLink(ie.prev, e.Seq, sealedIndex)
	head := encodeHead(v.keys.head, id, e.Seq, l)
	if err := v.store.Append(ctx, Sealed{Seq: e.Seq, Index: sealedIndex, Body: body}, head); err != nil {
		return IndexEntry{}, err
	}
	v.bySeq[e.Seq] = len(v.entries)
	v.entries = append(v.entries, ie)
	v.headSeq, v.nextSeq, v.last = e.Seq, e.Seq+1, l
	return ie, nil
}

func (v *Vault) checkConsistency(e *Entry) (Kind, error) {
	opened := false
	for i := range v.entries {
		if v.entries[i].Transport == e.Transport && v.entries[i].Kind == KindOpen {
			opened = true
			break
		}
	}
	switch {
	case e.Kind == KindOpen && opened:
		return 0, &FieldError{Field: "transport", Value: string(e.Transport), Allowed: "a new transport id (this one is already open in the vault)"}
	case e.Kind != KindOpen && !opened:
		return 0, &FieldError{Field: "transport", Value: string(e.Transport), Allowed: "a transport opened in this vault"}
	case e.Kind != KindAmend:
		return e.Kind, nil
	}
	i, ok := v.bySeq[e.Amends]
	if !ok {
		return 0, &FieldError{Field: "amends", Value: RecordName(e.Amends), Allowed: "a readable earlier record"}
	}
	t := v.entries[i]
	if t.Transport != e.Transport || t.Kind == KindAmend {
		return 0, &FieldError{Field: "amends", Value: RecordName(e.Amends), Allowed: "an original (not an amendment) entry of the same transport"}
	}
	if !e.Void && e.payloadKind() != t.Kind {
		return 0, &FieldError{Field: "amend", Value: e.payloadKind().String(), Allowed: "a replacement of the amended kind, " + t.Kind.String()}
	}
	return t.Kind, nil
}

// Read opens record seq: it checks the body against the hash in its index
// and returns the entry. A damaged body returns a *DamageError naming it.
func (v *Vault) Read(ctx context.Context, seq uint64) (*Entry, error) {
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.keys == nil {
		return nil, ErrLocked
	}
	v.lastUse = v.now()
	if !v.loaded {
		if err := v.load(ctx); err != nil {
			return nil, err
		}
	}
	return v.readLocked(ctx, seq)
}

func (v *Vault) readLocked(ctx context.Context, seq uint64) (*Entry, error) {
	i, ok := v.bySeq[seq]
	if !ok {
		return nil, NotFoundError(seq)
	}
	ie := v.entries[i]
	body, err := v.store.Body(ctx, seq)
	if err != nil {
		if errors.Is(err, ErrNotFound) {
			return nil, &DamageError{[]Problem{{Seq: seq, Kind: Missing, Detail: "body not in the store"}}}
		}
		return nil, err
	}
	if sum := sha256.Sum256(body); !bytes.Equal(sum[:], ie.bodyHash[:]) {
		return nil, &DamageError{[]Problem{{Seq: seq, Kind: Damaged, Detail: "body does not match its index"}}}
	}
	plain, err := open(v.keys.seal, adBody, v.hdr.vaultID, seq, body)
	if err != nil {
		return nil, &DamageError{[]Problem{{Seq: seq, Kind: Damaged, Detail: "body fails authentication"}}}
	}
	e := &Entry{}
	if err := json.Unmarshal(plain, e); err != nil || e.Transport != ie.Transport || e.Kind != ie.Kind {
		return nil, &DamageError{[]Problem{{Seq: seq, Kind: Damaged, Detail: "body does not decode or disagrees with its index"}}}
	}
	e.Seq = seq
	return e, nil
}

// Verify reads and checks every record, index and body, and returns every
// problem found (nil when the vault is intact).
func (v *Vault) Verify(ctx context.Context) ([]Problem, error) {
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.keys == nil {
		return nil, ErrLocked
	}
	v.lastUse = v.now()
	if err := v.load(ctx); err != nil {
		return nil, err
	}
	problems := append([]Problem(nil), v.problems...)
	for _, ie := range v.entries {
		if _, err := v.readLocked(ctx, ie.Seq); err != nil {
			var de *DamageError
			if !errors.As(err, &de) {
				return nil, err
			}
			problems = append(problems, de.Problems...)
		}
	}
	return problems, nil
}
