package cli

import "strconv"

func itoa(n int) string              { return strconv.Itoa(n) }
func strconvFormat(v float64) string { return strconv.FormatFloat(v, 'f', 6, 64) }
