package plumb.cli;

import picocli.CommandLine.ITypeConverter;
import picocli.CommandLine.TypeConversionException;

import java.util.Locale;

/**
 * Checks of option values that every command shares, as picocli converters: a value is refused
 * while the command line is parsed (exit status 2, "Invalid value for option '--threads': …"),
 * whichever command takes the option.
 */
final class OptionValues {

    /** Closest to 1 a --cl may be: beyond it the quantiles of the test statistic lose their precision. */
    static final double MAX_CL = 0.999999;
    /** Lowest --cl: below one half an upper limit would lie below the best fit. */
    static final double MIN_CL = 0.5;

    private OptionValues() {
    }

    private static long whole(String value) {
        try {
            return Long.parseLong(value.strip());
        } catch (NumberFormatException e) {
            throw new TypeConversionException("'" + value + "' is not a whole number");
        }
    }

    private static int atLeast(String value, long min) {
        long n = whole(value);
        if (n < min) throw new TypeConversionException("must be at least " + min + ", got " + n);
        if (n > Integer.MAX_VALUE) throw new TypeConversionException("must be at most " + Integer.MAX_VALUE + ", got " + n);
        return (int) n;
    }

    /** Threads, toys, counts: a whole number from 1. */
    static final class Positive implements ITypeConverter<Integer> {
        @Override
        public Integer convert(String value) {
            return atLeast(value, 1);
        }
    }

    /** Counts where 0 means "none" (report --toys, --exact-top). */
    static final class NonNegative implements ITypeConverter<Integer> {
        @Override
        public Integer convert(String value) {
            return atLeast(value, 0);
        }
    }

    /** Scan points: at least the two ends. */
    static final class ScanPoints implements ITypeConverter<Integer> {
        @Override
        public Integer convert(String value) {
            return atLeast(value, 2);
        }
    }

    /** Rays of a contour: fewer than 8 points cannot outline a region. */
    static final class Rays implements ITypeConverter<Integer> {
        @Override
        public Integer convert(String value) {
            return atLeast(value, 8);
        }
    }

    /** A finite number. */
    static final class Finite implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            double x;
            try {
                x = Double.parseDouble(value.strip());
            } catch (NumberFormatException e) {
                throw new TypeConversionException("'" + value + "' is not a number");
            }
            if (!Double.isFinite(x)) throw new TypeConversionException("must be a finite number, got " + value);
            return x;
        }
    }

    /** A confidence level of an upper limit, in [{@value #MIN_CL}, {@value #MAX_CL}]. */
    static final class ConfidenceLevel implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            double x = new Finite().convert(value);
            if (!(x >= MIN_CL && x <= MAX_CL)) {
                throw new TypeConversionException(String.format(Locale.ROOT,
                        "must lie in [%s, %s] (0.95 for 95%%), got %s", MIN_CL, MAX_CL, value));
            }
            return x;
        }
    }
}
