package logbook

import (
	_ "embed"
	"strings"
	"sync"
	"unicode"
	"unicode/utf8"
)

// MinPassphraseLength is the shortest passphrase accepted, in characters
// (Unicode code points).
const MinPassphraseLength = 10

//go:embed common_passwords.txt
var commonPasswordsText string

var commonPasswords = sync.OnceValue(func() map[string]bool {
	m := map[string]bool{}
	for _, line := range strings.Split(commonPasswordsText, "\n") {
		line = strings.TrimSpace(line)
		if line != "" && !strings.HasPrefix(line, "#") {
			m[line] = true
		}
	}
	return m
})

// Keyboard rows and alphabetic/numeric runs: a passphrase that is a run
// along one of them (or its reverse) is refused.
var sequences = []string{
	"0123456789012345678901234567890",
	"abcdefghijklmnopqrstuvwxyzabcdefghijklmnopqrstuvwxyz",
	"qwertyuiopasdfghjklzxcvbnmqwertyuiopasdfghjklzxcvbnm",
	"qwertzuiopasdfghjklyxcvbnm",
	"azertyuiopqsdfghjklmwxcvbn",
	"1qaz2wsx3edc4rfv5tgb6yhn7ujm8ik9ol0p",
	"1q2w3e4r5t6y7u8i9o0p",
	"zaq12wsxcde34rfvbgt56yhnmju78ik,.lo90p;/-[",
}

// CheckPassphrase returns a *PassphraseError if a new passphrase is too
// short (fewer than MinPassphraseLength characters), is one character
// repeated, is a keyboard or alphabet run, or is one of the commonest
// passwords (an embedded list of our own, written from memory; compared
// lower-case, also after stripping leading and trailing digits and
// punctuation, and when one of them is repeated), or has no letters. Passphrases are used as
// typed (UTF-8, no normalisation), so this only ever refuses, never alters.
func CheckPassphrase(p string) error {
	if utf8.RuneCountInString(p) < MinPassphraseLength {
		return &PassphraseError{Reason: "too short", Min: MinPassphraseLength}
	}
	lower := strings.ToLower(p)
	first, _ := utf8.DecodeRuneInString(lower)
	if strings.Trim(lower, string(first)) == "" {
		return &PassphraseError{Reason: "one repeated character"}
	}
	for _, s := range sequences {
		if strings.Contains(s, lower) || strings.Contains(reverse(s), lower) {
			return &PassphraseError{Reason: "keyboard or alphabet sequence"}
		}
	}
	common := commonPasswords()
	core := strings.TrimFunc(lower, func(r rune) bool {
		return unicode.IsDigit(r) || unicode.IsPunct(r) || unicode.IsSymbol(r) || unicode.IsSpace(r)
	})
	if core == "" {
		return &PassphraseError{Reason: "digits and punctuation only"}
	}
	for _, c := range []string{lower, core, strings.ReplaceAll(core, " ", "")} {
		if common[c] || isRepeat(c, common) {
			return &PassphraseError{Reason: "common password"}
		}
	}
	return nil
}

// isRepeat reports whether s is a common password written two or more
// times.
func isRepeat(s string, common map[string]bool) bool {
	for n := 1; n <= len(s)/2; n++ {
		if len(s)%n == 0 && strings.Repeat(s[:n], len(s)/n) == s && common[s[:n]] {
			return true
		}
	}
	return false
}

func reverse(s string) string {
	b := []byte(s)
	for i, j := 0, len(b)-1; i < j; i, j = i+1, j-1 {
		b[i], b[j] = b[j], b[i]
	}
	return string(b)
}
