package export

import stseries "furlong/stats/series"

// SeriesSourceLabel names an ANOVA line of a series in words, for the
// series workbook and the window's series view.
func SeriesSourceLabel(src string) string {
	switch src {
	case stseries.SourceSite:
		return "Sites"
	case stseries.SourceBlockWithinSite:
		return "Blocks within sites"
	case stseries.SourceEntry:
		return "Entries"
	case stseries.SourceEntryBySite:
		return "Entries × sites"
	case stseries.SourceError:
		return "Pooled error"
	case stseries.SourceTotal:
		return "Total"
	}
	return src
}
