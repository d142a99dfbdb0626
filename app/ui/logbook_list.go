package ui

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// listState is the list of transports and its search and filters. It is
// built from the sealed index only: no record body is decrypted to list.
type listState struct {
	listing  *logbook.Listing
	search   string
	status   string // "", "open", "closed", "amended"
	from, to string // yyyy-mm-dd, local dates, "" for no bound
}

// filter turns the form into a logbook.Filter.
func (s *listState) filter() logbook.Filter {
	f := logbook.Filter{Text: s.search}
	switch s.status {
	case "open":
		f.OpenOnly = true
	case "closed":
		f.ClosedOnly = true
	case "amended":
		f.Amended = true
	}
	if t, err := time.ParseInLocation("2006-01-02", s.from, time.Local); err == nil {
		f.From = t
	}
	if t, err := time.ParseInLocation("2006-01-02", s.to, time.Local); err == nil {
		f.To = t.AddDate(0, 0, 1) // the whole "to" day is included
	}
	return f
}

func (l *logbookScreen) renderList() app.UI {
	s := &l.list
	var rows []logbook.TransportSummary
	total := 0
	if s.listing != nil {
		rows = s.listing.Filter(s.filter())
		total = len(s.listing.Transports)
	}
	return app.Div().Class("lb-body").Body(
		l.nav(),
		l.renderProblems(),
		app.Div().Class("alv-card").Body(
			app.H2().Class("alv-card-title").Text("Transports"),
			app.Div().Class("lb-filters").Body(
				app.Div().Class("alv-field").Body(
					app.Label().For("lb-search").Text("Search (id, vehicle, origin, destination)"),
					app.Input().ID("lb-search").Class("alv-input alv-input-text").Type("search").
						Attr("autocomplete", "off").Value(s.search).
						OnInput(func(ctx app.Context, e app.Event) { s.search = ctx.JSSrc().Get("value").String() }),
				),
				app.Div().Class("alv-field").Body(
					app.Label().For("lb-from").Text("Opened from"),
					app.Input().ID("lb-from").Class("alv-input").Type("date").Value(s.from).
						OnChange(func(ctx app.Context, e app.Event) { s.from = ctx.JSSrc().Get("value").String() }),
				),
				app.Div().Class("alv-field").Body(
					app.Label().For("lb-to").Text("Opened to"),
					app.Input().ID("lb-to").Class("alv-input").Type("date").Value(s.to).
						OnChange(func(ctx app.Context, e app.Event) { s.to = ctx.JSSrc().Get("value").String() }),
				),
				segmented("lb-show", "Show", s.status, []choice{
					{"", "All"}, {"open", "Open"}, {"closed", "Closed"}, {"amended", "Corrected"},
				}, func(ctx app.Context, v string) { s.status = v }),
			),
			app.P().ID("lb-count").Class("alv-note").Text(strconv.Itoa(len(rows))+" of "+strconv.Itoa(total)+" transports"),
			app.If(len(rows) > 0, func() app.UI { return l.renderTable(rows) }).
				Else(func() app.UI {
					if total == 0 {
						return app.P().Class("alv-lead").Text("No transport yet. Start one from the current Brief.")
					}
					return app.P().Class("alv-lead").Text("No transport matches the search and filters.")
				}),
		),
	)
}

// lbListShown caps the rows drawn at once; the count above says how many
// match, and the search narrows them.
const lbListShown = 200

func (l *logbookScreen) renderTable(rows []logbook.TransportSummary) app.UI {
	more := 0
	if len(rows) > lbListShown {
		more = len(rows) - lbListShown
		rows = rows[:lbListShown]
	}
	trs := make([]app.UI, 0, len(rows))
	for _, r := range rows {
		id := r.ID
		trs = append(trs, app.Tr().DataSet("transport", string(id)).Body(
			app.Td().Class("alv-num-cell").Text(lbDayAndClock(r.Opened)),
			app.Td().Body(
				app.Button().Type("button").Class("alv-button lb-open-row").ID("lb-row-"+string(id)).
					Aria("label", "Open transport "+string(id)).
					Text(r.Origin+" → "+r.Destination).
					OnClick(func(ctx app.Context, e app.Event) { l.openTransport(ctx, id) }),
				app.Div().Class("lb-id").Text(string(id)),
			),
			app.Td().Text(r.Vehicle),
			app.Td().Body(lbFlagsOf(r)...),
		))
	}
	return app.Div().Class("lb-table-wrap").Body(
		app.Table().ID("lb-list").Class("alv-table lb-table").Body(
			app.Caption().Class("lb-sr").Text("Transports, newest first"),
			app.THead().Body(app.Tr().Body(
				app.Th().Scope("col").Text("Opened"),
				app.Th().Scope("col").Text("Route"),
				app.Th().Scope("col").Text("Vehicle"),
				app.Th().Scope("col").Text("Flags"),
			)),
			app.TBody().Body(trs...),
		),
		app.If(more > 0, func() app.UI {
			return app.P().Class("alv-note").Text(strconv.Itoa(more) + " more: narrow the search or the dates to see them.")
		}),
	)
}

// lbFlagsOf lists what a transport's line warns about.
func lbFlagsOf(r logbook.TransportSummary) []app.UI {
	flag := func(class, text string) app.UI { return app.Span().Class("lb-flag " + class).Text(text) }
	var out []app.UI
	if r.IsClosed() {
		out = append(out, flag("lb-flag-closed", "closed "+lbDayAndClock(r.Closed)))
	} else {
		out = append(out, flag("lb-flag-open", "open"))
	}
	if r.Amended {
		out = append(out, flag("lb-flag-amended", "corrected"))
	}
	if r.ChangedAfterClose {
		out = append(out, flag("lb-flag-late", "changed after close"))
	}
	if r.BriefAmended {
		out = append(out, flag("", "Brief amended"))
	}
	if r.Identifying {
		out = append(out, flag("lb-flag-ident", "identifying text"))
	}
	return out
}

// renderProblems lists what verification of the chain found.
func (l *logbookScreen) renderProblems() app.UI {
	if l.list.listing == nil || len(l.list.listing.Problems) == 0 {
		return app.Text("")
	}
	items := make([]app.UI, 0, len(l.list.listing.Problems))
	for _, p := range l.list.listing.Problems {
		items = append(items, app.Li().Text(p.String()))
	}
	return app.Div().ID("lb-chain-problems").Class("alv-card lb-warn").Attr("role", "alert").Body(
		app.H2().Class("alv-card-title").Text("The logbook shows signs of removal or change"),
		app.P().Text("Every readable record is still listed. The records named here failed verification:"),
		app.Ul().Body(items...),
	)
}
