package plumb.cli.plot;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.function.Supplier;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.w3c.dom.Document;

class FiguresTest {

    @TempDir
    Path dir;

    static Stream<Arguments> figures() {
        return Stream.of(
                Arguments.of("yields_linear", (Supplier<Figure>) () -> YieldsFigure.of(Fixtures.diphoton("post-fit"))),
                Arguments.of("yields_log", (Supplier<Figure>) () -> YieldsFigure.of(Fixtures.falling(false))),
                Arguments.of("yields_blinded", (Supplier<Figure>) () -> YieldsFigure.of(Fixtures.falling(true))),
                Arguments.of("pulls", (Supplier<Figure>) () -> PullsFigure.of(Fixtures.pulls())),
                Arguments.of("impacts", (Supplier<Figure>) () -> ImpactsFigure.of(Fixtures.impacts(), 8)),
                Arguments.of("correlation", (Supplier<Figure>) () -> CorrelationFigure.of(Fixtures.correlation(9))),
                Arguments.of("correlation_big", (Supplier<Figure>) () -> CorrelationFigure.of(Fixtures.correlation(40))),
                Arguments.of("scan", (Supplier<Figure>) () -> ScanFigure.of(Fixtures.scan())),
                Arguments.of("limits", (Supplier<Figure>) () -> LimitsFigure.of(Fixtures.limits(true))),
                Arguments.of("limits_blinded", (Supplier<Figure>) () -> LimitsFigure.of(Fixtures.limits(false))),
                Arguments.of("linearity", (Supplier<Figure>) () -> LinearityFigure.of(Fixtures.linearity())));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("figures")
    void everyFigureIsAValidPngAndSvg(String name, Supplier<Figure> figure) throws Exception {
        FigureFiles files = figure.get().write(dir, name);

        BufferedImage png = ImageIO.read(files.png().toFile());
        assertNotNull(png, "ImageIO cannot read " + files.png());
        assertEquals(files.width() * FigureWriter.PNG_SCALE, png.getWidth());
        assertEquals(files.height() * FigureWriter.PNG_SCALE, png.getHeight());
        assertTrue(files.width() >= 600, "nominal width " + files.width());
        assertTrue(notBlank(png), "PNG is a single colour");

        Document svg = parseXml(files.svg());
        assertEquals("svg", svg.getDocumentElement().getLocalName());
        assertEquals("http://www.w3.org/2000/svg", svg.getDocumentElement().getNamespaceURI());

        try (Stream<Path> left = Files.list(dir)) {
            assertEquals(List.of(), left.filter(p -> p.getFileName().toString().endsWith(".tmp")).toList(), "temporary files left");
        }
    }

    @Test
    void axisTitleComesFromTheObservableWithItsGreekLetters() throws Exception {
        FigureFiles files = YieldsFigure.of(Fixtures.diphoton("pre-fit")).write(dir, "gamma");
        String svg = Files.readString(files.svg(), StandardCharsets.UTF_8);
        assertTrue(svg.contains("m(γγ) [GeV]"), "observable missing from the SVG text");
        // The chosen font must have a glyph for γ, or the PNG shows boxes.
        assertTrue(new java.awt.Font(Theme.FONT_FAMILY, java.awt.Font.PLAIN, 12).canDisplay('γ'), Theme.FONT_FAMILY);
    }

    @Test
    void textIsNeverSmallerThanElevenPoints() {
        for (java.awt.Font f : List.of(Theme.TITLE, Theme.AXIS_LABEL, Theme.TICK_LABEL, Theme.LEGEND, Theme.NOTE, Theme.SMALL)) {
            assertTrue(f.getSize2D() >= 11, f.toString());
        }
    }

    @Test
    void logScaleOnlyBeyondTwoDecades() {
        assertFalse(YieldsFigure.useLog(new double[] {5, 100, 400}, null));
        assertTrue(YieldsFigure.useLog(new double[] {2, 100, 400}, null));
        assertTrue(YieldsFigure.useLog(new double[] {3, 10, 20}, new double[] {3, 10, 900}));
        assertFalse(YieldsFigure.useLog(new double[] {0, 0}, null));
    }

    @Test
    void signalIsStackedOnTop() {
        List<StackedYields.Layer> order = YieldsFigure.stackOrder(Fixtures.diphoton("pre-fit").layers());
        assertEquals(List.of("continuum γγ", "γ + jet fakes", "resonance"), order.stream().map(StackedYields.Layer::name).toList());
    }

    @Test
    void figureNamesAreSanitised() {
        assertEquals("sr_diphoton", FigureWriter.safeName("sr_diphoton"));
        assertEquals("x.._etc_passwd", FigureWriter.safeName("../etc/passwd"));
        assertEquals("a_b_c", FigureWriter.safeName("a b<c"));
        assertThrows(IllegalArgumentException.class,
                () -> FigureWriter.write(ScanFigure.of(Fixtures.scan()).chart(), dir, "../escape", 800, 600));
    }

    @Test
    void inputsAreValidated() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new StackedYields("c", "pre-fit", null,
                new double[] {0, 1, 2}, List.of(new StackedYields.Layer("s", new double[] {1, 2, 3}, false)), null, null));
        assertEquals("3 edges for 3 bins", e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> new LimitBands("mu", "m", 0.95, List.of(
                new LimitBands.Point(1, 1, 1, 1, 1, 1, 1))));
    }

    @Test
    void strongestCorrelationsKeepOrderAndPickTheLargestOffDiagonal() {
        double[][] m = {
            {1, 0.1, 0.9, 0.0},
            {0.1, 1, 0.2, 0.0},
            {0.9, 0.2, 1, 0.05},
            {0.0, 0.0, 0.05, 1}};
        CorrelationMatrix c = new CorrelationMatrix(null, List.of("a", "b", "c", "d"), m).strongest(3);
        assertEquals(List.of("a", "b", "c"), c.names());
        assertEquals(0.2, c.matrix()[1][2]);
        assertEquals(0.9, c.matrix()[2][0]);
    }

    @Test
    void correlationCellText() {
        assertEquals("0.56", CorrelationFigure.format(0.5612, 5));
        assertEquals("−0.53", CorrelationFigure.format(-0.529, 5));
        assertEquals("−.53", CorrelationFigure.format(-0.529, 20));
        assertEquals("1", CorrelationFigure.format(1.0, 5));
        assertEquals("0.00", CorrelationFigure.format(-0.001, 5));
    }

    @Test
    void scanSummaryUsesTheDecimalPlaceOfTheInterval() {
        assertEquals("best fit mu_res = 1.10   68%: [0.75, 1.55]   95%: [0.41, 1.98]", ScanFigure.summary(Fixtures.scan()));
        ScanCurve open = new ScanCurve("k", new double[] {0, 1}, new double[] {0, 1}, 0.0,
                new double[] {Double.NaN, 1.4142}, null);
        assertEquals("best fit k = 0.0   68%: [–, 1.4]   95%: [–, –]", ScanFigure.summary(open));
        assertNull(ScanFigure.summary(new ScanCurve("k", new double[] {0, 1}, new double[] {0, 1}, Double.NaN, null, null)));
    }

    @Test
    void percentOfConfidenceLevel() {
        assertEquals("95", LimitsFigure.percent(0.95));
        assertEquals("68.3", LimitsFigure.percent(0.683));
    }

    private static boolean notBlank(BufferedImage img) {
        int first = img.getRGB(0, 0);
        for (int y = 0; y < img.getHeight(); y += 7) {
            for (int x = 0; x < img.getWidth(); x += 7) if (img.getRGB(x, y) != first) return true;
        }
        return false;
    }

    /** Parses without fetching anything: DOCTYPEs are refused outright. */
    static Document parseXml(Path file) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setNamespaceAware(true);
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
        try {
            return f.newDocumentBuilder().parse(file.toFile());
        } catch (IOException e) {
            throw new AssertionError("cannot read " + file, e);
        }
    }
}
