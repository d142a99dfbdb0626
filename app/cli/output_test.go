package cli

import (
	"errors"
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
