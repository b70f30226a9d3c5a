package plumb.cli.build;

import plumb.cli.InputException;

import java.io.PrintWriter;
import java.lang.reflect.InvocationTargetException;
import java.nio.file.Path;

/**
 * The door from the command line to the spark module, which does the building: looked up by name
 * so that the command line itself never needs Spark (./plumb runs {@code build} and
 * {@code demo --events} from the spark module's jar with Spark's jars behind it).
 */
public final class EventBuilds {

    static final String BUILD = "plumb.spark.build.EventBuild";
    static final String DEMO = "plumb.spark.build.EventsDemo";

    /** The one line printed when the spark module or Spark's jars are missing. */
    public static final String HOW_TO_BUILD = "building from events needs the spark module and Spark's jars: run through "
            + "./plumb, which builds them, or build them with 'mvn -B -DskipTests package -pl spark -am' and run "
            + "spark/target/plumb-spark.jar with spark-submit";

    private EventBuilds() {
    }

    /** {@code plumb build}: the model and cut flow written, or an exception of the command line. */
    public static BuildOutcome build(BuildRequest request, PrintWriter out, PrintWriter err) {
        return (BuildOutcome) call(BUILD, "run", new Class<?>[] {BuildRequest.class, PrintWriter.class, PrintWriter.class},
                request, out, err);
    }

    /** The events demo: invented tables drawn from {@code seed} written to {@code dir}, built into DIR/model.json. */
    public static BuildOutcome demo(Path dir, String master, int timeoutSeconds, long seed, PrintWriter out, PrintWriter err) {
        return (BuildOutcome) call(DEMO, "run", new Class<?>[] {Path.class, String.class, int.class, long.class,
                PrintWriter.class, PrintWriter.class}, dir, master, timeoutSeconds, seed, out, err);
    }

    private static Object call(String className, String method, Class<?>[] types, Object... args) {
        try {
            return Class.forName(className).getMethod(method, types).invoke(null, args);
        } catch (ClassNotFoundException | NoClassDefFoundError e) {
            throw new InputException(HOW_TO_BUILD);
        } catch (InvocationTargetException e) {
            Throwable t = e.getCause();
            if (t instanceof NoClassDefFoundError) throw new InputException(HOW_TO_BUILD);
            if (t instanceof RuntimeException r) throw r;
            if (t instanceof Error x) throw x;
            throw new IllegalStateException(t);
        } catch (ReflectiveOperationException e) {
            throw new IllegalStateException(e);
        }
    }
}
