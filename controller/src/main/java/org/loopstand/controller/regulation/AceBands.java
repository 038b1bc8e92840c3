package org.loopstand.controller.regulation;

/**
 * Band classification of the filtered ACE.
 *
 * @param quietMw  |ACE| below this is QUIET, MW ≥ 0
 * @param assistMw |ACE| above this is ASSIST, MW &gt; quietMw
 */
public record AceBands(double quietMw, double assistMw) {
    public AceBands {
        if (!(quietMw >= 0) || !Double.isFinite(quietMw)) {
            throw new IllegalArgumentException("quietMw must be >= 0, was " + quietMw);
        }
        if (!(assistMw > quietMw) || !Double.isFinite(assistMw)) {
            throw new IllegalArgumentException("assistMw must be > quietMw (" + quietMw + "), was " + assistMw);
        }
    }

    public AceBand classify(double aceMw) {
        double a = Math.abs(aceMw);
        if (a < quietMw) {
            return AceBand.QUIET;
        }
        return a > assistMw ? AceBand.ASSIST : AceBand.REGULATING;
    }
}
