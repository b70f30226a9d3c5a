package plumb.cli;

import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.DataRequest;
import plumb.engine.inference.FitSettings;
import plumb.engine.likelihood.DataSet;

import java.nio.file.Path;

/**
 * The data sets of the POI tests (limit, discovery) resolved from the shared options by the
 * engine ({@link DataRequest#forPoiTest}), with the held parameters and settings.
 */
record PoiData(DataRequest.PoiTestData sets, int[] held, double[] heldValues, FitSettings settings) {

    /**
     * @param expectedPoi POI of the Asimov set of the expected result (0 for limits, 1 for discovery)
     * @param defaultAsimovPoi POI of --data asimov when --asimov-poi is not given
     */
    static PoiData resolve(Path file, CompiledModel m, FitOptions o, double expectedPoi, double defaultAsimovPoi) {
        if (m.poi() < 0) throw new InputException(file + ": the model names no parameter of interest (poi)");
        var held = o.heldByName(m);
        FitSettings settings = o.settings();
        try {
            DataRequest.PoiTestData d = o.dataRequest().forPoiTest(m, held, settings, expectedPoi, defaultAsimovPoi);
            return new PoiData(d, d.problem().heldIndices(), d.problem().heldValues(), settings);
        } catch (DataRequest.Refused e) {
            throw o.refused(e, file);
        }
    }

    /** The data of the observed result, or null when blinded. */
    DataSet data() {
        return sets.data();
    }

    String kind() {
        return sets.kind();
    }

    DataSet expected() {
        return sets.expected();
    }

    double expectedPoi() {
        return sets.expectedPoi();
    }

    DataSet generation() {
        return sets.generation();
    }

    Double asimovPoi() {
        return sets.asimovPoi();
    }

    boolean blinded() {
        return sets.blinded();
    }
}
