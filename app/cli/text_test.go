package cli

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"alvea/app/logbook"
)

// hostileText is free text a crew's entry or a plan document may carry:
// an escape sequence that clears the screen and turns it red, a newline
// followed by a line the report itself prints, a tab, a carriage return and
// a right-to-left override.
const hostileText = "\x1b[2J\x1b[31mrotor\nVERIFICATION FAILED\tx\r\u202eevil"

// checkPrintable fails when out carries a control character other than
// the report's own newlines and tabs' expansion, or a line the hostile text
// forged.
func checkPrintable(t *testing.T, what, out string) {
	t.Helper()
	for _, r := range out {
		if r != '\n' && hidden(r) {
			t.Errorf("%s: printed %U from the free text:\n%s", what, r, out)
			return
		}
	}
	for _, line := range strings.Split(out, "\n") {
		if strings.HasPrefix(line, "VERIFICATION FAILED") {
			t.Errorf("%s: the free text forged a line:\n%s", what, out)
		}
	}
	if !strings.Contains(out, `\x1b[2J\x1b[31mrotor\nVERIFICATION FAILED\tx\r\u202eevil`) {
		t.Errorf("%s: the free text is not shown escaped:\n%s", what, out)
	}
}

// TestAuditTextEscapesControlCharacters: the vehicle, places and cylinder
// labels of a bundle are printed with their control characters escaped.
func TestAuditTextEscapesControlCharacters(t *testing.T) {
	a := logbook.TransportAudit{
		ID: "T20310601-0000000", Opened: time.Date(2031, 6, 1, 8, 0, 0, 0, time.UTC),
		Vehicle: hostileText, Origin: hostileText, Destination: hostileText,
	}
	a.Oxygen.Cylinders = []logbook.CylinderAudit{{Label: hostileText, Definition: "CGA E"}}
	a.Deviations = []logbook.Deviation{{Code: logbook.DevNotClosed, Detail: hostileText}}
	var b bytes.Buffer
	PrintAudit(&b, "x.alvea-bundle", &logbook.AuditReport{Transports: []logbook.TransportAudit{a}})
	checkPrintable(t, "audit", b.String())
}

// TestPlanBriefEscapesControlCharacters: a plan's title and cylinder name
// are printed with their control characters escaped, in the brief and in
// the warnings that name the cylinder.
func TestPlanBriefEscapesControlCharacters(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "plans", "rotor-mountain.json"))
	if err != nil {
		t.Fatal(err)
	}
	doc := strings.Replace(string(data), `"title": "Rotor-wing transfer from a mountain clinic over a pass to the valley hospital"`,
		`"title": "\u001b[2J\u001b[31mrotor\nVERIFICATION FAILED\tx\r\u202eevil"`, 1)
	doc = strings.Replace(doc, `"name": "on-board D"`, `"name": "\u001b[2J\u001b[31mrotor\nVERIFICATION FAILED\tx\r\u202eevil"`, 1)
	var out, errb bytes.Buffer
	if code := Plan([]string{"-"}, strings.NewReader(doc), &out, &errb); code != ExitGo {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	checkPrintable(t, "plan", out.String())
}
