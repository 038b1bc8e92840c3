package org.loopstand.plant.grid;

/**
 * A generating unit: speed governor with droop, optional dead band, valve/gate servo with position
 * and rate limits (generation rate constraint), and a turbine.
 *
 * @param ratingMw               rating the droop is expressed on, MW, &gt; 0
 * @param droopPct               permanent droop R, percent of rating per percent of frequency, &gt; 0
 * @param governorTimeConstantS  valve/gate servo time constant, s, &gt; 0
 * @param deadBandHz             governor dead band (half width), Hz, ≥ 0
 * @param minOutputMw            lowest valve position, MW, 0 ≤ min ≤ max
 * @param maxOutputMw            highest valve position, MW, ≤ rating
 * @param raiseRateMwPerMin      fastest valve opening, MW/min, &gt; 0 (infinite = no limit)
 * @param lowerRateMwPerMin      fastest valve closing, MW/min, &gt; 0 (infinite = no limit)
 * @param initialOutputMw        load reference and output at t = 0, MW, in [min, max]
 * @param online                 false: the unit produces nothing for the whole run
 * @param tripTimeConstantS      after a trip the output falls as exp(−t/this), s, &gt; 0
 * @param regulatingMinMw        lowest setpoint the controller may ask for, MW
 * @param regulatingMaxMw        highest setpoint the controller may ask for, MW
 * @param rampMwPerMin           rate at which the plant interface moves the load reference, MW/min
 * @param pulseRateMwPerMin      load-reference change per minute of raise/lower pulse, MW/min
 * @param acceptsSetpoints       true: takes setpoint commands as well as pulses
 * @param cost                   production cost curve
 */
public record GeneratingUnit(String id, String area, Turbine turbine, double ratingMw, double droopPct,
                             double governorTimeConstantS, double deadBandHz, double minOutputMw,
                             double maxOutputMw, double raiseRateMwPerMin, double lowerRateMwPerMin,
                             double initialOutputMw, boolean online, double tripTimeConstantS,
                             double regulatingMinMw, double regulatingMaxMw, double rampMwPerMin,
                             double pulseRateMwPerMin, boolean acceptsSetpoints, CostCurve cost) {

    /** @return the governor's steady-state gain (1/R)·rating/f0 in MW/Hz. */
    public double governorGainMwPerHz(double nominalFrequencyHz) {
        return ratingMw / (droopPct / 100.0) / nominalFrequencyHz;
    }
}
