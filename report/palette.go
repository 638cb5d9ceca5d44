package report

import (
	"fmt"
	"strings"

	"coefaudit/audit"
)

// outcomeFill is the fill of each outcome, shared by the workbook and the
// HTML report, as sRGB hex. The outcome word is always written on it in
// black, so colour is never the only cue.
//
// The palette is designed to survive red–green colour blindness: the hues
// sit on the blue–yellow axis that protanopes and deuteranopes keep, and
// outcomes that fall on the same side of it are told apart by lightness
// (CIE L*): on the blue side consistent ≈ 86, conflict ≈ 70, missed ≈ 60;
// on the yellow side indeterminate ≈ 93, unsupported ≈ 74, reversed ≈ 58;
// incomplete is a neutral grey. htmlreport_palette_test.go checks every
// pair under normal vision and simulated protanopia and deuteranopia, and
// the contrast of black text on each fill.
var outcomeFill = map[string]string{
	audit.Consistent:    "#B3D8F4", // sky
	audit.Unsupported:   "#F2A65A", // amber
	audit.Missed:        "#9A82D4", // violet
	audit.Reversed:      "#E0674C", // vermilion
	audit.Indeterminate: "#F9EBA0", // straw
	audit.Conflict:      "#E896C2", // rose
	audit.Incomplete:    "#E4E4E4", // grey
}

// fillOf returns the fill of an outcome, grey for one not in the palette.
func fillOf(outcome string) string {
	if f, ok := outcomeFill[outcome]; ok {
		return f
	}
	return outcomeFill[audit.Incomplete]
}

// paletteCSS writes the palette as CSS custom properties (--o-consistent,
// …) and one rule per outcome class, so that the stylesheet never repeats
// the colours.
func paletteCSS() string {
	var b strings.Builder
	b.WriteString(":root{")
	for _, o := range audit.Outcomes {
		fmt.Fprintf(&b, "--o-%s:%s;", o, fillOf(o))
	}
	b.WriteString("}\n")
	for _, o := range audit.Outcomes {
		fmt.Fprintf(&b, ".o-%s{--o:var(--o-%s)}\n", o, o)
	}
	return b.String()
}
