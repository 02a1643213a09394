package main

import (
	"reflect"
	"testing"
)

// TestRunFlagsRoundTrip: the reading options a run-review record keeps
// (encode) read back (decodeRunFlags) as given, --window among them, and
// defaults are left out of the text. Source of the expected values: the
// options given (a round trip), the text written by hand from the flags.
func TestRunFlagsRoundTrip(t *testing.T) {
	cases := []struct {
		name string
		f    runFlags
		text string
	}{
		{"defaults", runFlags{window: defaultWindow}, ""},
		{"every option", runFlags{columns: map[string]string{"heating_medium_in": "TT-203", "time": "Zeit"}, separator: ";", decimalComma: true,
			temperatureUnit: "°F", flowUnit: "gpm", timezone: "Europe/Berlin", skipBadRows: 3, gap: 12, window: 120},
			"columns=heating_medium_in%3DTT-203&columns=time%3DZeit&decimal-comma=true&flow-unit=gpm&gap=12&separator=%3B&skip-bad-rows=3&temperature-unit=%C2%B0F&timezone=Europe%2FBerlin&window=120"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			text := c.f.encode()
			if text != c.text {
				t.Errorf("encoded %q, want %q", text, c.text)
			}
			back, err := decodeRunFlags(text)
			if err != nil {
				t.Fatal(err)
			}
			if back.windowWidth() != c.f.windowWidth() {
				t.Errorf("window %g s, want %g", back.windowWidth(), c.f.windowWidth())
			}
			back.window, c.f.window = 0, 0
			if !reflect.DeepEqual(back, c.f) {
				t.Errorf("read back %+v, want %+v", back, c.f)
			}
		})
	}
}
