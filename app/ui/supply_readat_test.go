package ui

import (
	"encoding/json"
	"html"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// at0506s is 2030-05-06 hh:mm:ss local time (a scenario of our own).
func at0506s(hh, mm, ss int) time.Time { return time.Date(2030, 5, 6, hh, mm, ss, 0, time.Local) }

// typeReading types a reading into Supply field by field, as a crew does.
func typeReading(s *supply, ctx app.Context, fields ...[2]string) {
	for _, f := range fields {
		s.edit(ctx, f[0], f[1])
	}
}

// countdownShown returns the countdown's figures as the screen shows them.
func countdownShown(t *testing.T, s *supply) map[string]string {
	t.Helper()
	page := rendered(t, s)
	out := map[string]string{}
	for _, id := range []string{"supply-minutes", "supply-minutes-reading", "supply-change-at", "supply-reserve-at"} {
		out[id] = htmlText(page, id)
	}
	return out
}

// A reading given a time it was read counts from that time. The check
// value is REFERENCES §7 [calc]: an E cylinder at 2000 psi, residual
// 200 psi, 10 L/min lasts (2000 − 200) × 0.28 L/psi ÷ 10 L/min = 50.4 min
// (504 usable litres). Read at 09:00 and typed at 09:20, 30.4 min are left
// at 09:20: shown as 30 (rounded down), the change due at 09:50 (09:00 +
// 50.4 min, truncated), and the reserve of the default settings (30 min at
// 10 L/min = 300 L) reached at 09:00 + (504 − 300) ÷ 10 = 20.4 min, 09:20.
// The same reading timed as typed shows 20 minutes more everywhere.
func TestSupplyReadAtCountdown(t *testing.T) {
	late, lp, _, lateNow := mountSupply(t)
	*lateNow = at0506s(9, 20, 0)
	typeReading(late, lp.ctx, [2]string{FieldSupplyReadAt, "09:00"}, [2]string{FieldSupplyGauge, "2000"}, [2]string{FieldSupplyFlow, "10"})
	now, np, _, nowNow := mountSupply(t)
	*nowNow = at0506s(9, 20, 0)
	typeReading(now, np.ctx, [2]string{FieldSupplyGauge, "2000"}, [2]string{FieldSupplyFlow, "10"})

	for _, c := range []struct {
		name string
		s    *supply
		want map[string]string
	}{
		{"read at 09:00, typed at 09:20", late, map[string]string{"supply-minutes": "30", "supply-minutes-reading": "50", "supply-change-at": "09:50", "supply-reserve-at": "09:20"}},
		{"read as typed at 09:20", now, map[string]string{"supply-minutes": "50", "supply-minutes-reading": "50", "supply-change-at": "10:10", "supply-reserve-at": "09:40"}},
	} {
		got := countdownShown(t, c.s)
		for id, want := range c.want {
			if got[id] != want {
				t.Errorf("%s: %s = %q, want %q", c.name, id, got[id], want)
			}
		}
		if n := len(c.s.session.Readings); n != 1 {
			t.Errorf("%s: %d readings, want 1", c.name, n)
		}
	}
	r, _ := late.session.lastReading()
	if !r.At().Equal(at0506s(9, 0, 0)) || !r.Typed().Equal(at0506s(9, 20, 0)) || !r.ReadGiven() {
		t.Errorf("the reading is read %v, typed %v (given %v); want read 09:00, typed 09:20", r.At(), r.Typed(), r.ReadGiven())
	}
	if !strings.Contains(rendered(t, late), "At the reading (09:00)") {
		t.Error("the countdown does not name the time it counts from")
	}

	// Read at typed within the minute after the gauge and flow corrects
	// that reading: one reading, now read at 09:00, the change at 09:50.
	after, ap, _, afterNow := mountSupply(t)
	*afterNow = at0506s(9, 20, 0)
	typeReading(after, ap.ctx, [2]string{FieldSupplyGauge, "2000"}, [2]string{FieldSupplyFlow, "10"})
	*afterNow = at0506s(9, 20, 40)
	after.edit(ap.ctx, FieldSupplyReadAt, "09:00")
	if got := countdownShown(t, after); got["supply-change-at"] != "09:50" || got["supply-minutes"] != "29" || len(after.session.Readings) != 1 {
		// 50.4 − 20 min 40 s = 29.73 min → 29.
		t.Errorf("Read at given as a correction: %v, %d readings; want the change at 09:50, 29 min left, one reading", got, len(after.session.Readings))
	}
}

// Read at is refused, with the field, the allowed range and the format
// named, and nothing lost of what was typed: malformed; before the
// previous reading of the same cylinder (also a clock time later than now,
// which the Logbook's rule reads as yesterday's). A time typed after the
// correction window waits for the next reading; a new reading does not
// take the time given for an older one. The times are our own scenario.
func TestSupplyReadAtRefusals(t *testing.T) {
	s, p, _, now := mountSupply(t)
	ctx := p.ctx
	typeReading(s, ctx, [2]string{FieldSupplyGauge, "2000"}, [2]string{FieldSupplyFlow, "10"}) // typed 09:00

	// 09:12: a time for a reading to come.
	*now = at0506s(9, 12, 0)
	s.edit(ctx, FieldSupplyReadAt, "09:05")
	if r, _ := s.session.lastReading(); len(s.session.Readings) != 1 || r.ReadGiven() || !r.At().Equal(at0506s(9, 0, 0)) {
		t.Fatalf("a Read at typed 12 min after the reading moved it: %+v", s.session.Readings)
	}
	if got := htmlText(rendered(t, s), "supply-read-at-next"); !strings.Contains(got, "09:05 is kept for the next reading") {
		t.Errorf("the waiting time is not explained: %q", got)
	}
	s.edit(ctx, FieldSupplyGauge, "1800")
	if r, _ := s.session.lastReading(); len(s.session.Readings) != 2 || !r.At().Equal(at0506s(9, 5, 0)) || r.Gauge != "1800" {
		t.Fatalf("the next reading did not take 09:05: %+v", s.session.Readings)
	}

	// 09:30: a new gauge is a new reading, timed now; Read at goes blank.
	*now = at0506s(9, 30, 0)
	s.edit(ctx, FieldSupplyGauge, "1600")
	if r, _ := s.session.lastReading(); len(s.session.Readings) != 3 || r.ReadGiven() || !r.At().Equal(at0506s(9, 30, 0)) || s.readAtText != "" {
		t.Fatalf("a new reading took the older reading's time: %+v, Read at %q", s.session.Readings, s.readAtText)
	}

	// 09:30:30: corrections of that reading's time.
	*now = at0506s(9, 30, 30)
	before := append([]SupplyReading(nil), s.session.Readings...)
	for _, c := range []struct{ typed, want string }{
		{"9.04", `Read at: "9.04" is not a clock time. Type hh:mm in 24-hour time, 00:00 to 23:59`},
		// The previous reading of cylinder 1 was read at 09:05.
		{"09:04", "Read at: 09:04 (2030-05-06 09:04) is before the previous reading of cylinder 1 (2030-05-06 09:05:00). Give a time from 09:05 to now as hh:mm (24-hour), or leave it blank for now."},
		// Later than the clock: yesterday's 09:45 by the Logbook's rule.
		{"09:45", "Read at: 09:45 (2030-05-05 09:45) is before the previous reading of cylinder 1 (2030-05-06 09:05:00). Give a time from 09:05 to now"},
	} {
		s.edit(ctx, FieldSupplyReadAt, c.typed)
		page := rendered(t, s)
		if msg := plainText(page, FieldSupplyReadAt+"-msg"); !strings.Contains(msg, c.want) {
			t.Errorf("%q: message %q, want %q", c.typed, msg, c.want)
		}
		if s.readAtText != c.typed || inputValue(page, FieldSupplyReadAt) != c.typed || inputValue(page, FieldSupplyGauge) != "1600" || inputValue(page, FieldSupplyFlow) != "10" {
			t.Errorf("%q refused: the fields hold %q, %q, %q", c.typed, inputValue(page, FieldSupplyReadAt), inputValue(page, FieldSupplyGauge), inputValue(page, FieldSupplyFlow))
		}
		if len(s.session.Readings) != len(before) || s.session.Readings[2] != before[2] {
			t.Errorf("%q refused: the readings changed: %+v", c.typed, s.session.Readings)
		}
		if htmlText(page, "supply-minutes") != "" || htmlText(page, "supply-countdown-msg") != "Correct the marked field to see the countdown." {
			t.Errorf("%q refused: a countdown is shown", c.typed)
		}
	}
	// The previous reading's own minute is allowed (not before it).
	s.edit(ctx, FieldSupplyReadAt, "09:05")
	if r, _ := s.session.lastReading(); len(s.session.Readings) != 3 || !r.At().Equal(at0506s(9, 5, 0)) || r.Gauge != "1600" {
		t.Errorf("09:05, the previous reading's minute: %+v (messages %v)", s.session.Readings, s.messages)
	}
}

// A session stored before readings had a read time loads as it did: each
// reading counts from when it was typed, keeps its logbook record, and is
// stored again in the same shape; a read time given is kept across a
// reload beside the typing time that names the reading.
func TestSupplyReadAtStoredSession(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	typed := at0506s(9, 0, 0)
	// The shape Supply stored until now (supplySchema 1, no "read").
	old := `{"schema":1,"cylinders":[{"kind":"E","gauge":"2000","gaugeUnit":"psi"}],"inUse":0,` +
		`"readings":[{"at":` + jsonInt(typed.UnixMilli()) + `,"cylinder":0,"gauge":"2000","gaugeUnit":"psi","flow":"10","log":{"transport":"t1","seq":3}}]}`
	if err := ctx.LocalStorage().Set(SupplyKey, persistedState{Value: json.RawMessage(old)}); err != nil {
		t.Fatal(err)
	}
	pre, ok := supplySessionFrom(ctx.LocalStorage())
	loaded := loadSupplySession(ctx)
	for name, sess := range map[string]SupplySession{"before the first render": pre, "through go-app": loaded} {
		r, found := sess.lastReading()
		if !found || r.ReadGiven() || !r.At().Equal(typed) || r.AtUnixMilli != typed.UnixMilli() || r.Log == nil || r.Log.Seq != 3 {
			t.Errorf("%s: the old reading loads as %+v (ok %v)", name, r, ok)
		}
	}
	s := stoppedSupply() // clock 09:00
	s.load(DefaultSettings(), loaded)
	// REFERENCES §7 [calc]: E, 2000 psi, residual 200, 10 L/min → 50.4 min.
	if got := countdownShown(t, s); got["supply-minutes"] != "50" || got["supply-change-at"] != "09:50" || s.readAtText != "" {
		t.Errorf("the old session's countdown: %v, Read at %q", got, s.readAtText)
	}
	raw, err := json.Marshal(loaded.Readings[0])
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(raw), `"read"`) {
		t.Errorf("an untimed reading is stored with a read time: %s", raw)
	}

	// A reading read at 08:40, typed at 09:00: stored and loaded again.
	sess := loaded.clone()
	sess.Readings = append(sess.Readings, SupplyReading{AtUnixMilli: at0506s(9, 1, 0).UnixMilli(), ReadUnixMilli: at0506s(8, 40, 0).UnixMilli(),
		Gauge: "1500", GaugeUnit: UnitPsi, Flow: "10", Log: &SupplyLogMark{Transport: "t1", Seq: 4}})
	saveSupplySession(ctx, sess)
	e.ConsumeAll()
	p2, _ := mount(t, app.Div())
	if err := p2.ctx.LocalStorage().Set(SupplyKey, mustStored(t, ctx)); err != nil {
		t.Fatal(err)
	}
	again := loadSupplySession(p2.ctx)
	r, _ := again.lastReading()
	if !r.At().Equal(at0506s(8, 40, 0)) || !r.Typed().Equal(at0506s(9, 1, 0)) || r.Log == nil || r.Log.Seq != 4 {
		t.Errorf("reloaded: %+v, want read 08:40, typed 09:01, record 4", r)
	}
	s.load(DefaultSettings(), again)
	if s.readAtText != "08:40" {
		t.Errorf("reloaded: Read at shows %q, want 08:40", s.readAtText)
	}
	// (1500 − 200) × 0.28 ÷ 10 = 36.4 min from 08:40 → the change at 09:16.
	if got := countdownShown(t, s); got["supply-change-at"] != "09:16" {
		t.Errorf("reloaded: change at %q, want 09:16", got["supply-change-at"])
	}
}

// plainText is htmlText with the HTML escapes read back (&#39; is ').
func plainText(page, id string) string { return html.UnescapeString(htmlText(page, id)) }

func jsonInt(v int64) string {
	b, _ := json.Marshal(v)
	return string(b)
}

// mustStored returns the session as go-app stored it in ctx's localStorage.
func mustStored(t *testing.T, ctx app.Context) persistedState {
	t.Helper()
	var st persistedState
	if err := ctx.LocalStorage().Get(SupplyKey, &st); err != nil || len(st.Value) == 0 {
		t.Fatalf("no stored session (%v)", err)
	}
	return st
}
