package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Data-set and blinding resolution: which data a fit and a POI test run on. */
class DataRequestTest {

    /** A signal region with signal s·mu on a background, and a control region of background only. */
    private static CompiledModel model(boolean blindSignalRegion, boolean blindControlRegion, boolean poi) {
        Variation norm = new Variation("bkg_norm", new Variation.NormEffect(0.9, 1.1), null, null, null);
        Sample sig = new Sample("signal", new double[] {5, 10}, null, poi ? List.of("mu") : List.of(), List.of());
        Sample bkg = new Sample("background", new double[] {50, 40}, null, List.of(), List.of(norm));
        Sample side = new Sample("background", new double[] {200}, null, List.of(), List.of(norm));
        Channel sr = new Channel("sr", "m", new double[] {0, 1, 2}, blindSignalRegion ? null : new double[] {58, 47},
                List.of(sig, bkg));
        Channel cr = new Channel("cr", "m", new double[] {0, 1}, blindControlRegion ? null : new double[] {230},
                List.of(side));
        List<ParameterSpec> params = poi ? List.of(new ParameterSpec("mu", null, new double[] {0, 5}, null, null, false))
                : List.of();
        return ModelCompiler.compile(new Model(Model.FORMAT, "req", null, poi ? "mu" : null, List.of(sr, cr), params,
                Map.of(), Map.of(), null));
    }

    private static final FitSettings SETTINGS = FitSettings.defaults();

    @Test
    void observedDataOfAFullyBlindedModelIsRefused() {
        CompiledModel m = model(true, true, true);
        DataRequest.Refused e = assertThrows(DataRequest.Refused.class,
                () -> DataRequest.observed().forFit(m, Map.of(), SETTINGS, 1));
        assertEquals(DataRequest.Reason.ALL_BLINDED, e.reason());
        // The Asimov data set needs no observed data: nuisances at their nominal values then.
        DataRequest.FitData d = new DataRequest(true, 2.0, true).forFit(m, Map.of(), SETTINGS, 1);
        assertEquals("asimov", d.kind());
        assertNull(d.asimovConditionalFit());
        assertEquals(2.0, d.asimovPoi());
        // Expected counts at mu = 2, background nominal: 2·5 + 50, 2·10 + 40, 200.
        assertArrayEquals(new double[] {60, 60, 200}, d.problem().data().counts(), 1e-9);
    }

    @Test
    void aPartlyBlindedModelFitsItsOpenChannelsAndHasNoObservedPoiTest() {
        CompiledModel m = model(true, false, true);
        DataRequest.FitData fit = DataRequest.observed().forFit(m, Map.of("bkg_norm", 0.5), SETTINGS, 1);
        assertEquals("observed", fit.kind());
        assertArrayEquals(new boolean[] {false, true}, fit.problem().data().channelIncluded());
        assertEquals(Map.of("bkg_norm", 0.5), fit.problem().held());

        DataRequest.PoiTestData test = DataRequest.observed().forPoiTest(m, Map.of(), SETTINGS, 0, 0);
        assertTrue(test.blinded());
        assertEquals("asimov", test.kind());
        // The toys' nuisances come from the open control region.
        assertArrayEquals(new boolean[] {false, true}, test.generation().channelIncluded());
        // Expected: Asimov at mu = 0 with bkg_norm from the control region's fit: its excess (230
        // against 200, a 15 % effect against a 10 % constraint) pulls the background up, not all the way.
        double b = test.expected().counts()[0];
        assertTrue(b > 52 && b < 57.5, "background of the first signal-region bin " + b);
    }

    @Test
    void anUnblindedModelTestsTheObservedData() {
        CompiledModel m = model(false, false, true);
        DataRequest.PoiTestData test = DataRequest.observed().forPoiTest(m, Map.of(), SETTINGS, 1, 1);
        assertFalse(test.blinded());
        assertEquals("observed", test.kind());
        assertSame(test.data(), test.generation());
        assertEquals(1, test.expectedPoi());
        assertEquals(DataSets.asimovAt(m, 1, new int[0], new double[0], true, SETTINGS).data().counts()[1],
                test.expected().counts()[1], 0);
    }

    @Test
    void anAsimovRequestAtTheExpectedPoiUsesOneDataSet() {
        CompiledModel m = model(false, false, true);
        DataRequest.PoiTestData same = new DataRequest(true, null, true).forPoiTest(m, Map.of(), SETTINGS, 0, 0);
        assertSame(same.expected(), same.data());
        assertEquals(0.0, same.asimovPoi());
        DataRequest.PoiTestData other = new DataRequest(true, 1.5, false).forPoiTest(m, Map.of(), SETTINGS, 0, 0);
        // Pre-fit: expected counts at mu = 1.5 and nominal background.
        assertArrayEquals(new double[] {57.5, 55, 200}, other.data().counts(), 1e-9);
    }

    @Test
    void badRequestsAreRefusedWithTheirReason() {
        CompiledModel noPoi = model(false, false, false);
        assertEquals(DataRequest.Reason.NO_POI, assertThrows(DataRequest.Refused.class,
                () -> new DataRequest(true, null, true).forFit(noPoi, Map.of(), SETTINGS, 1)).reason());
        assertEquals(DataRequest.Reason.NO_POI, assertThrows(DataRequest.Refused.class,
                () -> DataRequest.observed().forPoiTest(noPoi, Map.of(), SETTINGS, 0, 0)).reason());
        CompiledModel m = model(false, false, true);
        DataRequest.Refused range = assertThrows(DataRequest.Refused.class,
                () -> new DataRequest(true, 7.0, true).forFit(m, Map.of(), SETTINGS, 1));
        assertEquals(DataRequest.Reason.POI_OUT_OF_RANGE, range.reason());
        assertEquals(7.0, range.value());
        assertTrue(range.getMessage().endsWith("[0.0, 5.0]"), range.getMessage());
        assertEquals(DataRequest.Reason.POI_HELD, assertThrows(DataRequest.Refused.class,
                () -> DataRequest.observed().forPoiTest(m, Map.of("mu", 1.0), SETTINGS, 0, 0)).reason());
    }
}
