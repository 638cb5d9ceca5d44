// Package forestplot draws one forest plot per pooled topic, as SVG or PNG.
//
// Each study is a row: its label on the left, its estimate as a square
// whose area grows with the study's weight, its confidence interval as a
// horizontal line, and on the right the estimate with its interval in
// figures and the weight in percent. Below the studies the pooled
// random-effects estimate is a diamond spanning its confidence interval,
// and the prediction interval is a separate bar under it. A dashed vertical
// line marks 0, the null of no difference; a faint dotted one marks the
// pooled estimate. The axis label states the scale of the differences.
//
// The package only draws: it computes no statistics, and takes the numbers
// in a Plot as given (for example from coefaudit/infer/meta). Whatever the
// numbers, it draws something and says in a footnote what it could not
// show: rows with a missing or infinite estimate are listed but not drawn,
// infinite bounds are clipped to the axis with an arrow, reversed bounds
// are swapped, and labels too long for their column are shortened with an
// ellipsis.
//
// Both formats share one layout, drawn through gonum/plot's vector-graphics
// layer (vg) with the compiled-in Liberation Sans fonts, so no network or
// system fonts are needed. PNG is rendered at 300 dots per inch, print
// resolution at the plot's width of 7.5 inches, where no text is smaller
// than 8 points. SVG text names the font family "Liberation Sans" without
// embedding it unless Plot.EmbedFonts is set; viewers without that font
// substitute their own.
package forestplot
