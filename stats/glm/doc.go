// Package glm analyses factorial, split-plot and strip-plot field trials:
// crossed treatment factors (up to three) in a completely randomised
// design or in blocks, with one error or with the restricted
// randomisations of split, split-split and strip plots.
//
// Like package stats it knows nothing of trials: inputs are a response
// vector (NaN or a mask for missing plots), factors as level indices with
// level names, the blocks and an error structure; outputs are tables. It
// imports gonum, stats/dist and stats/meansep.
//
// # Models
//
// The fixed part is the blocks plus the treatment terms (every main
// effect and interaction unless Model.Terms says otherwise), coded with
// treatment contrasts. The error structure adds random units:
//
//	Factorial   y = block + A + B + A:B + … + e
//	SplitPlot   y = block + A + B + A:B + … + m(block:A) [+ s(block:A:B)] + e
//	StripPlot   y = block + A + B + A:B + h(block:A) + v(block:B) + e
//
// # Sums of squares
//
// A factorial is fitted by least squares. Each line's sum of squares is
// type II: the reduction in the residual sum of squares when the term is
// added to all the terms that do not contain it (for balanced data this
// equals the sequential sum of squares and the lines add up to the total;
// with missing plots they do not, and Result.Notes says so). F tests are
// against the error mean square.
//
// A complete split or strip plot (every block × combination present) has
// the classic strata analysis (Gomez & Gomez 1984, Statistical Procedures
// for Agricultural Research, 2nd ed., Wiley, ch. 3–4; Cochran & Cox 1957,
// Experimental Designs, ch. 7): sequential sums of squares in the order
// block, the terms of stratum a, error (a), the terms of stratum b,
// error (b), …, which are orthogonal for balanced data. Error (a) of a
// split plot is block:A, error (b) the rest (block:B + block:A:B; of a
// split-split plot block:B + block:A:B, with error (c) the rest). A strip
// plot has error (a) = block:A, error (b) = block:B, error (c) the rest,
// with A tested against (a), B against (b) and A:B against (c). Variance
// components come from the expected mean squares: E(MSₖ) = σ²ₑ + Σⱼ cⱼσ²ⱼ
// with cⱼ the plots per unit of a random term that contains stratum k's
// error unit; a negative estimate is reported as 0 with a note.
//
// # REML
//
// A split or strip plot with missing plots is fitted as a linear mixed
// model by restricted maximum likelihood, with blocks and treatments fixed
// and the units of the higher strata (main plots, sub-plots of a
// split-split plot, strips) random. With θⱼ = σⱼ/σₑ the profiled REML
// deviance log|Cθ| + (n−p)·log r²(θ) (Bates, Mächler, Bolker & Walker
// 2015, J. Stat. Softw. 67(1)) costs one Cholesky factorisation of the
// (units + fixed effects)-square matrix Cθ per evaluation; it is minimised
// by Newton's method on θ with a Nelder–Mead fallback, and a component at
// 0 is compared explicitly. Fixed effects are the generalised least
// squares estimates, Cov(β̂) = σ²ₑ(Cθ⁻¹)_XX.
//
// F tests are Wald tests of the type II hypotheses (the span of
// X₁'(I−P₀)X; for its basis see typeIIRows) with the denominator degrees
// of freedom of Fai & Cornelius (1996), J. Stat. Comput. Simul. 54,
// 363–378, from the Satterthwaite (1946) df of each independent contrast:
// ν = 2(l'Cl)²/(g'Ag), gᵢ = l'(∂C/∂φᵢ)l, A = 2H⁻¹ with H the observed
// information of the variance parameters φ (analytic). This is the
// approach of Kuznetsova, Brockhoff & Christensen (2017), J. Stat. Softw.
// 82(13), and the tests reproduce it on the oats data with three plots
// missing.
//
// # Means and comparisons
//
// Estimated marginal (least-squares) means average the fitted model with
// equal weights over the levels of the other factors and over the blocks
// (Searle, Speed & Milliken 1980, Am. Stat. 34, 216–221). A mean whose
// combination has no data under a model with its interaction is not
// estimable and is flagged. Every variance of a mean or a difference is
// l'Cl with C the covariance of β̂ as a function of the variance
// parameters, and its df is the Satterthwaite df above. For one error
// stratum that is the error df; for balanced strata C is linear in the
// error mean squares Eₖ, A = diag(2Eₖ²/dfₖ), and the formulas reduce to
// the textbook ones, for a split plot with a main-plot and b subplot
// levels in r blocks:
//
//	two main-plot means              √(2Ea/rb)                 df (a)
//	two subplot means                √(2Eb/ra)                 df (b)
//	two subplot levels, same main    √(2Eb/r)                  df (b)
//	two main levels, same subplot    √(2((b−1)Eb + Ea)/rb)     Satterthwaite:
//	                                 ((b−1)Eb + Ea)² / (((b−1)Eb)²/df_b + Ea²/df_a)
//
// and similarly for split-split and strip plots (Result.SEDs lists every
// kind, keyed "main", "sub", "sub_within_main", "main_within_sub", …;
// strip plots "horizontal", "vertical", "horizontal_within_vertical",
// "vertical_within_horizontal").
//
// All pairs of every effect are compared: t tests (LSD, protected by the
// effect's F test) with each pair's df, Tukey–Kramer with the smallest df
// of the set rounded down (conservative when strata mix), and letters
// from stats/meansep. When an interaction is significant its slices
// compare one factor's levels within each level (combination) of the
// others, with an F test of the slice (Fai–Cornelius df when strata mix)
// and its own comparisons.
//
// # Analysis of covariance
//
// A factorial (CRD or RCBD) can be adjusted for a covariate measured on
// the same plots (Model.Covariate; a plot without a value is left out and
// counted): the covariate is one more column of the fixed model,
//
//	y = block + A + B + A:B + … + β·x + e
//
// (Snedecor & Cochran 1989, Statistical Methods, 8th ed., ch. 18; Steel &
// Torrie 1980, ch. 17, for one list of treatments). Its line is its
// reduction in the residual sum of squares after the blocks and every
// treatment term (one df); each treatment term and the blocks are type II
// as above with the covariate among the terms they are adjusted for; the
// error has one df less. The estimated marginal means of every effect
// are taken at the covariate's mean over the plots analysed (its
// coefficient in L is 0 once it is centred), so their SEs, SEDs, pairs,
// letters and slices are those of adjusted means, all on the error df.
// Result.Covariate holds the common slope with its SE and t test, the
// test of homogeneity of slopes (a separate slope for every treatment
// combination against the common slope, on the extra slopes' df and the
// error df of that model), the analysis of the covariate itself with the
// same model and plots, with the F test of all treatment terms together
// (a significant one means the treatments changed the covariate, which
// must then not be used), and the unadjusted analysis of the same plots.
// Split and strip plots with a covariate are refused: their strata would
// need the covariate in each stratum.
//
// # Residuals
//
// Result.Residuals are within the lowest stratum: the response minus the
// least-squares fit of all fixed terms and of every error unit as a fixed
// effect, so main-plot (or strip) variation does not inflate them; for a
// factorial they are the ordinary residuals. Result.UnitResiduals holds
// the residuals of each higher stratum, one per main plot (or sub-plot,
// or strip): the fit with that stratum's error terms as fixed effects
// minus the fit without them.
package glm
