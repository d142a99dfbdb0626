package ui

import (
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// BenchmarkBriefKeystroke is the Go work of one keystroke in the cabin
// leg's minutes, natively (go-app's DOM calls are no-ops here): the plan
// read and computed again, then the result panel redrawn and compared with
// what it showed. A scenario of our own (scenarioDraft).
func BenchmarkBriefKeystroke(b *testing.B) {
	d := scenarioDraft()
	br := newBriefWith(&memDraftStore{draft: &d})
	s := br.s
	s.draft = d
	s.recompute()
	p := &ctxProbe{child: &briefResult{Rev: s.rev, s: s}}
	e := app.NewTestEngine()
	if err := e.Load(p); err != nil {
		b.Fatal(err)
	}
	e.ConsumeAll()
	values := []string{"120", "12", "125", "12", "126"}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		s.draft.Legs[1].Minutes = Entry{T: values[i%len(values)]}
		s.recompute()
		if !s.model.ok() {
			b.Fatal("the scenario did not compute")
		}
		p.child = &briefResult{Rev: s.rev, s: s}
		p.ctx.Dispatch(nil)
		e.ConsumeAll()
	}
}

// benchScenario is a Brief holding our own scenario (scenarioDraft), its
// plan computed.
func benchScenario(b *testing.B) *briefState {
	b.Helper()
	d := scenarioDraft()
	s := newBriefWith(&memDraftStore{draft: &d}).s
	s.draft = d
	s.recompute()
	if !s.model.ok() {
		b.Fatal("the scenario did not compute")
	}
	return s
}

// BenchmarkBriefRead is reading the form and computing the plan alone.
func BenchmarkBriefRead(b *testing.B) {
	s := benchScenario(b)
	for i := 0; i < b.N; i++ {
		s.recompute()
	}
}

// BenchmarkBriefPack is writing out the result panel for the direct path
// (the texts of every figure, warning and option), the plan computed.
func BenchmarkBriefPack(b *testing.B) {
	s := benchScenario(b)
	var p panelPack
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		s.pack(&p)
	}
	b.ReportMetric(float64(len(p.recs)), "bytes/pack")
}

// BenchmarkBriefKeystrokeDirect is the Go work of one keystroke in the
// cabin leg's minutes on the direct path, natively: the plan read and
// computed again, the panel written out, and the records that changed
// picked for the page (the page's own work is not in it).
func BenchmarkBriefKeystrokeDirect(b *testing.B) {
	d := scenarioDraft()
	s := newBriefWith(&memDraftStore{draft: &d}).s
	s.draft = d
	sent := 0
	s.writeTexts = func(packed string) bool { sent += len(packed); return true }
	s.recompute()
	app.HTMLString(&briefResult{Rev: s.rev, s: s}) // the panel drawn: its places kept
	s.resultUp = true                              // as if on screen
	s.afterRender(app.Context{})
	sent = 0
	values := []string{"120", "12", "125", "12", "126"}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		s.draft.Legs[1].Minutes = Entry{T: values[i%len(values)]}
		s.recompute()
		if !s.direct {
			b.Fatal("the keystroke did not take the direct path")
		}
	}
	b.ReportMetric(float64(sent)/float64(b.N), "bytes-sent/op")
}
