package plumb.engine.api;

/**
 * Goodness of fit with the saturated-model statistic.
 *
 * @param statistic −2 ln(L/L_saturated) at the best fit
 * @param ndof      fitted bins minus free unconstrained parameters
 * @param p         asymptotic p-value from the χ² distribution with ndof degrees of freedom
 * @param converged whether the best fit converged
 */
public record GofOutcome(double statistic, int ndof, double p, boolean converged) { }
