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
// linear or log axes. Map draws a quantity on a rectangular grid as colour
// (linear or log) with a colour bar, optional direction arrows and
// polylines on top.
//
// # Limits
//
// A log axis or log colour needs every value on it above zero. Output is
// SVG or PNG; a map draws one shape per grid cell, so an SVG of a large
// grid is large (a few hundred bytes per cell).
package draw
