//go:build !wasm

package e2e

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	cdpbrowser "github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"alvea/app/cli"
	"alvea/app/logbook"
)

// The Review screen in the browser, on the committed demo bundle
// (testdata/vault/demo.alvea-bundle; invented scenario, demo data only,
// written by app/logbook/demo_test.go). The numbers it shows are checked
// against those `alvea audit` writes for the same bundle (cli.Audit, run
// here natively with --json).

// rvDemoPass is the demo bundle's published, demo-only passphrase.
const rvDemoPass = "demo only: kestrel over the salt flats"

// rvWaitKDF bounds anything that derives a key in the browser (the demo
// bundle uses the default Argon2id, 64 MiB, t = 5: about a second in wasm).
const rvWaitKDF = 90 * time.Second

func rvDemoPath() string {
	return filepath.Join(repoRoot, "testdata", "vault", "demo"+logbook.BundleExt)
}

// rvCLIReport runs `alvea audit` on a copy of the demo bundle and returns
// the report it writes with --json, and its printed summary.
func rvCLIReport(t *testing.T) (*logbook.AuditReport, string) {
	t.Helper()
	dir := t.TempDir()
	data, err := os.ReadFile(rvDemoPath())
	if err != nil {
		t.Fatal(err)
	}
	bundle := filepath.Join(dir, "demo"+logbook.BundleExt)
	pass := filepath.Join(dir, "pass.txt")
	out := filepath.Join(dir, "audit.json")
	if err := os.WriteFile(bundle, data, 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(pass, []byte(rvDemoPass+"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	var stdout, stderr bytes.Buffer
	if code := cli.Audit([]string{bundle, "--passphrase-file", pass, "--json", out}, strings.NewReader(""), &stdout, &stderr); code != cli.ExitAuditOK {
		t.Fatalf("alvea audit exit %d: %s", code, stderr.String())
	}
	raw, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var r logbook.AuditReport
	if err := json.Unmarshal(raw, &r); err != nil {
		t.Fatalf("audit JSON: %v", err)
	}
	if len(r.Transports) != 3 {
		t.Fatalf("the demo audit has %d transports, want 3", len(r.Transports))
	}
	return &r, stdout.String()
}

// importDemo imports the demo bundle into the fresh profile's empty
// logbook, as a person would: choose the file, type the passphrase.
func (b *browser) rvImportDemo(url string) {
	b.t.Helper()
	b.open(url)
	b.waitFor("the import form", `document.querySelector("#lb-import-file") !== null`, 30*time.Second)
	b.must("choose the bundle", chromedp.SetUploadFiles(chromedp.CSS("#lb-import-file"), []string{rvDemoPath()}))
	b.typeInto("#lb-import-pass", rvDemoPass)
	b.tap("#lb-import-go")
	b.waitFor("the import", `document.querySelector("#lb-nav-list") !== null || (document.querySelector("#lb-problem")?.textContent ?? "") !== ""`, rvWaitKDF)
	if p := b.text("#lb-problem"); p != "" {
		b.t.Fatalf("import refused: %s", p)
	}
}

// rvTableCell is how the table writes an audited amount: its value, or
// "not computable" (the figures of a transport's page are written exactly
// as logbook.Amount.String(): "265 L", "not computable: reason").
func rvTableCell(a logbook.Amount) string {
	if !a.Known() {
		return "not computable"
	}
	return a.Value.String()
}

func (b *browser) rvCell(id logbook.TransportID, col string) string {
	b.t.Helper()
	return b.text(fmt.Sprintf(`#rv-table tr[data-transport=%q] [data-col=%q]`, string(id), col))
}

// Import the demo bundle into a fresh profile, open Review: the table, the
// totals and each transport's figures equal what `alvea audit` writes for
// the same bundle; the print view hides the navigation and shows the
// record id, the engine version and the chain position; a PDF prints on
// A4 and Letter; the CSV download carries no identifying column by
// default; axe-core finds nothing serious; screenshots for review.
func TestReviewMatchesCLIAndPrints(t *testing.T) {
	want, summary := rvCLIReport(t)
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.rvImportDemo(srv.URL("/logbook"))

	b.tap("#tab-review")
	b.waitFor("the review table", `document.querySelectorAll("#rv-table tr[data-transport]").length === 3`, 30*time.Second)

	// Across transports: every row and the totals.
	for i := range want.Transports {
		a := &want.Transports[i]
		o := &a.Oxygen
		for col, v := range map[string]string{
			"planned": rvTableCell(o.PlannedL), "used": rvTableCell(o.UsedL), "ratio": rvTableCell(o.Ratio),
			"reserve": rvTableCell(o.ReserveAtArrivalL), "required": rvTableCell(o.ReserveRequiredL),
			"deviations": fmt.Sprint(len(a.Deviations)),
		} {
			if got := b.rvCell(a.ID, col); got != v {
				t.Errorf("table %s %s = %q, the CLI says %q", a.ID, col, got, v)
			}
		}
	}
	tot := want.Totals
	for sel, v := range map[string]string{
		"#rv-total-planned": tot.PlannedL.String() + " L", "#rv-total-used": tot.UsedL.String() + " L",
		"#rv-total-ratio": tot.OverallRatio.String(), "#rv-total-transports": fmt.Sprint(tot.Transports),
	} {
		if got := b.text(sel); got != v {
			t.Errorf("%s = %q, the CLI says %q", sel, got, v)
		}
	}
	// The CLI's printed totals line holds the same sums.
	if line := fmt.Sprintf("planned %s L, used %s L, ratio %s", tot.PlannedL, tot.UsedL, tot.OverallRatio); !strings.Contains(summary, line) {
		t.Errorf("CLI summary lacks %q", line)
	}
	for _, v := range b.axe() {
		t.Errorf("review table: axe %s [%s] %s at %v", v.ID, v.Impact, v.Help, v.Nodes)
	}
	for _, small := range smallTargets(b) {
		t.Errorf("review table: touch target under 44 px: %s", small)
	}
	// The two distribution plots, side by side at 1024×768 and stacked at
	// 768×1024, draw every text at 12 px or more (as Altitude's).
	for _, vp := range [][2]int64{{1024, 768}, {768, 1024}} {
		b.viewport(vp[0], vp[1])
		for _, id := range []string{"#rv-plot-ratio", "#rv-plot-reserve"} {
			if px := b.plotTextSize(id); px < 12 {
				t.Errorf("%d×%d: the smallest text of %s is %.1f px, want at least 12", vp[0], vp[1], id, px)
			}
		}
	}
	b.viewport(1024, 768)
	b.screenshot("review-table", 1024, 768)
	b.screenshot("review-table", 768, 1024)

	// Filters: by flag (two transports do not carry it), then cleared.
	b.tap("#rv-flag-RESERVE_BREACHED")
	b.waitFor("one transport with a breach", `document.querySelectorAll("#rv-table tr[data-transport]").length === 1`, 10*time.Second)
	b.tap("#rv-clear")
	b.waitFor("the filter cleared", `document.querySelectorAll("#rv-table tr[data-transport]").length === 3`, 10*time.Second)

	// CSV: the download has no identifying column by default.
	rows := rvDownloadCSV(t, b)
	if len(rows) != 4 {
		t.Fatalf("CSV has %d lines, want 4", len(rows))
	}
	for _, col := range rows[0] {
		for _, ident := range logbook.IdentifyingColumns {
			if col == ident {
				t.Errorf("CSV carries identifying column %q by default", col)
			}
		}
	}
	for _, row := range rows {
		for _, c := range row {
			for _, marker := range []string{"DEMO-IDENTIFYING-MARKER", "Fell Station", "T20310503"} {
				if strings.Contains(c, marker) {
					t.Errorf("CSV carries %q by default", marker)
				}
			}
		}
	}

	// Per transport: every figure, for each transport of the CLI's report.
	for i := range want.Transports {
		a := &want.Transports[i]
		b.tap(fmt.Sprintf("#rv-row-%s", a.ID))
		b.waitFor("transport "+string(a.ID), fmt.Sprintf(`document.querySelector("#rv-transport")?.dataset.transport === %q`, string(a.ID)), 10*time.Second)
		rvCheckTransport(t, b, a, want.Chain)
		if i == 0 {
			rvCheckPrint(t, b, a)
			for _, v := range b.axe() {
				t.Errorf("review of %s: axe %s [%s] %s at %v", a.ID, v.ID, v.Impact, v.Help, v.Nodes)
			}
			for _, small := range smallTargets(b) {
				t.Errorf("review of %s: touch target under 44 px: %s", a.ID, small)
			}
			b.screenshot("review-transport", 1024, 768)
			b.screenshot("review-transport", 768, 1024)
		}
		b.tap("#rv-back")
		b.waitFor("the table again", `document.querySelector("#rv-table") !== null`, 10*time.Second)
	}

	// A reload locks the vault: the Review shows no figure and points to
	// the Logbook to unlock it.
	b.reload()
	b.waitFor("the locked notice", `document.querySelector("#rv-to-logbook") !== null`, 30*time.Second)
	if b.exists("#rv-table") || b.exists("#rv-transport") || b.exists("#rv-print") {
		t.Error("figures shown while the logbook is locked")
	}
	if href := eval[string](b, `document.querySelector("#rv-to-logbook").getAttribute("href")`); href != "/logbook" {
		t.Errorf("locked notice links to %q", href)
	}
	b.tap("#rv-to-logbook")
	b.waitFor("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
}

// rvCheckTransport compares a transport's review with the CLI's audit.
func rvCheckTransport(t *testing.T, b *browser, a *logbook.TransportAudit, chain logbook.ChainStatus) {
	t.Helper()
	o, pc := &a.Oxygen, &a.Course
	figures := map[string]logbook.Amount{
		"#rv-planned": o.PlannedL, "#rv-planned-reserve": o.PlannedWithReserveL, "#rv-planned-usable": o.PlannedUsableL,
		"#rv-used": o.UsedL, "#rv-ratio": o.Ratio, "#rv-reserve": o.ReserveAtArrivalL, "#rv-reserve-required": o.ReserveRequiredL,
		"#rv-multiple": o.ReserveMultiple, "#rv-lowest": pc.LowestSpO2, "#rv-below": pc.MinutesBelowTarget,
		"#rv-longest": pc.LongestBelowMinutes,
	}
	if o.FinalBriefRecord != "" {
		figures["#rv-final-planned"] = o.FinalPlannedL
	}
	for sel, amount := range figures {
		if got := b.text(sel); got != amount.String() {
			t.Errorf("%s %s = %q, the CLI says %q", a.ID, sel, got, amount.String())
		}
	}
	// Litres planned per leg and used per cylinder.
	legs := eval[[]string](b, `Array.from(document.querySelectorAll("#rv-legs [data-col=planned]")).map(e => e.textContent.trim())`)
	if len(legs) != len(o.PlannedLegs) {
		t.Errorf("%s: %d legs shown, the CLI has %d", a.ID, len(legs), len(o.PlannedLegs))
	}
	for i := 0; i < len(legs) && i < len(o.PlannedLegs); i++ {
		if legs[i] != o.PlannedLegs[i].OxygenL.String() {
			t.Errorf("%s leg %d: %q L, the CLI says %s", a.ID, i+1, legs[i], o.PlannedLegs[i].OxygenL)
		}
	}
	for _, c := range o.Cylinders {
		sel := fmt.Sprintf(`#rv-cylinders tr[data-cylinder=%q] [data-col=used]`, c.Label)
		if got := b.text(sel); got != c.UsedL.String() {
			t.Errorf("%s cylinder %s used %q, the CLI says %q", a.ID, c.Label, got, c.UsedL.String())
		}
		sel = fmt.Sprintf(`#rv-cylinders tr[data-cylinder=%q] [data-col=above]`, c.Label)
		if got := b.text(sel); got != c.UsableAtArrivalL.String() {
			t.Errorf("%s cylinder %s above residual %q, the CLI says %q", a.ID, c.Label, got, c.UsableAtArrivalL.String())
		}
	}
	codes := eval[[]string](b, `Array.from(document.querySelectorAll("#rv-deviations li[data-code]")).map(e => e.dataset.code)`)
	var wantCodes []string
	for _, d := range a.Deviations {
		wantCodes = append(wantCodes, d.Code)
	}
	if strings.Join(codes, ",") != strings.Join(wantCodes, ",") {
		t.Errorf("%s deviations %v, the CLI says %v", a.ID, codes, wantCodes)
	}
	if got := b.text("#rv-record-id"); got != string(a.ID) {
		t.Errorf("record id %q", got)
	}
	engine := a.EngineVersion
	if engine == "" {
		engine = "none (no Brief)"
	}
	if got := b.text("#rv-engine"); got != engine {
		t.Errorf("%s engine %q, want %q", a.ID, got, engine)
	}
	wantChain := fmt.Sprintf("%s–%s (%d records) of a chain of %d records, head %s, verified", a.FirstRecord, a.LastRecord, a.Records, chain.Records, chain.Head)
	if got := b.text("#rv-chain"); got != wantChain {
		t.Errorf("%s chain %q, want %q", a.ID, got, wantChain)
	}
	// Never a 0 for what is not computable.
	if len(a.NotComputable()) > 0 && !b.exists("#rv-nc") {
		t.Errorf("%s: the reasons for what is not computable are not listed", a.ID)
	}
}

// rvCheckPrint checks the Print button and the print view of a transport.
func rvCheckPrint(t *testing.T, b *browser, a *logbook.TransportAudit) {
	t.Helper()
	// The Print button asks the browser to print (stubbed: headless
	// Chromium has no dialog to close).
	eval[bool](b, `(() => { window.__printed = 0; window.print = () => { window.__printed++ }; return true })()`)
	b.tap("#rv-print")
	if n := eval[int](b, `window.__printed`); n != 1 {
		t.Errorf("Print called window.print %d times", n)
	}
	// The @page rule writes the id, the chain position and the engine
	// version in every printed page's top margin.
	pageRule := eval[string](b, `(() => {
		for (const s of document.styleSheets) {
			let rules; try { rules = s.cssRules } catch (e) { continue }
			for (const r of rules) {
				if (r instanceof CSSMediaRule) for (const p of r.cssRules) if (p instanceof CSSPageRule && p.cssText.includes("@top-left")) return p.cssText
			}
		}
		return "" })()`)
	for _, want := range []string{string(a.ID), a.FirstRecord + "–" + a.LastRecord, "engine " + a.EngineVersion, "counter(pages)"} {
		if !strings.Contains(pageRule, want) {
			t.Errorf("print page rule lacks %q: %s", want, pageRule)
		}
	}

	rvMedia(t, b, "print")
	defer rvMedia(t, b, "")
	for _, sel := range []string{".alv-header", ".alv-footer", "nav", "#rv-back", "#rv-print"} {
		if shown := eval[bool](b, fmt.Sprintf(`(() => { const e = document.querySelector(%q); return e !== null && getComputedStyle(e).display !== "none" && e.getClientRects().length > 0 })()`, sel)); shown {
			t.Errorf("print view shows %s", sel)
		}
	}
	ident := b.text("#rv-ident")
	for _, want := range []string{string(a.ID), a.EngineVersion, a.FirstRecord + "–" + a.LastRecord} {
		if !strings.Contains(ident, want) {
			t.Errorf("print header lacks %q: %s", want, ident)
		}
	}
	if !eval[bool](b, `getComputedStyle(document.querySelector("#rv-ident")).display !== "none"`) {
		t.Error("print header hidden")
	}
	b.screenshot("review-print", 1024, 768)

	// A PDF on A4 (8.27 × 11.69 in) and Letter (8.5 × 11 in).
	pageObj := regexp.MustCompile(`/Type\s*/Page[^s]`)
	for _, paper := range []struct {
		name string
		w, h float64
	}{{"A4", 8.27, 11.69}, {"Letter", 8.5, 11}} {
		res, err := chromedp.Call(b.ctx, page.PrintToPDF, page.PrintToPDFParams{PaperWidth: paper.w, PaperHeight: paper.h})
		if err != nil {
			t.Fatalf("print to PDF (%s): %v", paper.name, err)
		}
		pages := len(pageObj.FindAll(res.Data, -1))
		if !bytes.HasPrefix(res.Data, []byte("%PDF-")) || pages < 1 {
			t.Errorf("%s: not a PDF with pages (%d bytes, %d pages)", paper.name, len(res.Data), pages)
		}
		dir := filepath.Join(repoRoot, "testoutput")
		if err := os.MkdirAll(dir, 0o755); err == nil {
			os.WriteFile(filepath.Join(dir, "review-"+paper.name+".pdf"), res.Data, 0o644)
		}
	}
}

// rvMedia emulates a CSS media type ("" restores the screen).
func rvMedia(t *testing.T, b *browser, media string) {
	t.Helper()
	if _, err := chromedp.Call(b.ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: media}); err != nil {
		t.Fatalf("emulate media %q: %v", media, err)
	}
}

// rvDownloadCSV taps Download CSV and returns the file the browser saved.
func rvDownloadCSV(t *testing.T, b *browser) [][]string {
	t.Helper()
	dir := t.TempDir()
	events := true
	if _, err := chromedp.CallBrowser(b.ctx, cdpbrowser.SetDownloadBehavior, cdpbrowser.SetDownloadBehaviorParams{
		Behavior: cdpbrowser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dir, EventsEnabled: &events,
	}); err != nil {
		t.Fatalf("download behaviour: %v", err)
	}
	b.tap("#rv-csv-go")
	b.waitFor("the CSV status", `(document.querySelector("#rv-csv-status")?.textContent ?? "").startsWith("Saved")`, 10*time.Second)
	deadline := time.Now().Add(20 * time.Second)
	for time.Now().Before(deadline) {
		files, _ := filepath.Glob(filepath.Join(dir, "*.csv"))
		if len(files) == 1 {
			data, err := os.ReadFile(files[0])
			if err == nil && len(data) > 0 {
				rows, err := csv.NewReader(bytes.NewReader(data)).ReadAll()
				if err != nil {
					t.Fatalf("CSV: %v", err)
				}
				return rows
			}
		}
		time.Sleep(100 * time.Millisecond)
	}
	t.Fatalf("no CSV downloaded into %s", dir)
	return nil
}
