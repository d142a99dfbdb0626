package logbook

import (
	"crypto/pbkdf2"
	"crypto/sha256"
	"fmt"

	"golang.org/x/crypto/argon2"
)

// KDFAlgorithm names the passphrase key-derivation function of a vault.
type KDFAlgorithm uint8

const (
	// Argon2id (RFC 9106), golang.org/x/crypto/argon2. The default.
	Argon2id KDFAlgorithm = 1
	// PBKDF2SHA256 is PBKDF2 (RFC 8018) with HMAC-SHA-256, from crypto/pbkdf2.
	PBKDF2SHA256 KDFAlgorithm = 2
)

func (a KDFAlgorithm) String() string {
	switch a {
	case Argon2id:
		return "argon2id"
	case PBKDF2SHA256:
		return "pbkdf2-hmac-sha256"
	}
	return fmt.Sprintf("kdf(%d)", uint8(a))
}

// KDFParams are the key-derivation settings stored in a vault header, so a
// later version can raise them (ChangePassphrase re-derives with new ones).
type KDFParams struct {
	Algorithm KDFAlgorithm
	// Argon2id: passes, memory in KiB, lanes.
	Time      uint32
	MemoryKiB uint32
	Threads   uint8
	// PBKDF2: iteration count.
	Iterations uint32
}

// The floors are OWASP Password Storage Cheat Sheet minimums (2023 edition,
// common practice): Argon2id m=19 MiB, t=2, p=1; PBKDF2-HMAC-SHA256 600 000
// iterations. The ceilings bound the work a damaged or hostile header can ask
// of a tablet.
const (
	minArgonTime      = 2
	maxArgonTime      = 64
	minArgonMemoryKiB = 19 * 1024
	maxArgonMemoryKiB = 1024 * 1024 // 1 GiB
	maxArgonThreads   = 16
	minPBKDF2Iter     = 600_000
	maxPBKDF2Iter     = 50_000_000
	saltLen           = 16
	keyLen            = 32
)

// DefaultKDF is the setting new vaults get: Argon2id, 64 MiB, 5 passes, one
// lane (WebAssembly runs one thread, so more lanes only slow the tablet).
//
// Measured on the development machine (AMD EPYC, 2 cores shared, Go 1.26):
// native about 270 ms; WebAssembly under V8 (Node, the engine of Chromium)
// about 610 ms (64 MiB, 3 passes 366 ms; 6 passes 731 ms). That is within
// the one-second unlock budget with room for slower tablets, and well above
// the OWASP floor (19 MiB, 2 passes).
var DefaultKDF = KDFParams{Algorithm: Argon2id, Time: 5, MemoryKiB: 64 * 1024, Threads: 1}

// MinimumKDF is the OWASP floor for Argon2id (m=19 MiB, t=2, p=1). Tests
// and benchmarks use it for speed; nothing may go below it.
var MinimumKDF = KDFParams{Algorithm: Argon2id, Time: minArgonTime, MemoryKiB: minArgonMemoryKiB, Threads: 1}

// Validate reports whether p is within the accepted range: never below the
// OWASP minimums, never above the ceilings.
func (p KDFParams) Validate() error {
	switch p.Algorithm {
	case Argon2id:
		if p.Time < minArgonTime || p.Time > maxArgonTime ||
			p.MemoryKiB < minArgonMemoryKiB || p.MemoryKiB > maxArgonMemoryKiB ||
			p.Threads < 1 || p.Threads > maxArgonThreads || p.Iterations != 0 {
			return fmt.Errorf("%w: argon2id t=%d (allowed %d to %d), m=%d KiB (allowed %d to %d), p=%d (allowed 1 to %d)",
				ErrKDFParams, p.Time, minArgonTime, maxArgonTime, p.MemoryKiB, minArgonMemoryKiB, maxArgonMemoryKiB, p.Threads, maxArgonThreads)
		}
	case PBKDF2SHA256:
		if p.Iterations < minPBKDF2Iter || p.Iterations > maxPBKDF2Iter || p.Time != 0 || p.MemoryKiB != 0 || p.Threads != 0 {
			return fmt.Errorf("%w: pbkdf2 iterations %d (allowed %d to %d)", ErrKDFParams, p.Iterations, minPBKDF2Iter, maxPBKDF2Iter)
		}
	default:
		return fmt.Errorf("%w: unknown algorithm %d", ErrKDFParams, uint8(p.Algorithm))
	}
	return nil
}

func (p KDFParams) String() string {
	if p.Algorithm == PBKDF2SHA256 {
		return fmt.Sprintf("%s iterations=%d", p.Algorithm, p.Iterations)
	}
	return fmt.Sprintf("%s t=%d m=%dKiB p=%d", p.Algorithm, p.Time, p.MemoryKiB, p.Threads)
}

// deriveKey runs the KDF without range checks (tests use it with the small
// published vector parameters). The passphrase is used as its UTF-8 bytes,
// exactly as typed: no normalisation.
func deriveKey(p KDFParams, passphrase []byte, salt []byte, n int) ([]byte, error) {
	switch p.Algorithm {
	case Argon2id:
		return argon2.IDKey(passphrase, salt, p.Time, p.MemoryKiB, p.Threads, uint32(n)), nil
	case PBKDF2SHA256:
		return pbkdf2.Key(sha256.New, string(passphrase), salt, int(p.Iterations), n)
	}
	return nil, ErrKDFParams
}
