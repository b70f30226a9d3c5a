package plumb.spark.build;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import plumb.cli.InputException;
import plumb.spark.build.BuildSpec.Events;
import plumb.spark.build.BuildSpec.Expr;
import plumb.spark.build.BuildSpec.Outside;
import plumb.spark.build.BuildSpec.Region;
import plumb.spark.build.BuildSpec.SampleSpec;
import plumb.spark.build.BuildSpec.Source;
import plumb.spark.build.BuildSpec.Step;
import plumb.spark.build.BuildSpec.TidyChoice;
import plumb.spark.build.BuildSpec.VariationSpec;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Reads a build description (docs/build-format.md) strictly: unknown keys, wrong types and broken
 * rules are errors naming the file and the JSON path. Expressions are only checked for being
 * non-empty here; Spark checks them against the tables later ({@link EventBuild}).
 */
public final class BuildSpecReader {

    private static final Pattern NAME = Pattern.compile("[A-Za-z0-9_.:+-]{1,128}");

    private final Path file;

    private BuildSpecReader(Path file) {
        this.file = file;
    }

    /** @throws InputException naming the file and the JSON path of the first problem */
    public static BuildSpec read(Path file) {
        String text;
        try {
            text = Files.readString(file);
        } catch (IOException e) {
            throw new InputException(file + ": cannot read: " + e.getMessage());
        }
        return parse(text, file);
    }

    static BuildSpec parse(String text, Path file) {
        JsonNode root;
        try {
            root = new ObjectMapper().readTree(text);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new InputException(file + ": not valid JSON: " + e.getOriginalMessage());
        }
        return new BuildSpecReader(file).top(root);
    }

    private BuildSpec top(JsonNode root) {
        object(root, "(top level)", "format", "name", "description", "poi", "labels", "outside", "data", "regions",
                "samples", "tidy");
        String format = text(root, "format", "format", true);
        if (!BuildSpec.FORMAT.equals(format)) fail("format", "\"" + format + "\", expected \"" + BuildSpec.FORMAT + "\"");
        String name = name(root, "name", "name");
        String description = text(root, "description", "description", false);
        String poi = root.has("poi") ? name(root, "poi", "poi") : null;
        Map<String, Object> labels = labels(root.get("labels"));
        Outside outside = outside(root, "outside", Outside.DROP);
        Events data = null;
        if (root.has("data")) {
            object(root.get("data"), "data", "events");
            data = events(root.get("data").get("events"), "data.events");
        }
        TidyChoice tidy = root.has("tidy") ? tidy(root.get("tidy"), "tidy", TidyChoice.NONE) : TidyChoice.NONE;

        JsonNode rs = array(root.get("regions"), "regions", true);
        List<Region> regions = new ArrayList<>();
        Set<String> regionNames = new HashSet<>();
        for (int i = 0; i < rs.size(); i++) {
            Region r = region(rs.get(i), "regions[" + i + "]", outside);
            if (!regionNames.add(r.name())) fail("regions[" + i + "].name", "\"" + r.name() + "\" repeats another region's name");
            regions.add(r);
        }
        JsonNode ss = array(root.get("samples"), "samples", true);
        List<SampleSpec> samples = new ArrayList<>();
        Set<String> sampleNames = new HashSet<>();
        boolean poiUsed = false;
        for (int i = 0; i < ss.size(); i++) {
            SampleSpec s = sample(ss.get(i), "samples[" + i + "]", regionNames, tidy);
            if (!sampleNames.add(s.name())) fail("samples[" + i + "].name", "\"" + s.name() + "\" repeats another sample's name");
            poiUsed |= s.factors().contains(poi);
            samples.add(s);
        }
        if (poi != null && !poiUsed) fail("poi", "\"" + poi + "\" is in no sample's factors");
        return new BuildSpec(file, name, description, poi, labels, outside, data, regions, samples);
    }

    private Region region(JsonNode n, String path, Outside defaultOutside) {
        object(n, path, "name", "title", "steps", "observable", "edges", "outside", "blinded");
        String name = name(n, "name", path + ".name");
        String title = text(n, "title", path + ".title", false);
        JsonNode st = array(n.get("steps"), path + ".steps", true);
        List<Step> steps = new ArrayList<>();
        for (int k = 0; k < st.size(); k++) {
            String p = path + ".steps[" + k + "]";
            object(st.get(k), p, "name", "keep");
            steps.add(new Step(text(st.get(k), "name", p + ".name", true), expr(st.get(k), "keep", p + ".keep")));
        }
        Expr observable = expr(n, "observable", path + ".observable");
        JsonNode e = array(n.get("edges"), path + ".edges", true);
        if (e.size() < 2) fail(path + ".edges", e.size() + " values, expected at least 2");
        double[] edges = new double[e.size()];
        for (int b = 0; b < e.size(); b++) {
            edges[b] = number(e.get(b), path + ".edges[" + b + "]");
            if (b > 0 && !(edges[b] > edges[b - 1])) {
                fail(path + ".edges[" + b + "]", edges[b] + " is not above the edge before it (" + edges[b - 1] + ")");
            }
        }
        Outside outside = outside(n, path + ".outside", defaultOutside);
        boolean blinded = bool(n, "blinded", path + ".blinded", false);
        return new Region(name, title, steps, observable, edges, outside, blinded);
    }

    private SampleSpec sample(JsonNode n, String path, Set<String> regionNames, TidyChoice tidy) {
        object(n, path, "name", "events", "weight", "factors", "mcStatistics", "regions", "variations");
        String name = name(n, "name", path + ".name");
        Events events = events(n.get("events"), path + ".events");
        Expr weight = n.has("weight") ? expr(n, "weight", path + ".weight") : new Expr("1", path + ".weight");
        List<String> factors = names(n.get("factors"), path + ".factors");
        boolean mcStat = bool(n, "mcStatistics", path + ".mcStatistics", true);
        List<String> regions = regionList(n, path, regionNames);
        List<VariationSpec> variations = new ArrayList<>();
        if (n.has("variations")) {
            JsonNode vs = array(n.get("variations"), path + ".variations", false);
            for (int i = 0; i < vs.size(); i++) {
                String p = path + ".variations[" + i + "]";
                VariationSpec v = variation(vs.get(i), p, regionNames, tidy);
                for (String r : v.regions() == null ? List.<String>of() : v.regions()) {
                    if (regions != null && !regions.contains(r)) {
                        fail(p + ".regions", "\"" + r + "\" is not among the sample's regions");
                    }
                }
                for (VariationSpec other : variations) {
                    if (other.parameter().equals(v.parameter())) fail(p + ".parameter", "\"" + v.parameter() + "\" appears twice in this sample");
                }
                variations.add(v);
            }
        }
        return new SampleSpec(name, events, weight, factors, mcStat, regions, variations, path);
    }

    private VariationSpec variation(JsonNode n, String path, Set<String> regionNames, TidyChoice defaults) {
        object(n, path, "parameter", "weights", "events", "observable", "norm", "regions", "tidy");
        String parameter = name(n, "parameter", path + ".parameter");
        List<String> sources = new ArrayList<>();
        for (String k : new String[] {"weights", "events", "observable", "norm"}) if (n.has(k)) sources.add(k);
        if (sources.size() != 1) {
            fail(path, sources.isEmpty() ? "needs one of weights, events, observable, norm"
                    : "has " + String.join(" and ", sources) + "; exactly one of weights, events, observable, norm");
        }
        String key = sources.get(0);
        List<String> regions = regionList(n, path, regionNames);
        TidyChoice tidy = n.has("tidy") ? tidy(n.get("tidy"), path + ".tidy", defaults) : defaults;
        JsonNode side = n.get(key);
        String p = path + "." + key;
        object(side, p, "up", "down");
        if (key.equals("norm")) {
            double up = positive(side, "up", p), down = positive(side, "down", p);
            return new VariationSpec(parameter, Source.NORM, null, null, null, null, up, down, regions, tidy, path);
        }
        if (!side.has("up") && !side.has("down")) fail(p, "needs up, down or both");
        if (key.equals("events")) {
            Events up = side.has("up") ? events(side.get("up"), p + ".up") : null;
            Events down = side.has("down") ? events(side.get("down"), p + ".down") : null;
            return new VariationSpec(parameter, Source.EVENTS, null, null, up, down, 1, 1, regions, tidy, path);
        }
        Expr up = side.has("up") ? expr(side, "up", p + ".up") : null;
        Expr down = side.has("down") ? expr(side, "down", p + ".down") : null;
        return new VariationSpec(parameter, key.equals("weights") ? Source.WEIGHTS : Source.OBSERVABLE, up, down,
                null, null, 1, 1, regions, tidy, path);
    }

    private TidyChoice tidy(JsonNode n, String path, TidyChoice d) {
        object(n, path, "smooth", "symmetrise", "splitNorm", "pruneNorm", "pruneShape");
        String sym = d.symmetrise();
        if (n.has("symmetrise")) {
            sym = n.get("symmetrise").isNull() ? null : text(n, "symmetrise", path + ".symmetrise", true);
            if (sym != null && !sym.equals("larger") && !sym.equals("mean")) {
                fail(path + ".symmetrise", "\"" + sym + "\", expected \"larger\" or \"mean\"");
            }
        }
        double pruneNorm = n.has("pruneNorm") ? nonNegative(n.get("pruneNorm"), path + ".pruneNorm") : d.pruneNorm();
        double pruneShape = n.has("pruneShape") ? nonNegative(n.get("pruneShape"), path + ".pruneShape") : d.pruneShape();
        return new TidyChoice(bool(n, "smooth", path + ".smooth", d.smooth()), sym,
                bool(n, "splitNorm", path + ".splitNorm", d.splitNorm()), pruneNorm, pruneShape);
    }

    private List<String> regionList(JsonNode n, String path, Set<String> regionNames) {
        if (!n.has("regions")) return null;
        List<String> list = names(n.get("regions"), path + ".regions");
        for (int i = 0; i < list.size(); i++) {
            if (!regionNames.contains(list.get(i))) fail(path + ".regions[" + i + "]", "\"" + list.get(i) + "\" is not a region");
        }
        return list;
    }

    private Events events(JsonNode n, String path) {
        JsonNode a = array(n, path, true);
        List<String> paths = new ArrayList<>();
        Path dir = file.toAbsolutePath().getParent();
        for (int i = 0; i < a.size(); i++) {
            JsonNode e = a.get(i);
            if (!e.isTextual() || e.asText().isBlank()) fail(path + "[" + i + "]", "expected a file name or glob");
            Path p = Path.of(e.asText());
            paths.add(p.isAbsolute() ? p.toString() : dir.resolve(p).normalize().toString());
        }
        return new Events(List.copyOf(paths), path);
    }

    private Outside outside(JsonNode n, String path, Outside d) {
        String key = path.contains(".") ? path.substring(path.lastIndexOf('.') + 1) : path;
        if (!n.has(key)) return d;
        String v = text(n, key, path, true);
        return switch (v) {
            case "drop" -> Outside.DROP;
            case "fold" -> Outside.FOLD;
            default -> throw error(path, "\"" + v + "\", expected \"drop\" or \"fold\"");
        };
    }

    private Map<String, Object> labels(JsonNode n) {
        Map<String, Object> labels = new LinkedHashMap<>();
        if (n == null) return labels;
        if (!n.isObject()) fail("labels", "expected an object");
        for (Map.Entry<String, JsonNode> e : n.properties()) {
            if (e.getValue().isNumber()) labels.put(e.getKey(), e.getValue().asDouble());
            else if (e.getValue().isTextual()) labels.put(e.getKey(), e.getValue().asText());
            else fail("labels." + e.getKey(), "expected a number or a string");
        }
        return labels;
    }

    // ---- small typed readers, each failing with the path

    private void object(JsonNode n, String path, String... known) {
        if (n == null || !n.isObject()) fail(path, "expected an object");
        Set<String> keys = Set.of(known);
        for (Iterator<String> it = n.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!keys.contains(k)) {
                fail(path.equals("(top level)") ? k : path + "." + k, "unknown key (known keys here: " + String.join(", ", known) + ")");
            }
        }
    }

    private JsonNode array(JsonNode n, String path, boolean nonEmpty) {
        if (n == null) fail(path, "required key is missing");
        if (!n.isArray()) fail(path, "expected an array");
        if (nonEmpty && n.isEmpty()) fail(path, "is empty");
        return n;
    }

    private String text(JsonNode parent, String key, String path, boolean required) {
        JsonNode n = parent.get(key);
        if (n == null) {
            if (required) fail(path, "required key is missing");
            return null;
        }
        if (!n.isTextual()) fail(path, "expected a string");
        return n.asText();
    }

    private String name(JsonNode parent, String key, String path) {
        String s = text(parent, key, path, true);
        if (!NAME.matcher(s).matches()) fail(path, "\"" + s + "\" is not a name (letters, digits and _.:+- only)");
        return s;
    }

    private List<String> names(JsonNode n, String path) {
        List<String> out = new ArrayList<>();
        if (n == null) return out;
        JsonNode a = array(n, path, false);
        for (int i = 0; i < a.size(); i++) {
            if (!a.get(i).isTextual() || !NAME.matcher(a.get(i).asText()).matches()) fail(path + "[" + i + "]", "expected a name");
            out.add(a.get(i).asText());
        }
        return out;
    }

    private Expr expr(JsonNode parent, String key, String path) {
        String s = text(parent, key, path, true);
        if (s.isBlank()) fail(path, "the expression is empty");
        return new Expr(s, path);
    }

    private boolean bool(JsonNode parent, String key, String path, boolean d) {
        JsonNode n = parent.get(key);
        if (n == null) return d;
        if (!n.isBoolean()) fail(path, "expected true or false");
        return n.asBoolean();
    }

    private double number(JsonNode n, String path) {
        if (n == null || !n.isNumber()) fail(path, "expected a number");
        double v = n.asDouble();
        if (!Double.isFinite(v)) fail(path, "expected a finite number");
        return v;
    }

    private double nonNegative(JsonNode n, String path) {
        double v = number(n, path);
        if (v < 0) fail(path, v + ", expected at least 0");
        return v;
    }

    private double positive(JsonNode parent, String key, String path) {
        if (!parent.has(key)) fail(path + "." + key, "required key is missing");
        double v = number(parent.get(key), path + "." + key);
        if (!(v > 0)) fail(path + "." + key, v + ", expected κ > 0");
        return v;
    }

    private void fail(String path, String what) {
        throw error(path, what);
    }

    private InputException error(String path, String what) {
        return new InputException(file + ": " + path + ": " + what);
    }
}
