package plumb.spark.campaign;

import org.apache.spark.broadcast.Broadcast;
import plumb.engine.compile.CompiledModel;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.ObjectInputStream;
import java.io.ObjectOutputStream;
import java.io.ObjectStreamClass;
import java.io.UncheckedIOException;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The compiled model as bytes (Java serialisation of its flat arrays), the form it is broadcast
 * in, and the executors' cache of models read back: each executor deserialises a model once and
 * its tasks share it (the model is read-only).
 */
final class ModelBytes {

    /** Models kept per executor; older ones are dropped (a run uses one, a multi-model limit a few). */
    private static final int CACHED = 16;

    private static final Map<String, CompiledModel> CACHE = new LinkedHashMap<>(CACHED, 0.75f, true) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<String, CompiledModel> eldest) {
            return size() > CACHED;
        }
    };

    private ModelBytes() {
    }

    static byte[] of(CompiledModel m) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (ObjectOutputStream out = new ObjectOutputStream(bytes)) {
            out.writeObject(m);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return bytes.toByteArray();
    }

    static CompiledModel read(byte[] bytes) {
        try (ObjectInputStream in = new ContextObjectInput(new ByteArrayInputStream(bytes))) {
            return (CompiledModel) in.readObject();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (ClassNotFoundException e) {
            throw new IllegalStateException("model bytes name an unknown class: " + e.getMessage(), e);
        }
    }

    /**
     * A broadcast model with a key unique to it (broadcast ids restart with each Spark context,
     * and an embedded executor lives as long as this process).
     */
    record Shared(String key, Broadcast<byte[]> bytes) implements java.io.Serializable {

        static Shared of(org.apache.spark.api.java.JavaSparkContext sc, CompiledModel m) {
            return new Shared(java.util.UUID.randomUUID().toString(), sc.broadcast(ModelBytes.of(m)));
        }

        /** The model, deserialised once per executor. */
        CompiledModel model() {
            synchronized (CACHE) {
                CompiledModel m = CACHE.get(key);
                if (m == null) {
                    m = read(bytes.value());
                    CACHE.put(key, m);
                }
                return m;
            }
        }
    }

    /** Resolves classes with the task's class loader (where a cluster puts the application jar). */
    private static final class ContextObjectInput extends ObjectInputStream {
        ContextObjectInput(InputStream in) throws IOException {
            super(in);
        }

        @Override
        protected Class<?> resolveClass(ObjectStreamClass desc) throws IOException, ClassNotFoundException {
            ClassLoader loader = Thread.currentThread().getContextClassLoader();
            if (loader == null) return super.resolveClass(desc);
            try {
                return Class.forName(desc.getName(), false, loader);
            } catch (ClassNotFoundException e) {
                return super.resolveClass(desc);
            }
        }
    }
}
