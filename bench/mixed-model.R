# lmer on the benchmark's data, timed in-process: Rscript bench/mixed-model.R FILE.csv RUNS
suppressMessages({ library(lme4); library(lmerTest) })
args <- commandArgs(TRUE)
d <- read.csv(args[1]); runs <- as.integer(args[2])
d$variety <- factor(d$variety, levels = unique(d$variety))
fit <- lmerTest::lmer(value ~ variety + (1 | site) + (1 | site:block), d)
times <- replicate(runs, system.time({
  fit <- lmerTest::lmer(value ~ variety + (1 | site) + (1 | site:block), d)
  a <- anova(fit, ddf = "Satterthwaite")
})[["elapsed"]])
vc <- as.data.frame(VarCorr(fit))
cat(sprintf("lmer + anova (Satterthwaite), %s: median_ms=%.1f over %d runs\n", R.version.string, 1000 * median(times), runs))
cat("lmer variance components:", paste(vc$grp, signif(vc$vcov, 6), collapse = ", "), "\n")
