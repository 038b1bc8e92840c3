package org.loopstand.plant.scenario;

import java.util.List;
import java.util.Locale;
import java.util.stream.Collectors;

import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultType;
import org.loopstand.plant.fault.ParameterSpec;
import org.loopstand.plant.fault.TargetKind;
import org.loopstand.plant.check.CheckLibrary;
import org.loopstand.plant.check.CheckType;

/**
 * The fault and check tables of docs/faults.md, written from the libraries themselves so that the
 * documentation cannot drift from the code ({@code loopstand fault list --markdown} prints them; a test
 * holds the document to them).
 */
public final class ScenarioDocs {
    private ScenarioDocs() {
    }

    /** @return one markdown table of every fault type with its parameters */
    public static String faultTable() {
        StringBuilder b = new StringBuilder();
        b.append("| fault type | category | targets | what it does | parameters (range, default) |\n");
        b.append("|---|---|---|---|---|\n");
        for (FaultType t : FaultLibrary.standard().types()) {
            b.append("| `").append(t.name()).append("` | ").append(t.category().name().toLowerCase(Locale.ROOT)).append(" | ")
                    .append(t.targetKinds().stream().sorted().map(TargetKind::wireName).collect(Collectors.joining(", ")))
                    .append(" | ").append(t.description()).append(" | ").append(params(t.parameters())).append(" |\n");
        }
        return b.toString();
    }

    /** @return one markdown table of every check type with its parameters */
    public static String checkTable() {
        StringBuilder b = new StringBuilder();
        b.append("| check type | side | what must hold | parameters (range, default) |\n");
        b.append("|---|---|---|---|\n");
        for (CheckType t : CheckLibrary.standard().types()) {
            b.append("| `").append(t.name()).append("` | ").append(t.controllerSide() ? "controller (addition)" : "plant")
                    .append(" | ").append(t.description()).append(" | ").append(params(t.parameters())).append(" |\n");
        }
        return b.toString();
    }

    private static String params(List<ParameterSpec> ps) {
        if (ps.isEmpty()) {
            return "none";
        }
        return ps.stream().map(p -> "`" + p.name() + "` " + p.rangeText() + ", " + p.defaultText())
                .collect(Collectors.joining("; "));
    }
}
