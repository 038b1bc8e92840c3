package org.loopstand.controller.dispatch;

/** Demand outside the sum of the unit limits. */
public final class InfeasibleDispatchException extends RuntimeException {
    private final double demandMw;
    private final double minTotalMw;
    private final double maxTotalMw;

    public InfeasibleDispatchException(double demandMw, double minTotalMw, double maxTotalMw) {
        super("demand " + demandMw + " MW cannot be served: units can give " + minTotalMw + " to " + maxTotalMw + " MW");
        this.demandMw = demandMw;
        this.minTotalMw = minTotalMw;
        this.maxTotalMw = maxTotalMw;
    }

    public double demandMw() { return demandMw; }
    public double minTotalMw() { return minTotalMw; }
    public double maxTotalMw() { return maxTotalMw; }
}
