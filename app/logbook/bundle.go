package logbook

import (
	"bytes"
	"context"
	"crypto/hmac"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
)

// Bundle, format version 1 (binary, our own): the whole vault in one file
// for transfer to an auditor. It is exactly what the store holds (sealed
// header, head and records), so the same passphrase opens it, plus a
// whole-file check:
//
//	magic    13 bytes "alvea-bundle\n"
//	version  1 byte   1
//	header   uvarint length, bytes (the vault header)
//	head     uvarint length, bytes (the authenticated chain head)
//	count    uvarint
//	records  count × (seq uvarint, index uvarint-length bytes, body uvarint-length bytes)
//	check    32 bytes HMAC-SHA-256 under the bundle key (derived from the
//	         data key) over every byte before it
//
// Every record is also sealed and chained, so a damaged bundle is reported
// by record; the check covers the bytes between them.
const (
	bundleMagic   = "alvea-bundle\n"
	bundleVersion = 1
	maxIndexSize  = 4 << 10
	maxBodySize   = 2 << 20
	// BundleExt is the file name extension of bundles.
	BundleExt = ".alvea-bundle"
)

// Export writes the whole vault as one bundle to w. The vault must be
// unlocked (the whole-file check needs the data key). It exports what the
// store holds, damaged records included, so an auditor sees the same.
func (v *Vault) Export(ctx context.Context, w io.Writer) error {
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.keys == nil {
		return ErrLocked
	}
	v.lastUse = v.now()
	header, head, err := v.store.Meta(ctx)
	if err != nil {
		return err
	}
	items, err := v.store.Index(ctx)
	if err != nil {
		return err
	}
	var b bytes.Buffer
	b.WriteString(bundleMagic)
	b.WriteByte(bundleVersion)
	b.Write(putBytes(nil, header))
	b.Write(putBytes(nil, head))
	b.Write(appendUvarint(nil, uint64(len(items))))
	for _, it := range items {
		body, err := v.store.Body(ctx, it.Seq)
		if err != nil && !errors.Is(err, ErrNotFound) {
			return err
		}
		rec := appendUvarint(nil, it.Seq)
		rec = putBytes(rec, it.Index)
		b.Write(putBytes(rec, body))
	}
	m := hmac.New(sha256.New, v.keys.bundle)
	m.Write(b.Bytes())
	b.Write(m.Sum(nil))
	_, err = w.Write(b.Bytes())
	return err
}

// parsedBundle is a bundle read as far as its structure allows.
type parsedBundle struct {
	header, head []byte
	records      []Sealed
	problems     []Problem // structure problems (cut short, bad check)
	signed       []byte    // bytes the check covers
	check        []byte    // the check, nil if absent
}

// parseBundle reads a bundle's structure. It returns ErrBundle only when
// not even the header can be read; a bundle cut short later keeps the
// records read so far and notes the problem.
func parseBundle(data []byte) (*parsedBundle, error) {
	if len(data) == 0 {
		return nil, fmt.Errorf("%w: the file is empty", ErrBundle)
	}
	r := &reader{b: data}
	if !bytes.Equal(r.fixed(len(bundleMagic)), []byte(bundleMagic)) {
		return nil, fmt.Errorf("%w: not a logbook bundle (it does not start with the bundle signature)", ErrBundle)
	}
	ver := r.u8()
	if r.err != nil {
		return nil, fmt.Errorf("%w: cut short after the bundle signature", ErrBundle)
	}
	if ver != bundleVersion {
		return nil, fmt.Errorf("%w: version %d (this build reads %d)", ErrBundle, ver, bundleVersion)
	}
	p := &parsedBundle{header: r.bytes(maxHeaderSize)}
	p.head = r.bytes(headSize)
	if r.err != nil {
		return nil, fmt.Errorf("%w: cut short in the vault header, %d bytes in all", ErrBundle, len(data))
	}
	count := r.uvarint()
	for i := uint64(0); r.err == nil && i < count; i++ {
		seq := r.uvarint()
		idx := r.bytes(maxIndexSize)
		body := r.bytes(maxBodySize)
		if r.err != nil {
			p.problems = append(p.problems, Problem{Kind: BundleDamaged, Detail: fmt.Sprintf("bundle cut short or malformed after %d of %d records", i, count)})
			break
		}
		p.records = append(p.records, Sealed{Seq: seq, Index: idx, Body: body})
	}
	if r.err == nil {
		p.signed = data[:len(data)-len(r.b)]
		p.check = r.fixed(sha256.Size)
		if r.err != nil || len(r.b) != 0 {
			p.check = nil
		}
	}
	if p.check == nil && len(p.problems) == 0 {
		p.problems = append(p.problems, Problem{Kind: BundleDamaged, Detail: "whole-file check missing or trailing bytes"})
	}
	return p, nil
}

// CheckBundle reads a bundle's structure without a passphrase: ErrBundle,
// saying why, when data is not a readable bundle at all (the same test
// OpenBundle makes first), so that a wrong file is named before anyone is
// asked for a passphrase. A nil error says nothing about the records.
func CheckBundle(data []byte) error {
	_, err := parseBundle(data)
	return err
}

// OpenBundle unlocks a bundle into a fresh in-memory store and verifies
// everything: the whole-file check, the chain, every index and every body.
// It returns ErrBundle if the data is not a bundle and ErrUnlock for a wrong
// passphrase or damaged header. When records fail it returns the vault AND
// a *DamageError naming each problem by record: the rest stay readable
// (`alvea audit` prints them and exits with its damage status). Nothing is
// ever written back to the bundle.
func OpenBundle(ctx context.Context, data []byte, passphrase string) (*Vault, error) {
	return openBundle(ctx, data, func(v *Vault) error { return v.Unlock(ctx, passphrase) })
}

// openBundle is OpenBundle with the unlock step given (tests reuse derived
// keys to sweep many changed copies without a key derivation each).
func openBundle(ctx context.Context, data []byte, unlock func(*Vault) error) (*Vault, error) {
	p, err := parseBundle(data)
	if err != nil {
		return nil, err
	}
	store := &memStore{records: map[uint64]Sealed{}, header: p.header}
	v := newVault(store, p.header)
	v.idle = 0
	if err := unlock(v); err != nil {
		return nil, err
	}
	problems := append([]Problem(nil), p.problems...)
	if p.check != nil {
		m := hmac.New(sha256.New, v.keys.bundle)
		m.Write(p.signed)
		if !hmac.Equal(m.Sum(nil), p.check) {
			problems = append(problems, Problem{Kind: BundleDamaged, Detail: "whole-file check failed"})
		}
	}
	if len(p.head) > 0 {
		store.head = p.head
	}
	for _, rec := range p.records {
		if _, dup := store.records[rec.Seq]; dup {
			problems = append(problems, Problem{Seq: rec.Seq, Kind: Unexpected, Detail: "record number repeated in the bundle"})
			continue
		}
		store.records[rec.Seq] = rec
	}
	found, err := v.Verify(ctx)
	if err != nil {
		return nil, err
	}
	problems = append(problems, found...)
	if len(problems) > 0 {
		return v, &DamageError{Problems: problems}
	}
	return v, nil
}

// Import verifies a bundle completely and only then writes it into store,
// which must hold no vault (ErrVaultExists). A bundle with any problem is
// refused with its *DamageError and nothing is written. If a write fails
// part-way the store is cleared again. The imported vault is returned
// unlocked, with the same passphrase and vault id as the bundle.
func Import(ctx context.Context, store Store, data []byte, passphrase string) (*Vault, error) {
	if _, _, err := store.Meta(ctx); err == nil {
		return nil, ErrVaultExists
	} else if !errors.Is(err, ErrNoVault) {
		return nil, err
	}
	src, err := OpenBundle(ctx, data, passphrase)
	if err != nil {
		return nil, err
	}
	defer src.Lock()
	srcStore := src.store.(*memStore)
	items, _ := srcStore.Index(ctx)
	if err := store.PutHeader(ctx, srcStore.header); err != nil {
		return nil, err
	}
	rollback := func(err error) (*Vault, error) {
		if cerr := store.Clear(ctx); cerr != nil {
			return nil, fmt.Errorf("%w (and rolling back failed: %v)", err, cerr)
		}
		return nil, err
	}
	id := src.hdr.vaultID
	for _, it := range items {
		rec := srcStore.records[it.Seq]
		ie := src.entries[src.bySeq[it.Seq]]
		head := encodeHead(src.keys.head, id, it.Seq, nextLink(ie.prev, it.Seq, rec.Index))
		if err := store.Append(ctx, rec, head); err != nil {
			return rollback(err)
		}
	}
	// Hand over the keys already derived instead of running the KDF again.
	k, err := deriveKeys(bytes.Clone(src.keys.data))
	if err != nil {
		return rollback(err)
	}
	v := newVault(store, srcStore.header)
	v.hdr = src.hdr
	v.setKeys(k)
	return v, nil
}
