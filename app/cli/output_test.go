package cli

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// fullWriter refuses every write, as standard output redirected to a full
// disk does.
type fullWriter struct{}

var errFull = errors.New("no space left on device")

func (fullWriter) Write([]byte) (int, error) { return 0, errFull }

// TestReportNotWrittenIsNotSuccess: when standard output cannot take the
// brief or the audit, the command says so and does not exit 0 (before, the
// text brief and the audit summary were lost with exit 0).
func TestReportNotWrittenIsNotSuccess(t *testing.T) {
	var errb strings.Builder
	code := Plan([]string{"../../testdata/plans/rotor-mountain.json"}, strings.NewReader(""), fullWriter{}, &errb)
	if code != ExitEngineError || !strings.Contains(errb.String(), "standard output") || !strings.Contains(errb.String(), errFull.Error()) {
		t.Errorf("plan: exit %d, stderr %q", code, errb.String())
	}
	dir := t.TempDir()
	bundle, _ := demoCopy(t, dir)
	errb.Reset()
	code = Audit([]string{bundle, "--passphrase-file", writePass(t, dir, auditPass)}, strings.NewReader(""), fullWriter{}, &errb)
	if code != ExitAuditIO || !strings.Contains(errb.String(), "standard output") || !strings.Contains(errb.String(), errFull.Error()) {
		t.Errorf("audit: exit %d, stderr %q", code, errb.String())
	}
}

// TestPlanDoubleDashEndsOptions: after "--" an argument starting with - is
// the FILE (the usual end of options), so a plan saved as "-night.json"
// can be given; before, "--" was refused as an unknown option.
func TestPlanDoubleDashEndsOptions(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "plans", "rotor-mountain.json"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "-night.json"), data, 0o600); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	var out, errb strings.Builder
	if code := Plan([]string{"--json", "--", "-night.json"}, strings.NewReader(""), &out, &errb); code != ExitGo || !strings.HasPrefix(out.String(), "{") {
		t.Errorf("exit %d, stderr %q", code, errb.String())
	}
	errb.Reset()
	if code := Plan([]string{"-night.json"}, strings.NewReader(""), &out, &errb); code != ExitUsage || !strings.Contains(errb.String(), "unknown option -night.json") {
		t.Errorf("without --: exit %d, stderr %q", code, headLine(errb.String()))
	}
}
