package org.loopstand.plant.runtime;

/**
 * What the plant loop tells about each physics step's unit pass (the slice of unit interfaces that
 * runs after the step, publishing the telemetry then due), so that a publisher can spread that
 * telemetry over the step ({@link PublisherThread} with {@link TelemetryPacing#SPREAD}). Loop thread
 * only; both calls must be cheap.
 */
public interface StepPassMarks {
    /** No marks: every publish leaves as it comes. */
    StepPassMarks NONE = new StepPassMarks() {
        @Override
        public void stepPassBegins() {
        }

        @Override
        public void stepPassEnds(long wallPeriodNanos) {
        }
    };

    /** The unit pass of a step begins. */
    void stepPassBegins();

    /** @param wallPeriodNanos the step's period in wall time, ns (the physics step over the run's rate) */
    void stepPassEnds(long wallPeriodNanos);
}
