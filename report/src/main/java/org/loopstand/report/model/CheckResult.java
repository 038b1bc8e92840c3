package org.loopstand.report.model;

import java.util.Objects;

/**
 * One scenario check as judged.
 *
 * @param name           what was checked, e.g. {@code ACE recovered within 15 min}
 * @param passed         the verdict
 * @param decidingFigure the figure that decided it, with unit, e.g. {@code 540 s}
 * @param limit          the limit it was held to, with unit, e.g. {@code ≤ 900 s}
 * @param source         where the limit comes from, e.g. {@code NERC BAL-002 (from memory)}; may be empty
 */
public record CheckResult(String name, boolean passed, String decidingFigure, String limit, String source) {
    public CheckResult {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(decidingFigure, "decidingFigure");
        Objects.requireNonNull(limit, "limit");
        source = source == null ? "" : source;
    }
}
