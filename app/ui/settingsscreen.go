package ui

import (
	"fmt"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// settingsScreen edits the crew's Settings. Each field is checked as it is
// typed: a valid value is saved at once; an invalid one shows its message
// (field, allowed range, unit) beside the field and is not saved, so every
// other screen keeps using the last valid value.
type settingsScreen struct {
	app.Compo

	saved    Settings
	text     map[string]string // what is in each numeric field, as typed
	messages FieldErrors       // the message beside each field, if any
	newCyl   CustomCylinder    // the add-a-cylinder form
	cylMsgs  FieldErrors
	rendered bool // the first render has read the saved settings
}

func newSettingsScreen() *settingsScreen {
	s := &settingsScreen{}
	s.load(DefaultSettings())
	return s
}

func (s *settingsScreen) OnMount(ctx app.Context) {
	s.load(LoadSettings(ctx))
}

func (s *settingsScreen) load(st Settings) {
	s.saved = st
	s.text = map[string]string{
		FieldSafeResidual:   st.SafeResidualShown(),
		FieldReserveFactor:  st.ReserveFactor,
		FieldReserveMinutes: st.ReserveMinutes,
		FieldSpO2Target:     st.SpO2Target,
		FieldAutoLock:       st.AutoLockMinutes,
	}
	s.messages = FieldErrors{}
	s.newCyl = CustomCylinder{PressureUnit: st.PressureUnit}
	s.cylMsgs = FieldErrors{}
}

// save stores next; on success it becomes the screen's saved settings.
func (s *settingsScreen) save(ctx app.Context, next Settings) {
	if err := SaveSettings(ctx, next); err != nil {
		app.Log(err)
		return
	}
	s.saved = next.clone()
}

// edit handles typing into one numeric field.
func (s *settingsScreen) edit(ctx app.Context, field, text string) {
	s.text[field] = text
	next := s.saved.clone()
	var msg string
	switch field {
	case FieldSafeResidual:
		_, msg = residualRule(next.PressureUnit).Check(text)
		next.SafeResidual, next.SafeResidualUnit = strings.TrimSpace(text), next.PressureUnit
	case FieldReserveFactor:
		_, msg = ruleReserveFactor.Check(text)
		next.ReserveFactor = strings.TrimSpace(text)
	case FieldReserveMinutes:
		_, msg = ruleReserveMin.Check(text)
		next.ReserveMinutes = strings.TrimSpace(text)
	case FieldSpO2Target:
		_, msg = ruleSpO2Target.Check(text)
		next.SpO2Target = strings.TrimSpace(text)
	case FieldAutoLock:
		_, msg = ruleAutoLock.Check(text)
		next.AutoLockMinutes = strings.TrimSpace(text)
	}
	if msg != "" {
		s.messages[field] = msg
		return
	}
	delete(s.messages, field)
	next.SafeResidual = commaDecimal(next.SafeResidual)
	next.ReserveFactor = commaDecimal(next.ReserveFactor)
	next.ReserveMinutes = commaDecimal(next.ReserveMinutes)
	next.SpO2Target = commaDecimal(next.SpO2Target)
	next.AutoLockMinutes = commaDecimal(next.AutoLockMinutes)
	s.save(ctx, next)
}

// pick handles a segmented choice (units, theme).
func (s *settingsScreen) pick(ctx app.Context, what, value string) {
	next := s.saved.clone()
	switch what {
	case "pressure":
		next.PressureUnit = value
	case "altitude":
		next.AltitudeUnit = value
	case "gas":
		next.GasUnit = value
	case "theme":
		next.Theme = value
	}
	s.save(ctx, next)
	if what == "pressure" && s.messages[FieldSafeResidual] == "" {
		s.text[FieldSafeResidual] = s.saved.SafeResidualShown()
	}
	if what == "pressure" && s.newCyl.FullPressure == "" {
		s.newCyl.PressureUnit = s.saved.PressureUnit
	}
}

func (s *settingsScreen) addCylinder(ctx app.Context, e app.Event) {
	c := s.newCyl
	c.Name = strings.TrimSpace(c.Name)
	c.WaterCapacity = commaDecimal(strings.TrimSpace(c.WaterCapacity))
	c.FullPressure = commaDecimal(strings.TrimSpace(c.FullPressure))
	s.cylMsgs = c.Validate()
	for _, existing := range s.saved.Cylinders {
		if strings.EqualFold(existing.Name, c.Name) && c.Name != "" {
			s.cylMsgs[FieldCylName] = fmt.Sprintf("A cylinder named %q is already in the catalogue.", c.Name)
		}
	}
	if len(s.cylMsgs) > 0 {
		return
	}
	next := s.saved.clone()
	next.Cylinders = append(next.Cylinders, c)
	s.save(ctx, next)
	s.newCyl = CustomCylinder{PressureUnit: s.saved.PressureUnit}
}

func (s *settingsScreen) removeCylinder(ctx app.Context, i int) {
	if i < 0 || i >= len(s.saved.Cylinders) {
		return
	}
	next := s.saved.clone()
	next.Cylinders = append(next.Cylinders[:i:i], next.Cylinders[i+1:]...)
	s.save(ctx, next)
}

func (s *settingsScreen) Render() app.UI {
	if !s.rendered {
		// The saved settings, read before the first render so that the
		// defaults are never drawn first (see preload.go); OnMount reads
		// them again through go-app.
		s.rendered = true
		if st, ok := preloadSettings(); ok {
			s.load(st)
		}
	}
	st := s.saved
	return app.Section().Class("alv-screen").Aria("labelledby", "settings-title").Body(
		app.H1().ID("settings-title").Text("Settings"),
		app.P().Class("alv-lead").Text("Saved on this device as you type. Settings hold no patient data."),
		app.Div().Class("alv-grid").Body(
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Display units"),
				segmented("set-pressure", "Cylinder pressure", st.PressureUnit,
					[]choice{{UnitPsi, "psi"}, {UnitBar, "bar"}},
					func(ctx app.Context, v string) { s.pick(ctx, "pressure", v) }),
				segmented("set-altitude", "Altitude", st.AltitudeUnit,
					[]choice{{UnitFeet, "ft"}, {UnitM, "m"}},
					func(ctx app.Context, v string) { s.pick(ctx, "altitude", v) }),
				segmented("set-gas", "Blood and alveolar gases", st.GasUnit,
					[]choice{{UnitMmHg, "mmHg"}, {UnitKPa, "kPa"}},
					func(ctx app.Context, v string) { s.pick(ctx, "gas", v) }),
			),
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Reserve policy"),
				numberField(FieldSafeResidual, "Safe residual (change the cylinder at)", st.PressureUnit,
					s.text[FieldSafeResidual], s.messages[FieldSafeResidual],
					func(ctx app.Context, v string) { s.edit(ctx, FieldSafeResidual, v) }),
				numberField(FieldReserveFactor, "Reserve factor (times the planned use)", "×",
					s.text[FieldReserveFactor], s.messages[FieldReserveFactor],
					func(ctx app.Context, v string) { s.edit(ctx, FieldReserveFactor, v) }),
				numberField(FieldReserveMinutes, "Added reserve time", "min",
					s.text[FieldReserveMinutes], s.messages[FieldReserveMinutes],
					func(ctx app.Context, v string) { s.edit(ctx, FieldReserveMinutes, v) }),
				app.P().Class("alv-note").Text("Your service's policy decides these values."),
			),
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Patient target"),
				numberField(FieldSpO2Target, "SpO2 target (lowest acceptable)", "%",
					s.text[FieldSpO2Target], s.messages[FieldSpO2Target],
					func(ctx app.Context, v string) { s.edit(ctx, FieldSpO2Target, v) }),
				app.P().Class("alv-note").Text("Medical direction sets the target for each patient."),
			),
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Theme"),
				segmented("set-theme", "Screen", st.Theme,
					[]choice{{ThemeDay, "Day"}, {ThemeNight, "Night (dim)"}},
					func(ctx app.Context, v string) { s.pick(ctx, "theme", v) }),
				app.P().Class("alv-note").Text("Night is dim and red-shifted to keep dark adaptation in the cockpit."),
			),
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Logbook"),
				numberField(FieldAutoLock, "Lock the logbook after this long without use", "min",
					s.text[FieldAutoLock], s.messages[FieldAutoLock],
					func(ctx app.Context, v string) { s.edit(ctx, FieldAutoLock, v) }),
				app.P().Class("alv-note").Text("Any tap or key anywhere in Alvea counts as use. A lock keeps the Brief on screen but stops saving its patient values until the logbook is unlocked."),
			),
		),
		s.renderCylinders(),
	)
}

func (s *settingsScreen) renderCylinders() app.UI {
	st := s.saved
	builtIn := []physio.CylinderSize{physio.SizeD, physio.SizeE, physio.SizeM, physio.SizeG, physio.SizeH}
	rows := make([]app.UI, 0, len(builtIn))
	for _, size := range builtIn {
		f, err := physio.CylinderFactor(size)
		if err != nil {
			continue
		}
		rows = append(rows, app.Tr().Body(
			app.Th().Scope("row").Text(string(size)),
			app.Td().Text("cylinder factor"),
			app.Td().Class("alv-num-cell").Text(fmt.Sprintf("%g L/psi", f)),
		))
	}
	own := make([]app.UI, 0, len(st.Cylinders))
	for i, c := range st.Cylinders {
		i, c := i, c
		own = append(own, app.Tr().Body(
			app.Th().Scope("row").Text(c.Name),
			app.Td().Text("water capacity "+c.WaterCapacity+" L"),
			app.Td().Class("alv-num-cell").Text("full at "+c.FullPressure+" "+c.PressureUnit),
			app.Td().Body(app.Button().Type("button").Class("alv-button").
				ID(fmt.Sprintf("cyl-remove-%d", i)).
				Aria("label", "Remove "+c.Name).
				Text("Remove").
				OnClick(func(ctx app.Context, e app.Event) { s.removeCylinder(ctx, i) })),
		))
	}
	return app.Div().Class("alv-card").Body(
		app.H2().Class("alv-card-title").Text("Cylinder catalogue"),
		app.Table().Class("alv-table").Body(
			app.Caption().Text("Built-in CGA letter sizes (common practice)"),
			app.TBody().Body(rows...),
		),
		app.If(len(own) > 0, func() app.UI {
			return app.Table().Class("alv-table").ID("cyl-own").Body(
				app.Caption().Text("Your cylinders"),
				app.TBody().Body(own...),
			)
		}),
		app.H3().Text("Add a cylinder by water capacity"),
		app.Div().Class("alv-form-row").Body(
			textField(FieldCylName, "Name", s.newCyl.Name, s.cylMsgs[FieldCylName],
				func(ctx app.Context, v string) { s.newCyl.Name = v }),
			numberField(FieldCylWater, "Water capacity", "L", s.newCyl.WaterCapacity, s.cylMsgs[FieldCylWater],
				func(ctx app.Context, v string) { s.newCyl.WaterCapacity = v }),
			numberField(FieldCylPressure, "Full pressure", s.newCyl.PressureUnit, s.newCyl.FullPressure, s.cylMsgs[FieldCylPressure],
				func(ctx app.Context, v string) { s.newCyl.FullPressure = v }),
		),
		app.Button().ID("cyl-add").Type("button").Class("alv-button alv-primary").Text("Add cylinder").OnClick(s.addCylinder),
	)
}
