package plumb.cli;

import org.junit.jupiter.api.Test;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** --version prints the version written in the parent pom.xml, read from the built jar's resources. */
class VersionTest {

    @Test
    void versionComesFromThePom() throws Exception {
        String pom = Files.readString(Path.of("..", "pom.xml"));
        // the parent's own <version>, the first one after its <artifactId>
        Matcher m = Pattern.compile("<artifactId>plumb-parent</artifactId>\\s*<version>([^<]+)</version>").matcher(pom);
        assertTrue(m.find(), "no version in pom.xml");
        String expected = m.group(1).trim();

        StringWriter out = new StringWriter();
        int code = Main.execute(new String[] {"--version"}, new PrintWriter(out, true), new PrintWriter(new StringWriter(), true));
        assertEquals(0, code);
        assertEquals("plumb " + expected, out.toString().trim());
        assertEquals(expected, Main.VERSION);
    }
}
