package trialfile

import "furlong/trial"

// encodeContrasts maps the trial's saved contrasts to the file (version 4).
func encodeContrasts(cs []trial.Contrast) []contrastV4 {
	if len(cs) == 0 {
		return nil
	}
	out := make([]contrastV4, len(cs))
	for i, c := range cs {
		out[i] = contrastV4{Name: c.Name, First: c.First, Second: c.Second}
		for _, t := range c.Terms {
			out[i].Coefficients = append(out[i].Coefficients, contrastTermV4{Treatment: t.Treatment, Weight: t.Weight})
		}
	}
	return out
}

// decodeContrasts maps the file's contrasts to the trial. They are checked
// against the treatments when used (trial.Contrast.Weights), so that a
// hand-edited contrast does not stop the trial from opening.
func decodeContrasts(cs []contrastV4) []trial.Contrast {
	if len(cs) == 0 {
		return nil
	}
	out := make([]trial.Contrast, len(cs))
	for i, c := range cs {
		out[i] = trial.Contrast{Name: c.Name}
		if len(c.First) > 0 {
			out[i].First = c.First
		}
		if len(c.Second) > 0 {
			out[i].Second = c.Second
		}
		for _, t := range c.Coefficients {
			out[i].Terms = append(out[i].Terms, trial.ContrastTerm{Treatment: t.Treatment, Weight: t.Weight})
		}
	}
	return out
}
