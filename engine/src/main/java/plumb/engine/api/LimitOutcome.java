package plumb.engine.api;

import plumb.engine.inference.ExpectedBands;

/**
 * An asymptotic CLs upper limit on the parameter of interest (q̃μ statistic).
 *
 * @param poi      name of the parameter of interest
 * @param cl       confidence level
 * @param observed the limit on the problem's data; NaN for a blinded model fitted to observed data
 * @param expected the expected limits (median, ±1σ, ±2σ) under the background-only hypothesis
 * @param muHat    best-fit POI value on the data (NaN when blinded)
 */
public record LimitOutcome(String poi, double cl, double observed, ExpectedBands expected, double muHat) { }
