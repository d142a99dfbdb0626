package logbook

import (
	"bytes"
	"context"
	"errors"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

func exportBundle(t testing.TB, v *Vault) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := v.Export(ctx, &b); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func TestBundleRoundTrip(t *testing.T) {
	v, _ := newTestVault(t)
	id := sampleTransport(t, v, t0)
	data := exportBundle(t, v)

	if _, err := OpenBundle(ctx, data, "not the passphrase"); !errors.Is(err, ErrUnlock) {
		t.Fatalf("wrong passphrase: %v", err)
	}
	dst := NewMemStore()
	w, err := Import(ctx, dst, data, testPass)
	if err != nil {
		t.Fatal(err)
	}
	tr, err := w.Transport(ctx, id)
	if err != nil || tr.Opening.Origin.Name != "Hill Clinic" || len(tr.Events) != 2 {
		t.Fatalf("imported transport: %+v %v", tr, err)
	}
	// The imported vault keeps growing: append, and its export opens clean.
	if _, err := w.Append(ctx, &Entry{Transport: id, Kind: KindNote, At: t0, Note: &Note{Text: "reviewed"}}); err != nil {
		t.Fatal(err)
	}
	if _, err := OpenBundle(ctx, exportBundle(t, w), testPass); err != nil {
		t.Fatal(err)
	}
	if _, err := Import(ctx, dst, data, testPass); !errors.Is(err, ErrVaultExists) {
		t.Errorf("import over a vault: %v", err)
	}
}

// mustDetect asserts that a changed bundle does not open clean.
func mustDetect(t *testing.T, data []byte, what string) {
	t.Helper()
	_, err := OpenBundle(ctx, data, testPass)
	if err == nil {
		t.Fatalf("%s: not detected", what)
	}
	if !errors.Is(err, ErrDamaged) && !errors.Is(err, ErrUnlock) && !errors.Is(err, ErrBundle) {
		t.Fatalf("%s: unexpected error %v", what, err)
	}
	dst := NewMemStore()
	if _, err := Import(ctx, dst, data, testPass); err == nil {
		t.Fatalf("%s: imported", what)
	}
	if _, _, err := dst.Meta(ctx); !errors.Is(err, ErrNoVault) {
		t.Fatalf("%s: refused import wrote to the store", what)
	}
}

// Property: every single-byte change at random positions is detected.
func TestBundleRandomByteChanges(t *testing.T) {
	v, _ := newTestVault(t)
	sampleTransport(t, v, t0)
	data := exportBundle(t, v)
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 60; i++ {
		pos := rng.IntN(len(data))
		changed := bytes.Clone(data)
		changed[pos] ^= byte(1 + rng.IntN(255))
		mustDetect(t, changed, "byte "+itoa(pos))
	}
}

// Full sweep over a small bundle (one record): every byte after the vault
// header changed once. Header bytes each cost a key derivation, so the
// header is covered by one change in each field (and TestDamagedHeaderIsVague
// changes every header byte of a stored vault).
func TestBundleFullSweep(t *testing.T) {
	v, s := newTestVault(t)
	id := NewTransportID(t0)
	if _, err := v.Append(ctx, &Entry{Transport: id, Kind: KindOpen, At: t0, Open: &Opening{Vehicle: "v"}}); err != nil {
		t.Fatal(err)
	}
	data := exportBundle(t, v)
	hdr, _, _ := s.Meta(ctx)
	start := len(bundleMagic) + 1 + 1 + len(hdr) // magic, version, header length, header
	// Header: first byte of each field, and its last byte.
	for _, off := range []int{0, 12, 13, 30, 31, 35, 39, 40, 44, 62, 86, len(hdr) - 1} {
		changed := bytes.Clone(data)
		changed[len(bundleMagic)+2+off] ^= 0x20
		mustDetect(t, changed, "header byte "+itoa(off))
	}
	// Header bytes unchanged: reuse the vault's keys instead of deriving.
	reuse := func(w *Vault) error {
		if !bytes.Equal(w.raw, hdr) {
			return w.Unlock(ctx, testPass)
		}
		h, err := parseHeader(w.raw)
		if err != nil {
			return err
		}
		k, err := deriveKeys(bytes.Clone(v.keys.data))
		w.hdr, w.keys = h, k
		return err
	}
	if _, err := openBundle(ctx, data, reuse); err != nil {
		t.Fatal(err)
	}
	for pos := 0; pos < len(data); pos++ {
		if pos >= len(bundleMagic)+2 && pos < start {
			continue // header bytes: sampled above
		}
		changed := bytes.Clone(data)
		changed[pos] ^= 0x01
		if _, err := openBundle(ctx, changed, reuse); err == nil {
			t.Fatalf("byte %d of %d changed: not detected", pos, len(data))
		}
	}
}

func TestBundleTruncationRemovalReorder(t *testing.T) {
	v, s := newTestVault(t)
	sampleTransport(t, v, t0)
	data := exportBundle(t, v)
	for _, n := range []int{1, 31, 32, 33, len(data) / 2, len(data) - 200, 20} {
		mustDetect(t, data[:len(data)-n], "cut "+itoa(n))
	}
	// Rebuild bundles from a tampered store (records removed, reordered),
	// signed again by the exporting vault: the chain still names records.
	cases := []struct {
		name string
		do   func(r map[uint64]Sealed)
		want string
	}{
		{"removed", func(r map[uint64]Sealed) { delete(r, 5) }, "R5 missing"},
		{"truncated", func(r map[uint64]Sealed) { delete(r, 8) }, "R8 missing"},
		{"reordered", func(r map[uint64]Sealed) {
			a, b := r[6], r[7]
			a.Seq, b.Seq = 7, 6
			r[6], r[7] = b, a
		}, "R6 damaged"},
	}
	for _, c := range cases {
		saved := map[uint64]Sealed{}
		s.tamper(func(_, _ *[]byte, r map[uint64]Sealed) { saved = clone(r); c.do(r) })
		bad := exportBundle(t, v)
		s.tamper(func(_, _ *[]byte, r map[uint64]Sealed) {
			clear(r)
			for k, x := range saved {
				r[k] = x
			}
		})
		_, err := OpenBundle(ctx, bad, testPass)
		var de *DamageError
		if !errors.As(err, &de) || !strings.Contains(de.Error(), c.want) {
			t.Errorf("%s: %v, want it to name %q", c.name, err, c.want)
		}
		mustDetect(t, bad, c.name)
	}
}

func TestImportRollsBackOnWriteFailure(t *testing.T) {
	v, _ := newTestVault(t)
	sampleTransport(t, v, t0)
	data := exportBundle(t, v)
	dst := &failingStore{Store: NewMemStore(), failAt: 4}
	if _, err := Import(ctx, dst, data, testPass); !errors.Is(err, ErrQuota) {
		t.Fatalf("import: %v, want ErrQuota", err)
	}
	if _, _, err := dst.Meta(ctx); !errors.Is(err, ErrNoVault) {
		t.Error("failed import left a partial vault")
	}
}

type failingStore struct {
	Store
	n, failAt int
}

func (f *failingStore) Append(c context.Context, rec Sealed, head []byte) error {
	f.n++
	if f.n == f.failAt {
		return ErrQuota
	}
	return f.Store.Append(c, rec, head)
}

func TestFileStoreVaultAndTornWrite(t *testing.T) {
	path := filepath.Join(t.TempDir(), "vault.alvea-log")
	fs, err := OpenFileStore(path)
	if err != nil {
		t.Fatal(err)
	}
	v, err := Create(ctx, fs, testPass, MinimumKDF)
	if err != nil {
		t.Fatal(err)
	}
	sampleTransport(t, v, t0)
	fs.Close()
	good, _ := os.ReadFile(path)

	// Append a ninth record, then cut the file at every length inside that
	// final frame: each cut reopens with exactly the eight committed
	// records, no half record, and accepts the next append.
	fs, _ = OpenFileStore(path)
	v, _ = Open(ctx, fs)
	if err := v.Unlock(ctx, testPass); err != nil {
		t.Fatal(err)
	}
	l, _ := v.List(ctx)
	if _, err := v.Append(ctx, &Entry{Transport: l.Transports[0].ID, Kind: KindNote, At: t0, Note: &Note{Text: "torn"}}); err != nil {
		t.Fatal(err)
	}
	fs.Close()
	full, _ := os.ReadFile(path)
	// Every cut point would cost a key derivation each; take every cut in
	// the frame's length field and checksum, and a stride through the rest.
	var cuts []int
	for cut := len(good); cut < len(full); cut++ {
		if cut < len(good)+6 || cut > len(full)-6 || (cut-len(good))%37 == 0 {
			cuts = append(cuts, cut)
		}
	}
	for _, cut := range cuts {
		os.WriteFile(path, full[:cut], 0o600)
		fs, err := OpenFileStore(path)
		if err != nil {
			t.Fatalf("cut %d: %v", cut, err)
		}
		w, _ := Open(ctx, fs)
		if err := w.Unlock(ctx, testPass); err != nil {
			t.Fatal(err)
		}
		if ps, err := w.Verify(ctx); err != nil || len(ps) != 0 {
			t.Fatalf("cut %d: %v %v", cut, ps, err)
		}
		l, _ := w.List(ctx)
		if l.Head != 8 || len(l.Entries) != 8 {
			t.Fatalf("cut %d: head %d, %d entries", cut, l.Head, len(l.Entries))
		}
		if cut == len(full)-1 {
			// The next append after a torn write lands cleanly.
			if _, err := w.Append(ctx, &Entry{Transport: l.Transports[0].ID, Kind: KindNote, At: t0, Note: &Note{Text: "after"}}); err != nil {
				t.Fatal(err)
			}
			fs.Close()
			fs, _ = OpenFileStore(path)
			w, _ = Open(ctx, fs)
			w.Unlock(ctx, testPass)
			if ps, _ := w.Verify(ctx); len(ps) != 0 {
				t.Fatalf("after torn write and append: %v", ps)
			}
		}
		fs.Close()
	}

	// A damaged frame in the middle: skipped, its record named missing.
	damaged := bytes.Clone(good)
	damaged[len(good)/2] ^= 0xff // inside an early record's frame
	os.WriteFile(path, damaged, 0o600)
	fs, _ = OpenFileStore(path)
	defer fs.Close()
	w, _ := Open(ctx, fs)
	w.Unlock(ctx, testPass)
	ps, _ := w.Verify(ctx)
	if len(ps) == 0 || fs.Skipped() != 1 {
		t.Fatalf("middle damage: %v skipped %d", ps, fs.Skipped())
	}
}

func itoa(i int) string { return strconv.Itoa(i) }
