package report

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"coefaudit/audit"
)

// srgbToLinear undoes the sRGB transfer function (IEC 61966-2-1:1999).
func srgbToLinear(v float64) float64 {
	if v <= 0.04045 {
		return v / 12.92
	}
	return math.Pow((v+0.055)/1.055, 2.4)
}

// linearFromHex reads "#RRGGBB" as linear-light sRGB.
func linearFromHex(t *testing.T, hex string) [3]float64 {
	t.Helper()
	if len(hex) != 7 || hex[0] != '#' {
		t.Fatalf("colour %q is not #RRGGBB", hex)
	}
	var c [3]float64
	for i := range c {
		x, err := strconv.ParseUint(hex[1+2*i:3+2*i], 16, 8)
		if err != nil {
			t.Fatalf("colour %q: %v", hex, err)
		}
		c[i] = srgbToLinear(float64(x) / 255)
	}
	return c
}

// Colour-vision-deficiency simulation matrices for dichromacy (severity
// 1.0), applied to linear sRGB: Machado GM, Oliveira MM, Fernandes LAF
// (2009). A physiologically-based model for simulation of color vision
// deficiency. IEEE TVCG 15(6):1291–1298, supplementary matrices, as
// tabulated in colour-science's CVD_MATRICES_MACHADO2010 (SECONDARY: read
// in that copy, not in the paper's own supplement).
var (
	machadoProtanopia = [3][3]float64{
		{0.152286, 1.052583, -0.204868},
		{0.114503, 0.786281, 0.099216},
		{-0.003882, -0.048116, 1.051998}}
	machadoDeuteranopia = [3][3]float64{
		{0.367322, 0.860646, -0.227968},
		{0.280085, 0.672501, 0.047413},
		{-0.011820, 0.042940, 0.968881}}
)

func simulate(m [3][3]float64, c [3]float64) [3]float64 {
	var o [3]float64
	for i := range o {
		for j := range c {
			o[i] += m[i][j] * c[j]
		}
		o[i] = math.Min(1, math.Max(0, o[i]))
	}
	return o
}

// luminance is the relative luminance Y of linear sRGB (IEC 61966-2-1
// primaries, D65), as WCAG 2.1 defines it.
func luminance(c [3]float64) float64 {
	return 0.2126729*c[0] + 0.7151522*c[1] + 0.0721750*c[2]
}

// cieLab converts linear sRGB to CIE 1976 L*a*b* with the D65 white
// (CIE 15:2004, §8.2.1).
func cieLab(c [3]float64) [3]float64 {
	x := 0.4124564*c[0] + 0.3575761*c[1] + 0.1804375*c[2]
	y := luminance(c)
	z := 0.0193339*c[0] + 0.1191920*c[1] + 0.9503041*c[2]
	f := func(t float64) float64 {
		if t > 216.0/24389 {
			return math.Cbrt(t)
		}
		return (24389.0/27*t + 16) / 116
	}
	fx, fy, fz := f(x/0.95047), f(y), f(z/1.08883)
	return [3]float64{116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)}
}

func deltaE76(a, b [3]float64) float64 {
	return math.Sqrt((a[0]-b[0])*(a[0]-b[0]) + (a[1]-b[1])*(a[1]-b[1]) + (a[2]-b[2])*(a[2]-b[2]))
}

// TestColourMaths pins the conversions the palette check relies on.
func TestColourMaths(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		// sRGB white is the D65 white: L* = 100 (CIE 15:2004 definition).
		{"L* of white", cieLab(linearFromHex(t, "#FFFFFF"))[0], 100, 1e-3},
		// Arithmetic: 0x80/255 = 0.50196; ((0.50196+0.055)/1.055)^2.4 = 0.21586.
		{"linear of 0x80", linearFromHex(t, "#808080")[0], 0.21586, 1e-5},
		// Arithmetic: L* = 116·0.21586^(1/3) − 16 = 53.585.
		{"L* of #808080", cieLab(linearFromHex(t, "#808080"))[0], 53.585, 1e-3},
		// WCAG 2.1 contrast ratio of black on white: (1 + 0.05)/(0 + 0.05) = 21.
		{"contrast black on white", (luminance(linearFromHex(t, "#FFFFFF")) + 0.05) / 0.05, 21, 1e-3},
		// A neutral stays neutral under both simulations (each matrix row sums to 1).
		{"protanopia keeps grey", simulate(machadoProtanopia, linearFromHex(t, "#808080"))[0], 0.21586, 1e-5},
		{"deuteranopia keeps grey", simulate(machadoDeuteranopia, linearFromHex(t, "#808080"))[2], 0.21586, 1e-5},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if math.Abs(tt.got-tt.want) > tt.tol {
				t.Errorf("%s = %.6g, want %.6g", tt.name, tt.got, tt.want)
			}
		})
	}
}

// TestOutcomePaletteColourBlind checks that the outcome fills stay apart
// for normal vision and simulated protanopia and deuteranopia, and that
// black outcome words stay readable on every fill.
func TestOutcomePaletteColourBlind(t *testing.T) {
	// ΔE*ab ≥ 15 between every pair: a design threshold (common practice,
	// no source; about 6 times the just-noticeable difference of ≈ 2.3 that
	// Sharma (2003), Digital Color Imaging Handbook, quotes).
	const minDeltaE = 15
	// WCAG 2.1 success criterion 1.4.3: contrast ≥ 4.5:1 for normal text.
	const minContrast = 4.5
	visions := []struct {
		name string
		sim  func([3]float64) [3]float64
	}{
		{"normal", func(c [3]float64) [3]float64 { return c }},
		{"protanopia", func(c [3]float64) [3]float64 { return simulate(machadoProtanopia, c) }},
		{"deuteranopia", func(c [3]float64) [3]float64 { return simulate(machadoDeuteranopia, c) }},
	}
	if len(outcomeFill) != len(audit.Outcomes) {
		t.Fatalf("outcomeFill has %d colours, want one per outcome (%d)", len(outcomeFill), len(audit.Outcomes))
	}
	for _, v := range visions {
		t.Run(v.name, func(t *testing.T) {
			lab := map[string][3]float64{}
			for _, o := range audit.Outcomes {
				c := v.sim(linearFromHex(t, fillOf(o)))
				lab[o] = cieLab(c)
				if ratio := (luminance(c) + 0.05) / 0.05; ratio < minContrast {
					t.Errorf("contrast of black on %s (%s) = %.2f, want ≥ %g", o, fillOf(o), ratio, float64(minContrast))
				}
			}
			for i, a := range audit.Outcomes {
				for _, b := range audit.Outcomes[i+1:] {
					if d := deltaE76(lab[a], lab[b]); d < minDeltaE {
						t.Errorf("ΔE*ab(%s, %s) = %.1f, want ≥ %d", a, b, d, minDeltaE)
					}
				}
			}
		})
	}
}

func TestPaletteCSS(t *testing.T) {
	css := paletteCSS()
	for _, o := range audit.Outcomes {
		if want := "--o-" + o + ":" + fillOf(o) + ";"; !strings.Contains(css, want) {
			t.Errorf("paletteCSS() lacks %q", want)
		}
	}
}
