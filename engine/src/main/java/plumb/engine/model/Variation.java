package plumb.engine.model;

/**
 * One systematic variation tying a nuisance parameter to a sample. At least one of {@code norm}
 * and {@code shape} is present. The interpolation fields are null when absent from the file
 * (meaning {@link Interpolation#SMOOTH}).
 */
public record Variation(String parameter, NormEffect norm, ShapeEffect shape,
                        Interpolation normInterpolation, Interpolation shapeInterpolation) {

    /** The interpolation of the norm part, with the format's default applied. */
    public Interpolation normMode() {
        return normInterpolation == null ? Interpolation.SMOOTH : normInterpolation;
    }

    /** The interpolation of the shape part, with the format's default applied. */
    public Interpolation shapeMode() {
        return shapeInterpolation == null ? Interpolation.SMOOTH : shapeInterpolation;
    }

    /** Multiplicative effect on the sample total at θ = −1 ({@code down}) and θ = +1 ({@code up}). */
    public record NormEffect(double down, double up) { }

    /** Alternative yields per bin at θ = −1 ({@code down}) and θ = +1 ({@code up}). */
    public record ShapeEffect(double[] down, double[] up) { }
}
