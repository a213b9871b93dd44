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
cat(sprintf("lmer + anova (Satterthwaite), %s, lme4 %s, lmerTest %s\n", R.version.string, packageVersion("lme4"), packageVersion("lmerTest")))
cat(sprintf("times_ms=%s\n", paste(sprintf("%.1f", 1000 * times), collapse = ",")))
cat("lmer variance components:", paste(vc$grp, signif(vc$vcov, 6), collapse = ", "), "\n")
