package plumb.cli.table;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class TableTest {

    // Rounding rule: uncertainty to two significant digits, value to the same decimal place
    // (common practice; the first two rows are the usual textbook examples).
    @ParameterizedTest
    @CsvSource(delimiter = ';', value = {
        "12.345;    0.0678;  12.345 ± 0.068",
        "1234.5;    56.7;    1235 ± 57",
        "0.0996;    0.0996;  0.10 ± 0.10",
        "123456;    5678;    123500 ± 5700",
        "0.6;       1.0;     0.6 ± 1.0",
        "0;         1;       0.0 ± 1.0",
        "-0.31;     0.92;    -0.31 ± 0.92",
        "-0.0001;   0.05;    0.000 ± 0.050",
        "2.5;       0.15;    2.50 ± 0.15",
        "1.23456e-6; 2.1e-8; 0.000001235 ± 0.000000021",
        "17;        12.5;    17 ± 13",
    })
    void measurementRoundsTheErrorToTwoDigitsAndTheValueToMatch(double value, double error, String expected) {
        assertEquals(expected, Table.measurement(value, error));
    }

    @Test
    void measurementWithoutUsableErrorShowsFourDigits() {
        assertEquals("5.000 ± 0", Table.measurement(5, 0));
        assertEquals("5.000 ± –", Table.measurement(5, Double.NaN));
        assertEquals("–", Table.measurement(Double.NaN, 1));
    }

    @ParameterizedTest
    @CsvSource(delimiter = ';', value = {
        "5;        4; 5.000",
        "1234.5;   4; 1235",
        "12345.6;  4; 12350",
        "0.012345; 3; 0.0123",
        "-2.5;     2; -2.5",
        "9.68e-4;  3; 0.000968",
        "2.33e-5;  3; 2.33e-05",
        "3.2e8;    3; 3.20e+08",
    })
    void numberKeepsSignificantDigits(double value, int digits, String expected) {
        assertEquals(expected, Table.number(value, digits));
    }

    // RFC 4180, section 2, rules 5-7: fields with comma, quote or line break are quoted and
    // inner quotes doubled; lines end with CRLF.
    @Test
    void csvQuotesOnlyWhereRfc4180Requires() {
        Table t = Table.builder("ignored title", "name", "value").row("a,b", "say \"hi\"").row("plain", "two\nlines")
                .row(" padded", "").build();
        String csv = TableFormat.CSV.render(t);
        assertEquals("name,value\r\n\"a,b\",\"say \"\"hi\"\"\"\r\nplain,\"two\nlines\"\r\n\" padded\",\r\n", csv);
    }

    @Test
    void latexEscapesTheTenSpecialCharacters() {
        assertEquals("\\textbackslash{}\\&\\%\\$\\#\\_\\{\\}\\textasciitilde{}\\textasciicircum{}",
                Escape.latex("\\&%$#_{}~^"));
        assertEquals("m($\\gamma$$\\gamma$) [GeV]", Escape.latex("m(γγ) [GeV]"));
        assertEquals("1.0 $\\pm$ 0.2", Escape.latex("1.0 ± 0.2"));
    }

    @Test
    void latexTableHasColumnSpecRulesAndEscapedCells() {
        Table t = Table.builder("Yields & more", "sample_name", "yield").row("bkg_1", "12 ± 3").build();
        String tex = TableFormat.LATEX.render(t);
        assertEquals("% Yields \\& more\n\\begin{tabular}{lr}\n\\hline\nsample\\_name & yield \\\\\n\\hline\n"
                + "bkg\\_1 & 12 $\\pm$ 3 \\\\\n\\hline\n\\end{tabular}\n", tex);
    }

    @Test
    void markdownEscapesPipesAndAlignsNumbers() {
        Table t = Table.builder(null, "name", "n").row("a|b", "3").row("c", "-4.5").build();
        assertEquals("| name | n |\n| --- | ---: |\n| a\\|b | 3 |\n| c | -4.5 |\n", TableFormat.MARKDOWN.render(t));
    }

    @Test
    void htmlEscapesMarkup() {
        Table t = Table.builder("<b>", "x").row("<script>alert('1')</script> & \"q\"").build();
        String html = TableFormat.HTML.render(t);
        assertTrue(html.contains("&lt;script&gt;alert(&#39;1&#39;)&lt;/script&gt; &amp; &quot;q&quot;"), html);
        assertFalse(html.contains("<script>"));
        assertTrue(html.contains("<caption>&lt;b&gt;</caption>"));
    }

    @Test
    void textAlignsColumnsByCodePoints() {
        Table t = Table.builder(null, "sample", "yield").row("γ+jet", "12 ± 3").row("continuum", "1234 ± 56").build();
        String text = TableFormat.TEXT.render(t);
        assertEquals(String.join("\n",
                "sample         yield",
                "---------  ---------",
                "γ+jet         12 ± 3",
                "continuum  1234 ± 56", ""), text);
    }

    @Test
    void rowsMustMatchTheHeader() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Table.builder(null, "a", "b").row("only one").build());
        assertEquals("row 0 has 1 cells, the header has 2", e.getMessage());
    }

    @Test
    void formatNamesParseAsTypedOnTheCommandLine() {
        assertEquals(TableFormat.MARKDOWN, TableFormat.parse("md"));
        assertEquals(TableFormat.LATEX, TableFormat.parse("LaTeX"));
        assertEquals(TableFormat.TEXT, TableFormat.parse("text"));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> TableFormat.parse("xls"));
        assertEquals("unknown table format 'xls', expected text, markdown, csv, latex or html", e.getMessage());
        assertEquals(List.of("txt", "md", "csv", "tex", "html"),
                List.of(TableFormat.values()).stream().map(TableFormat::extension).toList());
    }
}
