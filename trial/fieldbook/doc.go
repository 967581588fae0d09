// Package fieldbook writes a trial's plots as a field book table (CSV) and
// imports data recorded in such a table back into the trial.
//
// A field book has one row per plot in walking order and the columns
//
//	plot,block,row,column,treatment,treatment_name,<trait key>,...
//
// with one column per stored (not derived) trait. A factorial trial's book
// has, between treatment_name and the traits, one column per factor
// headed by its key and holding the plot's level code, and a split or
// strip plot's book then main_plot (the main plot, or horizontal strip,
// within the block), a split-split plot's sub_plot and a strip plot's
// strip (the vertical strip within the block); see DesignColumns. On
// import a level code that differs from the trial's is an error (the book
// belongs to another layout), a differing main plot, subplot or strip
// number a warning, as for block, row and column. Cells hold the current
// value in the shortest form that reads back to the same number, or are
// empty for a missing value, so that writing a book and importing it again
// never changes data.
//
// Import is in two steps. ReadTable (or an xlsx reader elsewhere) turns a
// file into a table of strings; Plan compares the table with the trial and
// lists what an import would change and every problem found, each with its
// line, plot, trait and old and new value; Apply carries out the plan, or
// refuses and changes nothing while errors remain.
package fieldbook
