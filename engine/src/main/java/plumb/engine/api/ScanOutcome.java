package plumb.engine.api;

import java.util.List;

/**
 * A profile likelihood scan of one parameter.
 *
 * @param parameter the parameter scanned
 * @param best      its best-fit value
 * @param error     its symmetric error
 * @param points    the profiled points, ascending in value
 * @param low68     lower end of the 68 % interval (2ΔNLL = 1), NaN when not reached in the range
 * @param high68    upper end of the 68 % interval
 * @param low95     lower end of the 95 % interval (2ΔNLL = 3.84)
 * @param high95    upper end of the 95 % interval
 */
public record ScanOutcome(String parameter, double best, double error, List<ProfilePoint> points, double low68,
                          double high68, double low95, double high95) {

    public ScanOutcome {
        points = List.copyOf(points);
    }

    /**
     * One point: twice the profiled −ln L above the lowest found (NaN when its refit failed).
     */
    public record ProfilePoint(double value, double twiceNllAboveMin, String status) { }
}
