package logbook

import (
	"bytes"
	"encoding/hex"
	"os/exec"
	"strconv"
	"strings"
	"testing"
)

// PBKDF2-HMAC-SHA256 test vectors of RFC 7914 §11 (published), checked
// twice: against the values printed in the RFC and against `openssl kdf`
// (external oracle, installed on the build machine; the test fails, never
// skips, when it is missing).
func TestPBKDF2RFC7914(t *testing.T) {
	cases := []struct {
		pass, salt string
		iter       uint32
		want       string // RFC 7914 §11
	}{
		{"passwd", "salt", 1, "55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc49ca9cccf179b645991664b39d77ef317c71b845b1e30bd509112041d3a19783"},
		{"Password", "NaCl", 80000, "4ddcd8f60b98be21830cee5ef22701f9641a4418d04c0414aeff08876b34ab56a1d425a1225833549adb841b51c9b3176a272bdebba1d078478f62b397f33c8d"},
	}
	for _, c := range cases {
		got, err := deriveKey(KDFParams{Algorithm: PBKDF2SHA256, Iterations: c.iter}, []byte(c.pass), []byte(c.salt), 64)
		if err != nil {
			t.Fatal(err)
		}
		if hex.EncodeToString(got) != c.want {
			t.Errorf("PBKDF2(%q, %q, %d) = %x, RFC 7914 §11 gives %s", c.pass, c.salt, c.iter, got, c.want)
		}
		out, err := exec.Command("openssl", "kdf", "-keylen", "64", "-kdfopt", "digest:SHA256",
			"-kdfopt", "pass:"+c.pass, "-kdfopt", "salt:"+c.salt, "-kdfopt", "iter:"+strconv.Itoa(int(c.iter)), "PBKDF2").Output()
		if err != nil {
			t.Fatalf("openssl kdf oracle not available (install openssl): %v", err)
		}
		oracle := strings.ToLower(strings.ReplaceAll(strings.TrimSpace(string(out)), ":", ""))
		if oracle != hex.EncodeToString(got) {
			t.Errorf("PBKDF2(%q, %q, %d) = %x, openssl kdf gives %s", c.pass, c.salt, c.iter, got, oracle)
		}
	}
}

// Argon2id against the reference implementation's command line (`argon2`,
// Debian package argon2; external oracle, the test fails if it is missing).
// x/crypto's Argon2 takes no secret or associated data, so the RFC 9106
// vectors, which use both, cannot run through it.
func TestArgon2idOracle(t *testing.T) {
	cases := []struct {
		pass, salt      string
		time, logMemKiB uint32
		pinned          string // from the argon2 CLI on this machine, pinned so a changed CLI is noticed
	}{
		// The example of REFERENCES.md: echo -n password | argon2 somesaltsomesalt -id -t 2 -m 15 -p 1 -l 32 -r
		{"password", "somesaltsomesalt", 2, 15, "217f2b4eaa7477d3eedfb412ee5d48c74ea1c64b1a6aff44cb966da7e448452f"},
		{"correct horse battery", "0123456789abcdef", 3, 12, "ae0157131adc3ae30b3e741b231009785c2030bb6c97bc048d2fc5d052401cb1"},
	}
	for _, c := range cases {
		got, err := deriveKey(KDFParams{Algorithm: Argon2id, Time: c.time, MemoryKiB: 1 << c.logMemKiB, Threads: 1}, []byte(c.pass), []byte(c.salt), 32)
		if err != nil {
			t.Fatal(err)
		}
		cmd := exec.Command("argon2", c.salt, "-id", "-t", strconv.Itoa(int(c.time)), "-m", strconv.Itoa(int(c.logMemKiB)), "-p", "1", "-l", "32", "-r")
		cmd.Stdin = strings.NewReader(c.pass)
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("argon2 CLI oracle not available (install package argon2): %v", err)
		}
		oracle := strings.TrimSpace(string(out))
		if oracle != hex.EncodeToString(got) {
			t.Errorf("Argon2id(%q, %q, t=%d, m=2^%d KiB) = %x, argon2 CLI gives %s", c.pass, c.salt, c.time, c.logMemKiB, got, oracle)
		}
		if c.pinned != hex.EncodeToString(got) {
			t.Errorf("Argon2id(%q, %q) = %x, pinned CLI value %s", c.pass, c.salt, got, c.pinned)
		}
	}
}

func TestKDFParamsValidate(t *testing.T) {
	// OWASP Password Storage Cheat Sheet minimums (common practice).
	good := []KDFParams{DefaultKDF, MinimumKDF, {Algorithm: PBKDF2SHA256, Iterations: 600_000}}
	bad := []KDFParams{
		{Algorithm: Argon2id, Time: 1, MemoryKiB: 19 * 1024, Threads: 1},
		{Algorithm: Argon2id, Time: 2, MemoryKiB: 19*1024 - 1, Threads: 1},
		{Algorithm: Argon2id, Time: 2, MemoryKiB: 19 * 1024, Threads: 0},
		{Algorithm: PBKDF2SHA256, Iterations: 599_999},
		{Algorithm: 9},
	}
	for _, p := range good {
		if err := p.Validate(); err != nil {
			t.Errorf("%v: %v", p, err)
		}
	}
	for _, p := range bad {
		if err := p.Validate(); err == nil {
			t.Errorf("%v accepted, below the OWASP minimum or unknown", p)
		}
	}
	if DefaultKDF.MemoryKiB < MinimumKDF.MemoryKiB || DefaultKDF.Time < MinimumKDF.Time {
		t.Error("DefaultKDF weaker than the OWASP floor")
	}
}

func TestAEADRoundTrip(t *testing.T) {
	key := bytes.Repeat([]byte{7}, 32)
	var id [vaultIDLen]byte
	for _, n := range []int{0, 1, 100, 70_000} {
		plain := bytes.Repeat([]byte("o2"), n)
		blob := seal(key, adBody, id, 5, plain)
		got, err := open(key, adBody, id, 5, blob)
		if err != nil || !bytes.Equal(got, plain) {
			t.Fatalf("round trip of %d bytes failed: %v", len(plain), err)
		}
		if again := seal(key, adBody, id, 5, plain); bytes.Equal(again[:24], blob[:24]) {
			t.Error("nonce repeated")
		}
		// Wrong position, role, vault, key, or any flipped byte: refused.
		other := id
		other[0] ^= 1
		if _, err := open(key, adBody, id, 6, blob); err == nil {
			t.Error("opened at another sequence number")
		}
		if _, err := open(key, adIndex, id, 5, blob); err == nil {
			t.Error("opened in another role")
		}
		if _, err := open(key, adBody, other, 5, blob); err == nil {
			t.Error("opened in another vault")
		}
		if _, err := open(bytes.Repeat([]byte{8}, 32), adBody, id, 5, blob); err == nil {
			t.Error("opened with another key")
		}
		for i := 0; i < len(blob); i += 1 + len(blob)/50 {
			blob[i] ^= 0x40
			if _, err := open(key, adBody, id, 5, blob); err == nil {
				t.Errorf("byte %d changed, still opened", i)
			}
			blob[i] ^= 0x40
		}
	}
}
