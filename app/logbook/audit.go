package logbook

// The audit: what was planned against what happened, per transport and
// across transports. It is pure arithmetic on folded transports (Fold or
// Vault.Transport), so the Review screen and `alvea audit` show the same
// numbers from the same functions:
//
//	AuditTransport(t, opts)          one transport → TransportAudit
//	BuildReport(audits, filter, opts) many → AuditReport (rows, totals, distributions)
//	AuditVault(ctx, v, opts, filter) an unlocked vault → AuditReport
//	AuditReport.WriteCSV(w, include) the table, identifying columns only on request
//
// Definitions (each also stated beside the code that computes it):
//
//   - Transport minute 0 is the time of the open entry; every minute in the
//     audit (timeline, cylinder changes) counts from it, as the plan's
//     minute 0 is the start of its first leg.
//   - Planned oxygen is the Brief snapshot recorded first (the pre-flight
//     plan): its calculated need (no reserve), its legs' litres, and its
//     policy (residual, reserve, SpO2 target). A later Brief is reported
//     beside it, never silently substituted.
//   - Used oxygen per cylinder is the fall in contents between consecutive
//     gauge readings, by the cylinder's own method (physio Cylinder.Contents:
//     cylinder factor, water capacity or label), summed; a rise adds nothing
//     and is flagged (GAUGE_ROSE). Rounded UP to the litre (judging a plan,
//     more used is the safe side).
//   - Arrival is the first handover event, else the first arrive event,
//     else the last landing. The reserve at arrival is the oxygen above the
//     policy residual in every cylinder (physio Cylinder.Usable) at each
//     cylinder's last reading up to ArrivalReadingWindow after arrival (a
//     reading taken a little later can only show less: the safe side);
//     rounded DOWN to the litre. The policy reserve is the Brief's oxygen
//     needed with reserve minus its calculated need (what the plan meant to
//     be left when the need had been used).
//   - SpO2 minutes below target are counted step-wise (sample and hold):
//     each reading holds until the next SpO2 reading, and the last reading
//     holds for no time. A run below target is a stretch of consecutive
//     readings under the target, measured from its first reading to the
//     next reading at or above target (or to the last reading). Rounded UP
//     to 0.1 min.
//
// Missing data is never a zero: a value that cannot be computed carries the
// reason instead (Amount.NotComputable, e.g. "no readings for cylinder B"),
// and totals that would need it are not computable either.

import (
	"encoding/json"
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// AuditVersion is the version of the audit arithmetic, reported with every
// audit so that a printed review can be traced to the rules that made it.
const AuditVersion = "1.0.0"

// AuditOptions are the auditor's settings. Zero fields take the defaults
// stated on each (WithDefaults fills them).
type AuditOptions struct {
	// SpO2TargetPercent overrides the target of the Brief (0: use the
	// Brief's target; without a Brief, DefaultSpO2TargetPercent). 50–100.
	SpO2TargetPercent float64 `json:"spo2_target_percent,omitempty"`
	// SpO2BelowLimit: SPO2_BELOW_TARGET is raised when one run below target
	// lasts longer than this. Default DefaultSpO2BelowLimit.
	SpO2BelowLimit time.Duration `json:"spo2_below_limit_ns"`
	// ChangeLateTolerance: a cylinder change more than this after the
	// planned minute is late. Default DefaultChangeLateTolerance.
	ChangeLateTolerance time.Duration `json:"change_late_tolerance_ns"`
	// ArrivalReadingWindow: gauge readings up to this long after arrival
	// count as the reading at arrival. Default DefaultArrivalReadingWindow.
	ArrivalReadingWindow time.Duration `json:"arrival_reading_window_ns"`
}

// Audit defaults. They are Alvea's own choices, not published limits: a
// programme sets its own through AuditOptions.
const (
	// DefaultSpO2TargetPercent is used only when no Brief gives a target: the
	// lower end of the usual 94–98 % range (BTS 2017 oxygen guideline), the
	// same default as the plan engine.
	DefaultSpO2TargetPercent = 94.0
	// DefaultSpO2BelowLimit: a run below target longer than 5 minutes is a
	// deviation (shorter dips are often probe artefacts or brief
	// manoeuvres; local protocol may set another limit).
	DefaultSpO2BelowLimit = 5 * time.Minute
	// DefaultChangeLateTolerance: 10 minutes, about the time a crew needs to
	// swap a regulator to the next cylinder.
	DefaultChangeLateTolerance = 10 * time.Minute
	// DefaultArrivalReadingWindow: 15 minutes, for the gauge check done at
	// handover rather than at the moment of arrival.
	DefaultArrivalReadingWindow = 15 * time.Minute
)

// WithDefaults returns o with zero fields set to the defaults.
func (o AuditOptions) WithDefaults() AuditOptions {
	if o.SpO2BelowLimit == 0 {
		o.SpO2BelowLimit = DefaultSpO2BelowLimit
	}
	if o.ChangeLateTolerance == 0 {
		o.ChangeLateTolerance = DefaultChangeLateTolerance
	}
	if o.ArrivalReadingWindow == 0 {
		o.ArrivalReadingWindow = DefaultArrivalReadingWindow
	}
	return o
}

// Validate checks the options' ranges; errors are *FieldError.
func (o AuditOptions) Validate() error {
	if o.SpO2TargetPercent != 0 {
		if err := checkFloat("spo2_target_percent", o.SpO2TargetPercent, 50, 100, "%"); err != nil {
			return err
		}
	}
	for _, d := range []struct {
		name string
		v    time.Duration
	}{{"spo2_below_limit", o.SpO2BelowLimit}, {"change_late_tolerance", o.ChangeLateTolerance}, {"arrival_reading_window", o.ArrivalReadingWindow}} {
		if err := checkFloat(d.name, d.v.Minutes(), 0, 24*60, "min"); err != nil {
			return err
		}
	}
	return nil
}

// Amount is one audited number with its unit, or the reason it cannot be
// computed: Value is nil exactly when NotComputable is set. Rounding names
// the direction ("up", "down", "nearest").
type Amount struct {
	Value         *physio.Number `json:"value"`
	Unit          string         `json:"unit"`
	Rounding      string         `json:"rounding,omitempty"`
	NotComputable string         `json:"not_computable,omitempty"`
}

// Known reports whether the amount has a value.
func (a Amount) Known() bool { return a.Value != nil }

// Decimal returns the value (zero and false when not computable).
func (a Amount) Decimal() (decimal.Decimal, bool) {
	if a.Value == nil {
		return decimal.Zero, false
	}
	return a.Value.Decimal, true
}

// String gives "224 L", "0.93", or "not computable: <reason>".
func (a Amount) String() string {
	if a.Value == nil {
		return "not computable: " + a.NotComputable
	}
	if a.Unit == "" {
		return a.Value.String()
	}
	return a.Value.String() + " " + a.Unit
}

// measured rounds x to places decimals in direction r into an Amount. A
// non-finite x (it cannot arise from validated entries) becomes not
// computable rather than a made-up number.
func measured(x float64, unit string, places int32, r physio.Rounding) Amount {
	d, ok := roundSafe(x, places, r)
	if !ok {
		return notComputable(unit, "the arithmetic gave no finite number")
	}
	return Amount{Value: &physio.Number{Decimal: d}, Unit: unit, Rounding: r.String()}
}

func exact(d decimal.Decimal, unit string, r physio.Rounding) Amount {
	return Amount{Value: &physio.Number{Decimal: d}, Unit: unit, Rounding: r.String()}
}

func notComputable(unit, format string, args ...any) Amount {
	return Amount{Unit: unit, NotComputable: fmt.Sprintf(format, args...)}
}

// roundSafe rounds x to places decimals in direction r after dropping
// binary noise below 10⁻⁶ of the last place, so that 2000 × 0.28 − 1200 ×
// 0.28 (224.00000000000003 in binary) is 224 L, not 225 L rounded up. Every
// real difference still rounds in the safe direction.
func roundSafe(x float64, places int32, r physio.Rounding) (decimal.Decimal, bool) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return decimal.Zero, false
	}
	d := decimal.NewFromFloat(x).Round(places + 6)
	switch r {
	case physio.RoundDown:
		return d.RoundFloor(places), true
	case physio.RoundUp:
		return d.RoundCeil(places), true
	}
	return d.Round(places), true
}

func number(x float64, places int32, r physio.Rounding) physio.Number {
	d, _ := roundSafe(x, places, r)
	return physio.Number{Decimal: d}
}

// Deviation codes. They are stable: scripts, filters (--flag) and the
// Review screen key on them. DeviationCodes lists them with their meaning.
const (
	DevReserveBreached       = "RESERVE_BREACHED"
	DevCylinderBelowResidual = "CYLINDER_BELOW_RESIDUAL"
	DevCylinderChangedLate   = "CYLINDER_CHANGED_LATE"
	DevOxygenAbovePlan       = "OXYGEN_ABOVE_PLAN"
	DevGaugeRose             = "GAUGE_ROSE"
	DevSpO2BelowTarget       = "SPO2_BELOW_TARGET"
	DevPlanAmendedInFlight   = "PLAN_AMENDED_IN_FLIGHT"
	DevAmendedAfterClose     = "AMENDED_AFTER_CLOSE"
	DevEntryAfterClose       = "ENTRY_AFTER_CLOSE"
	DevNoBrief               = "NO_BRIEF"
	DevNotClosed             = "NOT_CLOSED"
	DevRecordDamaged         = "RECORD_DAMAGED"
)

// DeviationCode is one code with how it is computed.
type DeviationCode struct {
	Code    string `json:"code"`
	Meaning string `json:"meaning"`
}

// DeviationCodes lists every code in report order.
var DeviationCodes = []DeviationCode{
	{DevReserveBreached, "oxygen above the residual at arrival is less than the policy reserve of the Brief (needed with reserve − calculated need)"},
	{DevCylinderBelowResidual, "a gauge reading below the policy's safe residual pressure"},
	{DevCylinderChangedLate, "the n-th cylinder change was recorded more than the tolerance after the plan's n-th change minute, or not at all though the transport lasted past it"},
	{DevOxygenAbovePlan, "oxygen used (all cylinders) is more than the Brief's calculated need"},
	{DevGaugeRose, "a gauge reading higher than the one before on the same cylinder (refill, swap under one label, or misread); the rise adds nothing to oxygen used"},
	{DevSpO2BelowTarget, "one run of SpO2 readings below target lasted longer than the set limit (step-wise, sample and hold)"},
	{DevPlanAmendedInFlight, "a new Brief was recorded after departure or lift-off and before arrival"},
	{DevAmendedAfterClose, "a correction was appended after the transport was closed"},
	{DevEntryAfterClose, "a new entry (not a correction) was appended after the transport was closed"},
	{DevNoBrief, "the transport carries no Brief snapshot: nothing planned to compare with"},
	{DevNotClosed, "the transport was never closed"},
	{DevRecordDamaged, "a record of this transport could not be read (failed verification)"},
}

func deviationRank(code string) int {
	for i, c := range DeviationCodes {
		if c.Code == code {
			return i
		}
	}
	return len(DeviationCodes)
}

// IsDeviationCode reports whether code is one of DeviationCodes.
func IsDeviationCode(code string) bool { return deviationRank(code) < len(DeviationCodes) }

// Deviation is one finding, named by the record at fault where there is
// one ("" otherwise).
type Deviation struct {
	Code   string `json:"code"`
	Record string `json:"record,omitempty"`
	Detail string `json:"detail"`
	seq    uint64
}

// TransportAudit is the audit of one transport: what the Review screen
// shows and `alvea audit` prints. Identifying fields (crew, patient) are
// kept out of JSON; CSV includes them only on request.
type TransportAudit struct {
	ID          TransportID `json:"id"`
	Opened      time.Time   `json:"opened"`
	Closed      *time.Time  `json:"closed"`
	Vehicle     string      `json:"vehicle"`
	Origin      string      `json:"origin"`
	Destination string      `json:"destination"`
	// Chain position: the records of this transport in the vault.
	FirstRecord string `json:"first_record"`
	LastRecord  string `json:"last_record"`
	Records     int    `json:"records"`
	// The Brief the audit compares against, and the engine that computed it.
	BriefRecord   string `json:"brief_record,omitempty"`
	EngineVersion string `json:"engine_version,omitempty"`
	AuditVersion  string `json:"audit_version"`

	Oxygen     OxygenAudit   `json:"oxygen"`
	Course     PatientCourse `json:"patient_course"`
	Timeline   Timeline      `json:"timeline"`
	Deviations []Deviation   `json:"deviations"`
	Problems   []string      `json:"problems,omitempty"` // unreadable records, by record

	Crew    []string `json:"-"`
	Patient Patient  `json:"-"`
}

// DeviationCount returns how many deviations carry code.
func (a *TransportAudit) DeviationCount(code string) int {
	n := 0
	for _, d := range a.Deviations {
		if d.Code == code {
			n++
		}
	}
	return n
}

// NotComputable lists every reason an amount of the audit could not be
// computed, without repeats, in the order met.
func (a *TransportAudit) NotComputable() []string {
	var out []string
	seen := map[string]bool{}
	add := func(x Amount) {
		if x.Value == nil && x.NotComputable != "" && !seen[x.NotComputable] {
			seen[x.NotComputable] = true
			out = append(out, x.NotComputable)
		}
	}
	o := &a.Oxygen
	for _, x := range []Amount{o.PlannedL, o.UsedL, o.Ratio, o.ReserveAtArrivalL, o.ReserveRequiredL} {
		add(x)
	}
	for _, x := range []Amount{a.Course.LowestSpO2, a.Course.MinutesBelowTarget} {
		add(x)
	}
	return out
}

// briefPlan is a Brief with its result decoded.
type briefPlan struct {
	seq    uint64
	at     time.Time
	brief  Brief
	result *physio.PlanResult
	err    string // why result is nil
}

func decodeBrief(b Timed[Brief]) briefPlan {
	p := briefPlan{seq: b.Seq, at: b.At, brief: b.Value}
	if len(b.Value.Result) == 0 {
		p.err = fmt.Sprintf("the Brief snapshot (%s) has no result", RecordName(b.Seq))
		return p
	}
	var r physio.PlanResult
	if err := json.Unmarshal(b.Value.Result, &r); err != nil {
		p.err = fmt.Sprintf("the Brief result (%s) does not decode as a plan result", RecordName(b.Seq))
		return p
	}
	if why := implausibleResult(&r); why != "" {
		p.err = fmt.Sprintf("the Brief result (%s) is not one the plan engine produces: %s", RecordName(b.Seq), why)
		return p
	}
	p.result = &r
	return p
}

// AuditTransport audits one folded transport. It never fails: what cannot
// be computed says why (Amount.NotComputable). opts are validated by the
// caller (AuditOptions.Validate); zero fields take the defaults.
func AuditTransport(t *Transport, opts AuditOptions) TransportAudit {
	opts = opts.WithDefaults()
	a := TransportAudit{
		ID: t.ID, Opened: t.Opened, AuditVersion: AuditVersion,
		Vehicle: t.Opening.Vehicle, Origin: t.Opening.Origin.Name, Destination: t.Opening.Destination.Name,
		Records: len(t.History), Crew: t.Opening.Crew, Patient: t.Opening.Patient,
	}
	if !t.Closed.IsZero() {
		c := t.Closed
		a.Closed = &c
	}
	if n := len(t.History); n > 0 {
		a.FirstRecord, a.LastRecord = RecordName(t.History[0].Seq), RecordName(t.History[n-1].Seq)
	}
	start := t.Opened
	if start.IsZero() && len(t.History) > 0 {
		start = t.History[0].At
	}
	c := &auditContext{t: t, opts: opts, start: start, a: &a}
	if len(t.Briefs) > 0 {
		p := decodeBrief(t.Briefs[0])
		c.plan = &p
		a.BriefRecord = RecordName(p.seq)
		a.EngineVersion = p.brief.EngineVersion
		if len(t.Briefs) > 1 {
			f := decodeBrief(t.Briefs[len(t.Briefs)-1])
			c.final = &f
		}
	}
	c.findArrival()
	c.oxygen()
	c.course()
	c.timeline()
	c.lifecycle()
	for _, p := range t.Problems {
		a.Problems = append(a.Problems, p.String())
		c.deviate(DevRecordDamaged, p.Seq, "%s", p.String())
	}
	sort.SliceStable(a.Deviations, func(i, j int) bool {
		ri, rj := deviationRank(a.Deviations[i].Code), deviationRank(a.Deviations[j].Code)
		if ri != rj {
			return ri < rj
		}
		return a.Deviations[i].seq < a.Deviations[j].seq
	})
	if a.Deviations == nil {
		a.Deviations = []Deviation{}
	}
	return a
}

// auditContext carries what the parts of one transport's audit share.
type auditContext struct {
	t     *Transport
	opts  AuditOptions
	start time.Time // minute 0
	a     *TransportAudit
	plan  *briefPlan // the first Brief (nil: none)
	final *briefPlan // the last Brief when there is more than one

	arrival      time.Time // zero: no arrival recorded
	arrivalEvent string
	arrivalSeq   uint64
	moving       time.Time // first depart or lift-off; zero if none
}

func (c *auditContext) minute(at time.Time) float64 { return at.Sub(c.start).Minutes() }

func (c *auditContext) deviate(code string, seq uint64, format string, args ...any) {
	d := Deviation{Code: code, Detail: fmt.Sprintf(format, args...), seq: seq}
	if seq != 0 {
		d.Record = RecordName(seq)
	}
	c.a.Deviations = append(c.a.Deviations, d)
}

// findArrival picks arrival: the first handover, else the first arrive,
// else the last landing. The first depart or lift-off starts movement.
func (c *auditContext) findArrival() {
	var arrive, landing *Timed[Event]
	for i := range c.t.Events {
		e := &c.t.Events[i]
		switch e.Value.Type {
		case EventHandover:
			if c.arrival.IsZero() {
				c.arrival, c.arrivalEvent, c.arrivalSeq = e.At, string(EventHandover), e.Seq
			}
		case EventArrive:
			if arrive == nil {
				arrive = e
			}
		case EventLanding:
			landing = e
		case EventDepart, EventLiftOff:
			if c.moving.IsZero() {
				c.moving = e.At
			}
		}
	}
	if c.arrival.IsZero() && arrive != nil {
		c.arrival, c.arrivalEvent, c.arrivalSeq = arrive.At, string(EventArrive), arrive.Seq
	}
	if c.arrival.IsZero() && landing != nil {
		c.arrival, c.arrivalEvent, c.arrivalSeq = landing.At, string(EventLanding), landing.Seq
	}
}

// lifecycle raises the deviations about the record itself: no Brief, plan
// amended in flight, entries or corrections after the close, never closed.
func (c *auditContext) lifecycle() {
	t := c.t
	if len(t.Briefs) == 0 {
		c.deviate(DevNoBrief, 0, "no Brief snapshot was recorded")
	}
	for _, b := range t.Briefs[min(1, len(t.Briefs)):] {
		switch {
		case c.moving.IsZero():
			c.deviate(DevPlanAmendedInFlight, b.Seq, "new Brief at minute %s (no departure or lift-off recorded, so taken as in flight)", number(c.minute(b.At), 0, physio.RoundNearest))
		case !b.At.Before(c.moving) && (c.arrival.IsZero() || !b.At.After(c.arrival)):
			c.deviate(DevPlanAmendedInFlight, b.Seq, "new Brief at minute %s, after movement began at minute %s", number(c.minute(b.At), 0, physio.RoundNearest), number(c.minute(c.moving), 0, physio.RoundNearest))
		}
	}
	closed := false
	for _, e := range t.History {
		switch {
		case e.Kind == KindClose && !closed:
			closed = true
		case closed && e.Kind == KindAmend:
			c.deviate(DevAmendedAfterClose, e.Seq, "corrects %s after the close: %s", RecordName(e.Amends), e.Reason)
		case closed:
			c.deviate(DevEntryAfterClose, e.Seq, "%s entry appended after the close", e.Kind)
		}
	}
	if t.Closed.IsZero() {
		c.deviate(DevNotClosed, 0, "no close in force")
	}
}

// joinReasons joins reasons for a total that needs every part.
func joinReasons(reasons []string) string { return strings.Join(reasons, "; ") }
