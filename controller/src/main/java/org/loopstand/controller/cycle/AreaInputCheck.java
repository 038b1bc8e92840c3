package org.loopstand.controller.cycle;

import org.loopstand.controller.intake.AreaCycleInputs;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;
import org.loopstand.controller.ace.AceResult;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.controller.intake.ValidationReason;
import org.loopstand.controller.safety.UsableValue;

/**
 * Judges one area's inputs for the interlock and computes its ACE only from usable values. Each
 * unusable input adds its reason code with the figures behind it (validation reasons and age):
 * {@code frequencyUnusable:{area}} with {@code frequency:{area} frozen ageMs=1200},
 * {@code tieFlowUnusable:{area}:{tie}}, {@code scheduleMissing:{area}},
 * {@code aceBeyondSanityLimit:{area}} with {@code aceMw=… limitMw=…}.
 */
final class AreaInputCheck {
    private AreaInputCheck() {
    }

    /** @return ACE, or null when one of its inputs is unusable (the reasons are in {@code c}) */
    static AceResult ace(AreaController area, AreaCycleInputs a, AreaInterlocks.Conditions c) {
        String id = area.areaId();
        Optional<UsableValue> f = UsableValue.from(a.frequencyHz());
        if (f.isEmpty()) {
            c.area(id, "frequencyUnusable:" + id, figures("frequency:" + id, a.frequencyHz()));
        }
        List<UsableValue> ties = new ArrayList<>();
        boolean tiesOk = true;
        for (Map.Entry<String, ValidatedValue> t : new TreeMap<>(a.tieFlowsMw()).entrySet()) {
            Optional<UsableValue> v = UsableValue.from(t.getValue());
            if (v.isPresent()) {
                c.tieEnd(id, t.getKey());
                ties.add(v.get());
            } else {
                c.tieUnusable(id, t.getKey(), figures("tieFlow:" + id + ":" + t.getKey(), t.getValue()));
                tiesOk = false;
            }
        }
        if (a.schedule() == null) {
            c.area(id, "scheduleMissing:" + id, "no schedule received and none from the site file");
        }
        if (f.isEmpty() || !tiesOk || a.schedule() == null) {
            return null;
        }
        return area.computeAce(f.get(), ties, a.schedule(), a.timeErrorS(), a.inadvertentAccumMwh());
    }

    /** Reason {@code aceBeyondSanityLimit:{area}} when |ACE| exceeds the limit; NaN counts as beyond. */
    static void sanity(String areaId, double aceMw, double limitMw, AreaInterlocks.Conditions c) {
        if (!(Math.abs(aceMw) <= limitMw)) {
            c.area(areaId, "aceBeyondSanityLimit:" + areaId,
                    String.format(Locale.ROOT, "ace:%s aceMw=%.1f limitMw=%.0f", areaId, aceMw, limitMw));
        }
    }

    /** @return e.g. {@code frequency:north stale,holdExpired ageMs=12000} */
    static String figures(String input, ValidatedValue v) {
        if (v == null) {
            return input + " missing";
        }
        List<String> codes = new ArrayList<>();
        for (ValidationReason r : v.reasons()) {
            codes.add(r.code());
        }
        String age = v.ageMs() == Long.MAX_VALUE ? "none" : Long.toString(v.ageMs());
        return input + " " + (codes.isEmpty() ? "unusable" : String.join(",", codes)) + " ageMs=" + age;
    }
}
