package logbook

import (
	"crypto/hkdf"
	"crypto/hmac"
	"crypto/rand"
	"crypto/sha256"
	"crypto/subtle"
	"errors"

	"golang.org/x/crypto/chacha20poly1305"
)

// Keys. The random 256-bit data key never leaves memory unwrapped; four
// subkeys are derived from it with HKDF-SHA-256 (RFC 5869), one per purpose,
// so a key is never used for two jobs.
type keys struct {
	data   []byte
	seal   []byte // XChaCha20-Poly1305 key for record indexes and bodies
	head   []byte // HMAC-SHA-256 key of the chain head
	bundle []byte // HMAC-SHA-256 key over a whole export bundle
	draft  []byte // XChaCha20-Poly1305 key of the draft slot (draft.go)
}

func deriveKeys(data []byte) (*keys, error) {
	k := &keys{data: data}
	var err error
	for _, s := range []struct {
		dst  *[]byte
		info string
	}{{&k.seal, "alvea v1 record seal"}, {&k.head, "alvea v1 chain head"}, {&k.bundle, "alvea v1 bundle"}, {&k.draft, "alvea v1 draft"}} {
		if *s.dst, err = hkdf.Key(sha256.New, data, nil, s.info, keyLen); err != nil {
			return nil, err
		}
	}
	return k, nil
}

// wipe overwrites every key byte. Go may have copied key bytes elsewhere
// (the garbage collector moves nothing, but AEAD instances hold copies until
// collected); we build AEADs per call so no long-lived copy remains.
func (k *keys) wipe() {
	if k == nil {
		return
	}
	clear(k.data)
	clear(k.seal)
	clear(k.head)
	clear(k.bundle)
	clear(k.draft)
}

// Sealed blob layout: 24-byte random nonce, then XChaCha20-Poly1305
// ciphertext and tag. Additional data binds the blob to its purpose, the
// vault and its position:
//
//	"alvea v1 index" | "alvea v1 body", vault id (16), seq (8, big-endian)
//
// so a blob copied to another position, another vault or the other role
// fails to open.
const (
	adIndex = "alvea v1 index"
	adBody  = "alvea v1 body"
)

func recordAD(role string, vaultID [vaultIDLen]byte, seq uint64) []byte {
	b := make([]byte, 0, len(role)+vaultIDLen+8)
	b = append(b, role...)
	b = append(b, vaultID[:]...)
	return putU64(b, seq)
}

func seal(key []byte, role string, vaultID [vaultIDLen]byte, seq uint64, plain []byte) []byte {
	aead, err := chacha20poly1305.NewX(key)
	if err != nil {
		panic("logbook: seal key length") // keys are always 32 bytes
	}
	out := make([]byte, chacha20poly1305.NonceSizeX, chacha20poly1305.NonceSizeX+len(plain)+chacha20poly1305.Overhead)
	rand.Read(out)
	return aead.Seal(out, out, plain, recordAD(role, vaultID, seq))
}

var errOpen = errors.New("logbook: authentication failed")

func open(key []byte, role string, vaultID [vaultIDLen]byte, seq uint64, blob []byte) ([]byte, error) {
	if len(blob) < chacha20poly1305.NonceSizeX+chacha20poly1305.Overhead {
		return nil, errOpen
	}
	aead, err := chacha20poly1305.NewX(key)
	if err != nil {
		return nil, errOpen
	}
	plain, err := aead.Open(nil, blob[:chacha20poly1305.NonceSizeX], blob[chacha20poly1305.NonceSizeX:], recordAD(role, vaultID, seq))
	if err != nil {
		return nil, errOpen
	}
	return plain, nil
}

// The chain. Each record's index holds the link of the record before it;
// the link of a record is
//
//	link(n) = SHA-256("alvea v1 link" | link(n-1) | seq n | sealed index n)
//
// with link(0) = SHA-256("alvea v1 genesis" | vault id). The sealed index
// holds the SHA-256 of the sealed body, so a link covers the whole record.
type link [sha256.Size]byte

func genesis(vaultID [vaultIDLen]byte) link {
	h := sha256.New()
	h.Write([]byte("alvea v1 genesis"))
	h.Write(vaultID[:])
	var l link
	h.Sum(l[:0])
	return l
}

func nextLink(prev link, seq uint64, sealedIndex []byte) link {
	h := sha256.New()
	h.Write([]byte("alvea v1 link"))
	h.Write(prev[:])
	h.Write(putU64(nil, seq))
	h.Write(sealedIndex)
	var l link
	h.Sum(l[:0])
	return l
}

// The head: the last record's sequence number and link, with an HMAC under
// the head key. It is rewritten with every append in the same atomic store
// write, so removing records from the end (truncation) is detected.
//
//	seq (8) | link (32) | HMAC-SHA-256(head key, "alvea v1 head" | vault id | seq | link) (32)
const headSize = 8 + sha256.Size + sha256.Size

func headMAC(key []byte, vaultID [vaultIDLen]byte, seq uint64, l link) []byte {
	m := hmac.New(sha256.New, key)
	m.Write([]byte("alvea v1 head"))
	m.Write(vaultID[:])
	m.Write(putU64(nil, seq))
	m.Write(l[:])
	return m.Sum(nil)
}

func encodeHead(key []byte, vaultID [vaultIDLen]byte, seq uint64, l link) []byte {
	b := putU64(make([]byte, 0, headSize), seq)
	b = append(b, l[:]...)
	return append(b, headMAC(key, vaultID, seq, l)...)
}

// parseHead returns the head's seq and link, or ok=false if it fails its
// MAC or is malformed.
func parseHead(key []byte, vaultID [vaultIDLen]byte, b []byte) (seq uint64, l link, ok bool) {
	if len(b) != headSize {
		return 0, l, false
	}
	r := &reader{b: b}
	seq = r.u64()
	copy(l[:], r.fixed(sha256.Size))
	mac := r.fixed(sha256.Size)
	if subtle.ConstantTimeCompare(mac, headMAC(key, vaultID, seq, l)) != 1 {
		return 0, link{}, false
	}
	return seq, l, true
}
