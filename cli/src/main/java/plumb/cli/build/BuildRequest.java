package plumb.cli.build;

import java.nio.file.Path;

/**
 * What {@code plumb build} was asked: the build description, where the model goes, and the Spark
 * master ({@code local[*]} unless --spark says otherwise).
 */
public record BuildRequest(Path spec, Path out, String master, int timeoutSeconds) {
}
