package org.loopstand.controller.pulsetest.safety;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.PrintStream;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.loopstand.controller.pulsetest.plan.PlanLimits;
import org.loopstand.controller.pulsetest.programme.PulseProgramme;
import org.loopstand.protocol.security.AuthPolicy;

/**
 * What stands between the pulse test and a real generator: the broker check with its typed
 * confirmation, and the excursion and duration caps.
 */
public final class SafetyGate {
    /** Printed before every test and carried in the report. */
    public static final List<String> CAUTIONS = List.of(
            "This test moves a generating unit. Coordinate every run with the plant's control room and the grid "
                    + "operator before it starts, and keep them informed until it ends.",
            "Follow local codes and the site's switching and testing procedures; they take precedence over "
                    + "anything this tool does or says.",
            "Type q and Enter at any time to stop the programme: nothing further is sent. A pulse already acting "
                    + "runs out on its own (at most the plan's maxPulseMs).");

    private SafetyGate() {
    }

    /**
     * A broker counts as a test broker when it was declared one ({@code --test-broker}), is in memory, or
     * its host is a loopback address (127.0.0.0/8, ::1, localhost); a comma-separated list of broker
     * nodes only when every node's host is.
     *
     * @param brokerUrl          e.g. {@code tcp://127.0.0.1:1883}, {@code mem:}
     * @param declaredTestBroker the operator said it is a test broker
     */
    public static boolean isTestBroker(String brokerUrl, boolean declaredTestBroker) {
        if (declaredTestBroker) {
            return true;
        }
        if (brokerUrl == null || brokerUrl.isBlank()) {
            return false;
        }
        if (brokerUrl.startsWith("mem:")) {
            return true;
        }
        // only literal addresses and localhost count; a comma-separated list of cluster nodes counts only
        // when every node is on loopback; no name is resolved
        return AuthPolicy.isLoopbackBroker(brokerUrl.trim());
    }

    /**
     * Decides whether the test may start against this broker. Against a broker that is not a test
     * broker the operator must have passed {@code --live-plant} and then type the unit id exactly.
     *
     * @param in  operator input (the console in production)
     * @param out where the question is printed
     * @return empty when allowed, else the refusal in plain words
     */
    public static Optional<String> admit(String brokerUrl, boolean declaredTestBroker, boolean livePlant,
            String unitId, BufferedReader in, PrintStream out) {
        return admit(brokerUrl, declaredTestBroker, livePlant, unitId, "This test will move unit " + unitId + ".",
                "unit", in, out);
    }

    /**
     * As {@link #admit(String, boolean, boolean, String, BufferedReader, PrintStream)} for any tool that
     * commands units: {@code confirmWord} must be typed exactly.
     *
     * @param whatMoves sentence saying what will be commanded
     * @param subject   what the confirmation word is the id of: "unit", "site"
     */
    public static Optional<String> admit(String brokerUrl, boolean declaredTestBroker, boolean livePlant,
            String confirmWord, String whatMoves, String subject, BufferedReader in, PrintStream out) {
        String unitId = confirmWord;
        if (isTestBroker(brokerUrl, declaredTestBroker)) {
            return Optional.empty();
        }
        if (!livePlant) {
            return Optional.of("refusing to start: broker " + brokerUrl + " is not a test broker (not loopback, "
                    + "not declared with --test-broker). To move a real unit, pass --live-plant and confirm.");
        }
        out.println("LIVE PLANT: broker " + brokerUrl + " is not a test broker. " + whatMoves);
        out.println("Type the " + subject + " id (" + unitId + ") to confirm, anything else to stop:");
        out.flush();
        String answer;
        try {
            answer = in.readLine();
        } catch (IOException e) {
            return Optional.of("refusing to start: cannot read the confirmation: " + e.getMessage());
        }
        if (answer == null || !answer.trim().equals(unitId)) {
            return Optional.of("refusing to start: confirmation '" + (answer == null ? "" : answer.trim())
                    + "' does not name " + subject + " " + unitId);
        }
        return Optional.empty();
    }

    /**
     * The caps in force: the plan's, or the operator's tighter ones. An operator's cap must be a finite
     * number in (0, plan's cap]; anything else (NaN, an infinity, zero, a negative, a value above the
     * plan's cap) is refused, never clipped or ignored.
     *
     * @param cliMaxExcursionMw  {@code --max-excursion-mw}, MW, or null when not given
     * @param cliMaxDurationS    {@code --max-duration-s}, s, or null when not given
     * @throws IllegalArgumentException naming every refused option, its value and its range
     */
    public static PlanLimits caps(PlanLimits plan, Double cliMaxExcursionMw, Double cliMaxDurationS) {
        StringBuilder problems = new StringBuilder();
        double mw = operatorCap("--max-excursion-mw", cliMaxExcursionMw, plan.maxExcursionMw(), "MW", problems);
        double s = operatorCap("--max-duration-s", cliMaxDurationS, plan.maxDurationS(), "s", problems);
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException(problems.toString());
        }
        return new PlanLimits(mw, s);
    }

    private static double operatorCap(String option, Double value, double planCap, String unit, StringBuilder problems) {
        if (value == null) {
            return planCap;
        }
        double v = value;
        if (!Double.isFinite(v) || v <= 0 || v > planCap) {
            if (!problems.isEmpty()) {
                problems.append("; ");
            }
            problems.append(String.format(Locale.ROOT, "%s must be a finite number in (0, %.2f] %s (the plan's cap; "
                    + "a tighter cap only), got %s", option, planCap, unit, value));
            return planCap;
        }
        return v;
    }

    /** @return empty when the programme keeps within the caps, else the refusal naming the figure */
    public static Optional<String> checkCaps(PulseProgramme programme, PlanLimits caps) {
        StringBuilder why = new StringBuilder();
        if (programme.maxExcursionMw() > caps.maxExcursionMw() + 1e-9) {
            why.append(String.format(Locale.ROOT, "the programme moves the unit up to %.2f MW from its start, above "
                    + "the cap of %.2f MW", programme.maxExcursionMw(), caps.maxExcursionMw()));
        }
        double durationS = programme.durationMs() / 1000.0;
        if (durationS > caps.maxDurationS()) {
            if (!why.isEmpty()) {
                why.append("; ");
            }
            why.append(String.format(Locale.ROOT, "the programme lasts %.0f s, above the cap of %.0f s", durationS,
                    caps.maxDurationS()));
        }
        return why.isEmpty() ? Optional.empty() : Optional.of("refusing to start: " + why);
    }
}
