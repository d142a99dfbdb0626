package logbook

import (
	"bytes"
	"crypto/rand"
	"fmt"

	"golang.org/x/crypto/chacha20poly1305"
)

// Vault header, format version 1 (binary, big-endian, our own):
//
//	magic      12 bytes  "alvea-vault\n"
//	version    1 byte    1
//	vault id   16 bytes  random
//	kdf        1 byte algorithm, u32 time, u32 memory KiB, 1 byte threads,
//	           u32 iterations, salt (uvarint length, 16 bytes)
//	nonce      24 bytes  XChaCha20-Poly1305 nonce of the key wrap
//	wrapped    uvarint length, 48 bytes: the data key sealed under the
//	           passphrase key, with every header byte before the nonce as
//	           additional data
//
// Because the wrap authenticates the whole header, a changed parameter,
// salt or id makes unlocking fail exactly as a wrong passphrase does.

const (
	headerMagic   = "alvea-vault\n"
	formatVersion = 1
	vaultIDLen    = 16
	maxHeaderSize = 256
)

type header struct {
	version uint8
	vaultID [vaultIDLen]byte
	kdf     KDFParams
	salt    []byte
	nonce   []byte
	wrapped []byte
}

// authPart encodes the header up to (not including) the wrap nonce: the
// additional data of the key wrap.
func (h *header) authPart() []byte {
	b := make([]byte, 0, 96)
	b = append(b, headerMagic...)
	b = putU8(b, h.version)
	b = append(b, h.vaultID[:]...)
	b = putU8(b, uint8(h.kdf.Algorithm))
	b = putU32(b, h.kdf.Time)
	b = putU32(b, h.kdf.MemoryKiB)
	b = putU8(b, h.kdf.Threads)
	b = putU32(b, h.kdf.Iterations)
	b = putBytes(b, h.salt)
	return b
}

func (h *header) encode() []byte {
	b := h.authPart()
	b = append(b, h.nonce...)
	return putBytes(b, h.wrapped)
}

// parseHeader reads a header. Any error is reported as ErrUnlock by its
// callers: a damaged header and a wrong passphrase look the same.
func parseHeader(data []byte) (*header, error) {
	if len(data) > maxHeaderSize {
		return nil, errShort
	}
	r := &reader{b: data}
	if !bytes.Equal(r.fixed(len(headerMagic)), []byte(headerMagic)) {
		return nil, errShort
	}
	h := &header{version: r.u8()}
	if r.err == nil && h.version != formatVersion {
		return nil, fmt.Errorf("logbook: vault format version %d not supported (this build reads %d)", h.version, formatVersion)
	}
	copy(h.vaultID[:], r.fixed(vaultIDLen))
	h.kdf.Algorithm = KDFAlgorithm(r.u8())
	h.kdf.Time = r.u32()
	h.kdf.MemoryKiB = r.u32()
	h.kdf.Threads = r.u8()
	h.kdf.Iterations = r.u32()
	h.salt = r.bytes(saltLen)
	h.nonce = r.fixed(chacha20poly1305.NonceSizeX)
	h.wrapped = r.bytes(keyLen + chacha20poly1305.Overhead)
	if err := r.done(); err != nil {
		return nil, err
	}
	if len(h.salt) != saltLen || len(h.wrapped) != keyLen+chacha20poly1305.Overhead {
		return nil, errShort
	}
	if err := h.kdf.Validate(); err != nil {
		return nil, err
	}
	return h, nil
}

// wrap derives the passphrase key with a fresh salt and seals dataKey.
func (h *header) wrap(passphrase []byte, kdf KDFParams, dataKey []byte) error {
	h.kdf = kdf
	h.salt = make([]byte, saltLen)
	h.nonce = make([]byte, chacha20poly1305.NonceSizeX)
	rand.Read(h.salt)
	rand.Read(h.nonce)
	kek, err := deriveKey(kdf, passphrase, h.salt, keyLen)
	if err != nil {
		return err
	}
	defer clear(kek)
	aead, err := chacha20poly1305.NewX(kek)
	if err != nil {
		return err
	}
	h.wrapped = aead.Seal(nil, h.nonce, dataKey, h.authPart())
	return nil
}

// unwrap returns the data key, or ErrUnlock.
func (h *header) unwrap(passphrase []byte) ([]byte, error) {
	kek, err := deriveKey(h.kdf, passphrase, h.salt, keyLen)
	if err != nil {
		return nil, ErrUnlock
	}
	defer clear(kek)
	aead, err := chacha20poly1305.NewX(kek)
	if err != nil {
		return nil, ErrUnlock
	}
	key, err := aead.Open(nil, h.nonce, h.wrapped, h.authPart())
	if err != nil || len(key) != keyLen {
		return nil, ErrUnlock
	}
	return key, nil
}
