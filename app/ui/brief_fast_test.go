package ui

import (
	"fmt"
	"html"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// The direct path of the result panel (brief_result.go) against go-app's
// own rendering of the same panel: the render is the reference here, and
// physio.ComputePlan for the figures written.

// ---- a small reading of go-app's HTML output ----

// htmlNode is an element or a text of go-app's HTML output.
type htmlNode struct {
	tag      string // "" for a text
	attrs    map[string]string
	children []*htmlNode
	text     string
	inline   bool                 // a text written on the element's own line (its only child)
	ids      map[string]*htmlNode // the root: elements by id
}

var voidTags = map[string]bool{"area": true, "base": true, "br": true, "col": true, "embed": true, "hr": true,
	"img": true, "input": true, "link": true, "meta": true, "source": true, "track": true, "wbr": true}

// parseHTML reads go-app's HTML encoding (attributes quoted as Go
// strings, text escaped by html.EscapeString, one child per line when
// there are several). It fails the test on anything else.
func parseHTML(t *testing.T, src string) *htmlNode {
	t.Helper()
	root := &htmlNode{tag: "#root", ids: map[string]*htmlNode{}}
	stack := []*htmlNode{root}
	i := 0
	for i < len(src) {
		top := stack[len(stack)-1]
		if src[i] != '<' {
			j := strings.IndexByte(src[i:], '<')
			if j < 0 {
				j = len(src) - i
			}
			raw := src[i : i+j]
			i += j
			inline := !strings.ContainsRune(raw, '\n')
			if !inline && strings.TrimSpace(raw) == "" {
				continue // the line breaks and indents between children
			}
			text := html.UnescapeString(raw)
			if !inline {
				text = strings.TrimSpace(text)
			}
			top.children = append(top.children, &htmlNode{text: text, inline: inline})
			continue
		}
		if strings.HasPrefix(src[i:], "</") {
			j := strings.IndexByte(src[i:], '>')
			name := src[i+2 : i+j]
			if top.tag != name {
				t.Fatalf("html: </%s> closes <%s>", name, top.tag)
			}
			stack = stack[:len(stack)-1]
			i += j + 1
			continue
		}
		i++
		j := strings.IndexAny(src[i:], " >")
		n := &htmlNode{tag: src[i : i+j], attrs: map[string]string{}}
		i += j
		for src[i] != '>' {
			i++ // the space
			k := strings.IndexAny(src[i:], "= >")
			name := src[i : i+k]
			i += k
			if src[i] != '=' {
				n.attrs[name] = "true" // go-app writes "true" (and only that) bare
				continue
			}
			i++
			q, err := strconv.QuotedPrefix(src[i:])
			if err != nil {
				t.Fatalf("html: attribute %s: %v", name, err)
			}
			v, _ := strconv.Unquote(q)
			n.attrs[name] = v
			i += len(q)
		}
		i++
		if id, ok := n.attrs["id"]; ok {
			if root.ids[id] != nil {
				t.Errorf("html: two elements with id %q", id)
			}
			root.ids[id] = n
		}
		top.children = append(top.children, n)
		if !voidTags[n.tag] {
			stack = append(stack, n)
		}
	}
	if len(stack) != 1 {
		t.Fatalf("html: <%s> not closed", stack[len(stack)-1].tag)
	}
	return root
}

// byID returns the element with the id, or nil (n is a root).
func (n *htmlNode) byID(id string) *htmlNode { return n.ids[id] }

// textChild returns the element's only child when it is a text (go-app
// writes an empty text as nothing), as the page script requires.
func (n *htmlNode) textChild() (*htmlNode, bool) {
	switch {
	case len(n.children) == 0:
		c := &htmlNode{inline: true}
		n.children = append(n.children, c)
		return c, true
	case len(n.children) == 1 && n.children[0].tag == "" && n.children[0].inline:
		return n.children[0], true
	}
	return nil, false
}

// canon writes the tree with attributes in name order (go-app writes them
// in no fixed order) and empty texts left out.
func (n *htmlNode) canon(b *strings.Builder) {
	if n.tag == "" {
		if n.text != "" {
			b.WriteString(strconv.Quote(n.text))
		}
		return
	}
	b.WriteString("<" + n.tag)
	names := make([]string, 0, len(n.attrs))
	for k := range n.attrs {
		names = append(names, k)
	}
	sort.Strings(names)
	for _, k := range names {
		b.WriteString(" " + k + "=" + strconv.Quote(n.attrs[k]))
	}
	b.WriteString(">")
	for _, c := range n.children {
		c.canon(b)
	}
	b.WriteString("</" + n.tag + ">\n")
}

func (n *htmlNode) String() string {
	var b strings.Builder
	n.canon(&b)
	return b.String()
}

// record is one record of a packed panel.
type record struct{ id, value, attr string }

func records(t *testing.T, packed string) []record {
	t.Helper()
	var out []record
	for _, r := range strings.Split(packed, string(rune(packRec))) {
		f := strings.Split(r, string(rune(packField)))
		switch len(f) {
		case 2:
			out = append(out, record{id: f[0], value: f[1]})
		case 3:
			out = append(out, record{id: f[0], value: f[1], attr: f[2]})
		default:
			t.Fatalf("packed record %q has %d fields", r, len(f))
		}
	}
	return out
}

// apply writes the records into the tree as the page script writes them
// into the DOM, and reports false where the script reports false.
func apply(n *htmlNode, recs []record) bool {
	ok := true
	for _, r := range recs {
		el := n.byID(r.id)
		if el == nil {
			ok = false
			continue
		}
		if r.attr != "" {
			if r.value == "" {
				delete(el.attrs, r.attr)
			} else {
				el.attrs[r.attr] = r.value
			}
			continue
		}
		c, single := el.textChild()
		if !single {
			ok = false
			continue
		}
		c.text = r.value
	}
	return ok
}

// ---- plans ----

// panelCase is the scenario (scenarioDraft, a transport of our own) with
// one edit, some "How"s open, under some display units.
type panelCase struct {
	name     string
	edit     func(d *BriefDraft)
	open     []string
	settings func(st *Settings)
}

// panelCases are edits a crew makes one key at a time: most keep the
// panel's shape (the same figures, warnings, legs), some change it
// (a figure appears, a warning comes or goes, the plan gives way to the
// fix list).
func panelCases() []panelCase {
	var cs []panelCase
	add := func(name string, edit func(d *BriefDraft)) {
		cs = append(cs, panelCase{name: name, edit: edit})
	}
	for _, v := range []string{"120", "12", "125", "1", "126", "600", "2880"} {
		add("leg1 minutes "+v, func(d *BriefDraft) { d.Legs[1].Minutes = Entry{T: v} })
	}
	for _, v := range []string{"3", "6", "1"} {
		add("leg0 flow "+v, func(d *BriefDraft) { d.Legs[0].Flow = Entry{T: v} })
	}
	for _, v := range []string{"0", "2500", "8500"} {
		add("origin "+v, func(d *BriefDraft) { d.Route.Origin = Entry{v, "ft"} })
	}
	for _, v := range []string{"10000", "41000", "45000"} {
		add("cruise "+v, func(d *BriefDraft) { d.Route.Cruise = Entry{v, "ft"} })
	}
	for _, v := range []string{"2", "8.6"} {
		add("differential "+v, func(d *BriefDraft) { d.Route.Differential = Entry{v, "psi"} })
	}
	for _, v := range []string{"88", "99", "70"} {
		add("spo2 "+v, func(d *BriefDraft) { d.Patient.SpO2 = Entry{T: v} })
	}
	add("pao2 given", func(d *BriefDraft) { d.Patient.PaO2 = Entry{"70", "mmHg"} })
	add("age given", func(d *BriefDraft) { d.Patient.Age = Entry{T: "60"} })
	add("hb given", func(d *BriefDraft) { d.Patient.Hb = Entry{T: "13"} })
	for _, v := range []string{"1000", "300", "150"} {
		add("pressure "+v, func(d *BriefDraft) { d.Supply[0].Pressure = Entry{v, "psi"} })
	}
	for _, v := range []string{"1", "20"} {
		add("count "+v, func(d *BriefDraft) { d.Supply[0].Count = Entry{T: v} })
	}
	add("second cylinder line", func(d *BriefDraft) {
		d.Supply = append(d.Supply, SupplyDraft{Kind: "E", Pressure: Entry{"2000", "psi"}, Count: Entry{T: "1"}})
	})
	for _, v := range []string{"x", "30000", "x9"} {
		add("origin invalid "+v, func(d *BriefDraft) { d.Route.Origin = Entry{v, "ft"} })
	}
	add("leg1 minutes empty", func(d *BriefDraft) { d.Legs[1].Minutes = Entry{} })
	// A short, low flight with a patient on room air: no warning, no
	// option, one assumption.
	add("an easy transport", func(d *BriefDraft) {
		d.Route.Cruise = Entry{"10000", "ft"}
		d.Patient = PatientDraft{FiO2: Entry{T: "0.21"}, PaO2: Entry{"95", "mmHg"}, PaCO2: Entry{"40", "mmHg"}, RQ: Entry{T: "0.8"},
			Temperature: Entry{T: "37"}, Hb: Entry{T: "14"}, Age: Entry{T: "40"}, MeasuredAt: "origin"}
		d.Legs[1] = LegDraft{Where: "cabin", Minutes: Entry{T: "60"}, Device: "nasal_cannula", Flow: Entry{T: "2"}}
		d.Supply[0] = SupplyDraft{Kind: "E", Pressure: Entry{"2000", "psi"}, Count: Entry{T: "3"}}
	})
	// "How"s open, and other display units, over a few of the edits.
	n := len(cs)
	for _, c := range cs[:n] {
		if strings.HasPrefix(c.name, "leg1 minutes 1") || c.name == "age given" || c.name == "origin 8500" {
			c.name += ", How open"
			c.open = []string{"b-r-need-how", "b-r-leg1-litres-how", "b-r-cabin-how", "b-r-g-pao2a-how", "b-r-cyl1-usable-how"}
			cs = append(cs, c)
		}
	}
	for _, c := range cs[:n] {
		if strings.HasPrefix(c.name, "leg1 minutes") || strings.HasPrefix(c.name, "origin") {
			c.name += ", m and kPa"
			c.settings = func(st *Settings) { st.AltitudeUnit, st.GasUnit = UnitM, UnitKPa }
			cs = append(cs, c)
		}
	}
	return cs
}

// panelState is the Brief's state for a case.
func panelState(c panelCase) *briefState {
	s := newBriefState(nil)
	s.draft = scenarioDraft()
	if c.edit != nil {
		c.edit(&s.draft)
	}
	if c.settings != nil {
		c.settings(&s.settings)
	}
	for _, id := range c.open {
		s.open[id] = true
	}
	s.recompute()
	return s
}

// Every record of the packed panel names an element that go-app renders
// for the same plan, holding that very text (a single text node) or
// attribute value. And for any two plans, once the panel has drawn the
// first: when the second packs to the same shape, its records written
// into the first's rendering give exactly what go-app renders for the
// second: nothing the plan decides is left out of the direct path, and a
// list that shrank (its places kept, hidden) is no exception.
func TestBriefPackMatchesRender(t *testing.T) {
	cases := panelCases()
	check := func(name string, s *briefState, tree *htmlNode, recs []record) {
		t.Helper()
		seen := map[string]bool{}
		for _, r := range recs {
			key := r.id + " " + r.attr
			if seen[key] {
				t.Errorf("%s: %q packed twice", name, key)
			}
			seen[key] = true
			el := tree.byID(r.id)
			if el == nil {
				t.Errorf("%s: packed id %q is not in the rendered panel", name, r.id)
				continue
			}
			if r.attr != "" {
				if got := el.attrs[r.attr]; got != r.value { // "" for none
					t.Errorf("%s: %s[%s] packed %q, rendered %q", name, r.id, r.attr, r.value, got)
				}
				continue
			}
			tc, ok := el.textChild()
			if !ok {
				t.Errorf("%s: %s holds more than one text: %s", name, r.id, el)
				continue
			}
			if tc.text != r.value {
				t.Errorf("%s: %s packed %q, rendered %q", name, r.id, r.value, tc.text)
			}
		}
	}
	set := func(s *briefState, c panelCase) {
		s.draft = scenarioDraft()
		if c.edit != nil {
			c.edit(&s.draft)
		}
		s.settings = DefaultSettings()
		if c.settings != nil {
			c.settings(&s.settings)
		}
		s.open = map[string]bool{}
		for _, id := range c.open {
			s.open[id] = true
		}
		s.recompute()
	}
	shapes := map[string]bool{}
	rendered := map[string]string{} // case and shape → canonical rendering
	pairs, fewer, none := 0, 0, 0
	for _, from := range cases {
		s := panelState(from)
		raw := app.HTMLString(&briefResult{Rev: s.rev, s: s})
		var p, fromPack panelPack
		s.pack(&fromPack)
		s.pack(&p)
		if p.bad() {
			t.Fatalf("%s: a text holds a separator", from.name)
		}
		check(from.name, s, parseHTML(t, raw), records(t, string(p.recs)))
		shape := string(p.appendShape(nil))
		shapes[shape] = true
		warnings := 0
		if s.model.ok() {
			warnings = len(s.model.result.Warnings)
		}
		for _, to := range cases {
			if to.name == from.name {
				continue
			}
			set(s, to)
			s.pack(&p)
			diff, same, ok := p.changedSince(&fromPack, nil)
			if sameShape := string(p.appendShape(nil)) == shape; same != sameShape {
				t.Fatalf("%s → %s: changedSince says same shape %v, the shapes say %v", from.name, to.name, same, sameShape)
			}
			if !same {
				continue
			}
			pairs++
			if s.model.ok() && len(s.model.result.Warnings) < warnings {
				fewer++
				if len(s.model.result.Warnings) == 0 {
					none++
				}
			}
			recs := records(t, string(p.recs))
			tree := parseHTML(t, raw)
			if !apply(tree, recs) {
				t.Errorf("%s → %s: a record found no single text to write", from.name, to.name)
				continue
			}
			// Only the records that changed, written into the first
			// plan's rendering, give the same.
			diffTree := parseHTML(t, raw)
			if !ok {
				t.Fatalf("%s → %s: a changed text holds a separator", from.name, to.name)
			}
			if len(diff) > 0 && !apply(diffTree, records(t, string(diff))) {
				t.Errorf("%s → %s: a changed record found no single text to write", from.name, to.name)
			}
			// go-app's rendering of the second plan depends on the
			// places kept, which the shape holds.
			key := to.name + "\x00" + shape
			want, done := rendered[key]
			if !done {
				raw := app.HTMLString(&briefResult{Rev: s.rev, s: s})
				check(to.name+" (after "+from.name+")", s, parseHTML(t, raw), recs)
				want = parseHTML(t, raw).String()
				rendered[key] = want
			}
			if got := tree.String(); got != want {
				t.Errorf("%s → %s: the panel written directly differs from the rendered one:\n%s", from.name, to.name, firstDiff(got, want))
			}
			if got := diffTree.String(); got != want {
				t.Errorf("%s → %s: the changed records written differ from the rendered panel:\n%s", from.name, to.name, firstDiff(got, want))
			}
		}
	}
	if len(shapes) < 4 {
		t.Fatalf("only %d shapes among the cases: the edits do not change the panel's shape enough to test it", len(shapes))
	}
	if pairs < 100 || fewer < 20 || none == 0 {
		t.Errorf("only %d pairs of plans with the same shape were compared, %d of them with fewer warnings, %d with none", pairs, fewer, none)
	}
	t.Logf("%d cases, %d shapes, %d pairs of the same shape compared (%d with fewer warnings, %d with none)", len(cases), len(shapes), pairs, fewer, none)
}

// A pack's shape is each record's id, then its attribute name if it has
// one, each followed by a space; changedSince sees a record whose text
// moved within the same bytes as another shape.
func TestPanelPackShape(t *testing.T) {
	var p, q panelPack
	p.text("5047", "b-r-cabin", "-v")
	p.attr("hidden", "", "b-r-cabin")
	p.text2(": ", "Cabin", "b-r-cabin", "-how-sr")
	if got, want := string(p.appendShape(nil)), "b-r-cabin-v b-r-cabin hidden b-r-cabin-how-sr "; got != want {
		t.Errorf("shape %q, want %q", got, want)
	}
	q.text("5100", "b-r-cabin", "-v")
	q.attr("hidden", "hidden", "b-r-cabin")
	q.text2(": ", "Cabin", "b-r-cabin", "-how-sr")
	diff, same, ok := q.changedSince(&p, nil)
	if !same || !ok || string(diff) != "b-r-cabin-v\x1f5100\x1eb-r-cabin\x1fhidden\x1fhidden" {
		t.Errorf("same shape: changed %q, same %v, ok %v", diff, same, ok)
	}
	// The same bytes, "a␟b␟c": a text "b" with the attribute c, then a
	// text "b␟c" holding a separator: not the same shape.
	var r, u panelPack
	r.attr("c", "b", "a")
	u.text("b\x1fc", "a")
	if _, same, _ := u.changedSince(&r, nil); same {
		t.Error("a text holding a separator taken for an attribute of the same shape")
	}
	var v panelPack
	v.text("5047", "b-r-cabin", "-v")
	if _, same, _ := v.changedSince(&p, nil); same {
		t.Error("a pack with fewer records taken for the same shape")
	}
}

// firstDiff shows the first differing line of two renderings.
func firstDiff(got, want string) string {
	g, w := strings.Split(got, "\n"), strings.Split(want, "\n")
	for i := 0; i < len(g) && i < len(w); i++ {
		if g[i] != w[i] {
			return fmt.Sprintf("written:  %s\nrendered: %s", g[i], w[i])
		}
	}
	return fmt.Sprintf("%d lines written, %d rendered", len(g), len(w))
}

// The decision a keystroke takes: with the panel's shape on screen known
// (after a render), a plan of the same shape is written whole and needs
// no render (direct); a plan of another shape, a write the page refuses,
// or a panel not on screen take go-app's update; the render that follows
// brings the direct path back. The figure written is the one physio
// computes for the same document.
func TestBriefDirectPath(t *testing.T) {
	d := scenarioDraft()
	s := newBriefWith(&memDraftStore{draft: &d}).s
	s.draft = d
	s.recompute()
	if s.direct {
		t.Fatal("direct with the panel not on screen")
	}
	p, e := mount(t, &briefResult{Rev: s.rev, s: s})
	var last string
	accept := true
	s.writeTexts = func(packed string) bool { last = packed; return accept }
	// As the panel's OnMount in the browser (with the probe's context).
	(&briefResult{s: s}).OnMount(p.ctx)
	e.ConsumeAll()
	if len(s.shownShape) == 0 {
		t.Fatal("no shape kept once the panel is on screen")
	}
	render := func() {
		p.child = &briefResult{Rev: s.rev, s: s}
		p.ctx.Dispatch(nil)
		e.ConsumeAll()
	}
	key := func(minutes string) {
		s.draft.Legs[1].Minutes = Entry{T: minutes}
		s.recompute()
	}

	key("125")
	if !s.direct {
		t.Error("same shape: not direct")
	}
	doc := scenarioDoc()
	doc.Legs[1].Minutes = physio.PlanValue(125)
	want, err := physio.ComputePlan(doc)
	if err != nil {
		t.Fatal(err)
	}
	written := map[string]string{}
	for _, r := range records(t, last) {
		written[r.id+" "+r.attr] = r.value
	}
	if got := written["b-r-leg1-litres-v "]; got != want.Legs[1].OxygenL.String() {
		t.Errorf("leg 2's oxygen written %q; physio.ComputePlan gives %s for 125 min", got, want.Legs[1].OxygenL)
	}
	// Only what changed is sent: the title of leg 1 (its minutes did not
	// change) is not.
	if _, sent := written["b-r-leg0-title "]; sent {
		t.Error("an unchanged text was sent again")
	}
	if len(written) > 40 {
		t.Errorf("%d records sent for one leg's minutes", len(written))
	}
	// The same plan again: nothing to send, still direct.
	last = ""
	s.recompute()
	if !s.direct || last != "" {
		t.Errorf("an unchanged plan: direct %v, sent %q", s.direct, last)
	}

	// A warning appears (the cylinder at the residual): another shape.
	s.draft.Supply[0].Pressure = Entry{"150", "psi"}
	s.recompute()
	if s.direct {
		t.Error("a new warning was taken as the same shape")
	}
	if !strings.Contains(last, "b-r-need-v\x1f") {
		t.Error("the texts were not written on a change of shape")
	}
	key("126")
	if s.direct {
		t.Error("same shape as the last plan but not as the panel on screen: taken as direct")
	}
	render()
	key("127")
	if !s.direct {
		t.Error("after the render, the same shape is not direct")
	}
	// The warnings go away again: their places stay, hidden; direct.
	s.draft.Supply[0].Pressure = Entry{"1800", "psi"}
	s.recompute()
	if !s.direct {
		t.Error("fewer warnings than places kept: not direct")
	}
	if !strings.Contains(last, "b-warn8\x1f\x1fdata-code\x1e") || !strings.Contains(last, "b-warn8\x1ftrue\x1fhidden\x1e") {
		t.Error("the place of a warning gone is not emptied and hidden")
	}

	accept = false
	key("128")
	if s.direct {
		t.Error("the page refused the write, still direct")
	}
	render() // the page refuses again after the render: no shape known
	if len(s.shownShape) != 0 {
		t.Error("a shape kept after the page refused to write it")
	}
	accept = true
	key("129")
	if s.direct {
		t.Error("direct with no shape known on screen")
	}
	if !strings.Contains(last, "b-r-leg0-title\x1f") {
		t.Error("after a refused write, the next one is not sent in full")
	}
	render()
	if len(s.shownShape) == 0 {
		t.Error("no shape kept after a render the page took")
	}
	s.resultUp = false
	key("17")
	if s.direct {
		t.Error("direct with the panel gone")
	}
}

// A text holding a separator is never sent to the page (it would be cut in
// two there): a changed record with one stops the direct write, and a
// full pack with one anywhere is refused, whichever record holds it.
func TestPanelPackRefusesSeparatorInText(t *testing.T) {
	var before, after panelPack
	before.text("12", "b-a")
	before.text("ok", "b-b")
	before.attr("hidden", "", "b-c")
	after.text("13", "b-a")
	after.text("ok", "b-b")
	after.attr("hidden", "", "b-c")
	if diff, same, ok := after.changedSince(&before, nil); !same || !ok || string(diff) != "b-a\x1f13" {
		t.Fatalf("clean change: %q, same %v, ok %v", diff, same, ok)
	}
	if after.bad() {
		t.Fatal("a clean pack is called bad")
	}
	for _, sep := range []string{"\x1e", "\x1f"} {
		var bad panelPack
		bad.text("13", "b-a")
		bad.text("o"+sep+"k", "b-b")
		bad.attr("hidden", "", "b-c")
		if _, same, ok := bad.changedSince(&before, nil); same && ok {
			t.Errorf("%q: a changed text with a separator would be sent", sep)
		}
		if !bad.bad() {
			t.Errorf("%q: a pack with a separator in a text is not called bad", sep)
		}
	}
	// An attribute's name is never mistaken for a separator in its value.
	var attrs panelPack
	attrs.attr("data-status", "go", "b-status")
	if attrs.bad() {
		t.Error("an attribute record is called bad")
	}
}
