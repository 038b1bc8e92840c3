package org.loopstand.plant.grid;

/** The prime mover between the governor's valve (or gate) position and the mechanical power. */
public sealed interface Turbine permits Turbine.NonReheat, Turbine.Reheat, Turbine.Hydro {

    /** @return the shortest time constant of this turbine, s (for the step-size check). */
    double fastestTimeConstantS();

    /** Steam turbine without reheat: {@code 1/(1 + s·Tt)}. */
    record NonReheat(double turbineTimeConstantS) implements Turbine {
        @Override
        public double fastestTimeConstantS() {
            return turbineTimeConstantS;
        }
    }

    /**
     * Reheat steam turbine: steam chest {@code 1/(1 + s·Tch)} then reheater {@code 1/(1 + s·Trh)};
     * output = Fhp·chest + (1 − Fhp)·reheater.
     *
     * @param hpFraction Fhp, share of power from the high-pressure stage, in (0, 1]
     */
    record Reheat(double steamChestTimeConstantS, double reheatTimeConstantS, double hpFraction)
            implements Turbine {
        @Override
        public double fastestTimeConstantS() {
            return Math.min(steamChestTimeConstantS, reheatTimeConstantS);
        }
    }

    /**
     * Hydro turbine with an inelastic water column {@code (1 − s·Tw)/(1 + s·Tw/2)}, and a governor
     * with transient droop compensation {@code (1 + s·Tr)/(1 + s·(Rt/Rp)·Tr)} ahead of the gate.
     * Transient droop equal to the permanent droop (or a reset time of 0) means no compensation.
     *
     * @param waterStartingTimeS Tw, s, &gt; 0
     * @param transientDroopPct  Rt, percent, ≥ permanent droop
     * @param resetTimeS         Tr, s, ≥ 0
     */
    record Hydro(double waterStartingTimeS, double transientDroopPct, double resetTimeS) implements Turbine {
        @Override
        public double fastestTimeConstantS() {
            return 0.5 * waterStartingTimeS;
        }
    }
}
