package ui

import (
	"fmt"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// The Brief draft: every field as the crew typed it, kept across reloads
// and browser restarts. Texts are stored as typed, with the display unit
// they were typed under, so a change of display unit never rounds a value
// the crew entered (the same rule as Settings).

// draftSchema is bumped when BriefDraft changes shape; a stored draft of
// another schema is not used.
const draftSchema = 1

// Entry is one field as typed: the text and the display unit in force when
// it was typed. A text that carries its own unit ("2400 m") keeps it.
type Entry struct {
	T string `json:"t,omitempty"`
	U string `json:"u,omitempty"`
}

// BriefDraft is the whole Brief form.
type BriefDraft struct {
	Schema  int           `json:"schema"`
	Route   RouteDraft    `json:"route"`
	Legs    []LegDraft    `json:"legs"`
	Patient PatientDraft  `json:"patient"`
	Supply  []SupplyDraft `json:"supply"`
	Policy  PolicyDraft   `json:"policy"`
}

// Aircraft pressurisation choices of the route.
const (
	CabinUnpressurised = "unpressurised"
	CabinPressurised   = "pressurised"
	CabinStated        = "stated"
)

// RouteDraft is the route and the aircraft.
type RouteDraft struct {
	Origin        Entry  `json:"origin"`
	Destination   Entry  `json:"destination"`
	Cruise        Entry  `json:"cruise"`
	Cabin         string `json:"cabin"` // unpressurised | pressurised | stated ("" not chosen)
	Differential  Entry  `json:"differential"`
	CabinAltitude Entry  `json:"cabinAltitude"`
}

// LegDraft is one leg: where, how long, and the oxygen set-up.
type LegDraft struct {
	Where        string `json:"where"`
	Minutes      Entry  `json:"minutes"`
	Device       string `json:"device"` // a physio.Device, or "" not chosen
	Flow         Entry  `json:"flow"`
	FiO2         Entry  `json:"fio2"`
	MinuteVolume Entry  `json:"minuteVolume"`
	BiasFlow     Entry  `json:"biasFlow"`
	Leak         Entry  `json:"leak"`
	DriveGas     Entry  `json:"driveGas"`
	Drive        string `json:"drive"`
}

// PatientDraft is the patient's ground state.
//
// PATIENT DATA. DESIGN.md forbids it in plain browser storage: it is never
// written by localDraftStore; the Brief keeps it through vaultDraftStore
// (vault_draft.go), in memory and sealed in the Logbook vault.
type PatientDraft struct {
	FiO2        Entry  `json:"fio2"`
	PaO2        Entry  `json:"pao2"`
	SpO2        Entry  `json:"spo2"`
	PaCO2       Entry  `json:"paco2"`
	RQ          Entry  `json:"rq"`
	Temperature Entry  `json:"temperature"`
	Hb          Entry  `json:"hb"`
	Age         Entry  `json:"age"`
	MeasuredAt  string `json:"measuredAt"`
}

// Cylinder kinds of a supply line besides the CGA letters D, E, M, G, H:
// a water capacity typed on the line, or a cylinder from the Settings
// catalogue (catalogueKind + its name).
const (
	SupplyWaterCapacity = "wc"
	catalogueKind       = "cat:"
)

// SupplyDraft is one line of cylinders on board.
type SupplyDraft struct {
	Kind          string `json:"kind"` // D|E|M|G|H, "wc", or "cat:NAME"
	WaterCapacity Entry  `json:"waterCapacity"`
	Pressure      Entry  `json:"pressure"`
	Count         Entry  `json:"count"`
}

// PolicyDraft overrides the reserve policy of Settings for this transport
// when Override is set; otherwise Settings apply.
type PolicyDraft struct {
	Override   bool  `json:"override"`
	Residual   Entry `json:"residual"`
	Factor     Entry `json:"factor"`
	Minutes    Entry `json:"minutes"`
	SpO2Target Entry `json:"spo2Target"`
}

// NewBriefDraft returns the empty form a new transport starts with: three
// legs (origin ground, flight, destination ground) and one cylinder line,
// with no value guessed. Devices, minutes and every clinical value are
// left for the crew.
func NewBriefDraft() BriefDraft {
	return BriefDraft{
		Schema: draftSchema,
		Legs: []LegDraft{
			{Where: "origin"},
			{Where: "cabin"},
			{Where: "destination"},
		},
		Patient: PatientDraft{MeasuredAt: "origin"},
		Supply:  []SupplyDraft{{Kind: "E", Count: Entry{T: "1"}}},
	}
}

// clone copies d so that a stored or saved draft never shares slices with
// the one being edited.
func (d BriefDraft) clone() BriefDraft {
	d.Legs = append([]LegDraft(nil), d.Legs...)
	d.Supply = append([]SupplyDraft(nil), d.Supply...)
	return d
}

// DraftStore keeps the Brief draft. Load reports found=false when nothing
// is stored. The Brief calls Save after edits (debounced), Load once when
// it mounts.
type DraftStore interface {
	Load(ctx app.Context) (draft BriefDraft, found bool, err error)
	Save(ctx app.Context, draft BriefDraft) error
}

// Keys of localDraftStore.
const (
	draftKey = "alvea.brief.draft"
	// draftPatientKey is where an earlier version kept the patient block
	// in plain localStorage. Nothing writes it now; takeOldPatient moves a
	// value found there out and deletes it.
	draftPatientKey = "alvea.brief.patient"
)

// localDraftStore keeps the part of the draft that says nothing about the
// patient — route, legs, supply and policy — in the browser's localStorage
// (go-app's memory storage natively). It never stores the patient block:
// Load gives an empty one, Save leaves it out.
type localDraftStore struct{}

var _ DraftStore = localDraftStore{}

// storedDraft is the draft without its patient block.
type storedDraft struct {
	Schema int           `json:"schema"`
	Route  RouteDraft    `json:"route"`
	Legs   []LegDraft    `json:"legs"`
	Supply []SupplyDraft `json:"supply"`
	Policy PolicyDraft   `json:"policy"`
}

// storedPatient is the patient block as sealed in the vault's draft slot
// (and as an earlier version left it under draftPatientKey).
type storedPatient struct {
	Schema  int          `json:"schema"`
	Patient PatientDraft `json:"patient"`
}

func (localDraftStore) Load(ctx app.Context) (BriefDraft, bool, error) {
	return loadLocalDraft(ctx.LocalStorage())
}

// Preload reads the draft without a Context (browser only; see preload.go).
func (localDraftStore) Preload() (BriefDraft, bool, error) { return loadLocalDraft(windowStorage{}) }

// loadLocalDraft reads the draft kept in ls, the patient block left out.
func loadLocalDraft(ls storageGetter) (BriefDraft, bool, error) {
	var s storedDraft
	if err := ls.Get(draftKey, &s); err != nil {
		return NewBriefDraft(), false, fmt.Errorf("ui: reading the brief draft: %w", err)
	}
	if s.Schema != draftSchema {
		return NewBriefDraft(), false, nil
	}
	return BriefDraft{Schema: draftSchema, Route: s.Route, Legs: s.Legs, Supply: s.Supply, Policy: s.Policy,
		Patient: NewBriefDraft().Patient}, true, nil
}

func (localDraftStore) Save(ctx app.Context, d BriefDraft) error {
	s := storedDraft{Schema: draftSchema, Route: d.Route, Legs: d.Legs, Supply: d.Supply, Policy: d.Policy}
	if err := ctx.LocalStorage().Set(draftKey, s); err != nil {
		return fmt.Errorf("ui: saving the brief draft: %w", err)
	}
	return nil
}

// takeOldPatient returns the patient block an earlier version left in
// plain localStorage, if any, and deletes it there in every case.
func takeOldPatient(ctx app.Context) (PatientDraft, bool) {
	ls := ctx.LocalStorage()
	if !ls.Contains(draftPatientKey) {
		return PatientDraft{}, false
	}
	var p storedPatient
	err := ls.Get(draftPatientKey, &p)
	ls.Del(draftPatientKey)
	if err != nil || p.Schema != draftSchema || patientEmpty(p.Patient) {
		return PatientDraft{}, false
	}
	if p.Patient.MeasuredAt == "" {
		p.Patient.MeasuredAt = NewBriefDraft().Patient.MeasuredAt
	}
	return p.Patient, true
}

// memDraftStore keeps the draft in memory (tests, and a device that must
// not store anything).
type memDraftStore struct {
	draft *BriefDraft
	saves int
}

var _ DraftStore = (*memDraftStore)(nil)

func (m *memDraftStore) Load(ctx app.Context) (BriefDraft, bool, error) {
	if m.draft == nil {
		return NewBriefDraft(), false, nil
	}
	return m.draft.clone(), true, nil
}

func (m *memDraftStore) Save(ctx app.Context, d BriefDraft) error {
	c := d.clone()
	m.draft = &c
	m.saves++
	return nil
}
