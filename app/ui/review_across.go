package ui

import (
	"bytes"
	"errors"
	"slices"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/physio"
)

// Across transports: filters by date range, vehicle and flags; the table
// of transports; totals and distributions; the CSV export.

// rvFilterForm is what the auditor set in the filters.
type rvFilterForm struct {
	from, to string // yyyy-mm-dd (UTC days, as `alvea audit --from/--to`), "" for no bound
	vehicle  string
	flags    []string // deviation codes; a transport must carry every one
}

// filter turns the form into a logbook.AuditFilter, or a sentence saying
// what is wrong. The "to" day is included, as in `alvea audit --to`.
func (f rvFilterForm) filter() (logbook.AuditFilter, string) {
	out := logbook.AuditFilter{Vehicle: strings.TrimSpace(f.vehicle), Flags: slices.Clone(f.flags)}
	if f.from != "" {
		t, err := time.Parse(time.DateOnly, f.from)
		if err != nil {
			return out, "From: enter a date (year-month-day)."
		}
		out.From = t
	}
	if f.to != "" {
		t, err := time.Parse(time.DateOnly, f.to)
		if err != nil {
			return out, "To: enter a date (year-month-day)."
		}
		out.To = t.AddDate(0, 0, 1)
	}
	if err := out.Validate(); err != nil {
		var fe *logbook.FieldError
		if errors.As(err, &fe) && fe.Field == "to" {
			return out, "To must be on or after From (" + f.from + ")."
		}
		return out, "The filter is not valid: " + err.Error() + "."
	}
	return out, ""
}

// applyFilter builds the filtered report from the whole audit.
func (r *review) applyFilter() {
	if r.all == nil {
		r.shown = nil
		return
	}
	f, msg := r.form.filter()
	r.filterMsg = msg
	if msg != "" {
		r.shown = nil
		return
	}
	r.shown = logbook.BuildReport(r.all.Transports, f, r.all.Options)
	r.shown.Chain = r.all.Chain
}

func (r *review) toggleFlag(ctx app.Context, code string) {
	if i := slices.Index(r.form.flags, code); i >= 0 {
		r.form.flags = slices.Delete(r.form.flags, i, i+1)
	} else {
		r.form.flags = append(r.form.flags, code)
	}
	r.csvStatus = ""
	r.applyFilter()
}

func (r *review) clearFilter(ctx app.Context, e app.Event) {
	r.form = rvFilterForm{}
	r.csvStatus = ""
	r.applyFilter()
}

func (r *review) renderAcross() app.UI {
	top := "Alvea review · across transports · chain of " + rvPlural(r.all.Chain.Records, "record") + ", head " + r.all.Chain.Head + " · audit rules " + r.all.AuditVersion
	return app.Div().ID("rv-across").Class("rv-across").Body(
		app.Style().Text(rvPrintPageCSS(top)),
		r.renderChain(),
		r.renderFilters(),
		app.If(r.shown != nil, func() app.UI {
			return app.Div().Body(
				r.renderTable(),
				r.renderTotals(),
				r.renderDistributions(),
				r.renderCSV(),
			)
		}),
		app.P().Class("alv-note rv-audit-note").Text(rvAuditNote),
	)
}

// renderChain says what verification of the chain found.
func (r *review) renderChain() app.UI {
	c := r.all.Chain
	o := r.all.Options
	rules := "Audit rules " + r.all.AuditVersion + ": a run below the SpO2 target longer than " + rvMinutes(o.SpO2BelowLimit) +
		" is a deviation; a cylinder change more than " + rvMinutes(o.ChangeLateTolerance) + " after the plan is late; gauge readings up to " +
		rvMinutes(o.ArrivalReadingWindow) + " after arrival count as at arrival."
	if c.Verified {
		return app.Div().ID("rv-chain-status").Class("alv-card rv-card").Body(
			app.H2().Class("alv-card-title").Text("Across transports"),
			app.P().Text("Chain verified: "+rvPlural(c.Records, "record")+", head "+c.Head+"."),
			app.P().Class("alv-note").Text(rules),
		)
	}
	items := make([]app.UI, 0, len(c.Problems))
	for _, p := range c.Problems {
		items = append(items, app.Li().Text(p))
	}
	return app.Div().ID("rv-chain-status").Class("alv-card rv-warn").Attr("role", "alert").Body(
		app.H2().Class("alv-card-title").Text("The chain shows problems"),
		app.P().Text("These records failed verification; transports that need them show it as RECORD_DAMAGED:"),
		app.Ul().Body(items...),
		app.P().Class("alv-note").Text(rules),
	)
}

func rvMinutes(d time.Duration) string { return rounded(d.Minutes(), 1, physio.RoundNearest) + " min" }

func (r *review) renderFilters() app.UI {
	f := &r.form
	flags := make([]app.UI, 0, len(logbook.DeviationCodes))
	for _, c := range logbook.DeviationCodes {
		code := c.Code
		flags = append(flags, app.Button().ID("rv-flag-"+code).Type("button").Class("alv-seg-btn rv-flag").
			DataSet("code", code).Aria("pressed", ariaBool(slices.Contains(f.flags, code))).
			Text(rvDeviationLabel(code)).
			OnClick(func(ctx app.Context, e app.Event) { r.toggleFlag(ctx, code) }))
	}
	count := ""
	if r.shown != nil {
		count = rvItoa(len(r.shown.Transports)) + " of " + rvPlural(len(r.all.Transports), "transport")
	}
	return app.Section().ID("rv-filters").Class("alv-card rv-card rv-filters").Aria("labelledby", "rv-filters-title").Body(
		app.H3().ID("rv-filters-title").Class("alv-card-title").Text("Filter"),
		app.Div().Class("rv-filter-fields rv-noprint").Body(
			app.Div().Class("alv-field").Body(
				app.Label().For("rv-from").Text("Opened from (UTC day)"),
				app.Input().ID("rv-from").Class("alv-input rv-date").Type("date").Value(f.from).
					OnChange(func(ctx app.Context, e app.Event) {
						f.from = ctx.JSSrc().Get("value").String()
						r.applyFilter()
					}),
			),
			app.Div().Class("alv-field").Body(
				app.Label().For("rv-to").Text("Opened to (UTC day, included)"),
				app.Input().ID("rv-to").Class("alv-input rv-date").Type("date").Value(f.to).
					OnChange(func(ctx app.Context, e app.Event) {
						f.to = ctx.JSSrc().Get("value").String()
						r.applyFilter()
					}),
			),
			app.Div().Class("alv-field").Body(
				app.Label().For("rv-vehicle").Text("Vehicle contains"),
				app.Input().ID("rv-vehicle").Class("alv-input alv-input-text").Type("search").
					Attr("autocomplete", "off").Value(f.vehicle).
					OnInput(func(ctx app.Context, e app.Event) {
						f.vehicle = ctx.JSSrc().Get("value").String()
						r.applyFilter()
					}),
			),
		),
		app.FieldSet().Class("alv-fieldset rv-noprint").Body(
			app.Legend().Text("With every one of these deviations"),
			app.Div().Class("rv-flags").Body(flags...),
		),
		app.Div().Class("alv-actions rv-noprint").Body(
			app.Button().ID("rv-clear").Type("button").Class("alv-button").Text("Clear the filter").OnClick(r.clearFilter),
		),
		app.If(r.filterMsg != "", func() app.UI {
			return app.P().ID("rv-filter-msg").Class("alv-error").Attr("role", "alert").Text(r.filterMsg)
		}),
		app.P().ID("rv-filter-desc").Class("rv-filter-desc").Text(r.filterText()),
		app.P().ID("rv-count").Class("alv-note").Text(count),
	)
}

// filterText says what the filter selects, for the screen and the print.
func (r *review) filterText() string {
	f := r.form
	var parts []string
	if f.from != "" {
		parts = append(parts, "opened from "+f.from)
	}
	if f.to != "" {
		parts = append(parts, "opened to "+f.to+" (included, UTC)")
	}
	if v := strings.TrimSpace(f.vehicle); v != "" {
		parts = append(parts, "vehicle contains “"+v+"”")
	}
	if len(f.flags) > 0 {
		parts = append(parts, "with "+strings.Join(f.flags, ", "))
	}
	if len(parts) == 0 {
		return "Showing every transport."
	}
	return "Showing transports " + strings.Join(parts, "; ") + "."
}

func (r *review) renderTable() app.UI {
	rows := r.shown.Transports
	if len(rows) == 0 {
		return app.Div().Class("alv-card").Body(
			app.P().Class("alv-lead").Text("No transport matches the filter."),
		)
	}
	trs := make([]app.UI, 0, len(rows))
	for i := range rows {
		a := &rows[i]
		id := a.ID
		o := &a.Oxygen
		codes := make([]app.UI, 0, len(a.Deviations))
		seen := map[string]int{}
		for _, d := range a.Deviations {
			seen[d.Code]++
		}
		for _, c := range logbook.DeviationCodes {
			if n := seen[c.Code]; n > 0 {
				text := c.Code
				if n > 1 {
					text += " ×" + rvItoa(n)
				}
				codes = append(codes, app.Span().Class("rv-code").Text(text))
			}
		}
		trs = append(trs, app.Tr().DataSet("transport", string(id)).Body(
			app.Td().Class("rv-who").Body(
				app.Button().ID("rv-row-"+string(id)).Type("button").Class("alv-button rv-open-row").
					Aria("label", "Review transport "+string(id)).Text(string(id)).
					OnClick(func(ctx app.Context, e app.Event) { r.open(ctx, id) }),
				app.Div().Class("rv-sub rv-nowrap").Body(
					app.Span().Class("alv-sr").Text("row "),
					app.Text("#"+rvItoa(i+1)+" "+a.Opened.UTC().Format(time.DateOnly)),
				),
				app.Div().Class("rv-route-cell").Text(rvRoute(a)),
				app.Div().Class("rv-sub").Text(a.Vehicle),
			),
			app.Td().Class("alv-num-cell").DataSet("col", "planned").Body(rvCellUI(o.PlannedL)),
			app.Td().Class("alv-num-cell").DataSet("col", "used").Body(rvCellUI(o.UsedL)),
			app.Td().Class("alv-num-cell").DataSet("col", "ratio").Body(rvCellUI(o.Ratio)),
			app.Td().Class("alv-num-cell").DataSet("col", "reserve").Body(rvCellUI(o.ReserveAtArrivalL)),
			app.Td().Class("alv-num-cell").DataSet("col", "required").Body(rvCellUI(o.ReserveRequiredL)),
			app.Td().Class("alv-num-cell rv-dev-count").DataSet("col", "deviations").Text(rvItoa(len(a.Deviations))),
		))
		// The codes on a row of their own under the figures, so that the
		// number columns stay narrow enough for a portrait tablet.
		if len(codes) > 0 {
			trs = append(trs, app.Tr().Class("rv-codes-row").Body(
				app.Td().ColSpan(7).Body(
					app.Span().Class("alv-sr").Text("Deviations of "+string(id)+": "),
					app.Span().Class("rv-codes").Body(codes...),
				),
			))
		}
	}
	return app.Section().Class("alv-card rv-card").Aria("labelledby", "rv-table-title").Body(
		app.H3().ID("rv-table-title").Class("alv-card-title").Text("Transports, oldest first"),
		app.Div().Class("rv-table-wrap").Body(
			app.Table().ID("rv-table").Class("alv-table rv-table").Body(
				app.Caption().Class("alv-sr").Text("Planned against used oxygen, reserve at arrival and deviations per transport"),
				app.THead().Body(app.Tr().Body(
					app.Th().Scope("col").Text("Transport"),
					app.Th().Scope("col").Text("Planned L"),
					app.Th().Scope("col").Text("Used L"),
					app.Th().Scope("col").Text("Used ÷ planned"),
					app.Th().Scope("col").Text("Reserve at arrival L"),
					app.Th().Scope("col").Text("Policy reserve L"),
					app.Th().Scope("col").Text("Devia­tions"),
				)),
				app.TBody().Body(trs...),
			),
		),
		app.P().Class("alv-note").Text("Planned: the first Brief's calculated need (no reserve). Used: the fall in contents over the gauge readings, rounded up. Reserve at arrival: oxygen above the safe residual, rounded down. “not computable” means the record lacks what the figure needs: open the transport to see why."),
	)
}

func (r *review) renderTotals() app.UI {
	t := r.shown.Totals
	devs := make([]app.UI, 0, len(r.shown.Codes))
	for _, c := range r.shown.Codes {
		n := t.Deviations[c.Code]
		if n == 0 {
			continue
		}
		devs = append(devs, app.Tr().DataSet("code", c.Code).Body(
			app.Th().Scope("row").Body(app.Span().Class("rv-code").Text(c.Code)),
			app.Td().Text(rvDeviationLabel(c.Code)),
			app.Td().Class("alv-num-cell").DataSet("col", "count").Text(rvItoa(n)),
			app.Td().Class("alv-num-cell").DataSet("col", "transports").Text(rvItoa(t.TransportsWith[c.Code])),
		))
	}
	return app.Section().ID("rv-totals").Class("alv-card rv-card").Aria("labelledby", "rv-totals-title").Body(
		app.H3().ID("rv-totals-title").Class("alv-card-title").Text("Totals"),
		app.Div().Class("alv-figures").Body(
			rvPlainFigure("rv-total-transports", "Transports", rvItoa(t.Transports), rvItoa(t.Closed)+" closed"),
			rvPlainFigure("rv-total-planned", "Planned", t.PlannedL.String()+" L", "over "+rvPlural(t.Compared, "transport")+" with planned and used"),
			rvPlainFigure("rv-total-used", "Used", t.UsedL.String()+" L", "same transports"),
			rvFigure("rv-total-ratio", "Used ÷ planned, overall", t.OverallRatio, ""),
			rvPlainFigure("rv-total-reserve-known", "Reserve at arrival known", rvItoa(t.ReserveKnown), ""),
			rvPlainFigure("rv-total-nc", "With a figure not computable", rvItoa(t.NotComputable), ""),
		),
		app.If(len(devs) > 0, func() app.UI {
			return app.Table().ID("rv-dev-totals").Class("alv-table rv-table").Body(
				app.Caption().Text("Deviations by code"),
				app.THead().Body(app.Tr().Body(
					app.Th().Scope("col").Text("Code"),
					app.Th().Scope("col").Text("Meaning"),
					app.Th().Scope("col").Text("Deviations"),
					app.Th().Scope("col").Text("Transports"),
				)),
				app.TBody().Body(devs...),
			)
		}).Else(func() app.UI { return app.P().Class("alv-empty").Text("No deviation in these transports.") }),
	)
}

// rvPlainFigure is a labelled count or sum of the report.
func rvPlainFigure(id, label, value, note string) app.UI {
	return app.Div().Class("rv-fig").Body(
		app.Span().Class("alv-figure-label").Text(label),
		app.Span().ID(id).Class("rv-amount").Body(app.Span().Class("rv-num").Text(value)),
		app.If(note != "", func() app.UI { return app.Span().Class("rv-fig-note").Text(note) }),
	)
}

func (r *review) renderDistributions() app.UI {
	rows := r.shown.Transports
	return app.Section().ID("rv-distributions").Class("alv-card rv-card").Aria("labelledby", "rv-dist-title").Body(
		app.H3().ID("rv-dist-title").Class("alv-card-title").Text("Distributions"),
		// Side by side at tablet width, on the narrow viewBox so that the
		// axis text stays at 12 px or more (as on Altitude).
		app.Div().Class("alv-plots alv-plots-pair").Body(
			rvDistribution("rv-ratio-dist", r.shown.RatioDistribution,
				rvDistributionPlot("rv-plot-ratio", "Used ÷ planned oxygen per transport", "Used ÷ planned", "1 = as planned", r.shown.RatioDistribution, rows)),
			rvDistribution("rv-reserve-dist", r.shown.ReserveDistribution,
				rvDistributionPlot("rv-plot-reserve", "Reserve at arrival per transport", "Reserve ÷ policy reserve", "1 = policy reserve", r.shown.ReserveDistribution, rows)),
		),
	)
}

// rvDistribution shows one distribution: the plot, its summary and the
// counts per bin.
func rvDistribution(id string, d logbook.Distribution, p plotSpec) app.UI {
	summary := rvItoa(len(d.Values)) + " computable, " + rvItoa(d.NotComputable) + " not computable"
	if d.Median != nil {
		summary += "; min " + d.Min.String() + ", median " + d.Median.String() + ", max " + d.Max.String()
	}
	bins := make([]app.UI, 0, len(d.Bins))
	for _, b := range d.Bins {
		bins = append(bins, app.Tr().Body(
			app.Th().Scope("row").Class("alv-num-cell").Text(b.Label),
			app.Td().Class("alv-num-cell").Text(rvItoa(b.Count)),
		))
	}
	return app.Div().ID(id).Class("rv-dist").Body(
		plotFigure(p),
		app.P().Class("rv-dist-summary").Text(summary+"."),
		app.Table().Class("alv-table rv-table rv-bins").Body(
			app.Caption().Text("Transports per range of "+d.Quantity),
			app.THead().Body(app.Tr().Body(
				app.Th().Scope("col").Text("Range"),
				app.Th().Scope("col").Text("Transports"),
			)),
			app.TBody().Body(bins...),
		),
	)
}

// rvCSVColumnLabels names the identifying CSV columns for the auditor.
var rvCSVColumnLabels = map[string]string{
	logbook.ColumnID:      "Transport id",
	logbook.ColumnDate:    "Date",
	logbook.ColumnRoute:   "Route",
	logbook.ColumnCrew:    "Crew initials",
	logbook.ColumnPatient: "Patient (with any identifying text)",
}

// csvIncluded lists the ticked identifying columns in their fixed order.
func (r *review) csvIncluded() []string {
	var out []string
	for _, c := range logbook.IdentifyingColumns {
		if r.include[c] {
			out = append(out, c)
		}
	}
	return out
}

// exportCSV writes the table as shown (filtered) and offers it as a file.
func (r *review) exportCSV(ctx app.Context, e app.Event) {
	r.session.Touch()
	if r.shown == nil {
		return
	}
	var b bytes.Buffer
	if err := r.shown.WriteCSV(&b, r.csvIncluded()); err != nil {
		r.csvStatus = "The CSV could not be written: " + err.Error() + "."
		return
	}
	name := "alvea-review-" + time.Now().UTC().Format("20060102-1504") + ".csv"
	if err := reviewDownload(name, b.Bytes()); err != nil {
		r.csvStatus = "The CSV could not be offered as a file: " + err.Error() + "."
		return
	}
	n := len(r.shown.Transports)
	what := "no identifying column"
	if inc := r.csvIncluded(); len(inc) > 0 {
		what = "identifying columns: " + strings.Join(inc, ", ")
	}
	r.csvStatus = "Saved " + name + ": " + rvPlural(n, "row") + ", " + what + "."
}

func (r *review) renderCSV() app.UI {
	toggles := make([]app.UI, 0, len(logbook.IdentifyingColumns))
	for _, c := range logbook.IdentifyingColumns {
		col := c
		toggles = append(toggles, app.Button().ID("rv-inc-"+col).Type("button").Class("alv-seg-btn rv-flag").
			Aria("pressed", ariaBool(r.include[col])).Text(rvCSVColumnLabels[col]).
			OnClick(func(ctx app.Context, e app.Event) {
				r.include[col] = !r.include[col]
				r.csvStatus = ""
			}))
	}
	identifying := len(r.csvIncluded()) > 0
	return app.Section().ID("rv-csv").Class("alv-card rv-card rv-noprint").Aria("labelledby", "rv-csv-title").Body(
		app.H3().ID("rv-csv-title").Class("alv-card-title").Text("Export the table (CSV)"),
		app.P().Text("The file holds the rows shown above: vehicle type, oxygen figures, deviation counts and what was not computable. It carries nothing that identifies a transport, crew or patient unless you add it here."),
		app.FieldSet().Class("alv-fieldset").Body(
			app.Legend().Text("Add identifying columns"),
			app.Div().Class("rv-flags").Body(toggles...),
		),
		app.If(identifying, func() app.UI {
			return app.P().ID("rv-csv-warn").Class("alv-warn").Text("The file will identify transports, crews or patients: keep it as patient records are kept, and share it only as your programme allows.")
		}),
		app.Div().Class("alv-actions").Body(
			app.Button().ID("rv-csv-go").Type("button").Class("alv-button alv-primary").Text("Download CSV").
				Disabled(len(r.shown.Transports) == 0).OnClick(r.exportCSV),
		),
		app.P().ID("rv-csv-status").Class("alv-note").Attr("role", "status").Text(r.csvStatus),
	)
}
