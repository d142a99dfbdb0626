package logbook

import (
	"bytes"
	"encoding/hex"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"golang.org/x/crypto/chacha20poly1305"
)

// An invented patient block as the Brief would save it (demo values).
var draftPlain = []byte(`{"schema":1,"patient":{"pao2":{"t":"61.37","u":"mmHg"}}}`)

func TestDraftRoundTripAndReplace(t *testing.T) {
	v, s := newTestVault(t)
	if _, err := v.LoadDraft(ctx); !errors.Is(err, ErrNoDraft) || !errors.Is(err, ErrNotFound) {
		t.Fatalf("empty slot: %v, want ErrNoDraft", err)
	}
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	got, err := v.LoadDraft(ctx)
	if err != nil || !bytes.Equal(got, draftPlain) {
		t.Fatalf("LoadDraft = %q, %v", got, err)
	}
	// Sealed: the stored blob never holds the plain text, and two saves of
	// the same text differ (fresh nonce).
	blob1, _ := s.GetSide(ctx, draftSlot)
	if bytes.Contains(blob1, []byte("61.37")) {
		t.Error("the draft is stored in plain")
	}
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	blob2, _ := s.GetSide(ctx, draftSlot)
	if bytes.Equal(blob1, blob2) || bytes.Equal(blob1[:chacha20poly1305.NonceSizeX], blob2[:chacha20poly1305.NonceSizeX]) {
		t.Error("two saves gave the same nonce")
	}
	// A save replaces the one before.
	next := []byte(`{"schema":1}`)
	if err := v.SaveDraft(ctx, next); err != nil {
		t.Fatal(err)
	}
	if got, _ := v.LoadDraft(ctx); !bytes.Equal(got, next) {
		t.Errorf("after a second save: %q", got)
	}
	if err := v.ClearDraft(ctx); err != nil {
		t.Fatal(err)
	}
	if _, err := v.LoadDraft(ctx); !errors.Is(err, ErrNoDraft) {
		t.Errorf("after ClearDraft: %v", err)
	}
	if err := v.ClearDraft(ctx); err != nil {
		t.Errorf("clearing an empty slot: %v", err)
	}
	if err := v.SaveDraft(ctx, make([]byte, MaxDraftSize+1)); !errors.Is(err, ErrInvalid) {
		t.Errorf("oversized draft: %v, want ErrInvalid", err)
	}
}

func TestDraftNeedsTheKey(t *testing.T) {
	v, _ := newTestVault(t)
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	v.Lock()
	if err := v.SaveDraft(ctx, draftPlain); !errors.Is(err, ErrLocked) {
		t.Errorf("SaveDraft locked: %v", err)
	}
	if _, err := v.LoadDraft(ctx); !errors.Is(err, ErrLocked) {
		t.Errorf("LoadDraft locked: %v", err)
	}
	if err := v.Unlock(ctx, testPass); err != nil {
		t.Fatal(err)
	}
	if got, err := v.LoadDraft(ctx); err != nil || !bytes.Equal(got, draftPlain) {
		t.Errorf("after unlock: %q %v", got, err)
	}
}

// The draft key is HKDF-SHA-256 (RFC 5869) of the data key with the label
// "alvea v1 draft", no salt: checked against `openssl kdf … HKDF` (external
// oracle). The blob opens with XChaCha20-Poly1305 under that key with the
// documented additional data, and with no other key or data.
func TestDraftKeyAndLayout(t *testing.T) {
	v, s := newTestVault(t)
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command("openssl", "kdf", "-keylen", "32", "-kdfopt", "digest:SHA256",
		"-kdfopt", "hexkey:"+hex.EncodeToString(v.keys.data), "-kdfopt", "info:alvea v1 draft", "HKDF").Output()
	if err != nil {
		t.Fatalf("openssl kdf oracle not available (install openssl): %v", err)
	}
	oracle, _ := hex.DecodeString(strings.ReplaceAll(strings.TrimSpace(string(out)), ":", ""))
	if !bytes.Equal(oracle, v.keys.draft) {
		t.Fatalf("draft key %x, openssl HKDF gives %x", v.keys.draft, oracle)
	}
	for _, other := range [][]byte{v.keys.seal, v.keys.head, v.keys.bundle, v.keys.data} {
		if bytes.Equal(other, v.keys.draft) {
			t.Fatal("the draft key equals another key")
		}
	}
	blob, _ := s.GetSide(ctx, draftSlot)
	aead, _ := chacha20poly1305.NewX(oracle)
	ad := append([]byte("alvea v1 draft"), v.hdr.vaultID[:]...)
	ad = append(ad, 0, 0, 0, 0, 0, 0, 0, 0)
	n := chacha20poly1305.NonceSizeX
	plain, err := aead.Open(nil, blob[:n], blob[n:], ad)
	if err != nil || !bytes.Equal(plain, draftPlain) {
		t.Fatalf("the blob does not open as documented: %v", err)
	}
	// Neither the record key nor the record roles open it.
	recAEAD, _ := chacha20poly1305.NewX(v.keys.seal)
	if _, err := recAEAD.Open(nil, blob[:n], blob[n:], ad); err == nil {
		t.Error("the record key opens the draft")
	}
	for _, role := range []string{adIndex, adBody} {
		if _, err := open(v.keys.draft, role, v.hdr.vaultID, 0, blob); err == nil {
			t.Errorf("the draft opens as a record %s", role)
		}
	}
}

// A changed byte anywhere, a blob cut short, or a draft copied from another
// vault fails authentication with ErrDamaged; the records are untouched.
func TestDraftTamperAndWrongVault(t *testing.T) {
	v, s := newTestVault(t)
	sampleTransport(t, v, t0)
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	good, _ := s.GetSide(ctx, draftSlot)
	for i := range good {
		bad := bytes.Clone(good)
		bad[i] ^= 0x01
		s.PutSide(ctx, draftSlot, bad)
		if _, err := v.LoadDraft(ctx); !errors.Is(err, ErrDamaged) {
			t.Fatalf("byte %d changed: %v, want ErrDamaged", i, err)
		}
	}
	for _, cut := range []int{0, 10, len(good) - 1} {
		s.PutSide(ctx, draftSlot, good[:cut])
		if _, err := v.LoadDraft(ctx); !errors.Is(err, ErrDamaged) {
			t.Errorf("cut at %d: %v", cut, err)
		}
	}
	if ps, err := v.Verify(ctx); err != nil || len(ps) != 0 {
		t.Errorf("a damaged draft is reported against the records: %v %v", ps, err)
	}

	// Another vault (other data key and vault id) cannot open this draft.
	w, ws := newTestVault(t)
	ws.PutSide(ctx, draftSlot, good)
	if _, err := w.LoadDraft(ctx); !errors.Is(err, ErrDamaged) {
		t.Errorf("a draft from another vault: %v, want ErrDamaged", err)
	}
}

// The draft is outside the chain: saving it appends no record, moves no
// head, and Verify, List and Export neither see it nor depend on it.
// Bundles do NOT carry the draft: an imported vault starts with none.
func TestDraftOutsideChainAndBundles(t *testing.T) {
	v, s := newTestVault(t)
	sampleTransport(t, v, t0)
	before, _ := v.List(ctx)
	_, headBefore, _ := s.Meta(ctx)
	bundleBefore := exportBundle(t, v)
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	after, _ := v.List(ctx)
	_, headAfter, _ := s.Meta(ctx)
	items, _ := s.Index(ctx)
	if len(after.Entries) != len(before.Entries) || after.Head != before.Head || len(items) != 8 || !bytes.Equal(headBefore, headAfter) {
		t.Errorf("saving a draft changed the chain: %d→%d entries, head %d→%d", len(before.Entries), len(after.Entries), before.Head, after.Head)
	}
	if ps, err := v.Verify(ctx); err != nil || len(ps) != 0 {
		t.Errorf("verify with a draft: %v %v", ps, err)
	}
	blob, _ := s.GetSide(ctx, draftSlot)
	bundle := exportBundle(t, v)
	if bytes.Contains(bundle, blob[chacha20poly1305.NonceSizeX:chacha20poly1305.NonceSizeX+16]) {
		t.Error("the bundle carries the sealed draft")
	}
	// The bundle is the same size as before the draft: records only (each
	// export seals nothing anew, only the header, head and records).
	if len(bundle) != len(bundleBefore) {
		t.Errorf("bundle grew by %d bytes with a draft saved", len(bundle)-len(bundleBefore))
	}
	fresh := NewMemStore()
	w, err := Import(ctx, fresh, bundle, testPass)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := w.LoadDraft(ctx); !errors.Is(err, ErrNoDraft) {
		t.Errorf("the imported vault has a draft: %v", err)
	}
	// Clear (an import rolled back) empties the side slots too.
	if err := s.Clear(ctx); err != nil {
		t.Fatal(err)
	}
	if _, err := s.GetSide(ctx, draftSlot); !errors.Is(err, ErrNotFound) {
		t.Errorf("side slot after Clear: %v", err)
	}
}

// The file store keeps the draft across a close and reopen (last frame
// wins; a delete frame empties it), and a torn final side frame is ignored
// like a torn record.
func TestDraftFileStoreReopen(t *testing.T) {
	path := filepath.Join(t.TempDir(), "vault.alvea-log")
	fs, err := OpenFileStore(path)
	if err != nil {
		t.Fatal(err)
	}
	v, err := Create(ctx, fs, testPass, MinimumKDF)
	if err != nil {
		t.Fatal(err)
	}
	v.SetAutoLock(0, nil)
	sampleTransport(t, v, t0)
	if err := v.SaveDraft(ctx, []byte("first")); err != nil {
		t.Fatal(err)
	}
	if err := v.SaveDraft(ctx, draftPlain); err != nil {
		t.Fatal(err)
	}
	fs.Close()
	good, _ := os.ReadFile(path)
	if bytes.Contains(good, []byte("61.37")) {
		t.Fatal("the draft is in the file in plain")
	}

	reopen := func() (*FileStore, *Vault) {
		t.Helper()
		fs, err := OpenFileStore(path)
		if err != nil {
			t.Fatal(err)
		}
		w, _ := Open(ctx, fs)
		if err := w.Unlock(ctx, testPass); err != nil {
			t.Fatal(err)
		}
		w.SetAutoLock(0, nil)
		return fs, w
	}
	fs, w := reopen()
	if got, err := w.LoadDraft(ctx); err != nil || !bytes.Equal(got, draftPlain) {
		t.Fatalf("after reopen: %q %v", got, err)
	}
	if ps, _ := w.Verify(ctx); len(ps) != 0 {
		t.Errorf("verify: %v", ps)
	}
	// A save torn half-way leaves the previous draft.
	if err := w.SaveDraft(ctx, []byte("torn")); err != nil {
		t.Fatal(err)
	}
	fs.Close()
	full, _ := os.ReadFile(path)
	os.WriteFile(path, full[:len(good)+(len(full)-len(good))/2], 0o600)
	fs, w = reopen()
	if got, err := w.LoadDraft(ctx); err != nil || !bytes.Equal(got, draftPlain) {
		t.Errorf("after a torn save: %q %v", got, err)
	}
	if err := w.ClearDraft(ctx); err != nil {
		t.Fatal(err)
	}
	fs.Close()
	fs, w = reopen()
	defer fs.Close()
	if _, err := w.LoadDraft(ctx); !errors.Is(err, ErrNoDraft) {
		t.Errorf("after clear and reopen: %v", err)
	}
	if l, _ := w.List(ctx); len(l.Entries) != 8 {
		t.Errorf("records after draft frames: %d", len(l.Entries))
	}
}

func TestSideNames(t *testing.T) {
	for _, ok := range []string{"draft", "a", "x-1", strings.Repeat("z", MaxSideName)} {
		if err := CheckSideName(ok); err != nil {
			t.Errorf("%q refused: %v", ok, err)
		}
	}
	for _, bad := range []string{"", "Draft", "head:x", "a b", strings.Repeat("z", MaxSideName+1), "é"} {
		if err := CheckSideName(bad); !errors.Is(err, ErrInvalid) {
			t.Errorf("%q accepted: %v", bad, err)
		}
		if err := NewMemStore().PutSide(ctx, bad, nil); err == nil {
			t.Errorf("memory store took side name %q", bad)
		}
	}
}
