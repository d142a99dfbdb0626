package ui

import (
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// The link from the Brief draft to the Supply and Altitude screens. Each
// screen takes the parts of the draft that are complete: Supply needs the
// cylinders (and the legs and reserve policy when they are valid), never
// the patient; Altitude takes the route and, when it is complete, the
// patient. A part with a field to fix is not taken: the screen keeps its
// own values for it and says so.

// draftParts is the Brief draft read into a plan document, with which
// parts of it are complete.
type draftParts struct {
	doc    *physio.PlanDocument
	result *physio.PlanResult // the computed plan; nil unless every field is valid

	route, legs, patient, supply, policy bool // the part has no field to fix
}

// Field id prefixes of the Brief's parts (brief_build.go).
var draftPartPrefix = map[string]string{
	"route": "b-rt-", "legs": "b-leg", "patient": "b-pt-", "supply": "b-sup", "policy": "b-pol-",
}

// readDraftParts builds the draft under the settings and finds which parts
// are complete.
func readDraftParts(d BriefDraft, st Settings) draftParts {
	m := buildBrief(d, st)
	p := draftParts{doc: m.doc, result: m.result}
	clean := func(part string) bool {
		prefix := draftPartPrefix[part]
		for id := range m.msgs {
			if strings.HasPrefix(id, prefix) {
				return false
			}
		}
		return true
	}
	p.route, p.legs, p.patient, p.supply, p.policy = clean("route"), clean("legs"), clean("patient"), clean("supply"), clean("policy")
	if m.doc == nil {
		p.route, p.legs, p.patient, p.supply, p.policy = false, false, false, false, false
	}
	if len(d.Legs) == 0 {
		p.legs = false
	}
	if len(d.Supply) == 0 {
		p.supply = false
	}
	return p
}

// draftPlan returns the parts of the current Brief draft, or false when
// there is no draft. It reads the draft as the Brief keeps it (route, legs,
// supply and policy in localStorage; the patient block where the Brief
// holds it) and changes nothing. Tests replace it.
var draftPlan = func(ctx app.Context) (draftParts, bool) {
	return draftPlanFrom(ctx.LocalStorage(), LoadSettings(ctx), theVault)
}

// draftPlanFrom is draftPlan reading the plain part of the draft from ls
// (go-app's localStorage, or windowStorage before a first render), under
// the settings st.
func draftPlanFrom(ls storageGetter, st Settings, s *vaultSession) (draftParts, bool) {
	d, found := readBriefDraft(ls, s)
	if !found {
		return draftParts{}, false
	}
	return readDraftParts(d, st), true
}

// readBriefDraft reads the Brief draft without moving or deleting any of
// it: the plain part as localDraftStore keeps it in ls, and the patient
// block the vault session holds in memory for the Brief (see
// vaultDraftStore), which wins over anything else.
func readBriefDraft(ls storageGetter, s *vaultSession) (BriefDraft, bool) {
	d, found, err := loadLocalDraft(ls)
	if err != nil {
		return BriefDraft{}, false
	}
	if s != nil {
		if p, ok := s.DraftPatient(); ok {
			d.Patient = p
			found = true
		}
	}
	return d, found
}

// legBand is one leg of the draft's plan on the transport clock.
type legBand struct {
	Label          string
	Start, Minutes float64 // minutes from the start of the transport
}

// draftLegs returns the legs of the draft on the transport clock: the
// computed plan's when there is one, otherwise the legs' own minutes laid
// end to end in their order (as the plan lays them) when every leg has
// valid minutes — a leg's set-up still to be chosen does not move the
// clock.
func (p draftParts) draftLegs() []legBand {
	if p.doc == nil || len(p.doc.Legs) == 0 {
		return nil
	}
	var out []legBand
	if p.result != nil {
		for _, l := range p.result.Legs {
			out = append(out, legBand{Label: legName(l.Index, l.Label, l.Where), Start: l.StartMinute.InexactFloat64(), Minutes: l.Minutes.InexactFloat64()})
		}
		return out
	}
	start := 0.0
	for i, l := range p.doc.Legs {
		if l.Minutes == nil {
			return nil
		}
		out = append(out, legBand{Label: legName(i, l.Label, l.Where), Start: start, Minutes: *l.Minutes})
		start += *l.Minutes
	}
	return out
}

// legName is a leg's label, or "Leg N (where)".
func legName(i int, label, where string) string {
	if label != "" {
		return label
	}
	if where == physio.WhereCabin {
		where = "flight"
	}
	return "Leg " + strconv.Itoa(i+1) + " (" + where + ")"
}
