// Package trialfile reads and writes Furlong trial files (".furlong").
//
// A trial file is UTF-8 JSON, indented, members always in the order below:
//
//	{
//	  "format": "furlong-trial",
//	  "version": 3,
//	  "trial": {
//	    "title": "Maize hybrid strip, Hollow Creek farm",
//	    "crop": "maize", "season": "2026",
//	    "site": {"name": "North field", "latitude": -31.95, "longitude": null,
//	             "soil": "sandy loam", "previous_crop": "wheat"},
//	    "investigator": "...", "objective": "...", "notes": "...",
//	    "created": "2026-03-02T09:15:00+11:00",   (RFC 3339; null when unknown)
//	    "modified": "2026-04-20T17:02:11.5+10:00",
//	    "treatments": [{"code": "T01", "name": "...", "role": "entry"|"check",
//	                    "description": "...", "rate": 120 or null, "rate_unit": "kg N/ha",
//	                    "levels": ["N60", "V1"]}],
//	    "design": {"kind": "crd"|"rcbd"|"latin"|"split-plot"|"strip-plot", "reps": 4,
//	               "main_factor": "N", "sub_factor": "V"},
//	    "layout": {"plot_length": 10, "plot_width": 3, "harvest_length": 8,
//	               "harvest_width": 1.5, "alley": 1, "plots_per_row": 0,
//	               "blocks": "side-by-side"|"stacked", "numbering": "by-block"|"sequential",
//	               "walk": "serpentine"|"straight"},
//	    "randomization": {"seed": "18446744073709551615", "method": "...", "done": "..." or null},
//	    "analysis": {"mean_separation": "lsd"|"tukey"},
//	    "factors": [{"key": "N", "name": "Nitrogen rate",
//	                 "levels": [{"code": "N60", "name": "60 kg N/ha", "value": 60 or null,
//	                             "unit": "kg N/ha"}]}],
//	    "plots": [{"number": 101, "block": 1, "row": 1, "column": 1, "treatment": "T01",
//	               "main_plot": 1, "sub_plot": 2, "strip": 3,
//	               "note": "...", "exclusions": [{"trait": "yield", "reason": "hail"}]}],
//	    "traits": [{"key": "yield", "name": "...", "unit": "t/ha", "kind": "continuous",
//	                "min": 0, "max": null, "decimals": 2, "assessed": null,
//	                "higher_better": true,
//	                "transform": "none"|"log"|"sqrt"|"arcsin",
//	                "percent_of_check": true|false|null,
//	                "values": [5.1, null, 4.87, ...],
//	                "derived": {"kind": "adjusted-yield", "weight_trait": "wt",
//	                            "moisture_trait": "mst", "standard_moisture": 15.5,
//	                            "output_unit": "t/ha", "bushel_weight_lb": 56}}]
//	  }
//	}
//
// Plots are in walking order. A stored trait has "values", a list with one
// entry per plot in the order of "plots", null for a missing value; a
// derived trait has "derived" and no "values". A plot's "note" and
// "exclusions" are left out when empty; every other member is always
// written. Numbers are written in the shortest form that reads back to the
// same float64 (as encoding/json writes them). The randomisation seed is a
// decimal string, because many JSON readers hold numbers as float64 and
// would round seeds above 2^53; a JSON number is accepted on reading.
// Unknown members are ignored on reading.
//
// Checks on reading (Encode refuses the same things, so that whatever
// Furlong writes it can read): plot numbers, treatment codes and trait
// keys are unique; every plot names a treatment of the trial; a stored
// trait has exactly one value per plot; a count is a whole number of 0 or
// more; a percentage lies between 0 and 100; every number is finite; at
// most 3 factors of at most 50 levels, factor keys and level codes unique,
// each treatment of a factorial trial with one known level of every
// factor, a split or strip plot with at least 2 factors (ErrBadFactor).
// Values outside a trait's valid range (min, max) are data, not errors:
// they are kept, and flagged elsewhere. Scores may be fractional (half
// points are common practice in visual scoring).
//
// Analysis settings: "analysis" holds the trial's mean-separation method,
// used by every view of the results; a trait's "transform" is the scale it
// is analysed on ("arcsin" only for percent traits) and its
// "percent_of_check" says whether its means are shown as percentages of the
// check mean (null: only for the trial's yield trait).
//
// Factors (version 3): a factorial trial lists its crossed treatment
// factors (at most 3) in "factors"; its treatments are then the
// combinations of their levels, each with "levels" (its level code of
// every factor, in factor order) and the level codes joined by "-" as
// "code". A split plot puts "main_factor" on its main plots (and, with
// three factors, "sub_factor" on its subplots), a strip plot "main_factor"
// in its horizontal strips; each plot of a split or strip plot has
// "main_plot" (its main plot, or horizontal strip, within its block),
// a split-split plot's plots "sub_plot" (the subplot within the main
// plot), a strip plot's plots "strip" (the vertical strip within the
// block). All of these are left out when empty or 0, so a trial without
// factors is written as version 2 wrote it, apart from the version.
//
// Response settings (version 6): "analysis" may hold "response", a rate
// trial's response analysis settings: "leave_out" (treatment codes left out
// of the trend) and "price_ratio" (the price of a unit of input in units of
// produce); absent when not set. "economics" at trial level holds the
// user's prices for the margins over input cost: "currency" (a label),
// "produce_price" (per unit of the trait's unit), "trait" (the trait the
// return is worked out from; absent: the yield trait) and "costs", one per
// treatment with "product" (absent: not given) and "application", per unit
// area. Older versions ignore such members.
//
// Versions: version 3 is the format above. Version 2 was the same without
// the factors and the members that go with them ("factors", "levels",
// "main_factor", "sub_factor", "main_plot", "sub_plot", "strip"): a
// version 2 file opens unchanged, with one list of treatments, and those
// members, should a version 2 or older file hold them, are ignored.
// Version 1 was the same without
// "analysis", "transform" and "percent_of_check": Decode gives a version 1
// file the defaults (LSD, no transformation, percent of check for the yield
// trait only), so it opens and analyses as before; those members, should a
// version 1 file hold them, are ignored. Version 0, the first format,
// stored values per plot as an object keyed by trait
// ({"plot": 101, ..., "values": {"yield": 5.1}}), held the seed as a bare
// JSON number ("seed": 12345 at trial level, with "randomized" for the
// date), kept site, design and layout in flat members ("site": "North
// field", "design": "rcbd", "reps": 4, "plot_length", "plot_width",
// "plots_per_row", "serpentine": true) and marked checks with
// "check": true. Decode migrates version 0 files (with the default
// analysis settings); members version 0 did not
// have are left empty. Files with a version newer than Version are refused
// with ErrNewerVersion.
//
// Errors: problems with a file's content are *ParseError values giving the
// JSON path (for example "trial.plots[3].number"), the line and the column,
// and wrapping one of the sentinel errors (ErrSyntax, ErrTruncated,
// ErrWrongType, ErrDuplicatePlot, ...). Decode never panics.
//
// Save writes atomically and keeps the previous file as NAME.furlong.bak.
//
// Concurrent use: every save holds an exclusive lock of the file
// (LockExclusive); Update is the read-modify-write under that lock, and
// SaveChecked saves only over the version (Identity) the caller loaded, so
// a window never overwrites changes made by another program without
// knowing. MarkOpen leaves a presence marker beside a trial open in a
// window, which ReadPresence reads (for example to warn in the CLI). The
// names of these files are listed in lock.go and DEVELOPERS.md.
package trialfile
