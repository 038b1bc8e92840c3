package org.loopstand.plant.meter;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.Validity;

/**
 * Scans one area meter on its own fixed-rate period: reads frequency and the area's tie flows from
 * the simulator, adds seeded Gaussian noise, rounds to the transducer's resolution and sets quality.
 * Net interchange is the sum of the measured tie flows (+ = export), so it agrees with them. A scan
 * that falls due while the loop was stalled is skipped, not made up later.
 */
public final class AreaMeterPublisher {
    /** Frequency range the wire contract allows, Hz. */
    public static final double MIN_HZ = 40;
    public static final double MAX_HZ = 70;

    private final MeterSettings settings;
    private final SplittableRandom random;
    private final int area;
    private final int[] ties;
    private final String[] tieIds;
    private final double[] exportSign;
    private final long periodNanos;
    private long nextDueNanos;
    private long seq;

    /**
     * @param seed       noise seed (each meter should get its own)
     * @param startNanos clock reading of the first scan, ns
     * @param seqStart   first seq published
     */
    public AreaMeterPublisher(MeterSettings settings, Grid grid, long seed, long startNanos, long seqStart) {
        this.settings = settings;
        this.random = new SplittableRandom(seed);
        this.area = grid.areaIndex(settings.area());
        List<Integer> idx = new ArrayList<>();
        List<TieLine> all = grid.ties();
        for (int t = 0; t < all.size(); t++) {
            if (all.get(t).fromArea().equals(settings.area()) || all.get(t).toArea().equals(settings.area())) {
                idx.add(t);
            }
        }
        ties = idx.stream().mapToInt(Integer::intValue).toArray();
        tieIds = new String[ties.length];
        exportSign = new double[ties.length];
        for (int i = 0; i < ties.length; i++) {
            TieLine tie = all.get(ties[i]);
            tieIds[i] = tie.id();
            exportSign[i] = tie.fromArea().equals(settings.area()) ? 1.0 : -1.0;
        }
        this.periodNanos = settings.scanPeriodMs() * 1_000_000L;
        this.nextDueNanos = startNanos;
        this.seq = seqStart;
    }

    public MeterSettings settings() {
        return settings;
    }

    /** @return whether a scan is due at {@code nowNanos} */
    public boolean due(long nowNanos) {
        return nowNanos >= nextDueNanos;
    }

    /** @return clock reading the next scan is due at, ns */
    public long nextDueNanos() {
        return nextDueNanos;
    }

    /**
     * Takes a scan and moves the schedule on (skipping scans missed in a stall).
     *
     * @param sourceTimeMs scenario time of the scan, epoch ms
     */
    public AreaMeter scan(GridSimulator sim, long nowNanos, long sourceTimeMs) {
        long missed = Math.max(0, (nowNanos - nextDueNanos) / periodNanos);
        nextDueNanos += (missed + 1) * periodNanos;
        double f = quantize(sim.frequencyHz(area) + settings.frequencyNoiseSigmaHz() * random.nextGaussian(),
                settings.frequencyResolutionHz());
        Quality fq = Quality.GOOD;
        if (!(f >= MIN_HZ && f <= MAX_HZ)) {
            f = Math.max(MIN_HZ, Math.min(MAX_HZ, Double.isNaN(f) ? MIN_HZ : f));
            fq = Quality.of(Validity.INVALID, QualityFlag.OUT_OF_RANGE);
        }
        List<TieFlow> flows = new ArrayList<>(ties.length);
        double net = 0;
        for (int i = 0; i < ties.length; i++) {
            double mw = quantize(exportSign[i] * sim.tieFlowMw(ties[i]) + settings.flowNoiseSigmaMw() * random.nextGaussian(),
                    settings.flowResolutionMw());
            flows.add(new TieFlow(tieIds[i], mw, Quality.GOOD));
            net += mw;
        }
        return new AreaMeter(seq++, sourceTimeMs, settings.area(), settings.meter(), f, fq, flows,
                quantize(net, settings.flowResolutionMw()), Quality.GOOD);
    }

    static double quantize(double v, double resolution) {
        return resolution > 0 ? Math.round(v / resolution) * resolution : v;
    }
}
