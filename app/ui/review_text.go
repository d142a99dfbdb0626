package ui

import (
	"errors"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
	"github.com/shopspring/decimal"

	"alvea/app/logbook"
	"alvea/physio"
)

// Sentences and number formatting for the Review screen. The figures are
// the audit's own (app/logbook); here they are only written out, and gauge
// pressures and altitudes are converted to the display units of Settings.

// rvMessage turns an error from reading the audit into a sentence.
func rvMessage(err error) string {
	switch {
	case errors.Is(err, logbook.ErrLocked):
		return "The logbook locked before the audit was read. Unlock it on the Logbook screen."
	}
	return "The audit could not be read: " + err.Error() + "."
}

// rvDeviationText is what the screen says about a deviation code: a short
// label for the filter buttons and a plain-language explanation.
type rvDeviationText struct{ Label, Explain string }

// rvDeviationTexts covers every code of logbook.DeviationCodes (a native test
// checks that none is missing).
var rvDeviationTexts = map[string]rvDeviationText{
	logbook.DevReserveBreached: {"Reserve breached",
		"At arrival, the oxygen left above the safe residual was less than the reserve the Brief's policy set aside: the transport used oxygen meant for delays."},
	logbook.DevCylinderBelowResidual: {"Below residual",
		"A cylinder was read below the safe residual pressure: it was used further than the policy allows, close to running empty."},
	logbook.DevCylinderChangedLate: {"Changed late",
		"A cylinder change came more than the tolerance after the minute the plan gave for it, or was never recorded though the transport went on past it."},
	logbook.DevOxygenAbovePlan: {"Used above plan",
		"More oxygen was used than the Brief calculated (before its reserve). Compare the flows and durations with those the plan assumed."},
	logbook.DevGaugeRose: {"Gauge rose",
		"A gauge reading was higher than the one before on the same cylinder: a refill, another cylinder under the same label, or a misread. The rise is not counted as oxygen used."},
	logbook.DevSpO2BelowTarget: {"SpO2 below target",
		"The patient's SpO2 stayed below the target for longer than the set limit in one stretch (each reading counts until the next one)."},
	logbook.DevPlanAmendedInFlight: {"Plan amended en route",
		"A new Brief was recorded after the transport began moving. The audit compares with the first Brief and shows the amended need beside it."},
	logbook.DevAmendedAfterClose: {"Corrected after close",
		"A record was corrected after the transport was closed. The original stays readable; check the reason given for the correction."},
	logbook.DevEntryAfterClose: {"Entry after close",
		"A new entry was added after the transport was closed."},
	logbook.DevNoBrief: {"No Brief",
		"No Brief was recorded, so there is no plan to compare with: the planned figures are not computable."},
	logbook.DevNotClosed: {"Not closed",
		"The transport was never closed: it may still be under way, or the close was missed."},
	logbook.DevRecordDamaged: {"Record damaged",
		"A record of this transport failed verification and could not be read; figures that needed it are not computable."},
}

func rvDeviationLabel(code string) string {
	if t, ok := rvDeviationTexts[code]; ok {
		return t.Label
	}
	return code
}

// rvAmount shows an audited amount: its value and unit, or "not computable"
// with the reason. Its text is exactly logbook.Amount.String(), so tests
// (and an auditor) can compare it with what `alvea audit` prints. A value
// that cannot be computed is never shown as 0.
func rvAmount(id string, a logbook.Amount) app.UI {
	el := app.Span().Class("rv-amount")
	if id != "" {
		el = el.ID(id)
	}
	if !a.Known() {
		return el.Class("rv-nc").DataSet("known", "false").Body(
			app.Strong().Text("not computable"),
			app.Span().Class("rv-why").Text(": "+a.NotComputable),
		)
	}
	parts := []app.UI{app.Span().Class("rv-num").Text(a.Value.String())}
	if a.Unit != "" {
		// The space is in the unit's text so that the element's text is
		// "265 L" exactly.
		parts = append(parts, app.Span().Class("rv-unit").Text(" "+a.Unit))
	}
	return el.DataSet("known", "true").Body(parts...)
}

// rvCellUI is rvAmount for a table cell: the value, or "not computable" (the
// reason is given on the transport's own page).
func rvCellUI(a logbook.Amount) app.UI {
	if !a.Known() {
		return app.Span().Class("rv-nc").Text("not computable")
	}
	return app.Text(a.Value.String())
}

// rvFigure is a labelled audited figure with an optional note under it.
func rvFigure(id, label string, a logbook.Amount, note string) app.UI {
	return app.Div().Class("rv-fig").Body(
		app.Span().Class("alv-figure-label").Text(label),
		rvAmount(id, a),
		app.If(note != "", func() app.UI { return app.Span().Class("rv-fig-note").Text(note) }),
	)
}

// rvStamp writes a time as `alvea audit` does.
func rvStamp(t time.Time) string { return t.UTC().Format("2006-01-02 15:04 UTC") }

// rvGauge writes a gauge amount (psi for CGA sizes, bar otherwise, as the
// audit gives it) in the display pressure unit: unchanged when the units
// agree, else converted by physio and rounded to the nearest 1 psi or
// 0.1 bar (a reading is reported, not relied on for a margin).
func rvGauge(a logbook.Amount, unit string) string {
	if !a.Known() {
		return "not computable"
	}
	if a.Unit == unit {
		return a.Value.String() + " " + unit
	}
	return rvConvertPressure(a.Value.Decimal, a.Unit, unit, physio.RoundNearest)
}

// rvResidual writes the policy residual in the display unit, rounded up
// when converted (a higher residual is the safe side).
func rvResidual(a logbook.Amount, unit string) string {
	if !a.Known() {
		return "not computable"
	}
	if a.Unit == unit {
		return a.Value.String() + " " + unit
	}
	return rvConvertPressure(a.Value.Decimal, a.Unit, unit, physio.RoundUp)
}

func rvConvertPressure(v decimal.Decimal, from, to string, r physio.Rounding) string {
	p := pressureOf(v.InexactFloat64(), from)
	if to == UnitBar {
		return rounded(p.Bar(), 1, r) + " bar"
	}
	return rounded(p.Psi(), 0, r) + " psi"
}

// rvAltitude writes an altitude given in feet in the display unit; a
// conversion to metres rounds up (a higher altitude is the safe side).
func rvAltitude(ft physio.Number, unit string) string {
	if unit == UnitM {
		return rounded(physio.Feet(ft.InexactFloat64()).Metres(), 0, physio.RoundUp) + " m"
	}
	return ft.String() + " ft"
}

// rvDevice writes a plan's device name (nasal_cannula) as words.
func rvDevice(d string) string { return strings.ReplaceAll(d, "_", " ") }

// rvRecordRange writes a transport's place in the chain: "R1–R17".
func rvRecordRange(a *logbook.TransportAudit) string {
	if a.FirstRecord == "" {
		return "no records"
	}
	if a.FirstRecord == a.LastRecord {
		return a.FirstRecord
	}
	return a.FirstRecord + "–" + a.LastRecord
}

// rvChainText writes where a transport sits in the vault's chain and what
// verification found.
func rvChainText(a *logbook.TransportAudit, chain logbook.ChainStatus) string {
	s := rvRecordRange(a) + " (" + rvPlural(a.Records, "record") + ") of a chain of " + rvPlural(chain.Records, "record") + ", head " + chain.Head
	if chain.Verified {
		return s + ", verified"
	}
	return s + ", VERIFICATION FOUND PROBLEMS"
}

func rvPlural(n int, what string) string {
	if n == 1 {
		return "1 " + what
	}
	return rvItoa(n) + " " + what + "s"
}

func rvItoa(n int) string { return decimal.NewFromInt(int64(n)).String() }

// rvCSSString quotes text for a CSS string (content: "…").
func rvCSSString(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"' || r == '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case r < 0x20 || r == 0x7f || r == '<' || r == '>':
			// No control characters; no angle brackets, so the text can
			// never close the <style> element it sits in.
			b.WriteByte(' ')
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}

// rvPrintPageCSS is the @page rule that writes who and what a printed page
// belongs to in its top margin, and the page number in the bottom margin,
// on every printed page.
func rvPrintPageCSS(top string) string {
	return "@media print { @page { @top-left { content: " + rvCSSString(top) +
		"; font-size: 8pt; color: #222; } @bottom-right { content: \"Page \" counter(page) \" of \" counter(pages); font-size: 8pt; color: #222; } } }"
}
