package cli

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"alvea/app/logbook"
)

// The audit CLI runs on the committed demo bundle,
// testdata/vault/demo.alvea-bundle: the same bundle the Review screen's
// browser tests import. Its scenario (invented, ours, demo data only) and
// its generator are in app/logbook/demo_test.go (go test ./app/logbook -run
// TestDemoBundle -update). The CLI's summary, CSV and JSON of it are golden
// files under testdata/audit, refreshed only with go test ./app/cli -update.

const auditDir = "../../testdata/audit"

const demoBundle = "../../testdata/vault/demo.alvea-bundle"

// auditPass is the demo bundle's passphrase (logbook.DemoPassphrase in the
// logbook tests). Demo only: it is published, so it protects nothing.
const auditPass = "demo only: kestrel over the salt flats"

// demoCopy copies the demo bundle into dir (the tests never touch the
// committed file) and returns the copy's path and the record number of its
// last record.
func demoCopy(t *testing.T, dir string) (string, uint64) {
	t.Helper()
	data, err := os.ReadFile(demoBundle)
	if err != nil {
		t.Fatalf("demo bundle: %v (go test ./app/logbook -run TestDemoBundle -update writes it)", err)
	}
	path := filepath.Join(dir, "demo"+logbook.BundleExt)
	if err := os.WriteFile(path, data, 0o600); err != nil {
		t.Fatal(err)
	}
	v, err := logbook.OpenBundle(context.Background(), data, auditPass)
	if err != nil {
		t.Fatalf("demo bundle: %v", err)
	}
	defer v.Lock()
	l, err := v.List(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	return path, l.Head
}

func runAudit(args []string, stdin string) (int, string, string) {
	var out, errb bytes.Buffer
	code := Audit(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

func writePass(t *testing.T, dir, pass string) string {
	t.Helper()
	p := filepath.Join(dir, "pass.txt")
	if err := os.WriteFile(p, []byte(pass+"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	return p
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join(auditDir, name)
	if *updateGolden {
		if err := os.MkdirAll(auditDir, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./app/cli -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the golden file (go test ./app/cli -update refreshes it after review):\n%s", name, got)
	}
}

func TestAuditGolden(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	old := time.Date(2031, 6, 1, 12, 0, 0, 0, time.UTC)
	if err := os.Chtimes(bundle, old, old); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(bundle)
	csvPath, jsonPath := filepath.Join(dir, "out.csv"), filepath.Join(dir, "out.json")
	code, out, errs := runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, auditPass), "--csv", csvPath, "--json", jsonPath}, "")
	if code != ExitAuditOK || errs != "" {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	golden(t, "demo.summary.txt", []byte(out))
	csvOut, _ := os.ReadFile(csvPath)
	golden(t, "demo.csv", csvOut)
	jsonOut, _ := os.ReadFile(jsonPath)
	golden(t, "demo.json", jsonOut)

	// The bundle is only read: same bytes, same modification time.
	after, _ := os.ReadFile(bundle)
	st, err := os.Stat(bundle)
	if err != nil || !bytes.Equal(before, after) || !st.ModTime().Equal(old) {
		t.Errorf("bundle changed: bytes equal %v, mtime %v (want %v)", bytes.Equal(before, after), st.ModTime(), old)
	}
	// Identifying fields stay out of the CSV and JSON by default.
	for _, marker := range []string{"DEMO-IDENTIFYING-MARKER", "Fell Station", "JW"} {
		if bytes.Contains(csvOut, []byte(marker)) {
			t.Errorf("CSV carries %q", marker)
		}
	}
	if bytes.Contains(jsonOut, []byte("DEMO-IDENTIFYING-MARKER")) {
		t.Error("JSON carries the patient's identifying text")
	}
	// Asked for, they are included.
	code, _, errs = runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, auditPass), "--csv", csvPath, "--csv-include", "id,patient"}, "")
	csvOut, _ = os.ReadFile(csvPath)
	if code != ExitAuditOK || !bytes.Contains(csvOut, []byte("DEMO-IDENTIFYING-MARKER")) || !bytes.Contains(csvOut, []byte("T20310503-4K7QM2")) {
		t.Errorf("--csv-include: exit %d %s\n%s", code, errs, csvOut)
	}
}

func TestAuditPassphraseFromStdinAndFilters(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	// No terminal: one line from standard input.
	code, out, errs := runAudit([]string{"--vehicle", "road", "--from", "2031-05-09", "--to", "2031-05-09", bundle}, auditPass+"\n")
	if code != ExitAuditOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "Across transports (1)") || !strings.Contains(out, "T20310509-9XH3TB") || strings.Contains(out, "T20310503") {
		t.Errorf("filter by vehicle and date:\n%s", out)
	}
	code, out, _ = runAudit([]string{bundle, "--flag", "RESERVE_BREACHED,SPO2_BELOW_TARGET"}, auditPass)
	if code != ExitAuditOK || !strings.Contains(out, "Across transports (1)") || !strings.Contains(out, "T20310503-4K7QM2") {
		t.Errorf("filter by flags (exit %d):\n%s", code, out)
	}
}

func TestAuditTamperedExits3NamingRecord(t *testing.T) {
	dir := t.TempDir()
	bundle, last := demoCopy(t, dir)
	data, _ := os.ReadFile(bundle)
	// The last bytes before the 32-byte whole-file check belong to the last
	// record's body.
	data[len(data)-32-5] ^= 0x40
	tampered := filepath.Join(dir, "tampered"+logbook.BundleExt)
	if err := os.WriteFile(tampered, data, 0o600); err != nil {
		t.Fatal(err)
	}
	code, out, _ := runAudit([]string{tampered, "--passphrase-file", writePass(t, dir, auditPass)}, "")
	if code != ExitAuditDamaged {
		t.Fatalf("exit %d, want %d:\n%s", code, ExitAuditDamaged, out)
	}
	if !strings.Contains(out, logbook.RecordName(last)+" ") || !strings.Contains(out, "VERIFICATION FAILED") {
		t.Errorf("record %s not named:\n%s", logbook.RecordName(last), out)
	}
	// Not a bundle at all.
	junk := filepath.Join(dir, "junk")
	os.WriteFile(junk, []byte("not a bundle"), 0o600)
	if code, _, _ := runAudit([]string{junk}, auditPass); code != ExitAuditDamaged {
		t.Errorf("junk file: exit %d", code)
	}
}

func TestAuditWrongPassphraseExits4(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	code, out, errs := runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, "wrong-but-long-passphrase")}, "")
	if code != ExitAuditPassphrase || out != "" || !strings.Contains(errs, "wrong passphrase") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errs)
	}
}

func TestAuditUsageExits2(t *testing.T) {
	dir := t.TempDir()
	bundle := filepath.Join(dir, "b"+logbook.BundleExt)
	os.WriteFile(bundle, []byte("x"), 0o600)
	for _, args := range [][]string{
		{},
		{bundle, bundle},
		{bundle, "--nope"},
		{bundle, "--flag", "NOT_A_CODE"},
		{bundle, "--from", "03/05/2031"},
		{bundle, "--from", "2031-06-01", "--to", "2031-05-01"},
		{bundle, "--spo2-target", "120"},
		{bundle, "--spo2-limit", "-1"},
		{bundle, "--csv-include", "id"},
		{bundle, "--csv", "o.csv", "--csv-include", "name"},
		{bundle, "--json", bundle},
		{filepath.Join(dir, "missing")},
		{bundle, "--passphrase-file", filepath.Join(dir, "missing")},
	} {
		if code, _, errs := runAudit(args, ""); code != ExitUsage || errs == "" {
			t.Errorf("%q: exit %d, stderr %q", args, code, errs)
		}
	}
	if code, out, _ := runAudit([]string{"-h"}, ""); code != 0 || !strings.Contains(out, "usage: alvea audit") {
		t.Errorf("-h: exit %d", code)
	}
}
