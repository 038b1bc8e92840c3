package org.loopstand.controller.cli;

import java.io.PrintStream;
import java.util.Locale;
import org.loopstand.controller.pulsetest.PulseTestProgress;

/**
 * Prints a running pulse test's progress in the terminal: a line whenever the step changes and every
 * {@link #EVERY_S} seconds of test time in between (step, elapsed time, unit output against its reference
 * and against what the pulses sent so far ask for).
 */
final class ProgressPrinter {
    /** Longest quiet stretch between two progress lines, s of test time. */
    static final double EVERY_S = 10;

    private final PrintStream out;
    private String lastStep = "";
    private double lastPrintedS = Double.NEGATIVE_INFINITY;

    ProgressPrinter(PrintStream out) {
        this.out = out;
    }

    /** @param p the latest snapshot, or null (nothing yet) */
    void show(PulseTestProgress p) {
        if (p == null || (p.step().equals(lastStep) && p.elapsedS() - lastPrintedS < EVERY_S)) {
            return;
        }
        lastStep = p.step();
        lastPrintedS = p.elapsedS();
        out.println(line(p));
    }

    static String line(PulseTestProgress p) {
        String step = p.stepNumber() == 0 ? p.step()
                : String.format(Locale.ROOT, "step %d/%d %s", p.stepNumber(), p.stepCount(), p.step());
        StringBuilder b = new StringBuilder(String.format(Locale.ROOT, "[%7.1f s] %s", p.elapsedS(), step));
        if (Double.isFinite(p.outputMw())) {
            b.append(String.format(Locale.ROOT, " | output %.2f MW", p.outputMw()));
            if (Double.isFinite(p.ownMw()) && Math.abs(p.ownMw() - p.outputMw()) >= 0.005) {
                b.append(String.format(Locale.ROOT, " (own %.2f MW without the governor's answer)", p.ownMw()));
            }
            b.append(String.format(Locale.ROOT, " | reference %.2f MW", p.referenceMw()));
        }
        if (Double.isFinite(p.requestedMw())) {
            b.append(String.format(Locale.ROOT, " | requested %.2f MW", p.requestedMw()));
        }
        return b.toString();
    }
}
