package ui

// explainPackages maps the typed and sentinel errors of the file, field
// book and export packages to messages.
func explainPackages(action string, err error) (message, bool) {
	return message{}, false
}
