# Reference results for Furlong's analysis of covariance, computed with R
# (Debian's r-base-core 4.2.2, r-cran-car 3.1-1, r-cran-emmeans 1.8.4).
# Run from this folder: Rscript ancova-references.R
# It writes the data it used (CSV) and the results (JSON) beside itself.
suppressMessages({library(car); library(emmeans)})
options(digits = 15)
j <- function(x) if (length(x) == 1 && is.na(x)) "null" else format(x, digits = 15, scientific = FALSE, trim = TRUE)
num <- function(x) if (is.na(x)) "null" else sprintf("%.15g", x)

# 1. emmeans's own fibre data (Montgomery, Design and Analysis of
# Experiments): strength of fibre from three machines, covariate diameter.
data(fiber, package = "emmeans")
write.csv(fiber[, c("machine", "strength", "diameter")], "fiber-emmeans.csv", row.names = FALSE, quote = FALSE)
m1 <- lm(strength ~ diameter + machine, data = fiber)
a1 <- car::Anova(m1, type = 2)
e1 <- summary(emmeans(m1, "machine"))
hom <- anova(m1, lm(strength ~ diameter * machine, data = fiber))
s1 <- summary(m1)$coefficients

# 2. A factorial in blocks with a covariate: R's warpbreaks (2 wools x 3
# tensions, 9 looms each); rep = the loom's position 1-9 within its
# combination, used as blocks; x = 10 + (37 p mod 17) + 0.25 (p mod 5) for
# plot p (a covariate made from the layout: the data have none); plots 5
# and 33 lose their breaks, plot 20 its covariate.
wb <- warpbreaks
wb$plot <- seq_len(nrow(wb))
wb$rep <- factor(ave(wb$plot, wb$wool, wb$tension, FUN = seq_along))
wb$x <- 10 + (37 * wb$plot) %% 17 + 0.25 * (wb$plot %% 5)
wb$breaks[c(5, 33)] <- NA
wb$x[20] <- NA
write.csv(wb[, c("plot", "rep", "wool", "tension", "breaks", "x")], "warpbreaks-covariate.csv", row.names = FALSE, quote = FALSE, na = "")
d2 <- wb[complete.cases(wb[, c("breaks", "x")]), ]
m2 <- lm(breaks ~ rep + x + wool * tension, data = d2)
a2 <- car::Anova(m2, type = 2)
s2 <- summary(m2)$coefficients
ew <- summary(emmeans(m2, "wool"))
et <- summary(emmeans(m2, "tension"))
ewt <- summary(emmeans(m2, ~ wool:tension))
hom2 <- anova(m2, lm(breaks ~ rep + x * wool * tension, data = d2))

anova_json <- function(a) {
  rows <- character(0)
  for (i in seq_len(nrow(a))) {
    rows <- c(rows, sprintf('{"source": "%s", "df": %d, "ss": %s, "f": %s, "p": %s}', rownames(a)[i], as.integer(a$Df[i]),
      num(a[["Sum Sq"]][i]), num(a[["F value"]][i]), num(a[["Pr(>F)"]][i])))
  }
  paste0("[", paste(rows, collapse = ", "), "]")
}
means_json <- function(e, cols) {
  rows <- character(0)
  for (i in seq_len(nrow(e))) {
    lv <- paste(sprintf('"%s": "%s"', cols, sapply(cols, function(c) as.character(e[[c]][i]))), collapse = ", ")
    rows <- c(rows, sprintf('{"levels": {%s}, "emmean": %s, "se": %s, "df": %d}', lv, num(e$emmean[i]), num(e$SE[i]), as.integer(e$df[i])))
  }
  paste0("[", paste(rows, collapse = ", "), "]")
}
cat(file = "ancova.expected.json", sprintf('{
  "source": "R %s with car %s and emmeans %s (Debian bookworm packages); ancova-references.R in this folder",
  "fiber": {"model": "lm(strength ~ diameter + machine), car::Anova type 2, emmeans(~ machine) at the mean diameter",
    "anova": %s, "slope": %s, "slope_se": %s, "slope_p": %s, "mean_diameter": %s,
    "means": %s, "homogeneity_f": %s, "homogeneity_p": %s},
  "warpbreaks": {"model": "lm(breaks ~ rep + x + wool * tension) on the complete cases, car::Anova type 2, emmeans at the mean x",
    "n": %d, "anova": %s, "slope": %s, "slope_se": %s, "slope_p": %s, "mean_x": %s,
    "means_wool": %s, "means_tension": %s, "means_wool_tension": %s, "homogeneity_f": %s, "homogeneity_p": %s}
}
', paste0(R.version$major, ".", R.version$minor), as.character(packageVersion("car")), as.character(packageVersion("emmeans")),
  anova_json(a1), num(s1["diameter", 1]), num(s1["diameter", 2]), num(s1["diameter", 4]), num(mean(fiber$diameter)),
  means_json(e1, "machine"), num(hom$F[2]), num(hom[["Pr(>F)"]][2]),
  nrow(d2), anova_json(a2), num(s2["x", 1]), num(s2["x", 2]), num(s2["x", 4]), num(mean(d2$x)),
  means_json(ew, "wool"), means_json(et, "tension"), means_json(ewt, c("wool", "tension")), num(hom2$F[2]), num(hom2[["Pr(>F)"]][2])))
