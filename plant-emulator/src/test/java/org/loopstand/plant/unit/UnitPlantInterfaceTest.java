package org.loopstand.plant.unit;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.time.VirtualClock;

class UnitPlantInterfaceTest {
    private static final long T0 = 1_700_000_000_000L;
    private static final String CTRL = "controller-1";

    private final VirtualClock clock = new VirtualClock(T0);
    private final FakeField field = new FakeField(700, clock::epochMillis);
    private final RecordingOutput out = new RecordingOutput();
    private final PlantJournal journal = new PlantJournal();
    private long seq = 1;

    /** Demo-site basin-steam-1 figures: regulating 500..870 MW, ramp 20 MW/min, pulse rate 18 MW/min. */
    private UnitSettings settings(boolean acceptsSetpoints, WatchdogAction action) {
        return new UnitSettings("basin-steam-1", 500, 870, 20, 18, acceptsSetpoints, 10_000, 2_000, 30,
                action, 650, Set.of(CTRL));
    }

    private UnitPlantInterface unit(UnitSettings s) {
        return new UnitPlantInterface(s, field, clock, out, journal, 0);
    }

    private UnitPlantInterface unit() {
        return unit(settings(true, WatchdogAction.HOLD));
    }

    private UnitCommand pulse(PulseDirection d, long ms) {
        long now = clock.epochMillis();
        return UnitCommand.pulse(seq++, now, "basin-steam-1", CTRL, 0, now + 8_000, d, ms);
    }

    private UnitCommand setpoint(double mw) {
        long now = clock.epochMillis();
        return UnitCommand.setpoint(seq++, now, "basin-steam-1", CTRL, 0, now + 8_000, mw);
    }

    /** Runs the interface for {@code s} seconds in 20 ms ticks, letting the fake turbine follow. */
    private void run(UnitPlantInterface u, double s) {
        long ticks = Math.round(s / 0.02);
        for (long i = 0; i < ticks; i++) {
            clock.advanceMillis(20);
            u.tick();
            field.settle(0.02);
        }
    }

    private void receive(UnitPlantInterface u, UnitCommand c) {
        u.onCommand(c, clock.monotonicNanos());
    }

    @Test
    void shouldMoveReferenceByPulseRateTimesDurationSpreadOverThePulse() {
        UnitPlantInterface u = unit();
        u.tick();
        receive(u, pulse(PulseDirection.RAISE, 2_000));
        assertThat(out.lastAck().outcome()).isEqualTo(AckOutcome.ACCEPTED);
        run(u, 1.0);
        // 18 MW/min × 1 s = 0.3 MW after half the pulse
        assertThat(field.referenceMw).isCloseTo(700.3, within(1e-9));
        run(u, 2.0);
        // 18 MW/min × 2 s / 60 s = 0.6 MW in all
        assertThat(field.referenceMw).isCloseTo(700.6, within(1e-9));
        receive(u, pulse(PulseDirection.LOWER, 4_000));
        run(u, 5.0);
        assertThat(field.referenceMw).isCloseTo(700.6 - 1.2, within(1e-9));
    }

    @Test
    void shouldMoveToSetpointAtRampRate() {
        UnitPlantInterface u = unit();
        receive(u, setpoint(710));
        run(u, 15.0);
        // 20 MW/min for 15 s = 5 MW
        assertThat(field.referenceMw).isCloseTo(705, within(1e-9));
        run(u, 20.0);
        assertThat(field.referenceMw).isCloseTo(710, within(1e-9));
    }

    @Test
    void shouldHoldSetpointInsideRegulatingRangeAndSayItWasClamped() {
        UnitPlantInterface u = unit();
        receive(u, setpoint(900));
        assertThat(out.lastAck().outcome()).isEqualTo(AckOutcome.ACCEPTED);
        assertThat(out.lastAck().detail()).startsWith("atLimit");
        assertThat(u.targetMw()).isEqualTo(870);
    }

    @Test
    void shouldRefuseEveryFaultyCommandWithItsReasonAndNotMoveTheReference() {
        UnitPlantInterface u = unit(settings(false, WatchdogAction.HOLD));
        u.tick();
        long now = clock.epochMillis();
        receive(u, pulse(PulseDirection.RAISE, 1_000)); // accepted, seq 1, epoch 0
        run(u, 2);
        double ref = field.referenceMw;
        int writes = field.writes;

        record Case(UnitCommand command, RefusalReason reason) {
        }
        now = clock.epochMillis();
        List<Case> cases = List.of(
                new Case(UnitCommand.pulse(seq++, now - 10_000, "basin-steam-1", CTRL, 0, now - 1, PulseDirection.RAISE, 1_000), RefusalReason.EXPIRED),
                new Case(UnitCommand.pulse(seq - 1, now, "basin-steam-1", CTRL, 0, now + 8_000, PulseDirection.RAISE, 1_000), RefusalReason.DUPLICATE),
                new Case(UnitCommand.pulse(1, now, "basin-steam-1", CTRL, 0, now + 8_000, PulseDirection.RAISE, 1_000), RefusalReason.OUT_OF_ORDER),
                new Case(UnitCommand.pulse(seq++, now, "basin-steam-1", "intruder", 0, now + 8_000, PulseDirection.RAISE, 1_000), RefusalReason.WRONG_CONTROLLER),
                new Case(UnitCommand.pulse(seq++, now, "basin-steam-1", CTRL, 0, now + 8_000, PulseDirection.RAISE, 10_001), RefusalReason.PULSE_TOO_LONG),
                new Case(UnitCommand.setpoint(seq++, now, "basin-steam-1", CTRL, 0, now + 8_000, 720), RefusalReason.MALFORMED),
                new Case(UnitCommand.pulse(seq++, now, "basin-gas-1", CTRL, 0, now + 8_000, PulseDirection.RAISE, 1_000), RefusalReason.MALFORMED));
        for (Case c : cases) {
            receive(u, c.command());
            assertThat(out.lastAck().outcome()).as(c.reason().wireName()).isEqualTo(AckOutcome.REJECTED);
            assertThat(out.lastAck().reason()).isEqualTo(c.reason());
            assertThat(out.lastAck().commandSeq()).isEqualTo(c.command().seq());
            assertThat(out.lastAck().detail()).isNotBlank();
        }
        run(u, 2);
        assertThat(field.referenceMw).isEqualTo(ref);
        assertThat(field.writes).isEqualTo(writes);
        assertThat(u.refusalCount(RefusalReason.MALFORMED)).isEqualTo(2);
        assertThat(u.refusalCount(RefusalReason.EXPIRED)).isEqualTo(1);
        assertThat(journal.entries()).filteredOn(e -> e.kind().equals("refused")).hasSize(cases.size());
    }

    @Test
    void shouldSayWhatTheTimeBaseIsWhenACommandIsStampedWithTheWallClockInAnAcceleratedRun() {
        UnitPlantInterface u = unit();
        u.tick();
        // at rate 10 an hour of wall time is ten of scenario time: a wall-clock stamp lies far in the past
        long wallMs = clock.epochMillis() - 9 * 3_600_000L;
        receive(u, UnitCommand.pulse(seq++, wallMs, "basin-steam-1", CTRL, 0, wallMs + 8_000, PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.EXPIRED);
        assertThat(out.lastAck().detail()).isEqualTo("validUntil " + (wallMs + 8_000) + " passed " + (9 * 3_600_000L - 8_000)
                + " ms ago; every time on the bus is scenario epoch ms (the clock topic's sourceTime), not the wall clock");
        // a command that only just expired gets the plain sentence
        long now = clock.epochMillis();
        receive(u, UnitCommand.pulse(seq++, now - 5_000, "basin-steam-1", CTRL, 0, now - 500, PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().detail()).isEqualTo("validUntil " + (now - 500) + " passed 500 ms ago");
    }

    @Test
    void shouldNumberTelemetryAndAcksEachInTheirOwnSeriesSoAcksLeaveNoTelemetryGap() {
        UnitPlantInterface u = unit();
        u.tick();
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        receive(u, pulse(PulseDirection.LOWER, 1_000));
        run(u, 4.0);
        List<Long> telemetrySeqs = out.telemetry.stream().map(t -> t.seq()).toList();
        for (int i = 1; i < telemetrySeqs.size(); i++) {
            assertThat(telemetrySeqs.get(i)).isEqualTo(telemetrySeqs.get(i - 1) + 1);
        }
        assertThat(telemetrySeqs).hasSizeGreaterThanOrEqualTo(3);
        assertThat(out.acks.stream().map(a -> a.seq()).toList()).containsExactly(0L, 1L);
    }

    @Test
    void shouldRefuseOlderEpochOnceANewerOneWasSeen() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(3, ControllerState.REGULATING));
        long now = clock.epochMillis();
        receive(u, UnitCommand.pulse(seq++, now, "basin-steam-1", CTRL, 2, now + 8_000, PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.WRONG_EPOCH);
        // a newer epoch restarts the seq history: a low seq is fine
        receive(u, UnitCommand.pulse(0, now, "basin-steam-1", CTRL, 4, now + 8_000, PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().outcome()).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldRefuseInLocalOffAndWhenTripped() {
        UnitPlantInterface u = unit();
        u.setControlMode(ControlMode.LOCAL, "operator");
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.NOT_IN_REMOTE);
        u.setControlMode(ControlMode.OFF, "operator");
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.NOT_IN_REMOTE);
        u.setControlMode(ControlMode.REMOTE, "operator");
        field.status = UnitStatus.TRIPPED;
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.UNIT_OFFLINE);
        run(u, 2);
        assertThat(field.writes).isZero();
    }

    @Test
    void shouldRefusePulseAtLimitAndClampOneThatCrossesIt() {
        field.referenceMw = 869.9;
        UnitPlantInterface u = unit();
        receive(u, pulse(PulseDirection.RAISE, 1_000)); // 0.3 MW asked, 0.1 MW left
        assertThat(out.lastAck().outcome()).isEqualTo(AckOutcome.ACCEPTED);
        assertThat(out.lastAck().detail()).startsWith("atLimit");
        run(u, 2);
        assertThat(field.referenceMw).isCloseTo(870, within(1e-9));
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.AT_LIMIT);
        receive(u, pulse(PulseDirection.LOWER, 1_000));
        assertThat(out.lastAck().outcome()).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldLeaveRemoteWhenHeartbeatStopsAndReturnOnlyByOrder() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(0, ControllerState.REGULATING));
        receive(u, pulse(PulseDirection.RAISE, 10_000)); // 3 MW over 10 s
        run(u, 5);
        assertThat(u.controlMode()).isEqualTo(ControlMode.REMOTE);
        run(u, 26); // 31 s since the last status > 30 s watchdog
        assertThat(u.controlMode()).isEqualTo(ControlMode.LOCAL);
        assertThat(field.referenceMw).isCloseTo(703, within(1e-9)); // the pulse had finished before
        assertThat(journal.entries()).anyMatch(e -> e.kind().equals("watchdog"));
        // a status alone does not bring it back
        u.onControllerStatus(status(0, ControllerState.REGULATING));
        run(u, 1);
        assertThat(u.controlMode()).isEqualTo(ControlMode.LOCAL);
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.NOT_IN_REMOTE);
        u.setControlMode(ControlMode.REMOTE, "operator order");
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().outcome()).isEqualTo(AckOutcome.ACCEPTED);
        assertThat(out.telemetry.get(out.telemetry.size() - 1).controlMode()).isEqualTo(ControlMode.LOCAL);
    }

    @Test
    void shouldHoldAMoveInProgressOnControllerOfflineOrGoToBasePoint() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(0, ControllerState.REGULATING));
        receive(u, setpoint(720)); // 20 MW at 20 MW/min = 60 s
        run(u, 6);
        u.onControllerStatus(status(0, ControllerState.OFFLINE));
        run(u, 10);
        assertThat(u.controlMode()).isEqualTo(ControlMode.LOCAL);
        assertThat(field.referenceMw).isCloseTo(702, within(1e-9));

        FakeField other = new FakeField(700, clock::epochMillis);
        UnitPlantInterface b = new UnitPlantInterface(settings(true, WatchdogAction.BASE_POINT), other, clock, out, journal, 0);
        b.onControllerStatus(status(0, ControllerState.OFFLINE));
        for (int i = 0; i < 50 * 200; i++) {
            clock.advanceMillis(20);
            b.tick();
        }
        assertThat(other.referenceMw).isCloseTo(650, within(1e-9));
    }

    @Test
    void shouldNotArmWatchdogBeforeFirstControllerStatus() {
        UnitPlantInterface u = unit();
        run(u, 120);
        assertThat(u.controlMode()).isEqualTo(ControlMode.REMOTE);
    }

    @Test
    void shouldArmAndFeedTheWatchdogOnLiveStatusesOnlyNotOnTheRetainedCopyASubscriptionBrings() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(0, ControllerState.REGULATING), CTRL, true); // on subscribing: perhaps old
        run(u, 45); // watchdog 30 s: not armed by the retained copy
        assertThat(u.controlMode()).isEqualTo(ControlMode.REMOTE);
        assertThat(u.heartbeatAgeNanos(clock.monotonicNanos())).isEqualTo(-1);
        u.onControllerStatus(status(0, ControllerState.REGULATING), CTRL, false); // the first live one arms it
        run(u, 20);
        u.onControllerStatus(status(0, ControllerState.REGULATING), CTRL, true); // a resubscription's copy: no heartbeat
        run(u, 9);
        assertThat(u.controlMode()).isEqualTo(ControlMode.REMOTE);
        assertThat(u.heartbeatAgeNanos(clock.monotonicNanos())).isEqualTo(29_000_000_000L);
        run(u, 2);
        assertThat(u.controlMode()).isEqualTo(ControlMode.LOCAL); // 31 s after the last live status
        assertThat(journal.entries()).filteredOn(e -> e.kind().equals("watchdog")).singleElement()
                .satisfies(e -> assertThat(e.detail()).contains("no controller status for 30.0"));

        UnitPlantInterface fresh = unit();
        fresh.onControllerStatus(status(0, ControllerState.OFFLINE), CTRL, true); // the will of a controller gone
        assertThat(fresh.controlMode()).isEqualTo(ControlMode.LOCAL);
    }

    @Test
    void shouldPublishTelemetryOnItsScanPeriod() {
        UnitPlantInterface u = unit();
        u.tick();
        run(u, 20);
        // t = 0, 2, ..., 20 s
        assertThat(out.telemetry).hasSize(11);
        for (int i = 1; i < out.telemetry.size(); i++) {
            assertThat(out.telemetry.get(i).sourceTime() - out.telemetry.get(i - 1).sourceTime()).isEqualTo(2_000);
            assertThat(out.telemetry.get(i).seq()).isGreaterThan(out.telemetry.get(i - 1).seq());
        }
        assertThat(out.telemetry.get(0).setpointMw()).isEqualTo(700);
        assertThat(out.telemetry.get(0).regulatingMaxMw()).isEqualTo(870);
        assertThat(out.telemetry.get(0).pulseRateMwPerMin()).isEqualTo(18);
    }

    @Test
    void shouldStartFromTheTurbinesReferenceWithoutWriting() {
        field.ready = false;
        UnitPlantInterface u = unit();
        receive(u, pulse(PulseDirection.RAISE, 1_000));
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.UNIT_OFFLINE);
        field.referenceMw = Double.NaN; // a remote field has no reference before its first reading
        assertThat(u.telemetry().setpointMw()).isEqualTo(0.0);
        assertThat(u.telemetry().outputQuality().validity()).isEqualTo(org.loopstand.protocol.message.Validity.INVALID);
        assertThat(u.telemetry().status()).isEqualTo(UnitStatus.OFFLINE);
        field.referenceMw = 712.5;
        field.ready = true;
        run(u, 1);
        assertThat(u.loadReferenceMw()).isEqualTo(712.5);
        assertThat(field.writes).isZero();
    }

    @Test
    void shouldRecordTimeToReferenceChangeAndToVisibleOutputChange() {
        UnitPlantInterface u = unit();
        receive(u, pulse(PulseDirection.RAISE, 4_000));
        run(u, 5);
        assertThat(u.latency().toReferenceUs().getTotalCount()).isEqualTo(1);
        assertThat(u.latency().toReferenceUs().getMaxValue()).isBetween(19_000L, 21_000L); // first 20 ms tick
        // lag 1 s: output reaches +0.05 MW after the reference has moved about 0.1 MW (~0.5 s of pulse)
        assertThat(u.latency().toOutputUs().getTotalCount()).isEqualTo(1);
        assertThat(u.latency().toOutputUs().getMaxValue()).isBetween(200_000L, 2_000_000L);
    }

    private ControllerStatus status(long epoch, ControllerState state) {
        return new ControllerStatus(seq++, clock.epochMillis(), CTRL, epoch, state, List.of(), 0, List.of());
    }
}
