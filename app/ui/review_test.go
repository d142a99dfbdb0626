package ui

import (
	"bytes"
	"context"
	"encoding/csv"
	htmlpkg "html"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
	"github.com/shopspring/decimal"

	"alvea/app/logbook"
	"alvea/physio"
)

// The Review screen, natively, on the committed demo bundle
// (testdata/vault/demo.alvea-bundle; scenario in app/logbook/demo_test.go,
// invented, demo data only). Expected figures are worked by hand beside
// each check, from the bundle's readings and the Brief's plan document.

// reviewDemoPass is the demo bundle's published, demo-only passphrase.
const reviewDemoPass = "demo only: kestrel over the salt flats"

// Demo transport ids (fixed in the demo generator).
const (
	rvRotor = logbook.TransportID("T20310503-4K7QM2D")
	rvRoad  = logbook.TransportID("T20310509-9XH3TB4")
	rvOpen  = logbook.TransportID("T20310520-0B8ZR5Q")
)

// rvSession imports the demo bundle into a memory store and returns the
// unlocked session.
func rvSession(t *testing.T) *vaultSession {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "vault", "demo"+logbook.BundleExt))
	if err != nil {
		t.Fatal(err)
	}
	store := logbook.NewMemStore()
	s := newVaultSession(func(context.Context) (logbook.Store, error) { return store, nil }, logbook.MinimumKDF)
	if err := s.Import(context.Background(), data, reviewDemoPass); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(s.Lock)
	return s
}

// rvLoaded returns a Review screen with the demo audit read, as its
// goroutine does after mounting.
func rvLoaded(t *testing.T) *review {
	t.Helper()
	r := newReviewWith(rvSession(t))
	r.phase, _ = r.session.Phase()
	rep, err := r.audit(context.Background())
	r.adopt(rep, r.session.Rev(), err)
	if r.problem != "" || r.shown == nil {
		t.Fatalf("audit not adopted: %q", r.problem)
	}
	return r
}

func rvHTML(t *testing.T, r *review) string {
	t.Helper()
	return rendered(t, r)
}

// rvText returns the text content of the element with id in html (nested
// elements included), with tags dropped.
func rvText(html, id string) string {
	i := strings.Index(html, `id="`+id+`"`)
	if i < 0 {
		return ""
	}
	start := strings.LastIndex(html[:i], "<")
	tag := html[start+1:]
	tag = tag[:strings.IndexAny(tag, " >")]
	rest := html[start:]
	// Find the matching close tag, counting nested elements of the same name.
	depth, pos := 0, 0
	for {
		open := strings.Index(rest[pos:], "<"+tag)
		closeAt := strings.Index(rest[pos:], "</"+tag+">")
		if closeAt < 0 {
			return ""
		}
		if open >= 0 && open < closeAt {
			depth++
			pos += open + 1
			continue
		}
		depth--
		pos += closeAt + 1
		if depth == 0 {
			break
		}
	}
	// Text segments between tags; the indentation the HTML printer adds
	// (whitespace with a line break) is not text the browser would show.
	var b strings.Builder
	for _, seg := range strings.Split(rest[:pos-1], "<") {
		if j := strings.IndexByte(seg, '>'); j >= 0 {
			seg = seg[j+1:]
		}
		if strings.Contains(seg, "\n") {
			seg = strings.TrimSpace(seg)
		}
		b.WriteString(htmlpkg.UnescapeString(seg))
	}
	return b.String()
}

// A locked vault: no figure, a pointer to the Logbook to unlock it; an
// empty device: the same pointer.
func TestReviewLockedPointsToLogbook(t *testing.T) {
	r := rvLoaded(t)
	r.session.Lock()
	r.sync(app.Context{})
	if r.phase != phaseLocked || r.all != nil || r.shown != nil {
		t.Fatalf("after lock: phase %v, audit kept %v", r.phase, r.all != nil)
	}
	html := rvHTML(t, r)
	if !strings.Contains(html, `id="rv-to-logbook"`) || !strings.Contains(html, `href="/logbook"`) || !strings.Contains(html, "locked") {
		t.Errorf("locked screen does not point to the Logbook:\n%s", html)
	}
	for _, id := range []string{"rv-table", "rv-transport", "rv-print"} {
		if strings.Contains(html, `id="`+id+`"`) {
			t.Errorf("locked screen shows %s", id)
		}
	}
	empty := newReviewWith(newVaultSession(func(context.Context) (logbook.Store, error) { return logbook.NewMemStore(), nil }, logbook.MinimumKDF))
	if err := empty.session.Load(context.Background()); err != nil {
		t.Fatal(err)
	}
	empty.phase, _ = empty.session.Phase()
	if html := rvHTML(t, empty); empty.phase != phaseEmpty || !strings.Contains(html, `href="/logbook"`) {
		t.Errorf("empty device: phase %v\n%s", empty.phase, html)
	}
}

// The rotor transfer, worked by hand from the demo's records:
//   - planned (litres = flow × minutes per leg, common practice):
//     15 × 3 + 50 × 4 + 10 × 2 = 265 L; with the 1.5 reserve factor
//     397.5 → 398 L (rounded up); policy reserve 398 − 265 = 133 L.
//   - used (E cylinder factor 0.28 L/psi, common practice, REFERENCES §7):
//     E1 (1000 − 150) × 0.28 = 238 L; E2 (1000 − 620) × 0.28 = 106.4
//     → 107 L (rounded up); 345 L in all; 345 ÷ 265 = 1.302 → 1.3.
//   - at handover: E1 150 psi is below the 200 psi residual → 0 L;
//     E2 (620 − 200) × 0.28 = 117.6 → 117 L (rounded down); 117 < 133:
//     RESERVE_BREACHED; 117 ÷ 133 = 0.879 → 0.87 (rounded down).
//   - SpO2 91 % at minute 30 and 90 % at 38, 94 % at 45: below the 94 %
//     target from 30 to 45 = 15 min (each reading held until the next).
func TestReviewTransportFigures(t *testing.T) {
	r := rvLoaded(t)
	r.selectTransport(rvRotor)
	html := rvHTML(t, r)
	for id, want := range map[string]string{
		"rv-record-id":        string(rvRotor),
		"rv-planned":          "265 L",
		"rv-planned-reserve":  "398 L",
		"rv-used":             "345 L",
		"rv-ratio":            "1.3",
		"rv-reserve":          "117 L",
		"rv-reserve-required": "133 L",
		"rv-multiple":         "0.87",
		"rv-lowest":           "90 %",
		"rv-below":            "15 min",
		"rv-engine":           physio.EngineVersion,
		"rv-chain":            "R1–R17 (17 records) of a chain of 27 records, head R27, verified",
	} {
		if got := rvText(html, id); got != want {
			t.Errorf("%s = %q, want %q", id, got, want)
		}
	}
	for _, code := range []string{logbook.DevReserveBreached, logbook.DevAmendedAfterClose, logbook.DevPlanAmendedInFlight, logbook.DevCylinderChangedLate, logbook.DevSpO2BelowTarget} {
		if !strings.Contains(html, `data-code="`+code+`"`) {
			t.Errorf("deviation %s not listed", code)
		}
	}
	if !strings.Contains(html, htmlpkg.EscapeString(rvDeviationTexts[logbook.DevReserveBreached].Explain)) {
		t.Error("the reserve breach has no plain-language explanation")
	}
	for _, id := range []string{"rv-plot-spo2", "rv-plot-fio2", "rv-legs", "rv-cylinders", "rv-setup"} {
		if !strings.Contains(html, `id="`+id+`"`) {
			t.Errorf("%s missing", id)
		}
	}
	// The print header is the @page rule with the id, the chain position
	// and the engine version.
	if !strings.Contains(html, "@top-left") || !strings.Contains(html, string(rvRotor)) || !strings.Contains(html, "engine "+physio.EngineVersion) {
		t.Error("no print page header with the record id and engine version")
	}
}

// The open transport without a Brief: every figure that needs the plan or
// an arrival says "not computable" with the reason, never 0.
func TestReviewNotComputableIsNeverZero(t *testing.T) {
	r := rvLoaded(t)
	r.selectTransport(rvOpen)
	html := rvHTML(t, r)
	for id, want := range map[string]string{
		"rv-planned": "not computable: no Brief snapshot",
		"rv-used":    "not computable: one reading for cylinder D (two are needed)",
		"rv-ratio":   "not computable: used oxygen not computable",
		"rv-reserve": "not computable: no arrival recorded (handover, arrive or landing)",
		"rv-lowest":  "not computable: no SpO2 observations",
	} {
		if got := rvText(html, id); got != want {
			t.Errorf("%s = %q, want %q", id, got, want)
		}
	}
	if !strings.Contains(html, `id="rv-nc"`) {
		t.Error("the reasons are not listed")
	}
	// In the table the row says "not computable" where a value is missing.
	r.selected = ""
	html = rvHTML(t, r)
	row := html[strings.Index(html, `data-transport="`+string(rvOpen)+`"`):]
	row = row[:strings.Index(row, "</tr>")]
	if strings.Count(row, "not computable") != 5 || strings.Contains(row, ">0<") {
		t.Errorf("open transport's row: %s", row)
	}
}

// Display units from Settings: gauges in bar and altitudes in metres.
// 1000 psi = 68.947573 bar (GNU units: units -t '1000 psi' bar) → 68.9;
// 7500 ft = 2286 m exactly (1 ft = 0.3048 m, international foot);
// 3900 ft = 1188.72 m → 1189 m (rounded up).
func TestReviewDisplayUnits(t *testing.T) {
	r := rvLoaded(t)
	r.units.PressureUnit, r.units.AltitudeUnit = UnitBar, UnitM
	r.selectTransport(rvRotor)
	html := rvHTML(t, r)
	legs, cyls := rvText(html, "rv-legs"), rvText(html, "rv-cylinders")
	for _, want := range []string{"1189 m", "2286 m"} {
		if !strings.Contains(legs, want) {
			t.Errorf("legs lack %q: %s", want, legs)
		}
	}
	if !strings.Contains(cyls, "68.9 bar") || strings.Contains(cyls, "1000 psi") {
		t.Errorf("cylinders not in bar: %s", cyls)
	}
	// The residual of 200 psi = 13.789515 bar (GNU units) → 13.8 bar,
	// rounded up (a higher residual is the safe side).
	if got := rvText(html, "rv-residual"); !strings.Contains(got, "13.8 bar") {
		t.Errorf("residual %q", got)
	}
	r.units.PressureUnit = UnitPsi
	r.selectTransport(rvRoad)
	// 200 bar = 2900.7548 psi (GNU units) → 2901 psi.
	if cyls := rvText(rvHTML(t, r), "rv-cylinders"); !strings.Contains(cyls, "2901 psi") {
		t.Errorf("road cylinder not in psi: %s", cyls)
	}
}

// Filters by date range (UTC days, "to" included), vehicle and flags.
func TestReviewFilters(t *testing.T) {
	r := rvLoaded(t)
	count := func() int { return len(r.shown.Transports) }
	if count() != 3 {
		t.Fatalf("unfiltered: %d", count())
	}
	r.form.from, r.form.to = "2031-05-09", "2031-05-09"
	r.applyFilter()
	if count() != 1 || r.shown.Transports[0].ID != rvRoad {
		t.Errorf("one day: %d", count())
	}
	r.form = rvFilterForm{vehicle: "  ROTOR "}
	r.applyFilter()
	if count() != 1 || r.shown.Transports[0].ID != rvRotor {
		t.Errorf("vehicle: %d", count())
	}
	r.form = rvFilterForm{}
	r.toggleFlag(app.Context{}, logbook.DevNoBrief)
	if count() != 1 || r.shown.Transports[0].ID != rvOpen {
		t.Errorf("flag NO_BRIEF: %d", count())
	}
	r.toggleFlag(app.Context{}, logbook.DevReserveBreached) // both flags: none carries both
	if count() != 0 || !strings.Contains(rvHTML(t, r), "No transport matches the filter.") {
		t.Errorf("two flags: %d", count())
	}
	r.toggleFlag(app.Context{}, logbook.DevNoBrief)
	r.toggleFlag(app.Context{}, logbook.DevReserveBreached)
	if count() != 3 {
		t.Errorf("flags cleared: %d", count())
	}
	r.form = rvFilterForm{from: "2031-05-10", to: "2031-05-01"}
	r.applyFilter()
	if r.shown != nil || !strings.Contains(r.filterMsg, "To must be on or after From") {
		t.Errorf("reversed range: %q", r.filterMsg)
	}
	if html := rvHTML(t, r); !strings.Contains(html, `id="rv-filter-msg"`) {
		t.Error("reversed range: no message shown")
	}
	r.clearFilter(app.Context{}, app.Event{})
	if r.shown == nil || count() != 3 {
		t.Error("clear did not restore every transport")
	}
}

// The across-transport table, totals and distributions. Totals worked by
// hand: planned 265 + 540 = 805 L and used 345 + 500 = 845 L over the two
// transports with both (road: 10 L × (200 − 150) bar = 500 L, water
// capacity method); 845 ÷ 805 = 1.0497 → 1.05.
func TestReviewAcrossTable(t *testing.T) {
	r := rvLoaded(t)
	html := rvHTML(t, r)
	for id, want := range map[string]string{
		"rv-total-planned": "805 L",
		"rv-total-used":    "845 L",
		"rv-total-ratio":   "1.05",
		"rv-count":         "3 of 3 transports",
	} {
		if got := rvText(html, id); got != want {
			t.Errorf("%s = %q, want %q", id, got, want)
		}
	}
	for _, id := range []string{"rv-plot-ratio", "rv-plot-reserve", "rv-csv-go", "rv-flag-RESERVE_BREACHED", "rv-inc-patient"} {
		if !strings.Contains(html, `id="`+id+`"`) {
			t.Errorf("%s missing", id)
		}
	}
	row := html[strings.Index(html, `data-transport="`+string(rvRoad)+`"`):]
	row = row[:strings.Index(row, "</tr>")]
	for _, want := range []string{">540<", ">500<", ">0.93<", ">1360<"} {
		if !strings.Contains(row, want) {
			t.Errorf("road row lacks %s: %s", want, row)
		}
	}
}

// CSV export: no identifying column unless ticked in; the patient's
// identifying text only when the patient column is.
func TestReviewCSVExport(t *testing.T) {
	r := rvLoaded(t)
	var name string
	var got []byte
	old := reviewDownload
	reviewDownload = func(n string, data []byte) error { name, got = n, data; return nil }
	defer func() { reviewDownload = old }()

	r.exportCSV(app.Context{}, app.Event{})
	if !strings.HasSuffix(name, ".csv") || len(got) == 0 {
		t.Fatalf("no file offered: %q %d bytes (%s)", name, len(got), r.csvStatus)
	}
	recs, err := csv.NewReader(bytes.NewReader(got)).ReadAll()
	if err != nil || len(recs) != 4 {
		t.Fatalf("CSV: %v, %d lines", err, len(recs))
	}
	for _, col := range recs[0] {
		for _, ident := range logbook.IdentifyingColumns {
			if col == ident {
				t.Errorf("identifying column %q exported by default", col)
			}
		}
	}
	for _, marker := range []string{"DEMO-IDENTIFYING-MARKER", "Fell Station", string(rvRotor), "JW"} {
		if bytes.Contains(got, []byte(marker)) {
			t.Errorf("default CSV carries %q", marker)
		}
	}
	if !strings.Contains(r.csvStatus, "no identifying column") {
		t.Errorf("status %q", r.csvStatus)
	}
	r.include[logbook.ColumnPatient] = true
	r.include[logbook.ColumnID] = true
	if html := rvHTML(t, r); !strings.Contains(html, `id="rv-csv-warn"`) {
		t.Error("no warning with identifying columns ticked")
	}
	r.exportCSV(app.Context{}, app.Event{})
	if !bytes.Contains(got, []byte("DEMO-IDENTIFYING-MARKER")) || !bytes.HasPrefix(got, []byte("row,id,patient,")) {
		t.Errorf("ticked columns not exported:\n%s", got)
	}
	// The filter applies to the export.
	r.form.vehicle = "road"
	r.applyFilter()
	r.exportCSV(app.Context{}, app.Event{})
	if recs, _ := csv.NewReader(bytes.NewReader(got)).ReadAll(); len(recs) != 3 {
		t.Errorf("filtered export has %d lines, want 3", len(recs))
	}
}

// Every deviation code has a label and a plain-language explanation.
func TestReviewDeviationTexts(t *testing.T) {
	for _, c := range logbook.DeviationCodes {
		if d, ok := rvDeviationTexts[c.Code]; !ok || d.Label == "" || len(d.Explain) < 40 {
			t.Errorf("%s: no text", c.Code)
		}
	}
	if len(rvDeviationTexts) != len(logbook.DeviationCodes) {
		t.Errorf("%d texts for %d codes", len(rvDeviationTexts), len(logbook.DeviationCodes))
	}
}

// The print header text cannot break out of its CSS string or <style>.
func TestReviewPrintCSSQuoting(t *testing.T) {
	got := rvCSSString(`a "b" \c </style><x>` + "\n")
	if got != `"a \"b\" \\c  /style  x  "` {
		t.Errorf("rvCSSString = %s", got)
	}
	css := rvPrintPageCSS("T20310503-4K7QM2D")
	if !strings.Contains(css, "@page") || !strings.Contains(css, `content: "T20310503-4K7QM2D"`) || !strings.Contains(css, "counter(pages)") {
		t.Errorf("page CSS: %s", css)
	}
}

// Readings are drawn held until the next one, as the audit counts them.
func TestReviewHeldSteps(t *testing.T) {
	n := func(s string) physio.Number { return physio.Number{Decimal: decimal.RequireFromString(s)} }
	pts := rvHeldSteps([]logbook.TimePoint{{Minute: n("0"), Value: n("95")}, {Minute: n("30"), Value: n("91")}, {Minute: n("45"), Value: n("94")}})
	want := []plotPoint{{0, 95}, {30, 95}, {30, 91}, {45, 91}, {45, 94}}
	if len(pts) != len(want) {
		t.Fatalf("%v", pts)
	}
	for i := range want {
		if pts[i] != want[i] {
			t.Errorf("point %d = %v, want %v", i, pts[i], want[i])
		}
	}
}
