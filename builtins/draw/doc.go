// Package draw draws plots of plain data: columns of float64 numbers in
// coherent SI units, each with a quantity name and a unit label. It knows
// nothing of the Loopwise language, so it is tested without a session.
//
// # Units on the axes
//
// An axis is labelled "name [unit]", with the unit's SI prefix chosen so
// that the largest magnitude on the axis reads between 1 and 1000 (0.0021 T
// is drawn as 2.1 on an axis labelled "B [mT]"). A column may bring its own
// chooser (Column.Units) for compound units; without one, a unit made only
// of letters gets an engineering prefix from f to T and any other unit is
// drawn as given.
//
// # Plots
//
// Line draws one or several series of one unit against a column, on
// linear or log axes, with a legend in the corner that hides the fewest
// line segments. Map draws a quantity on a rectangular grid as colour
// (linear or log) with a colour bar, optional direction arrows, optional
// field lines traced on the grid (FieldLines, after Jobard and Lefer
// 1997) and polylines on top.
//
// # Limits
//
// A log axis or log colour needs every value on it above zero. Output is
// SVG or PNG. An SVG map of up to RasterCells cells draws one shape per
// cell (about 90 bytes each); a larger one embeds its cells as one PNG
// image. SVG text names its font and does not embed it.
package draw
