package logbook

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// Fuzz the parsers that read bytes from storage or a file: no panic, and
// nothing that fails a check is accepted.

func FuzzParseHeader(f *testing.F) {
	v, s := newTestVault(f)
	_ = v
	hdr, _, _ := s.Meta(ctx)
	f.Add(hdr)
	f.Add([]byte(headerMagic))
	f.Fuzz(func(t *testing.T, data []byte) {
		h, err := parseHeader(data)
		if err == nil {
			if h.kdf.Validate() != nil {
				t.Fatal("accepted a header with out-of-range KDF settings")
			}
			if !bytes.Equal(h.encode(), data) {
				t.Fatal("header does not re-encode to its bytes")
			}
		}
	})
}

func FuzzParseBundle(f *testing.F) {
	v, _ := newTestVault(f)
	sampleTransport(f, v, t0)
	var b bytes.Buffer
	v.Export(ctx, &b)
	f.Add(b.Bytes())
	f.Add([]byte(bundleMagic + "\x01"))
	keysData := bytes.Clone(v.keys.data)
	hdr := bytes.Clone(v.raw)
	f.Fuzz(func(t *testing.T, data []byte) {
		// Reuse keys when the header is the seed's; otherwise only parse
		// (a key derivation per input would starve the fuzzer).
		_, _ = openBundle(ctx, data, func(w *Vault) error {
			if !bytes.Equal(w.raw, hdr) {
				return ErrUnlock
			}
			h, _ := parseHeader(w.raw)
			k, err := deriveKeys(bytes.Clone(keysData))
			w.hdr, w.keys = h, k
			return err
		})
	})
}

func FuzzIndexAndHead(f *testing.F) {
	ie := IndexEntry{Transport: NewTransportID(t0), Kind: KindOpen, Of: KindOpen, At: t0, Vehicle: "v"}
	f.Add(ie.encode())
	f.Fuzz(func(t *testing.T, data []byte) {
		if e, err := parseIndex(1, data); err == nil && !bytes.Equal(e.encode(), data) {
			t.Fatal("index does not re-encode to its bytes")
		}
		var id [vaultIDLen]byte
		if _, _, ok := parseHead(make([]byte, 32), id, data); ok && len(data) != headSize {
			t.Fatal("accepted a head of the wrong size")
		}
	})
}

func FuzzFileStoreScan(f *testing.F) {
	dir := f.TempDir()
	path := filepath.Join(dir, "seed.alvea-log")
	fs, _ := OpenFileStore(path)
	v, _ := Create(ctx, fs, testPass, MinimumKDF)
	sampleTransport(f, v, t0)
	v.SaveDraft(ctx, []byte("draft")) // side frames 'S' and 'D' too
	v.ClearDraft(ctx)
	fs.Close()
	seed, _ := os.ReadFile(path)
	f.Add(seed)
	f.Fuzz(func(t *testing.T, data []byte) {
		s := &FileStore{records: map[uint64]Sealed{}}
		if err := s.scan(data); err == nil && s.end > int64(len(data)) {
			t.Fatal("kept offset beyond the data")
		}
	})
}
