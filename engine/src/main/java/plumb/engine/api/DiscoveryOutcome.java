package plumb.engine.api;

/**
 * The discovery test of POI = 0 with q0.
 *
 * @param poi        name of the parameter of interest
 * @param observedZ  significance on the problem's data, in standard deviations (NaN for a blinded model)
 * @param observedP  its one-sided p-value
 * @param muHat      best-fit POI value on the data
 * @param expectedZ  median expected significance: on the Asimov data set at {@code expectedPoi}
 * @param expectedPoi POI value of that Asimov data set
 */
public record DiscoveryOutcome(String poi, double observedZ, double observedP, double muHat, double expectedZ,
                               double expectedPoi) { }
