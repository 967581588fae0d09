//go:build !windows

package main

// releaseConsole lets go of a console made only for this process; outside
// Windows a program started from a desktop has none.
func releaseConsole() {}
