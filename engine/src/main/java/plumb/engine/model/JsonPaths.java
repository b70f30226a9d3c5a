package plumb.engine.model;

/**
 * JSON paths in the form of docs/model-format.md, "Errors": {@code key.key[index].key}, with no
 * leading dot at the top level ({@code channels[0].edges[2]}).
 */
final class JsonPaths {

    private JsonPaths() {
    }

    /** The path of member {@code key} of the object at {@code path}. */
    static String key(String path, String key) {
        return path.isEmpty() ? key : path + '.' + key;
    }

    /** The path of element {@code index} of the array at {@code path}. */
    static String index(String path, int index) {
        return path + '[' + index + ']';
    }
}
