package plumb.cli.plot;

import java.nio.file.Path;

/**
 * The two files written for one figure.
 *
 * @param name   base name shared by both files (no extension)
 * @param png    raster version, rendered at twice the nominal size for print
 * @param svg    vector version
 * @param width  nominal width in points
 * @param height nominal height in points
 */
public record FigureFiles(String name, Path png, Path svg, int width, int height) {
}
