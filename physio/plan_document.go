package physio

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// PlanDocumentVersion is the only plan document version this engine reads.
const PlanDocumentVersion = 1

// MaxPlanDocumentBytes bounds the size of a plan document accepted by
// ParsePlan; a real plan is a few kilobytes.
const MaxPlanDocumentBytes = 1 << 20

// Where a leg takes place: on the ground at a field, or in the cabin.
const (
	WhereOrigin      = "origin"
	WhereCabin       = "cabin"
	WhereDestination = "destination"
)

// RoomAir is an extra leg set-up: no supplemental oxygen (FiO2 0.21,
// 0 L/min). It is stated, never assumed.
const RoomAir Device = "room_air"

// PlanDocument is a transport plan as written by a crew: the route, the legs
// with their oxygen set-up, the patient's ground state, the cylinders on
// board and the reserve policy. Units are in the JSON key names. Optional
// values are pointers: nil means "not given", and any default the engine
// then applies is reported in PlanResult.Assumptions.
//
// Build one with ParsePlan (strict JSON) or in Go; ComputePlan validates it
// either way. json.Marshal of a valid document gives a document ParsePlan
// reads back unchanged.
type PlanDocument struct {
	Version int          `json:"version"`
	Title   string       `json:"title,omitempty"`
	Route   PlanRoute    `json:"route"`
	Legs    []PlanLeg    `json:"legs"`
	Patient PlanPatient  `json:"patient"`
	Supply  []PlanSupply `json:"supply"`
	Policy  *PlanPolicy  `json:"policy,omitempty"`
}

// PlanRoute: field elevations and the aircraft. A max_differential_psi
// absent or 0 means unpressurised (cabin = cruise). cabin_altitude_ft, when
// given, is the pilot's stated cabin altitude and overrides the computed one.
type PlanRoute struct {
	OriginElevationFt      *float64 `json:"origin_elevation_ft,omitempty"`
	DestinationElevationFt *float64 `json:"destination_elevation_ft,omitempty"`
	CruiseAltitudeFt       *float64 `json:"cruise_altitude_ft,omitempty"`
	MaxDifferentialPsi     *float64 `json:"max_differential_psi,omitempty"`
	CabinAltitudeFt        *float64 `json:"cabin_altitude_ft,omitempty"`
}

// PlanLeg is one stage of the transport: where (origin, cabin or
// destination), how long, and the oxygen set-up used on it.
type PlanLeg struct {
	Label   string      `json:"label,omitempty"`
	Where   string      `json:"where"`
	Minutes *float64    `json:"minutes,omitempty"`
	Oxygen  *PlanOxygen `json:"oxygen,omitempty"`
}

// PlanOxygen is a leg's set-up. Which fields a device needs:
//
//	nasal_cannula, simple_mask, non_rebreather  flow_lpm
//	venturi       flow_lpm (oxygen to the valve), fio2 (a valve setting)
//	blender       flow_lpm (total), fio2
//	high_flow     flow_lpm (total), fio2
//	ventilator    minute_volume_lpm, fio2, drive; bias_flow_lpm, leak_lpm,
//	              drive_gas_lpm optional (0 when absent, reported)
//	room_air      nothing
//
// A field a device does not use is refused, not ignored.
type PlanOxygen struct {
	Device          Device   `json:"device"`
	FlowLpm         *float64 `json:"flow_lpm,omitempty"`
	FiO2            *float64 `json:"fio2,omitempty"`
	MinuteVolumeLpm *float64 `json:"minute_volume_lpm,omitempty"`
	BiasFlowLpm     *float64 `json:"bias_flow_lpm,omitempty"`
	LeakLpm         *float64 `json:"leak_lpm,omitempty"`
	DriveGasLpm     *float64 `json:"drive_gas_lpm,omitempty"`
	Drive           Drive    `json:"drive,omitempty"`
}

// PlanPatient is the ground state: FiO2 breathed when PaO2 and/or SpO2 were
// measured, at measured_at (origin by default; destination for a return).
type PlanPatient struct {
	FiO2         *float64 `json:"fio2,omitempty"`
	PaO2MmHg     *float64 `json:"pao2_mmhg,omitempty"`
	SpO2Percent  *float64 `json:"spo2_percent,omitempty"`
	PaCO2MmHg    *float64 `json:"paco2_mmhg,omitempty"`
	RQ           *float64 `json:"rq,omitempty"`
	TemperatureC *float64 `json:"temperature_c,omitempty"`
	HbGPerDL     *float64 `json:"hb_g_dl,omitempty"`
	AgeYears     *float64 `json:"age_years,omitempty"`
	MeasuredAt   string   `json:"measured_at,omitempty"`
}

// PlanSupply is one line of cylinders on board: count cylinders of one kind
// at one gauge reading. The kind is exactly one of: a CGA letter size
// (factor method), a water capacity in litres, or a label's nominal
// contents at a nominal pressure. The gauge is pressure_psi or pressure_bar.
type PlanSupply struct {
	Name             string       `json:"name,omitempty"`
	Size             CylinderSize `json:"size,omitempty"`
	WaterCapacityL   *float64     `json:"water_capacity_l,omitempty"`
	LabelContentsL   *float64     `json:"label_contents_l,omitempty"`
	LabelPressureBar *float64     `json:"label_pressure_bar,omitempty"`
	PressurePsi      *float64     `json:"pressure_psi,omitempty"`
	PressureBar      *float64     `json:"pressure_bar,omitempty"`
	Count            *int         `json:"count,omitempty"`
}

// PlanPolicy is the reserve policy and the SpO2 target. Every field is
// optional; defaults are DefaultReservePolicy and DefaultSpO2TargetPercent.
type PlanPolicy struct {
	ResidualPsi       *float64 `json:"residual_psi,omitempty"`
	ResidualBar       *float64 `json:"residual_bar,omitempty"`
	ReserveFactor     *float64 `json:"reserve_factor,omitempty"`
	ReserveMinutes    *float64 `json:"reserve_minutes,omitempty"`
	SpO2TargetPercent *float64 `json:"spo2_target_percent,omitempty"`
}

// PlanValue returns a pointer to v, for building a PlanDocument in Go.
func PlanValue(v float64) *float64 { return &v }

// FieldError is one problem in a plan document: the path of the value
// (e.g. "supply[1].pressure_bar") and a message naming the value, the
// allowed range and the unit. Err, when set, is a sentinel (ErrOutOfRange,
// ErrSyntax, ErrUnit, ErrImpossible) for errors.Is.
type FieldError struct {
	Path    string
	Message string
	Err     error
}

func (e *FieldError) Error() string { return e.Path + ": " + e.Message }
func (e *FieldError) Unwrap() error { return e.Err }

// PlanErrors lists every problem found in a plan document, in document
// order. Its Error is one line per problem.
type PlanErrors []*FieldError

func (e PlanErrors) Error() string {
	lines := make([]string, len(e))
	for i, fe := range e {
		lines[i] = fe.Error()
	}
	return strings.Join(lines, "\n")
}

// ParsePlan reads a plan document strictly: JSON with "version": 1, every
// key known and given once, every value of the right type and within its
// range, every device with the settings it needs. All problems are returned
// together as PlanErrors, each naming its path, the value, the allowed range
// and unit. Nothing is guessed: absent optional values stay nil and
// ComputePlan reports the default it uses. A leading UTF-8 byte order mark
// is ignored (RFC 8259 §8.1 allows it); text that is not UTF-8 is refused.
func ParsePlan(data []byte) (*PlanDocument, error) {
	if len(data) > MaxPlanDocumentBytes {
		return nil, PlanErrors{{Path: "document", Message: fmt.Sprintf("%d bytes is above the %d byte limit", len(data), MaxPlanDocumentBytes), Err: ErrOutOfRange}}
	}
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	root, err := parseJSONTree(data)
	if err != nil {
		path := "document"
		var pe *jsonPathError
		if errors.As(err, &pe) && pe.path != "" {
			path = pe.path
		}
		return nil, PlanErrors{{Path: path, Message: err.Error(), Err: ErrSyntax}}
	}
	w := &planWalker{bad: map[string]bool{}, raw: map[string]string{}}
	doc := w.document(root)
	v := &planValidator{skip: w.bad, raw: w.raw}
	v.document(doc)
	all := append(w.errs, v.errs...)
	if len(all) > 0 {
		return nil, all
	}
	return doc, nil
}

// Validate checks a document built in Go with the same rules ParsePlan
// applies after decoding (ranges, required values, device settings).
func (d *PlanDocument) Validate() error {
	if d == nil {
		return PlanErrors{{Path: "document", Message: "missing", Err: ErrSyntax}}
	}
	v := &planValidator{}
	v.document(d)
	if len(v.errs) > 0 {
		return v.errs
	}
	return nil
}

// ---- a small ordered JSON tree, so that unknown keys, duplicate keys and
// wrong types can all be reported with their paths ----

type jsonKind int

const (
	jsonNull jsonKind = iota
	jsonBool
	jsonNumber
	jsonString
	jsonArray
	jsonObject
)

func (k jsonKind) String() string {
	return [...]string{"null", "true/false", "a number", "a string", "a list", "an object"}[k]
}

type jsonNode struct {
	kind  jsonKind
	text  string // number text or string value
	keys  []string
	vals  []*jsonNode
	items []*jsonNode
}

const maxJSONDepth = 32

// jsonPathError is a structural problem (a duplicate key, nesting too deep)
// found at a path of the document.
type jsonPathError struct {
	path string
	msg  string
}

func (e *jsonPathError) Error() string { return e.msg }

func parseJSONTree(data []byte) (*jsonNode, error) {
	if !utf8.Valid(data) {
		at := 0
		for at < len(data) {
			r, size := utf8.DecodeRune(data[at:])
			if r == utf8.RuneError && size <= 1 {
				break
			}
			at += size
		}
		return nil, fmt.Errorf("not UTF-8 text: invalid byte at %s", jsonPosition(data, at))
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	n, err := readJSONValue(dec, 0, "")
	if err != nil {
		var pe *jsonPathError
		if errors.As(err, &pe) {
			return nil, err
		}
		return nil, jsonSyntaxMessage(err, data)
	}
	if _, err := dec.Token(); err != io.EOF {
		return nil, fmt.Errorf("invalid JSON: extra data after the document, at %s", jsonPosition(data, int(dec.InputOffset())))
	}
	return n, nil
}

// jsonPosition names a byte offset as a person editing the file finds it:
// line and column (both from 1), and the byte.
func jsonPosition(data []byte, offset int) string {
	if offset > len(data) {
		offset = len(data)
	}
	if offset < 0 {
		offset = 0
	}
	line, col := 1, 1
	for _, b := range data[:offset] {
		if b == '\n' {
			line, col = line+1, 1
		} else if b&0xC0 != 0x80 { // count characters, not UTF-8 continuation bytes
			col++
		}
	}
	return fmt.Sprintf("line %d, column %d (byte %d)", line, col, offset)
}

func jsonSyntaxMessage(err error, data []byte) error {
	// The streaming decoder's offsets are not always where the fault is;
	// the whole-document check gives the exact byte.
	var raw json.RawMessage
	var se *json.SyntaxError
	if uerr := json.Unmarshal(data, &raw); errors.As(uerr, &se) {
		if len(bytes.TrimSpace(data)) == 0 || int(se.Offset) >= len(data) && strings.Contains(se.Error(), "end of JSON input") {
			return errors.New("invalid JSON: the document ends too early")
		}
		// Offset counts the bytes read when the fault was found: the
		// offending character is the one before it.
		return fmt.Errorf("invalid JSON at %s: %s", jsonPosition(data, int(se.Offset)-1), se.Error())
	}
	if err == io.EOF || errors.Is(err, io.ErrUnexpectedEOF) {
		return errors.New("invalid JSON: the document ends too early")
	}
	return fmt.Errorf("invalid JSON: %s", err.Error())
}

// jsonPathCut returns the length of the first n segments of path ("a.b[0]"
// has three: a, .b, [0]).
func jsonPathCut(path string, n int) int {
	seen := 0
	for i := 0; i < len(path); i++ {
		if (path[i] == '.' || path[i] == '[') && i > 0 {
			seen++
			if seen == n {
				return i
			}
		}
	}
	return len(path)
}

func readJSONValue(dec *json.Decoder, depth int, path string) (*jsonNode, error) {
	if depth > maxJSONDepth {
		// Name the value by its first few levels: the rest is the junk.
		short := path
		if i := jsonPathCut(path, 3); i < len(path) {
			short = path[:i]
		}
		if strings.HasPrefix(short, "[") {
			short = "document"
		}
		return nil, &jsonPathError{path: short, msg: fmt.Sprintf("nested more than %d levels deep; a plan document is only a few levels deep", maxJSONDepth)}
	}
	tok, err := dec.Token()
	if err != nil {
		return nil, err
	}
	switch t := tok.(type) {
	case nil:
		return &jsonNode{kind: jsonNull}, nil
	case bool:
		return &jsonNode{kind: jsonBool, text: strconv.FormatBool(t)}, nil
	case json.Number:
		return &jsonNode{kind: jsonNumber, text: t.String()}, nil
	case string:
		return &jsonNode{kind: jsonString, text: t}, nil
	case json.Delim:
		switch t {
		case '{':
			n := &jsonNode{kind: jsonObject}
			for dec.More() {
				kt, err := dec.Token()
				if err != nil {
					return nil, err
				}
				key, _ := kt.(string)
				for _, k := range n.keys {
					if k == key {
						return nil, &jsonPathError{path: planJoin(path, key),
							msg: "duplicate key: give each key once (JSON readers disagree on which copy wins)"}
					}
				}
				v, err := readJSONValue(dec, depth+1, planJoin(path, key))
				if err != nil {
					return nil, err
				}
				n.keys = append(n.keys, key)
				n.vals = append(n.vals, v)
			}
			if _, err := dec.Token(); err != nil {
				return nil, err
			}
			return n, nil
		case '[':
			n := &jsonNode{kind: jsonArray}
			for dec.More() {
				v, err := readJSONValue(dec, depth+1, fmt.Sprintf("%s[%d]", path, len(n.items)))
				if err != nil {
					return nil, err
				}
				n.items = append(n.items, v)
			}
			if _, err := dec.Token(); err != nil {
				return nil, err
			}
			return n, nil
		}
	}
	return nil, fmt.Errorf("unexpected %v", tok)
}

// ---- walking the tree into a PlanDocument: keys and types ----

type planWalker struct {
	errs PlanErrors
	bad  map[string]bool   // paths already reported, not to be reported again as missing
	raw  map[string]string // number text as written, for values too large for float64
}

func (w *planWalker) fail(path string, sentinel error, format string, args ...any) {
	w.errs = append(w.errs, &FieldError{Path: path, Message: fmt.Sprintf(format, args...), Err: sentinel})
	w.bad[path] = true
}

func planJoin(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func planDescribe(n *jsonNode) string {
	switch n.kind {
	case jsonString:
		return fmt.Sprintf("%s %q", n.kind, n.text)
	case jsonNumber, jsonBool:
		return n.text
	}
	return n.kind.String()
}

// object returns the members of an object node, reporting unknown keys.
// A nil node (key absent) gives an empty map.
func (w *planWalker) object(path string, n *jsonNode, allowed ...string) map[string]*jsonNode {
	m := map[string]*jsonNode{}
	if n == nil {
		return m
	}
	if n.kind != jsonObject {
		w.fail(path, ErrSyntax, "got %s; want an object", planDescribe(n))
		return m
	}
	for i, k := range n.keys {
		known := false
		for _, a := range allowed {
			if a == k {
				known = true
				break
			}
		}
		if !known {
			w.fail(planJoin(path, k), ErrSyntax, "unknown key (allowed here: %s)", strings.Join(allowed, ", "))
			continue
		}
		m[k] = n.vals[i]
	}
	return m
}

func (w *planWalker) list(path string, n *jsonNode) []*jsonNode {
	if n == nil {
		return nil
	}
	if n.kind != jsonArray {
		w.fail(path, ErrSyntax, "got %s; want a list", planDescribe(n))
		return nil
	}
	return n.items
}

func (w *planWalker) number(path string, n *jsonNode) *float64 {
	if n == nil {
		return nil
	}
	if n.kind != jsonNumber {
		w.fail(path, ErrSyntax, "got %s; want a number%s", planDescribe(n), planKeyUnit(path))
		return nil
	}
	v, err := strconv.ParseFloat(n.text, 64)
	if math.IsInf(v, 0) {
		// Too large for any quantity (1e400): kept as ±Inf so that the
		// validator names the allowed range, with the text as written.
		w.raw[path] = n.text
		return &v
	}
	if err != nil || math.IsNaN(v) {
		w.fail(path, ErrSyntax, "%s is not a usable number%s", n.text, planKeyUnit(path))
		return nil
	}
	if v == 0 && strings.ContainsAny(strings.SplitN(strings.ToLower(n.text), "e", 2)[0], "123456789") {
		// Too small for float64 (1e-400) and read as 0: a message names
		// it with the text as written, not as 0.
		w.raw[path] = n.text
	}
	return &v
}

// integer reads a whole number within l (count, version).
func (w *planWalker) integer(path string, n *jsonNode, l planLimit) *int {
	f := w.number(path, n)
	if f == nil {
		return nil
	}
	switch {
	case *f > l.max:
		w.fail(path, ErrOutOfRange, "%s is above the %s%s limit", n.text, fmtPlanNum(l.max), l.unitSuffix())
	case *f < l.min:
		w.fail(path, ErrOutOfRange, "%s is below the %s%s minimum", n.text, fmtPlanNum(l.min), l.unitSuffix())
	case *f != math.Trunc(*f):
		w.fail(path, ErrOutOfRange, "%s is not a whole number; want %s, %s to %s", n.text, l.what, fmtPlanNum(l.min), fmtPlanNum(l.max))
	default:
		i := int(*f)
		return &i
	}
	return nil
}

func (w *planWalker) str(path string, n *jsonNode) string {
	if n == nil {
		return ""
	}
	if n.kind != jsonString {
		w.fail(path, ErrSyntax, "got %s; want a string", planDescribe(n))
		return ""
	}
	if n.text == "" {
		w.fail(path, ErrSyntax, "empty string; leave the key out instead")
	}
	return n.text
}

func (w *planWalker) document(root *jsonNode) *PlanDocument {
	d := &PlanDocument{}
	m := w.object("", root, "version", "title", "route", "legs", "patient", "supply", "policy")
	if root != nil && root.kind != jsonObject {
		w.errs[len(w.errs)-1].Path = "document"
		return d
	}
	if v := w.number("version", m["version"]); v != nil {
		if *v == PlanDocumentVersion {
			d.Version = PlanDocumentVersion
		} else {
			w.fail("version", ErrUnit, "%s is not supported; this engine reads version %d", m["version"].text, PlanDocumentVersion)
		}
	}
	d.Title = w.str("title", m["title"])

	r := w.object("route", m["route"], "origin_elevation_ft", "destination_elevation_ft",
		"cruise_altitude_ft", "max_differential_psi", "cabin_altitude_ft")
	d.Route = PlanRoute{
		OriginElevationFt:      w.number("route.origin_elevation_ft", r["origin_elevation_ft"]),
		DestinationElevationFt: w.number("route.destination_elevation_ft", r["destination_elevation_ft"]),
		CruiseAltitudeFt:       w.number("route.cruise_altitude_ft", r["cruise_altitude_ft"]),
		MaxDifferentialPsi:     w.number("route.max_differential_psi", r["max_differential_psi"]),
		CabinAltitudeFt:        w.number("route.cabin_altitude_ft", r["cabin_altitude_ft"]),
	}

	legs := w.list("legs", m["legs"])
	if m["legs"] == nil {
		w.fail("legs", ErrSyntax, "missing; want a list of 1 to %d legs", maxPlanLegs)
	}
	d.Legs = make([]PlanLeg, 0, len(legs))
	for i, ln := range legs {
		p := fmt.Sprintf("legs[%d]", i)
		lm := w.object(p, ln, "label", "where", "minutes", "oxygen")
		leg := PlanLeg{
			Label:   w.str(p+".label", lm["label"]),
			Where:   w.str(p+".where", lm["where"]),
			Minutes: w.number(p+".minutes", lm["minutes"]),
		}
		if on, ok := lm["oxygen"]; ok {
			op := p + ".oxygen"
			om := w.object(op, on, "device", "flow_lpm", "fio2", "minute_volume_lpm",
				"bias_flow_lpm", "leak_lpm", "drive_gas_lpm", "drive")
			if on.kind == jsonObject {
				leg.Oxygen = &PlanOxygen{
					Device:          Device(w.str(op+".device", om["device"])),
					FlowLpm:         w.number(op+".flow_lpm", om["flow_lpm"]),
					FiO2:            w.number(op+".fio2", om["fio2"]),
					MinuteVolumeLpm: w.number(op+".minute_volume_lpm", om["minute_volume_lpm"]),
					BiasFlowLpm:     w.number(op+".bias_flow_lpm", om["bias_flow_lpm"]),
					LeakLpm:         w.number(op+".leak_lpm", om["leak_lpm"]),
					DriveGasLpm:     w.number(op+".drive_gas_lpm", om["drive_gas_lpm"]),
					Drive:           Drive(w.str(op+".drive", om["drive"])),
				}
			}
		}
		d.Legs = append(d.Legs, leg)
	}

	pm := w.object("patient", m["patient"], "fio2", "pao2_mmhg", "spo2_percent", "paco2_mmhg",
		"rq", "temperature_c", "hb_g_dl", "age_years", "measured_at")
	d.Patient = PlanPatient{
		FiO2:         w.number("patient.fio2", pm["fio2"]),
		PaO2MmHg:     w.number("patient.pao2_mmhg", pm["pao2_mmhg"]),
		SpO2Percent:  w.number("patient.spo2_percent", pm["spo2_percent"]),
		PaCO2MmHg:    w.number("patient.paco2_mmhg", pm["paco2_mmhg"]),
		RQ:           w.number("patient.rq", pm["rq"]),
		TemperatureC: w.number("patient.temperature_c", pm["temperature_c"]),
		HbGPerDL:     w.number("patient.hb_g_dl", pm["hb_g_dl"]),
		AgeYears:     w.number("patient.age_years", pm["age_years"]),
		MeasuredAt:   w.str("patient.measured_at", pm["measured_at"]),
	}

	supply := w.list("supply", m["supply"])
	if m["supply"] == nil {
		w.fail("supply", ErrSyntax, "missing; want a list of cylinders on board ([] for none)")
	}
	d.Supply = make([]PlanSupply, 0, len(supply))
	for i, sn := range supply {
		p := fmt.Sprintf("supply[%d]", i)
		sm := w.object(p, sn, "name", "size", "water_capacity_l", "label_contents_l",
			"label_pressure_bar", "pressure_psi", "pressure_bar", "count")
		d.Supply = append(d.Supply, PlanSupply{
			Name:             w.str(p+".name", sm["name"]),
			Size:             CylinderSize(w.str(p+".size", sm["size"])),
			WaterCapacityL:   w.number(p+".water_capacity_l", sm["water_capacity_l"]),
			LabelContentsL:   w.number(p+".label_contents_l", sm["label_contents_l"]),
			LabelPressureBar: w.number(p+".label_pressure_bar", sm["label_pressure_bar"]),
			PressurePsi:      w.number(p+".pressure_psi", sm["pressure_psi"]),
			PressureBar:      w.number(p+".pressure_bar", sm["pressure_bar"]),
			Count:            w.integer(p+".count", sm["count"], limitCount),
		})
	}

	if pn, ok := m["policy"]; ok {
		pol := w.object("policy", pn, "residual_psi", "residual_bar", "reserve_factor",
			"reserve_minutes", "spo2_target_percent")
		d.Policy = &PlanPolicy{
			ResidualPsi:       w.number("policy.residual_psi", pol["residual_psi"]),
			ResidualBar:       w.number("policy.residual_bar", pol["residual_bar"]),
			ReserveFactor:     w.number("policy.reserve_factor", pol["reserve_factor"]),
			ReserveMinutes:    w.number("policy.reserve_minutes", pol["reserve_minutes"]),
			SpO2TargetPercent: w.number("policy.spo2_target_percent", pol["spo2_target_percent"]),
		}
	}
	return d
}

// planKeyUnit names the unit a number key carries in its name, for type
// errors (the range is checked, and named, once the type is right).
func planKeyUnit(path string) string {
	units := []struct{ suffix, unit string }{
		{"_ft", "ft"}, {"_psi", "psi"}, {"_bar", "bar"}, {"_lpm", "L/min"}, {"minutes", "min"},
		{"_mmhg", "mmHg"}, {"_percent", "%"}, {"_l", "L"}, {"_c", "°C"}, {"_g_dl", "g/dL"}, {"_years", "years"},
		{"fio2", "(a fraction 0.21 to 1)"}, {"rq", "(a ratio 0.7 to 1)"}, {"reserve_factor", "(a multiplier 1 to 3)"},
		{"count", "(a whole number)"}, {"version", "(1)"},
	}
	for _, u := range units {
		if strings.HasSuffix(path, u.suffix) {
			if strings.HasPrefix(u.unit, "(") {
				return " " + u.unit
			}
			return " in " + u.unit
		}
	}
	return ""
}
