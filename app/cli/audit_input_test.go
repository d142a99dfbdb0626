package cli

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestAuditSpO2OptionsGivenOutOfRangeAreRefused: a value typed for
// --spo2-target or --spo2-limit is checked as typed. 0 (or -0, or a number
// too small for a float, which reads as 0) is not "use each Brief's
// target": that is what leaving the option out means, and taking a typed 0
// for it would audit against another target than the one asked for. NaN is
// named as NaN, not as the duration it happens to convert to.
func TestAuditSpO2OptionsGivenOutOfRangeAreRefused(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	pass := writePass(t, dir, auditPass)
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--spo2-target", "0"}, "--spo2-target 0 %: allowed 50 to 100 %"},
		{[]string{"--spo2-target", "-0"}, "--spo2-target -0 %: allowed 50 to 100 %"},
		{[]string{"--spo2-target", "1e-400"}, "--spo2-target 0 %: allowed 50 to 100 %"},
		{[]string{"--spo2-target", "NaN"}, "--spo2-target NaN %: allowed 50 to 100 %"},
		{[]string{"--spo2-limit", "NaN"}, "--spo2-limit NaN min: allowed 0 to 1440 min"},
	} {
		code, out, errs := runAudit(append([]string{bundle, "--passphrase-file", pass}, c.args...), "")
		if code != ExitUsage || out != "" || !strings.Contains(errs, c.want) {
			t.Errorf("%q: exit %d, stdout %d bytes, stderr %q; want exit %d and %q", c.args, code, len(out), headLine(errs), ExitUsage, c.want)
		}
	}
	// The edges of the range are accepted.
	for _, args := range [][]string{{"--spo2-target", "50"}, {"--spo2-target", "100"}, {"--spo2-limit", "0"}, {"--spo2-limit", "1440"}} {
		if code, _, errs := runAudit(append([]string{bundle, "--passphrase-file", pass}, args...), ""); code != ExitAuditOK {
			t.Errorf("%q: exit %d, %s", args, code, errs)
		}
	}
}

// TestAuditOutputsNamingTheSameFileAreRefused: --csv and --json spelled
// differently but naming one file would leave only the CSV (the JSON
// written first, then overwritten), and an output naming the passphrase
// file would overwrite it. Both are refused before anything is read.
func TestAuditOutputsNamingTheSameFileAreRefused(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	pass := writePass(t, dir, auditPass)
	out := filepath.Join(dir, "out")
	for _, args := range [][]string{
		{"--csv", out, "--json", dir + string(filepath.Separator) + "." + string(filepath.Separator) + "out"},
		{"--json", pass},
		{"--csv", pass},
	} {
		code, _, errs := runAudit(append([]string{bundle, "--passphrase-file", pass}, args...), "")
		if code != ExitUsage || !strings.Contains(errs, "same file") {
			t.Errorf("%q: exit %d, stderr %q; want exit %d naming the same file", args, code, headLine(errs), ExitUsage)
		}
	}
	if data, err := os.ReadFile(pass); err != nil || string(data) != auditPass+"\n" {
		t.Errorf("passphrase file overwritten: now %d bytes (%v)", len(data), err)
	}
}

// TestAuditEmptyPassphraseIsAUsageError: an empty first line of the
// passphrase file (an empty file, or one starting with a blank line), or an
// empty line on standard input, is not tried as a passphrase (a vault's is
// at least 10 characters): it is refused as a usage error naming where it
// was read, not reported as a wrong passphrase after a key derivation.
func TestAuditEmptyPassphraseIsAUsageError(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	for _, content := range []string{"", "\n", "\r\n", "\n" + auditPass + "\n"} {
		p := filepath.Join(dir, "empty.txt")
		if err := os.WriteFile(p, []byte(content), 0o600); err != nil {
			t.Fatal(err)
		}
		code, _, errs := runAudit([]string{bundle, "--passphrase-file", p}, "")
		if code != ExitUsage || !strings.Contains(errs, p) || !strings.Contains(errs, "empty") {
			t.Errorf("file %q: exit %d, stderr %q; want exit %d naming %s as empty", content, code, headLine(errs), ExitUsage, p)
		}
	}
	code, _, errs := runAudit([]string{bundle}, "\n")
	if code != ExitUsage || !strings.Contains(errs, "standard input") || !strings.Contains(errs, "empty") {
		t.Errorf("empty line on standard input: exit %d, stderr %q", code, headLine(errs))
	}
	// A trailing newline, or CRLF, is the line ending, not part of the
	// passphrase (the documented "first line of FILE").
	for _, ending := range []string{"", "\n", "\r\n", "\nsecond line\n"} {
		p := filepath.Join(dir, "pass.txt")
		os.WriteFile(p, []byte(auditPass+ending), 0o600)
		if code, _, errs := runAudit([]string{bundle, "--passphrase-file", p}, ""); code != ExitAuditOK {
			t.Errorf("passphrase + %q: exit %d, %s", ending, code, errs)
		}
	}
	// A file an editor saved with a byte-order mark first (U+FEFF, as
	// EF BB BF in UTF-8) holds the same passphrase; a mark anywhere else,
	// or a leading space, stays part of it.
	for content, want := range map[string]int{"\ufeff" + auditPass + "\r\n": ExitAuditOK, " " + auditPass: ExitAuditPassphrase, auditPass + "\ufeff": ExitAuditPassphrase} {
		p := filepath.Join(dir, "bom.txt")
		os.WriteFile(p, []byte(content), 0o600)
		if code, _, errs := runAudit([]string{bundle, "--passphrase-file", p}, ""); code != want {
			t.Errorf("passphrase file %q: exit %d, want %d (%s)", content, code, want, headLine(errs))
		}
	}
}

func headLine(s string) string {
	line, _, _ := strings.Cut(s, "\n")
	return line
}

// TestAuditDamageCountsOneProblem: a bundle whose only fault is its
// whole-file check (its last byte changed) is reported with "1 problem",
// not "1 problems", on both streams.
func TestAuditDamageCountsOneProblem(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	data, _ := os.ReadFile(bundle)
	data[len(data)-1] ^= 0x01
	os.WriteFile(bundle, data, 0o600)
	code, out, errs := runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, auditPass)}, "")
	if code != ExitAuditDamaged || !strings.Contains(out, "\n1 problem, by record:") || !strings.Contains(errs, "(1 problem)") {
		t.Errorf("exit %d:\n%s%s", code, out, errs)
	}
}

// TestAuditDateRangeRefusedAsTyped: --to before --from is refused naming
// the date typed, not the day after it that the inclusive filter holds
// (before: "to 2031-05-02" for --to 2031-05-01). One day is a valid range.
func TestAuditDateRangeRefusedAsTyped(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	code, _, errs := runAudit([]string{bundle, "--from", "2031-05-10", "--to", "2031-05-01"}, auditPass)
	if want := "--to 2031-05-01: allowed a date on or after --from 2031-05-10"; code != ExitUsage || !strings.Contains(errs, want) {
		t.Errorf("exit %d, stderr %q, want %q", code, headLine(errs), want)
	}
	if code, out, errs := runAudit([]string{bundle, "--from", "2031-05-09", "--to", "2031-05-09"}, auditPass); code != ExitAuditOK || !strings.Contains(out, "Across transports (1)") {
		t.Errorf("one day: exit %d, %s", code, headLine(errs))
	}
}

// TestAuditInputsAreReadWithinBounds: a passphrase file whose first line
// is longer than any passphrase (a wrong file given) and a bundle larger
// than the bundle limit are refused as usage errors naming the file and
// the limit, without being read whole (a wrong path such as /dev/zero
// would fill memory). Before, the long line was derived as a passphrase
// and reported as a wrong passphrase.
func TestAuditInputsAreReadWithinBounds(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	long := filepath.Join(dir, "long.txt")
	if err := os.WriteFile(long, []byte(strings.Repeat("x", 2*maxPassphraseLine)), 0o600); err != nil {
		t.Fatal(err)
	}
	code, _, errs := runAudit([]string{bundle, "--passphrase-file", long}, "")
	if code != ExitUsage || !strings.Contains(errs, long) || !strings.Contains(errs, fmt.Sprintf("longer than %d bytes", maxPassphraseLine)) {
		t.Errorf("long passphrase line: exit %d, stderr %q", code, headLine(errs))
	}
	code, _, errs = runAudit([]string{bundle}, strings.Repeat("y", 2*maxPassphraseLine)+"\n")
	if code != ExitUsage || !strings.Contains(errs, "standard input") || !strings.Contains(errs, fmt.Sprintf("longer than %d bytes", maxPassphraseLine)) {
		t.Errorf("long line on standard input: exit %d, stderr %q", code, headLine(errs))
	}
	// A passphrase of exactly the limit is read (and is wrong here).
	exact := filepath.Join(dir, "exact.txt")
	os.WriteFile(exact, []byte(strings.Repeat("x", maxPassphraseLine)+"\n"), 0o600)
	if code, _, errs := runAudit([]string{bundle, "--passphrase-file", exact}, ""); code != ExitAuditPassphrase {
		t.Errorf("passphrase of %d bytes: exit %d, %s", maxPassphraseLine, code, headLine(errs))
	}
	defer func(old int64) { maxBundleBytes = old }(maxBundleBytes)
	st, err := os.Stat(bundle)
	if err != nil {
		t.Fatal(err)
	}
	maxBundleBytes = st.Size() - 1
	code, _, errs = runAudit([]string{bundle}, auditPass+"\n")
	if want := fmt.Sprintf("%s: larger than %d bytes", bundle, st.Size()-1); code != ExitUsage || !strings.Contains(errs, want) {
		t.Errorf("bundle over the limit: exit %d, stderr %q, want %q", code, headLine(errs), want)
	}
	maxBundleBytes = st.Size()
	if code, _, errs := runAudit([]string{bundle}, auditPass+"\n"); code != ExitAuditOK {
		t.Errorf("bundle at the limit: exit %d, %s", code, headLine(errs))
	}
}

// TestAuditNotABundleBeforePassphrase: a file that is not a bundle is
// named, with why, before a passphrase is asked for or read (before, with
// no passphrase given, it was refused for the missing passphrase, and on a
// terminal the passphrase was asked for first).
func TestAuditNotABundleBeforePassphrase(t *testing.T) {
	dir := t.TempDir()
	plan := filepath.Join(dir, "plan.json")
	os.WriteFile(plan, []byte(`{"version": 1}`), 0o600)
	code, _, errs := runAudit([]string{plan}, "")
	if code != ExitAuditDamaged || !strings.Contains(errs, "plan.json") || !strings.Contains(errs, "not a logbook bundle") {
		t.Errorf("exit %d, stderr %q", code, headLine(errs))
	}
}
