package main

import (
	"fmt"

	"fyne.io/fyne/v2/app"

	"furlong/cmd/furlong/cli"
	"furlong/ui"
)

// appID is Furlong's application identifier (preferences and storage live
// under it).
const appID = "org.furlong.desktop"

func openWindow(opts cli.WindowOptions, env cli.Env) int {
	releaseConsole()
	a := app.NewWithID(appID)
	w := a.NewWindow("Furlong")
	fa := ui.New(a, w, ui.Options{Version: version}) // restores the remembered window size
	var err error
	switch {
	case opts.Demo:
		err = fa.OpenDemo()
	case opts.DemoSeries:
		err = fa.OpenDemoSeries()
	case opts.Series:
		err = fa.OpenSeriesFile(opts.Path)
	case opts.Path != "":
		err = fa.OpenFile(opts.Path)
	}
	if err != nil {
		// The window shows the problem in a dialog; say it on stderr too.
		fmt.Fprintf(env.Stderr, "furlong: %s\n", cli.Message(err))
	}
	w.ShowAndRun()
	return cli.ExitOK
}
