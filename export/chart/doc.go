// Package chart draws Furlong's charts with gonum/plot: treatment means with
// error bars and mean separation letters (Means), the spread of plot values
// per treatment (Spread), a trait over the field grid (HeatMap), residual
// diagnostics (Residuals, QQ) and the printable field map (FieldMap).
//
// Every chart is a *plot.Plot, so the desktop window and the season report
// draw the same pictures; Save writes one as PNG, SVG or PDF, SaveA4 on an
// A4 landscape page, and Image renders it for the screen.
//
// Colours are colour-blind safe: treatments and roles use the Okabe–Ito
// palette (OkabeIto), continuous values the viridis scale (Viridis), and
// every distinction made by colour is also made by a pattern, a shape or a
// label, so charts survive grey-scale printing. Keys are drawn beside the
// data, never over it. Field charts put row 1, column 1 at the lower left;
// a trial stores no compass bearing, so they state that orientation rather
// than a north arrow.
//
// Charts never show NaN: missing values are left out or drawn as grey,
// hatched cells, and treatments without data are named in the title.
package chart
