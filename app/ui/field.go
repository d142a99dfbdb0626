package ui

import (
	"sync"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Shared building blocks for screens. CSS classes (web/alvea.css):
//
//	alv-screen     a screen's <section>; its first child is the <h1>
//	alv-card       a bordered block; alv-card-title for its <h2>
//	alv-grid       cards side by side (two columns from 1000 px wide)
//	alv-field      a label, an input with its unit, and the message
//	alv-input      a text input (at least 44 px tall, large numerals)
//	alv-unit       the unit beside an input, always visible
//	alv-error      the message under a field (role="alert")
//	alv-result     a computed figure: alv-num (large numerals) + alv-unit
//	alv-how        a <details> "How" disclosure: formula, inputs, source, rounding
//	alv-plot       a figure holding an SVG plot drawn by the app
//	alv-seg        a row of toggle buttons (aria-pressed) for one choice
//	alv-button     a button (alv-primary for the main action)
//	alv-caution    the clinical caution (see newCaution)

// Clearing a typed field. go-app (v10.1.11) drops an empty value from an
// element's attributes instead of setting it, and on the next update calls
// removeAttribute("value") — while it writes every other value to the
// input's value property. Removing an attribute that is not there changes
// nothing: a field whose value goes back to "" in the component (a saved
// entry, "new transport") kept showing the old text.
//
// The fields made here carry data-empty="1" exactly when their rendered
// value is "". go-app sets that attribute on the element when the value
// becomes "", and one observer per page then empties the field on screen.
// A person clearing a field by typing is unaffected (it is already empty);
// a key typed in the instant before is written back by the next update,
// which sets the value property again.
const emptyAttr = "empty" // data-empty

var clearWatch sync.Once

// watchClearedFields installs the observer once, in the browser only.
func watchClearedFields() {
	if !app.IsClient {
		return
	}
	clearWatch.Do(func() {
		onChange := app.FuncOf(func(this app.Value, args []app.Value) any {
			if len(args) == 0 {
				return nil
			}
			records := args[0]
			for i := 0; i < records.Length(); i++ {
				el := records.Index(i).Get("target")
				if el.Truthy() && el.Get("dataset").Get(emptyAttr).String() == "1" && el.Get("value").String() != "" {
					el.Set("value", "")
				}
			}
			return nil
		})
		observer := app.Window().Get("MutationObserver").New(onChange)
		observer.Call("observe", app.Window().Get("document").Get("documentElement"), map[string]any{
			"attributes":      true,
			"attributeFilter": []any{"data-" + emptyAttr},
			"subtree":         true,
		})
	})
}

// emptyMark marks input as rendered empty (see watchClearedFields).
func emptyMark(input app.HTMLInput, value string) app.HTMLInput {
	if value == "" {
		return input.DataSet(emptyAttr, "1")
	}
	return input
}

// numberField renders a labelled numeric input with its unit beside it and
// its message under it. A value set back to "" empties the field on
// screen too (see watchClearedFields). The input uses inputmode="decimal" so a tablet shows
// the numeric keyboard; aria-describedby ties the unit and the message to
// the field, and aria-invalid marks a refused value. onInput receives the text as typed.
func numberField(id, label, unit, value, message string, onInput func(ctx app.Context, text string)) app.UI {
	watchClearedFields()
	msgID, unitID := id+"-msg", id+"-unit"
	describedBy := unitID
	if message != "" {
		describedBy += " " + msgID
	}
	input := app.Input().
		ID(id).
		Class("alv-input").
		Type("text").
		Attr("inputmode", "decimal").
		Attr("autocomplete", "off").
		Attr("spellcheck", "false").
		Value(value).
		Aria("invalid", ariaBool(message != "")).
		Aria("describedby", describedBy).
		OnInput(func(ctx app.Context, e app.Event) {
			onInput(ctx, ctx.JSSrc().Get("value").String())
		})
	input = emptyMark(input, value)
	return app.Div().Class("alv-field").Body(
		app.Label().For(id).Text(label),
		app.Div().Class("alv-input-row").Body(
			input,
			app.Span().ID(unitID).Class("alv-unit").Text(unit),
		),
		app.If(message != "", func() app.UI {
			return app.P().ID(msgID).Class("alv-error").Attr("role", "alert").Text(message)
		}),
	)
}

// textField is numberField for free text (no numeric keyboard, no unit).
func textField(id, label, value, message string, onInput func(ctx app.Context, text string)) app.UI {
	watchClearedFields()
	msgID := id + "-msg"
	input := app.Input().
		ID(id).
		Class("alv-input alv-input-text").
		Type("text").
		Attr("autocomplete", "off").
		Value(value).
		Aria("invalid", ariaBool(message != "")).
		OnInput(func(ctx app.Context, e app.Event) {
			onInput(ctx, ctx.JSSrc().Get("value").String())
		})
	if message != "" {
		input = input.Aria("describedby", msgID)
	}
	input = emptyMark(input, value)
	return app.Div().Class("alv-field").Body(
		app.Label().For(id).Text(label),
		app.Div().Class("alv-input-row").Body(input),
		app.If(message != "", func() app.UI {
			return app.P().ID(msgID).Class("alv-error").Attr("role", "alert").Text(message)
		}),
	)
}

// choice is one option of a segmented control.
type choice struct{ Value, Label string }

// segmented renders a one-of-many choice as toggle buttons in a fieldset,
// each at least 44 px, the chosen one aria-pressed. Buttons get the id
// prefix + "-" + value, for tests.
func segmented(idPrefix, legend, current string, options []choice, onPick func(ctx app.Context, value string)) app.UI {
	buttons := make([]app.UI, 0, len(options))
	for _, o := range options {
		o := o
		buttons = append(buttons, app.Button().
			ID(idPrefix+"-"+o.Value).
			Type("button").
			Class("alv-seg-btn").
			Aria("pressed", ariaBool(o.Value == current)).
			Text(o.Label).
			OnClick(func(ctx app.Context, e app.Event) { onPick(ctx, o.Value) }))
	}
	return app.FieldSet().Class("alv-fieldset").Body(
		app.Legend().Text(legend),
		app.Div().Class("alv-seg").Body(buttons...),
	)
}

// how renders the "How" disclosure under a computed figure. Later screens
// fill it with the formula's name, the inputs used, the published source and
// the rounding direction.
func how(summary string, body ...app.UI) app.UI {
	if summary == "" {
		summary = "How"
	}
	return app.Details().Class("alv-how").Body(
		append([]app.UI{app.Summary().Text(summary)}, body...)...,
	)
}

// ariaBool spells a boolean ARIA state out as "true" or "false", as ARIA
// wants. (go-app's prerender still writes "true" as a bare attribute; the
// running app sets the value in the DOM, which is what assistive technology
// reads once the app has started.)
func ariaBool(v bool) string {
	if v {
		return "true"
	}
	return "false"
}
