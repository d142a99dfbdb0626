package logbook

import (
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"slices"
	"sort"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// AuditFilter selects transports for the across-transport report. Zero
// fields select everything.
type AuditFilter struct {
	From    time.Time `json:"from"`    // opened at or after From
	To      time.Time `json:"to"`      // opened before To
	Vehicle string    `json:"vehicle"` // case-insensitive substring of the vehicle
	Flags   []string  `json:"flags"`   // deviation codes; a transport must carry every one
}

// Validate checks the flags are deviation codes and the range is ordered.
func (f AuditFilter) Validate() error {
	for _, code := range f.Flags {
		if !IsDeviationCode(code) {
			names := make([]string, len(DeviationCodes))
			for i, c := range DeviationCodes {
				names[i] = c.Code
			}
			return &FieldError{Field: "flag", Value: fmt.Sprintf("%q", code), Allowed: "one of " + strings.Join(names, ", ")}
		}
	}
	if !f.From.IsZero() && !f.To.IsZero() && !f.From.Before(f.To) {
		return &FieldError{Field: "to", Value: f.To.Format(time.DateOnly), Allowed: "a date after from (" + f.From.Format(time.DateOnly) + ")"}
	}
	return nil
}

// Match reports whether the filter selects a.
func (f AuditFilter) Match(a *TransportAudit) bool {
	if !f.From.IsZero() && a.Opened.Before(f.From) || !f.To.IsZero() && !a.Opened.Before(f.To) {
		return false
	}
	if v := strings.ToLower(strings.TrimSpace(f.Vehicle)); v != "" && !strings.Contains(strings.ToLower(a.Vehicle), v) {
		return false
	}
	for _, code := range f.Flags {
		if a.DeviationCount(code) == 0 {
			return false
		}
	}
	return true
}

// AuditReport is the audit of a set of transports: each transport's audit
// (oldest first), the totals and the distributions for the plots.
type AuditReport struct {
	AuditVersion string           `json:"audit_version"`
	Options      AuditOptions     `json:"options"`
	Filter       AuditFilter      `json:"filter"`
	Chain        ChainStatus      `json:"chain"`
	Codes        []DeviationCode  `json:"deviation_codes"`
	Transports   []TransportAudit `json:"transports"`
	Totals       AuditTotals      `json:"totals"`
	// RatioDistribution: used ÷ planned per transport. ReserveDistribution:
	// reserve at arrival as a multiple of the policy reserve.
	RatioDistribution   Distribution `json:"ratio_distribution"`
	ReserveDistribution Distribution `json:"reserve_distribution"`
}

// ChainStatus is what verification found, for the report header.
type ChainStatus struct {
	Verified bool     `json:"verified"`
	Records  int      `json:"records"`
	Head     string   `json:"head"`
	Problems []string `json:"problems"`
}

// AuditTotals sums the table. PlannedL, UsedL and OverallRatio are over
// the transports where both planned and used are known (Compared), so the
// ratio compares like with like.
type AuditTotals struct {
	Transports     int            `json:"transports"`
	Closed         int            `json:"closed"`
	Compared       int            `json:"compared"`
	PlannedL       physio.Number  `json:"planned_l"`
	UsedL          physio.Number  `json:"used_l"`
	OverallRatio   Amount         `json:"overall_ratio"`
	ReserveKnown   int            `json:"reserve_known"`
	Deviations     map[string]int `json:"deviations"`      // deviations by code
	TransportsWith map[string]int `json:"transports_with"` // transports with at least one, by code
	NotComputable  int            `json:"not_computable"`  // transports with some amount not computable
}

// Distribution is the data of one plot: the value per transport (for a
// strip or scatter plot) and counts in fixed bins (for a histogram).
type Distribution struct {
	Quantity      string         `json:"quantity"`
	Bins          []Bin          `json:"bins"`
	Values        []DistValue    `json:"values"`
	NotComputable int            `json:"not_computable"`
	Min           *physio.Number `json:"min"`
	Median        *physio.Number `json:"median"`
	Max           *physio.Number `json:"max"`
}

// Bin counts values v with From ≤ v < To (To nil: no upper bound).
type Bin struct {
	Label string         `json:"label"`
	From  physio.Number  `json:"from"`
	To    *physio.Number `json:"to"`
	Count int            `json:"count"`
}

// DistValue is one transport's value in a distribution.
type DistValue struct {
	ID    TransportID   `json:"id"`
	Value physio.Number `json:"value"`
}

// Bin edges: chosen by Alvea to separate under-use, on-plan and over-use
// (ratio) and breach, thin and ample reserves (multiple of the policy).
var (
	ratioEdges   = []string{"0", "0.5", "0.8", "1", "1.2", "1.5"}
	reserveEdges = []string{"0", "0.5", "1", "1.5", "2", "3"}
)

// BuildReport filters audits and adds the totals and distributions. The
// audits are sorted oldest first (then by id). opts is recorded as used.
func BuildReport(audits []TransportAudit, f AuditFilter, opts AuditOptions) *AuditReport {
	r := &AuditReport{AuditVersion: AuditVersion, Options: opts.WithDefaults(), Filter: f, Codes: DeviationCodes, Transports: []TransportAudit{}}
	if r.Filter.Flags == nil {
		r.Filter.Flags = []string{}
	}
	for i := range audits {
		if f.Match(&audits[i]) {
			r.Transports = append(r.Transports, audits[i])
		}
	}
	sort.SliceStable(r.Transports, func(i, j int) bool {
		a, b := r.Transports[i], r.Transports[j]
		if !a.Opened.Equal(b.Opened) {
			return a.Opened.Before(b.Opened)
		}
		return a.ID < b.ID
	})
	r.Chain.Problems = []string{}
	r.totals()
	r.RatioDistribution = distribution("used ÷ planned oxygen", ratioEdges, r.Transports, func(a *TransportAudit) Amount { return a.Oxygen.Ratio })
	r.ReserveDistribution = distribution("reserve at arrival ÷ policy reserve", reserveEdges, r.Transports, func(a *TransportAudit) Amount { return a.Oxygen.ReserveMultiple })
	return r
}

func (r *AuditReport) totals() {
	t := &r.Totals
	t.Transports = len(r.Transports)
	t.Deviations, t.TransportsWith = map[string]int{}, map[string]int{}
	planned, used := decimal.Zero, decimal.Zero
	for i := range r.Transports {
		a := &r.Transports[i]
		if a.Closed != nil {
			t.Closed++
		}
		p, pok := a.Oxygen.PlannedL.Decimal()
		u, uok := a.Oxygen.UsedL.Decimal()
		if pok && uok {
			t.Compared++
			planned, used = planned.Add(p), used.Add(u)
		}
		if a.Oxygen.ReserveAtArrivalL.Known() {
			t.ReserveKnown++
		}
		if len(a.NotComputable()) > 0 {
			t.NotComputable++
		}
		seen := map[string]bool{}
		for _, d := range a.Deviations {
			t.Deviations[d.Code]++
			if !seen[d.Code] {
				seen[d.Code] = true
				t.TransportsWith[d.Code]++
			}
		}
	}
	t.PlannedL, t.UsedL = physio.Number{Decimal: planned}, physio.Number{Decimal: used}
	switch {
	case t.Compared == 0:
		t.OverallRatio = notComputable("", "no transport with both planned and used oxygen")
	case planned.Sign() <= 0:
		t.OverallRatio = notComputable("", "the plans need 0 L in total")
	default:
		t.OverallRatio = exact(used.DivRound(planned, 8).Round(2), "", physio.RoundNearest)
	}
}

func distribution(quantity string, edges []string, audits []TransportAudit, value func(*TransportAudit) Amount) Distribution {
	d := Distribution{Quantity: quantity, Values: []DistValue{}}
	for i, e := range edges {
		b := Bin{From: physio.Number{Decimal: decimal.RequireFromString(e)}}
		if i+1 < len(edges) {
			to := physio.Number{Decimal: decimal.RequireFromString(edges[i+1])}
			b.To = &to
			b.Label = e + "–" + edges[i+1]
		} else {
			b.Label = "≥ " + e
		}
		d.Bins = append(d.Bins, b)
	}
	var sorted []decimal.Decimal
	for i := range audits {
		v, ok := value(&audits[i]).Decimal()
		if !ok {
			d.NotComputable++
			continue
		}
		d.Values = append(d.Values, DistValue{ID: audits[i].ID, Value: physio.Number{Decimal: v}})
		sorted = append(sorted, v)
		for j := len(d.Bins) - 1; j >= 0; j-- {
			if v.Cmp(d.Bins[j].From.Decimal) >= 0 {
				d.Bins[j].Count++
				break
			}
		}
	}
	if n := len(sorted); n > 0 {
		slices.SortFunc(sorted, func(a, b decimal.Decimal) int { return a.Cmp(b) })
		lo, hi := physio.Number{Decimal: sorted[0]}, physio.Number{Decimal: sorted[n-1]}
		med := sorted[n/2]
		if n%2 == 0 {
			med = sorted[n/2-1].Add(sorted[n/2]).Div(decimal.NewFromInt(2))
		}
		m := physio.Number{Decimal: med}
		d.Min, d.Median, d.Max = &lo, &m, &hi
	}
	return d
}

// AuditVault audits every transport of an unlocked vault and builds the
// report: the Review screen's entry point, and the CLI's after OpenBundle.
// Problems found while listing and reading are named by record in
// Chain.Problems; unreadable records of a transport also appear in its
// audit (RECORD_DAMAGED). It returns ErrLocked when the vault is locked.
func AuditVault(ctx context.Context, v *Vault, opts AuditOptions, f AuditFilter) (*AuditReport, error) {
	if err := opts.Validate(); err != nil {
		return nil, err
	}
	if err := f.Validate(); err != nil {
		return nil, err
	}
	l, err := v.List(ctx)
	if err != nil {
		return nil, err
	}
	var audits []TransportAudit
	for _, s := range l.Transports {
		t, err := v.Transport(ctx, s.ID)
		if err != nil {
			return nil, err
		}
		audits = append(audits, AuditTransport(t, opts))
	}
	r := BuildReport(audits, f, opts)
	r.Chain.Records = len(l.Entries)
	r.Chain.Head = "-"
	if l.Head != 0 {
		r.Chain.Head = RecordName(l.Head)
	}
	seen := map[string]bool{}
	add := func(p Problem) {
		if s := p.String(); !seen[s] {
			seen[s] = true
			r.Chain.Problems = append(r.Chain.Problems, s)
		}
	}
	for _, p := range l.Problems {
		add(p)
	}
	for i := range audits {
		for _, p := range audits[i].Problems {
			if !seen[p] {
				seen[p] = true
				r.Chain.Problems = append(r.Chain.Problems, p)
			}
		}
	}
	r.Chain.Verified = len(r.Chain.Problems) == 0
	return r, nil
}

// Identifying CSV columns, included only when asked for.
const (
	ColumnID      = "id"      // the transport id (links the row to the record)
	ColumnDate    = "date"    // opening date, UTC
	ColumnRoute   = "route"   // origin → destination names
	ColumnCrew    = "crew"    // crew initials
	ColumnPatient = "patient" // age band, sex, weight and any identifying text
)

// IdentifyingColumns lists the columns WriteCSV leaves out unless asked.
var IdentifyingColumns = []string{ColumnID, ColumnDate, ColumnRoute, ColumnCrew, ColumnPatient}

// WriteCSV writes the table, one row per transport, oldest first. Without
// include it carries no identifying field: a row number, the vehicle type,
// the oxygen figures, the deviation counts and what was not computable.
// include names identifying columns to add (IdentifyingColumns); an
// unknown name is a *FieldError. A value that is not computable is an empty
// cell, with its reason in the not_computable column. A text cell that a
// spreadsheet would read as a formula is written with a leading apostrophe
// (csvText); numbers are written as they are.
func (r *AuditReport) WriteCSV(w io.Writer, include []string) error {
	want := map[string]bool{}
	for _, c := range include {
		if !slices.Contains(IdentifyingColumns, c) {
			return &FieldError{Field: "include", Value: fmt.Sprintf("%q", c), Allowed: "one of " + strings.Join(IdentifyingColumns, ", ")}
		}
		want[c] = true
	}
	header := []string{"row"}
	for _, c := range IdentifyingColumns {
		if want[c] {
			header = append(header, c)
		}
	}
	header = append(header, "vehicle", "planned_l", "used_l", "ratio", "reserve_at_arrival_l", "reserve_required_l", "deviations")
	for _, c := range DeviationCodes {
		header = append(header, strings.ToLower(c.Code))
	}
	header = append(header, "not_computable")
	cw := csv.NewWriter(w)
	if err := cw.Write(header); err != nil {
		return err
	}
	cell := func(a Amount) string {
		if a.Value == nil {
			return ""
		}
		return a.Value.String()
	}
	for i := range r.Transports {
		a := &r.Transports[i]
		row := []string{fmt.Sprint(i + 1)}
		for _, c := range IdentifyingColumns {
			if !want[c] {
				continue
			}
			switch c {
			case ColumnID:
				row = append(row, csvText(string(a.ID)))
			case ColumnDate:
				row = append(row, a.Opened.UTC().Format(time.DateOnly))
			case ColumnRoute:
				row = append(row, csvText(a.Origin+" → "+a.Destination))
			case ColumnCrew:
				row = append(row, csvText(strings.Join(a.Crew, " ")))
			case ColumnPatient:
				row = append(row, csvText(patientText(a.Patient)))
			}
		}
		o := &a.Oxygen
		row = append(row, csvText(a.Vehicle), cell(o.PlannedL), cell(o.UsedL), cell(o.Ratio), cell(o.ReserveAtArrivalL), cell(o.ReserveRequiredL), fmt.Sprint(len(a.Deviations)))
		for _, c := range DeviationCodes {
			row = append(row, fmt.Sprint(a.DeviationCount(c.Code)))
		}
		row = append(row, csvText(strings.Join(a.NotComputable(), "; ")))
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// csvText keeps free text from being run as a formula when the CSV is
// opened in a spreadsheet: a cell starting with =, +, -, @, a tab, a
// carriage return or a line feed gets a leading apostrophe, which
// spreadsheets read as "this cell is text" (OWASP "CSV Injection", from
// memory). Only text cells go through it: a negative number stays a number.
func csvText(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r\n", rune(s[0])) {
		return "'" + s
	}
	return s
}

func patientText(p Patient) string {
	var parts []string
	if p.AgeBand != "" {
		parts = append(parts, string(p.AgeBand))
	}
	if p.Sex != "" {
		parts = append(parts, string(p.Sex))
	}
	if p.WeightKg != 0 {
		parts = append(parts, fmt.Sprintf("%g kg", p.WeightKg))
	}
	if s := strings.TrimSpace(p.Identifying); s != "" {
		parts = append(parts, s)
	}
	return strings.Join(parts, ", ")
}
