package logbook

import (
	"context"
	"errors"
	"fmt"
	"strconv"

	"golang.org/x/crypto/chacha20poly1305"
)

// The draft slot: one sealed blob kept beside the records, for a form the
// crew is still filling in (the Brief's patient block), so that it survives
// a reload without ever lying in plain browser storage.
//
// It is a draft, not a record. Each save replaces the one before; nothing
// of it is appended, chained, listed, audited or exported. That is on
// purpose, and it leaves the chain as strong as before:
//
//   - It is sealed with its own key (HKDF-SHA-256 of the data key, label
//     "alvea v1 draft"), never the record key, and with its own additional
//     data ("alvea v1 draft" | vault id | eight zero bytes), so a draft blob
//     cannot be passed off as a record index or body, nor a record as a
//     draft, nor a draft of one vault as another's.
//   - Chain verification (List, Verify), Read, Transport, Export and the
//     audit never read the side slot; the head covers only records. A
//     tampered, removed or replaced draft cannot hide, add or change a
//     record, and a damaged draft is never reported as a damaged record.
//   - What a draft holds becomes part of the log only when the crew starts
//     a transport: then the Brief snapshot is appended as a sealed, chained
//     record like any other.
//
// What an attacker with write access to the storage can do to the slot: put
// back an older sealed draft of the same vault (nothing orders drafts), or
// delete it. Either brings back or loses unsaved form values, never a
// record; they still cannot read or forge a draft without the passphrase.
const (
	draftSlot = "draft"
	adDraft   = "alvea v1 draft"

	// MaxDraftSize is the largest draft SaveDraft accepts, in bytes.
	MaxDraftSize = 64 << 10
	// maxSideSize bounds a side-slot blob: a sealed draft.
	maxSideSize = chacha20poly1305.NonceSizeX + MaxDraftSize + chacha20poly1305.Overhead
)

// ErrNoDraft: the draft slot is empty (LoadDraft). It unwraps to
// ErrNotFound.
var ErrNoDraft = fmt.Errorf("%w: no draft saved", ErrNotFound)

// errDraftDamaged: the draft blob fails authentication (changed, from
// another vault, or cut short). It unwraps to ErrDamaged.
var errDraftDamaged = fmt.Errorf("%w: the saved draft fails authentication", ErrDamaged)

// SaveDraft seals plain with a fresh random nonce under the draft key and
// stores it in the draft slot, replacing any draft there. It needs the vault
// unlocked (ErrLocked otherwise) and plain at most MaxDraftSize bytes
// (*FieldError). It returns once the store has written it; on error the
// slot holds the previous draft or none.
//
// Sealing happens under the vault's lock, the write after it, so a Lock
// never waits for storage; a draft sealed just before a lock may still be
// written (it is ciphertext like any other).
func (v *Vault) SaveDraft(ctx context.Context, plain []byte) error {
	if len(plain) > MaxDraftSize {
		return &FieldError{Field: "draft", Value: strconv.Itoa(len(plain)) + " bytes", Allowed: "at most " + strconv.Itoa(MaxDraftSize) + " bytes"}
	}
	v.mu.Lock()
	if v.keys == nil {
		v.mu.Unlock()
		return ErrLocked
	}
	blob := seal(v.keys.draft, adDraft, v.hdr.vaultID, 0, plain)
	v.mu.Unlock()
	return v.store.PutSide(ctx, draftSlot, blob)
}

// LoadDraft returns the draft last saved. It returns ErrLocked while the
// vault is locked, ErrNoDraft when none is saved, and an error that
// unwraps to ErrDamaged when the stored blob fails authentication (the
// caller may then ClearDraft; records are not concerned).
func (v *Vault) LoadDraft(ctx context.Context) ([]byte, error) {
	v.mu.Lock()
	if v.keys == nil {
		v.mu.Unlock()
		return nil, ErrLocked
	}
	key := append([]byte(nil), v.keys.draft...)
	id := v.hdr.vaultID
	v.mu.Unlock()
	defer clear(key)
	blob, err := v.store.GetSide(ctx, draftSlot)
	if errors.Is(err, ErrNotFound) {
		return nil, ErrNoDraft
	} else if err != nil {
		return nil, err
	}
	plain, err := open(key, adDraft, id, 0, blob)
	if err != nil {
		return nil, errDraftDamaged
	}
	return plain, nil
}

// ClearDraft empties the draft slot. It needs no key (it removes
// ciphertext only) and works locked or unlocked.
func (v *Vault) ClearDraft(ctx context.Context) error {
	return v.store.DeleteSide(ctx, draftSlot)
}
