package org.loopstand.controller.intake;

/**
 * One sample of one input as it arrived, filled straight from a wire record.
 *
 * @param value        measured value in the input's unit (Hz, MW)
 * @param sourceTimeMs time stamp at the source, epoch ms
 * @param receivedAtMs controller clock when the sample arrived, epoch ms
 * @param qualityGood  true when the source quality validity is {@code good} (questionable and
 *                     invalid count as not good)
 * @param seq          publisher sequence number, ≥ 0
 */
public record MeasuredValue(double value, long sourceTimeMs, long receivedAtMs, boolean qualityGood, long seq) {
    public MeasuredValue {
        if (seq < 0) {
            throw new IllegalArgumentException("seq must be >= 0, was " + seq);
        }
    }
}
