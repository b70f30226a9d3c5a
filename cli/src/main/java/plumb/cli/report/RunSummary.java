package plumb.cli.report;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.DigestInputStream;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;

/**
 * What the top of the report says about the run.
 *
 * @param model         model name
 * @param description   model description, or null
 * @param modelFile     the model file as given by the user, or null
 * @param modelSha256   SHA-256 of the model file in hex ({@link #sha256(Path)}), or null
 * @param dataSet       "observed" or "asimov"
 * @param seed          seed of all random numbers, or null when none was used
 * @param toolVersion   Plumb version string
 * @param seconds       wall time of the run's computations (drawing the page not included)
 * @param labels        the model's labels (values: numbers or strings), may be empty
 * @param warnings      warnings collected during the run, may be empty
 * @param nonConverged  names of fits that did not converge ("fit", "scan point mu=2.5", ...), may be empty
 * @param failures      sections that could not be computed, with why, in page order; may be empty
 */
public record RunSummary(String model, String description, String modelFile, String modelSha256, String dataSet,
                         Long seed, String toolVersion, double seconds, Map<String, Object> labels,
                         List<String> warnings, List<String> nonConverged, List<Failure> failures) {

    /**
     * A section of the report that failed.
     *
     * @param section the section's id on the page ("fit", "impacts", "yields", "scan", "discovery",
     *                "limits", "gof", "injection")
     * @param message why, one line
     */
    public record Failure(String section, String message) {
        public Failure {
            if (section == null || message == null) throw new IllegalArgumentException("a failure needs a section and a message");
        }
    }

    public RunSummary {
        if (model == null) throw new IllegalArgumentException("run summary needs the model name");
        labels = labels == null ? Map.of() : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(labels));
        warnings = warnings == null ? List.of() : List.copyOf(warnings);
        nonConverged = nonConverged == null ? List.of() : List.copyOf(nonConverged);
        failures = failures == null ? List.of() : List.copyOf(failures);
    }

    /** A summary of a run in which no section failed. */
    public RunSummary(String model, String description, String modelFile, String modelSha256, String dataSet,
                      Long seed, String toolVersion, double seconds, Map<String, Object> labels,
                      List<String> warnings, List<String> nonConverged) {
        this(model, description, modelFile, modelSha256, dataSet, seed, toolVersion, seconds, labels, warnings,
                nonConverged, List.of());
    }

    /** Why section {@code id} failed (several reasons joined by "; "), or null when it did not. */
    public String failure(String id) {
        List<String> why = new java.util.ArrayList<>();
        for (Failure f : failures) if (f.section().equals(id)) why.add(f.message());
        return why.isEmpty() ? null : String.join("; ", why);
    }

    /** True when something failed: a section, or a fit that did not converge (the run's exit status is then 1). */
    public boolean anyFailure() {
        return !failures.isEmpty() || !nonConverged.isEmpty();
    }

    /** SHA-256 of a file's bytes, lower-case hex (64 characters). */
    public static String sha256(Path file) throws IOException {
        MessageDigest digest;
        try {
            digest = MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every Java runtime has SHA-256", e);
        }
        try (InputStream in = new DigestInputStream(Files.newInputStream(file), digest)) {
            in.transferTo(java.io.OutputStream.nullOutputStream());
        }
        return HexFormat.of().formatHex(digest.digest());
    }
}
