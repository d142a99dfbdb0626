package logbook

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

// twoAudits returns the hand-worked transport of TestAuditOxygenHandWorked
// (ratio 1.21, reserve 1642 of 1800 L) and a second one a day later on
// another vehicle (28 L used of 600: ratio 0.05).
func twoAudits(t *testing.T) []TransportAudit {
	t.Helper()
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"}, CylinderSpec{Label: "B", WaterCapacity: physio.Litres(10)})
	b.entries[0].Open.Patient = Patient{AgeBand: AgeAdult, Identifying: "MARKER-NAME"}
	b.gauge(0, "A", physio.Psi(2000))
	b.gauge(0, "B", physio.Bar(200))
	b.gauge(69, "A", physio.Psi(1200))
	b.event(110, EventHandover)
	b.gauge(115, "B", physio.Bar(150))
	b.add(120, &Entry{Close: &Closing{}})
	first := b.audit(AuditOptions{})

	c := newAuditBuilder()
	c.id, c.start = "T20310315-0000000", c.start.AddDate(0, 0, 1)
	openWith(c, CylinderSpec{Label: "A", Size: "E"})
	c.entries[0].Open.Vehicle = "road ambulance"
	c.gauge(0, "A", physio.Psi(2000))
	c.event(60, EventArrive)
	c.gauge(60, "A", physio.Psi(1900))
	c.add(61, &Entry{Close: &Closing{}})
	second := c.audit(AuditOptions{})
	return []TransportAudit{second, first}
}

func TestBuildReportTotalsAndDistributions(t *testing.T) {
	r := BuildReport(twoAudits(t), AuditFilter{}, AuditOptions{})
	if len(r.Transports) != 2 || r.Transports[0].ID != "T20310314-0000000" {
		t.Fatalf("oldest first: %v", r.Transports)
	}
	tot := r.Totals
	// Planned 600 + 600 = 1200 L; used 724 + 28 = 752 L; 752/1200 = 0.6267 → 0.63.
	if tot.Compared != 2 || tot.PlannedL.String() != "1200" || tot.UsedL.String() != "752" || tot.OverallRatio.Value.String() != "0.63" {
		t.Errorf("totals %+v ratio %v", tot, tot.OverallRatio)
	}
	if tot.TransportsWith[DevReserveBreached] != 2 || tot.Closed != 2 {
		t.Errorf("counts %+v", tot)
	}
	// Ratios 1.21 (bin 1.2–1.5) and 0.05 (bin 0–0.5); median of two = 0.63.
	d := r.RatioDistribution
	if d.Bins[0].Count != 1 || d.Bins[4].Count != 1 || d.Median.String() != "0.63" || d.Min.String() != "0.05" || d.Max.String() != "1.21" {
		t.Errorf("ratio distribution %+v", d)
	}
	// Reserve multiples 0.91 (1642/1800) and 0.26 (476/1800, down).
	if r.ReserveDistribution.Bins[0].Count != 1 || r.ReserveDistribution.Bins[1].Count != 1 {
		t.Errorf("reserve distribution %+v", r.ReserveDistribution)
	}
}

func TestReportFilter(t *testing.T) {
	audits := twoAudits(t)
	day2 := time.Date(2031, 3, 15, 0, 0, 0, 0, time.UTC)
	for _, c := range []struct {
		f    AuditFilter
		want int
	}{
		{AuditFilter{From: day2}, 1},
		{AuditFilter{To: day2}, 1},
		{AuditFilter{Vehicle: "ROAD"}, 1},
		{AuditFilter{Flags: []string{DevOxygenAbovePlan}}, 1},
		{AuditFilter{Flags: []string{DevOxygenAbovePlan, DevReserveBreached}}, 1},
		{AuditFilter{Flags: []string{DevSpO2BelowTarget}}, 0},
		{AuditFilter{}, 2},
	} {
		if got := len(BuildReport(audits, c.f, AuditOptions{}).Transports); got != c.want {
			t.Errorf("filter %+v: %d transports, want %d", c.f, got, c.want)
		}
	}
}

func TestWriteCSVLeavesOutIdentifying(t *testing.T) {
	r := BuildReport(twoAudits(t), AuditFilter{}, AuditOptions{})
	var plain bytes.Buffer
	if err := r.WriteCSV(&plain, nil); err != nil {
		t.Fatal(err)
	}
	for _, marker := range []string{"MARKER-NAME", "T20310314", "Fell Station", "QX", "2031-03-14"} {
		if strings.Contains(plain.String(), marker) {
			t.Errorf("default CSV carries %q:\n%s", marker, plain.String())
		}
	}
	rows, err := csv.NewReader(&plain).ReadAll()
	if err != nil || len(rows) != 3 {
		t.Fatalf("rows %v err %v", rows, err)
	}
	if rows[0][1] != "vehicle" || rows[1][2] != "600" || rows[1][3] != "724" || rows[1][4] != "1.21" {
		t.Errorf("row %v / %v", rows[0], rows[1])
	}
	var with bytes.Buffer
	if err := r.WriteCSV(&with, []string{ColumnID, ColumnPatient}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(with.String(), "T20310314-0000000") || !strings.Contains(with.String(), "MARKER-NAME") {
		t.Errorf("included columns missing:\n%s", with.String())
	}
	if err := r.WriteCSV(&with, []string{"name"}); err == nil {
		t.Error("unknown column accepted")
	}
}
