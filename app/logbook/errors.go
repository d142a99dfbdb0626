package logbook

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// Sentinel errors a caller can test with errors.Is. User-facing sentences are
// written in the UI layer; these messages are for logs and developers.
var (
	// ErrUnlock is the one vague error of Unlock, Import and OpenBundle: the
	// passphrase is wrong or the header is damaged. It never says which.
	ErrUnlock = errors.New("logbook: wrong passphrase or damaged vault")
	// ErrLocked: the operation needs the data key and the vault is locked.
	ErrLocked = errors.New("logbook: vault is locked")
	// ErrNoVault: the store holds no vault yet (create one or import a bundle).
	ErrNoVault = errors.New("logbook: no vault in this store")
	// ErrVaultExists: Create or Import found a vault already in the store.
	ErrVaultExists = errors.New("logbook: a vault already exists in this store")
	// ErrWeakPassphrase: a new passphrase was refused; see *PassphraseError.
	ErrWeakPassphrase = errors.New("logbook: passphrase refused")
	// ErrInvalid: an entry failed validation; see *FieldError.
	ErrInvalid = errors.New("logbook: invalid entry")
	// ErrDamaged: stored or bundled data failed verification; see *DamageError.
	ErrDamaged = errors.New("logbook: damaged or tampered data")
	// ErrNotFound: no record with that sequence number or transport id.
	ErrNotFound = errors.New("logbook: not found")
	// ErrSeqExists: a store refused to overwrite an existing record (records
	// are append-only; another window may have written to the same vault).
	ErrSeqExists = errors.New("logbook: record already stored")
	// ErrQuota: the store refused a write for lack of space (browser quota or
	// full disk). The entry was not saved.
	ErrQuota = errors.New("logbook: storage full, entry not saved")
	// ErrBundle: a bundle file could not be read at all (not a bundle, wrong
	// version, or cut short before its records).
	ErrBundle = errors.New("logbook: not a readable bundle")
	// ErrKDFParams: key-derivation parameters are outside the accepted range.
	ErrKDFParams = errors.New("logbook: key-derivation parameters out of range")
)

// FieldError names the field of an entry that failed validation, the value
// given and what is allowed (range and unit). It unwraps to ErrInvalid.
type FieldError struct {
	Field   string // dotted path, e.g. "gauge.pressure_pa"
	Value   string // the value given, formatted
	Allowed string // e.g. "0 to 30000000 Pa", "1 to 4 letters A-Z"
}

func (e *FieldError) Error() string {
	return fmt.Sprintf("logbook: %s %s: allowed %s", e.Field, e.Value, e.Allowed)
}

func (e *FieldError) Unwrap() error { return ErrInvalid }

// PassphraseError says why a new passphrase was refused. It unwraps to
// ErrWeakPassphrase.
type PassphraseError struct {
	Reason string // "too short" (with MinLength), "common password", "one repeated character", "keyboard or number sequence"
	Min    int    // minimum length in characters, when Reason is "too short"
}

func (e *PassphraseError) Error() string {
	if e.Min > 0 {
		return fmt.Sprintf("logbook: passphrase %s (at least %d characters)", e.Reason, e.Min)
	}
	return "logbook: passphrase refused: " + e.Reason
}

func (e *PassphraseError) Unwrap() error { return ErrWeakPassphrase }

// ProblemKind classifies what verification found wrong with one record.
type ProblemKind int

const (
	// Damaged: the record's sealed index or body fails authentication (a
	// byte changed, or the record was moved to another position).
	Damaged ProblemKind = iota + 1
	// ChainBroken: the record opens but does not follow the record before it
	// (a record before it was removed, replaced or reordered).
	ChainBroken
	// Missing: the head says the record exists but the store does not hold it
	// (removed or truncated).
	Missing
	// Unexpected: the store holds a record after the authenticated head
	// (appended by something without the key, or a head write was lost).
	Unexpected
	// HeadDamaged: the authenticated head fails its check; truncation cannot
	// be ruled out.
	HeadDamaged
	// BundleDamaged: the bundle's whole-file check failed (bytes outside any
	// record changed, or a record was added or removed).
	BundleDamaged
)

var problemNames = [...]string{"", "damaged", "chain broken", "missing", "unexpected", "head damaged", "bundle check failed"}

func (k ProblemKind) String() string {
	if k > 0 && int(k) < len(problemNames) {
		return problemNames[k]
	}
	return "problem(" + strconv.Itoa(int(k)) + ")"
}

// Problem is one finding of verification, named by record.
type Problem struct {
	Seq    uint64 // the record's sequence number (0 for head or bundle problems)
	Kind   ProblemKind
	Detail string // lower-case detail for logs, e.g. "body hash does not match index"
}

// Record returns the record name used in reports, e.g. "R42".
func (p Problem) Record() string {
	if p.Seq == 0 {
		return "-"
	}
	return RecordName(p.Seq)
}

func (p Problem) String() string {
	if p.Seq == 0 {
		return p.Kind.String() + ": " + p.Detail
	}
	return p.Record() + " " + p.Kind.String() + ": " + p.Detail
}

// DamageError lists every problem verification found, by record. It
// unwraps to ErrDamaged.
type DamageError struct {
	Problems []Problem
}

func (e *DamageError) Error() string {
	parts := make([]string, 0, len(e.Problems))
	for i, p := range e.Problems {
		if i == 8 {
			parts = append(parts, fmt.Sprintf("and %d more", len(e.Problems)-i))
			break
		}
		parts = append(parts, p.String())
	}
	return "logbook: damaged or tampered data: " + strings.Join(parts, "; ")
}

func (e *DamageError) Unwrap() error { return ErrDamaged }

// RecordName is the short name of a record in reports: "R" and its sequence
// number in the vault, e.g. R1 for the first record.
func RecordName(seq uint64) string { return "R" + strconv.FormatUint(seq, 10) }
