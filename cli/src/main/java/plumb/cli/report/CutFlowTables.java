package plumb.cli.report;

import plumb.cli.build.CutFlowRow;
import plumb.cli.table.Table;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;

/**
 * A build's cut flow as the report shows it: one table per region, a row per selection step (and
 * the final {@value CutFlowRow#IN_THE_BINS} row), and for each sample its weighted sum Σw and its
 * number of events left after that step. A sample absent from a region has empty cells there.
 */
public final class CutFlowTables {

    private CutFlowTables() {
    }

    /** The tables by region name, regions and samples in the order of the rows. */
    public static Map<String, Table> byRegion(List<CutFlowRow> rows) {
        Map<String, List<CutFlowRow>> regions = new LinkedHashMap<>();
        for (CutFlowRow r : rows) regions.computeIfAbsent(r.region(), k -> new ArrayList<>()).add(r);
        Map<String, Table> out = new LinkedHashMap<>();
        for (Map.Entry<String, List<CutFlowRow>> e : regions.entrySet()) out.put(e.getKey(), table(e.getKey(), e.getValue()));
        return out;
    }

    private static Table table(String region, List<CutFlowRow> rows) {
        LinkedHashSet<String> samples = new LinkedHashSet<>();
        LinkedHashSet<String> steps = new LinkedHashSet<>();
        Map<String, CutFlowRow> cell = new LinkedHashMap<>();
        for (CutFlowRow r : rows) {
            samples.add(r.sample());
            steps.add(r.step());
            cell.put(r.sample() + '\u0000' + r.step(), r);
        }
        // the observed events have weight one: their Σw would only repeat their count
        boolean dataCounted = rows.stream().filter(r -> r.sample().equals(CutFlowRow.DATA)).allMatch(r -> r.weighted() == r.raw());
        List<String> header = new ArrayList<>();
        header.add("after step");
        for (String s : samples) {
            if (!(dataCounted && s.equals(CutFlowRow.DATA))) header.add(s + " Σw");
            header.add(s + " events");
        }
        Table.Builder t = Table.builder("Region " + region + ": events left after each step (cumulative)",
                header.toArray(String[]::new));
        for (String step : steps) {
            List<String> line = new ArrayList<>();
            line.add(step);
            for (String s : samples) {
                CutFlowRow r = cell.get(s + '\u0000' + step);
                if (!(dataCounted && s.equals(CutFlowRow.DATA))) line.add(r == null ? "" : Table.number(r.weighted(), 5));
                line.add(r == null ? "" : Long.toString(r.raw()));
            }
            t.row(line);
        }
        return t.build();
    }
}
