package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** sensitivity, project and contour through Main.execute: exit codes, JSON keys of docs/cli-contract.md, files. */
class PlanningCommandsTest {

    @TempDir Path dir;

    @Test
    void sensitivityJsonTablesAndFigure() throws Exception {
        Path model = CommandLineTestSupport.demoModel(dir);
        Path json = dir.resolve("s.json"), figs = dir.resolve("figs");
        var r = run("sensitivity", model.toString(), "--scale", "0.5,2", "--exact-top", "1", "--json", json.toString(),
                "--figure", figs.toString(), "--format", "markdown", "--threads", "2");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("| # | parameter |"), r.out());
        JsonNode j = CommandLineTestSupport.readJson(json);
        double limit = j.get("limit").asDouble();
        assertTrue(limit > 0);
        assertEquals(2, j.get("scales").size());
        JsonNode first = j.get("parameters").get(0);
        assertEquals(1, first.get("rank").asInt());
        JsonNode removed = first.get("changes").get(0);
        assertEquals("removed", removed.get("change").asText());
        assertTrue(removed.get("limit").asDouble() < limit, "removing the top uncertainty lowers the limit");
        assertTrue(removed.get("exact").get("limit").asDouble() < limit);
        // width × 2 makes things worse
        assertTrue(first.get("changes").get(2).get("limit").asDouble() > limit);
        assertTrue(j.get("parameters").get(1).get("changes").get(0).get("exact").isNull());
        assertTrue(Files.size(figs.resolve("sensitivity.png")) > 1000);
        assertTrue(Files.size(figs.resolve("sensitivity.svg")) > 1000);
    }

    @Test
    void projectJsonAndTable() throws Exception {
        Path model = CommandLineTestSupport.demoModel(dir);
        var r = run("project", model.toString(), "--lumi", "1,4", "--json", "-", "--threads", "2");
        assertEquals(0, r.status(), r.err());
        JsonNode j = r.json();
        JsonNode stat = j.get("scenarios").get("statOnly").get("points");
        JsonNode sys = j.get("scenarios").get("systematics").get("points");
        assertEquals(2, stat.size());
        double zs1 = stat.get(0).get("z").asDouble(), zs4 = stat.get(1).get("z").asDouble();
        assertEquals(2, zs4 / zs1, 0.1, "statistics only: about sqrt(4)");
        assertTrue(sys.get(1).get("z").asDouble() / sys.get(0).get("z").asDouble() < zs4 / zs1);
        assertEquals(5, sys.get(0).get("bands").size());
        var bad = run("project", model.toString(), "--lumi", "1,-2");
        assertEquals(2, bad.status());
        assertTrue(bad.err().contains("--lumi"), bad.err());
    }

    @Test
    void contourJsonAndBadNames() throws Exception {
        Path model = CommandLineTestSupport.demoModel(dir);
        var r = run("contour", model.toString(), "--x", "mu", "--y", "r_dijet", "--rays", "16", "--json", "-",
                "--threads", "2");
        assertEquals(0, r.status(), r.err());
        JsonNode j = r.json();
        assertEquals(2, j.get("regions").size());
        assertEquals(2.2958, j.get("regions").get(0).get("level").asDouble(), 1e-3);
        assertEquals(16, j.get("regions").get(1).get("x").size());
        assertFalse(j.get("best").get("x").isNull());
        var bad = run("contour", model.toString(), "--x", "mu", "--y", "nothing");
        assertEquals(2, bad.status());
        assertTrue(bad.err().contains("nothing"), bad.err());
    }
}
