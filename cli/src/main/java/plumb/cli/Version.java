package plumb.cli;

import picocli.CommandLine;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.Properties;

/**
 * The tool's version, read from {@code version.properties} that the build fills in from pom.xml,
 * so the number is written in one place only.
 */
public final class Version implements CommandLine.IVersionProvider {

    /** The project version this jar was built as. */
    public static final String NUMBER = read();

    private static String read() {
        try (InputStream in = Version.class.getResourceAsStream("version.properties")) {
            if (in == null) throw new IllegalStateException("version.properties is missing from the build");
            Properties p = new Properties();
            p.load(in);
            String v = p.getProperty("version");
            if (v == null || v.isBlank() || v.contains("${")) {
                throw new IllegalStateException("version.properties was not filled in by the build: " + v);
            }
            return v.trim();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    @Override
    public String[] getVersion() {
        return new String[] {"plumb " + NUMBER};
    }
}
