// Package glm analyses factorial, split-plot and strip-plot field trials.
package glm
