package plumb.engine.tooling;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.List;

/**
 * The nominal, up and down templates of every variation of every sample, as the model gives them
 * at θ = +1 and θ = −1: shape yields where there is a shape part (nominal otherwise), times κ of a
 * norm part. Input of the template figures.
 */
public final class Templates {

    /** One variation of one sample. {@code edges} may be null (numbered bins). */
    public record Template(String channel, String sample, String parameter, String observable, double[] edges,
                           double[] nominal, double[] up, double[] down) { }

    private Templates() {
    }

    public static List<Template> of(Model model) {
        List<Template> out = new ArrayList<>();
        for (Channel ch : model.channels()) {
            for (Sample s : ch.samples()) {
                for (Variation v : s.variations()) {
                    double[] n = s.yields();
                    double[] up = v.shape() == null ? n.clone() : v.shape().up().clone();
                    double[] down = v.shape() == null ? n.clone() : v.shape().down().clone();
                    if (v.norm() != null) {
                        for (int b = 0; b < n.length; b++) {
                            up[b] *= v.norm().up();
                            down[b] *= v.norm().down();
                        }
                    }
                    out.add(new Template(ch.name(), s.name(), v.parameter(), ch.observable(), ch.edges(), n, up, down));
                }
            }
        }
        return out;
    }
}
