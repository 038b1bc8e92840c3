package org.loopstand.plant.grid;

/**
 * One thing wrong with a network description.
 *
 * @param subject what it is about, e.g. {@code area westmark} or {@code unit g1}
 * @param field   the offending quantity, e.g. {@code inertiaS}; empty when about the whole subject
 * @param message what is wrong and what would be accepted
 */
public record GridProblem(String subject, String field, String message) {
    @Override
    public String toString() {
        return subject + (field.isEmpty() ? "" : " " + field) + ": " + message;
    }
}
