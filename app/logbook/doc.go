// Package logbook is Alvea's transport log: the record model, the encrypted
// and hash-chained vault that holds it, its stores, and bundle export and
// import. Pure Go: it never imports go-app or syscall/js (the IndexedDB
// store lives in package idb); it imports physio only to count cylinders.
//
// # Record model
//
// A transport is not saved as one document. It is a sequence of entries,
// each appended as its own sealed record:
//
//	open      route (origin/destination with elevations), vehicle, crew
//	          initials, minimal patient description, the Brief snapshot,
//	          cylinders on board
//	event     lift-off, landing, handover, cylinder change, … (timed)
//	gauge     one cylinder's gauge pressure at a time
//	observe   SpO2, FiO2, device, flow, respiratory rate, EtCO2, heart rate
//	note      free text
//	cylinder  a cylinder brought into use later
//	brief     a new Brief snapshot (the plan amended in flight)
//	close     the transport is closed
//	amend     a correction: names the record it corrects (Amends), says
//	          why, and carries the replacement payload, or Void to withdraw
//
// Why entries and not a snapshot per save: each one-tap entry during a
// flight is one small append, so a crash loses at most the entry being
// written; nothing already saved is ever rewritten; a correction is
// visibly a new record pointing at the old one (the old stays readable in
// Transport.History); and the audit reads gauge readings and observations
// directly as timed series. Fold (or Vault.Transport) applies corrections
// and gives the transport as it now stands.
//
// Ids: a record is named by its sequence number in the vault, "R42". A
// transport has a TransportID of our own format, T + UTC opening date +
// "-" + six Crockford base-32 random characters + a mod-37 check
// character, e.g. T20310902-7KQ3M9X.
//
// Units: quantities use physio's canonical units (pressure Pa, altitude m,
// flow L/min, volume L, fractions 0–1); JSON field names carry the unit.
// A cylinder is defined as physio counts it (CGA size, water capacity, or
// label contents at a pressure), so Transport.CylinderUse gives the oxygen
// used per cylinder from its gauge readings.
//
// Patient identity is minimal (age band, sex, weight). Patient.Identifying
// is optional free text that identifies the patient: stored only encrypted,
// flagged in the index (FlagIdentifying) so lists and exports can warn.
//
// # Vault
//
// A passphrase (CheckPassphrase: at least 10 characters, not one of the
// commonest passwords) unlocks a random 256-bit data key, wrapped with
// XChaCha20-Poly1305 under a key from Argon2id (DefaultKDF: 64 MiB, 5
// passes, 1 lane) or PBKDF2-HMAC-SHA-256 (≥ 600 000 iterations). The
// header holds the format version, a random vault id, the KDF and its
// parameters and salt, and the wrapped key; the whole header is the wrap's
// additional data, so any change to it fails like a wrong passphrase (one
// vague ErrUnlock). ChangePassphrase re-wraps the data key only.
//
// HKDF-SHA-256 derives from the data key one key to seal records, one to
// authenticate the chain head, one for bundle checks and one for the draft
// slot. Each record is two
// XChaCha20-Poly1305 blobs with fresh random 24-byte nonces and the vault id
// and sequence number as additional data: a small index (transport,
// kind, time, vehicle, route, flags, the previous record's link and the
// SHA-256 of the body) and the body (the entry as JSON). The chain link of
// a record hashes the previous link, its number and its sealed index; the
// head (last number and link) carries an HMAC and is written atomically
// with each record. Verification reports by record: Damaged (fails
// authentication or moved), ChainBroken, Missing (gap, or truncated below
// the head), Unexpected, HeadDamaged, BundleDamaged. A damaged record does
// not hide the others.
//
// Listing (Vault.List) opens only the small indexes and checks the chain;
// bodies are read when a transport is opened (Vault.Transport, Read) or
// for a full check (Verify).
//
// Lock zeroes the key bytes and drops everything decrypted; the vault locks
// itself after DefaultIdleLock without use (SetAutoLock, Touch; SetClock
// lets tests drive the idle time).
//
// # Draft slot
//
// SaveDraft, LoadDraft and ClearDraft keep one sealed blob beside the
// records (the Brief's patient block while the crew fills it in), under a
// fourth HKDF key, in a store side slot (Store.PutSide). It is overwritten,
// never appended, chained, listed, audited or exported; draft.go says why
// that leaves the chain as strong as before.
//
// # Stores
//
// Store keeps only ciphertext under numeric keys (and named side slots):
// NewMemStore, the crash-safe append-only OpenFileStore, and idb.Store in
// the browser.
//
// # Bundles
//
// Export writes the store's bytes as one bundle (format of our own,
// versioned) with an HMAC over the whole file; OpenBundle verifies it all
// and reports by record; Import writes only a bundle that verified clean.
//
// # Sources
//
//   - RFC 9106 (Argon2), via golang.org/x/crypto/argon2; checked against the
//     reference implementation's argon2 command line.
//   - RFC 8018 PBKDF2 with HMAC-SHA-256 (crypto/pbkdf2); checked against
//     RFC 7914 §11 vectors and openssl kdf.
//   - XChaCha20-Poly1305 (draft-irtf-cfrg-xchacha; RFC 8439 for
//     ChaCha20-Poly1305), golang.org/x/crypto/chacha20poly1305.
//   - RFC 5869 HKDF, RFC 2104 HMAC, FIPS 180-4 SHA-256 (standard library).
//   - OWASP Password Storage Cheat Sheet minimums (common practice).
//   - Crockford's base-32 alphabet and check symbol (published spec).
package logbook
