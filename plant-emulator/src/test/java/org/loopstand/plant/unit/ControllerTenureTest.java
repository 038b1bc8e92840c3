package org.loopstand.plant.unit;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.security.CommandTimeRules;
import org.loopstand.protocol.security.KeyRing;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.security.UnitKey;
import org.loopstand.protocol.time.VirtualClock;

/** Epochs, statuses and two controllers on one unit: one bad message never fences the unit. */
class ControllerTenureTest {
    private static final long T0 = 1_700_000_000_000L;
    private static final String CTRL = "controller-1";
    private static final String STANDBY = "controller-2";
    private static final String UNIT = "basin-steam-1";

    private final VirtualClock clock = new VirtualClock(T0);
    private final FakeField field = new FakeField(700, clock::epochMillis);
    private final RecordingOutput out = new RecordingOutput();
    private final PlantJournal journal = new PlantJournal();
    private final long epoch = T0 - 60_000; // the controller started a minute ago, epoch ms
    private long seq = 1;

    private UnitPlantInterface unit() {
        UnitSettings s = new UnitSettings(UNIT, 500, 870, 20, 18, true, 10_000, 2_000, 30,
                WatchdogAction.HOLD, 650, Set.of(CTRL, STANDBY));
        UnitPlantInterface u = new UnitPlantInterface(s, field, clock, out, journal, 0);
        u.tick();
        return u;
    }

    private UnitCommand pulse(String controller, long commandEpoch) {
        long now = clock.epochMillis();
        return UnitCommand.pulse(seq++, now, UNIT, controller, commandEpoch, now + 4_000, PulseDirection.RAISE, 1_000);
    }

    private ControllerStatus status(String controller, long statusEpoch, ControllerState state) {
        return new ControllerStatus(seq++, clock.epochMillis(), controller, statusEpoch, state, List.of(), 0, List.of());
    }

    private AckOutcome send(UnitPlantInterface u, UnitCommand c) {
        u.onCommand(c, clock.monotonicNanos());
        return out.lastAck().outcome();
    }

    private List<String> statusRefusalCodes() {
        return journal.entries().stream().filter(e -> e.kind().equals("statusRefused")).map(PlantJournal.Entry::code).toList();
    }

    @Test
    void shouldNotAdoptTheEpochOfAnExpiredCommand() {
        UnitPlantInterface u = unit();
        long now = clock.epochMillis();
        UnitCommand expired = UnitCommand.pulse(seq++, now - 5_000, UNIT, CTRL, epoch + 1_000_000, now - 1_000,
                PulseDirection.RAISE, 1_000);
        assertThat(send(u, expired)).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.EXPIRED);
        // the real controller's next command, at its own lower epoch, still goes through
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING));
        assertThat(u.statusRefusalCount()).isZero();
    }

    @Test
    void shouldNotLetAnExpiredCommandWithAHugeSeqJumpBlindTheUnit() {
        UnitPlantInterface u = unit();
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
        long now = clock.epochMillis();
        UnitCommand jumped = UnitCommand.pulse(seq + 1_000_000_000L, now - 5_000, UNIT, CTRL, epoch, now - 1_000,
                PulseDirection.RAISE, 1_000);
        assertThat(send(u, jumped)).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.EXPIRED);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldNotLetAnExpiredCommandStartTheSeqHistoryOfAFreshEpoch() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING)); // adopted, no command yet
        long now = clock.epochMillis();
        assertThat(send(u, UnitCommand.pulse(1_000_000_000L, now - 5_000, UNIT, CTRL, epoch, now - 1_000,
                PulseDirection.RAISE, 1_000))).isEqualTo(AckOutcome.REJECTED);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldRefuseAStatusWhoseControllerIdIsNotTheOneOfItsTopic() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch + 5_000, ControllerState.REGULATING), "intruder");
        assertThat(statusRefusalCodes()).containsExactly("wrongTopic");
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldRefuseAnEpochBeyondItsBoundInAStatusAndInACommand() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, 1_000_000_000_000_000L, ControllerState.REGULATING));
        assertThat(statusRefusalCodes()).containsExactly("epochAhead");
        long now = clock.epochMillis();
        UnitCommand huge = UnitCommand.pulse(seq++, now, UNIT, CTRL, Long.MAX_VALUE, now + 4_000, PulseDirection.RAISE, 1_000);
        assertThat(send(u, huge)).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.NOT_YET_VALID);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldRefuseALifetimeOverTheBoundAndAnIssueTimeAheadOfTheUnitsClock() {
        UnitPlantInterface u = unit();
        long now = clock.epochMillis();
        UnitCommand yearLong = new UnitCommand(seq++, now, UNIT, CTRL, epoch, now, now + 365L * 86_400_000L,
                org.loopstand.protocol.message.CommandKind.PULSE, PulseDirection.RAISE, 1_000, null, null, null);
        assertThat(send(u, yearLong)).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.BAD_LIFETIME);
        long ahead = now + CommandTimeRules.MAX_ISSUED_AHEAD_MS + 1;
        UnitCommand future = UnitCommand.pulse(seq++, ahead, UNIT, CTRL, epoch, ahead + 4_000, PulseDirection.RAISE, 1_000);
        assertThat(send(u, future)).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.NOT_YET_VALID);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldFenceAnOlderInstanceOfTheSameIdAndIgnoreItsRetainedOfflineWill() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING));
        long newer = epoch + 30_000; // the same id restarted (session takeover)
        u.onControllerStatus(status(CTRL, newer, ControllerState.REGULATING));
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.WRONG_EPOCH);
        u.onControllerStatus(status(CTRL, epoch, ControllerState.OFFLINE)); // the old session's will
        assertThat(statusRefusalCodes()).containsExactly("olderEpoch");
        assertThat(u.controlMode()).isEqualTo(ControlMode.REMOTE);
        assertThat(send(u, pulse(CTRL, newer))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldKeepASecondControllerOnStandbyAndHandOverWhenTheActiveOneGoesOffline() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING));
        u.onControllerStatus(status(STANDBY, epoch + 10_000, ControllerState.REGULATING));
        assertThat(statusRefusalCodes()).containsExactly("standby");
        assertThat(send(u, pulse(STANDBY, epoch + 10_000))).isEqualTo(AckOutcome.REJECTED);
        assertThat(out.lastAck().reason()).isEqualTo(RefusalReason.WRONG_CONTROLLER);
        assertThat(out.lastAck().detail()).startsWith("standby: controller controller-1 holds this unit");
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);

        u.onControllerStatus(status(CTRL, epoch, ControllerState.OFFLINE));
        assertThat(u.activeController()).isNull();
        u.onControllerStatus(status(STANDBY, epoch + 10_000, ControllerState.REGULATING));
        assertThat(u.activeController()).isEqualTo(STANDBY);
        // the unit left remote when its controller said offline; back to remote only by order
        assertThat(u.controlMode()).isEqualTo(ControlMode.LOCAL);
        u.setControlMode(ControlMode.REMOTE, "operator order after the handover");
        assertThat(send(u, pulse(STANDBY, epoch + 10_000))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldTakeCommandsFromAnAcceptedDeskThatPublishesNoStatusWithoutMakingItActive() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING));
        assertThat(send(u, pulse(STANDBY, epoch))).isEqualTo(AckOutcome.ACCEPTED); // a desk: no status of its own
        assertThat(u.activeController()).isEqualTo(CTRL);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldLetTheStandbyTakeOverWhenTheActiveOneFallsSilentForTheWatchdogPeriod() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING));
        clock.advanceMillis(20_000);
        u.onControllerStatus(status(STANDBY, epoch, ControllerState.REGULATING));
        assertThat(u.activeController()).isEqualTo(CTRL);
        clock.advanceMillis(10_001); // 30.001 s since controller-1 was last heard: watchdog 30 s
        u.onControllerStatus(status(STANDBY, epoch, ControllerState.REGULATING));
        assertThat(u.activeController()).isEqualTo(STANDBY);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.REJECTED);
        assertThat(send(u, pulse(STANDBY, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldLetAnAdoptedEpochLapseAfterTheWatchdogPeriodSoItCannotFenceForever() {
        UnitPlantInterface u = unit();
        u.onControllerStatus(status(CTRL, epoch + 3_600_000, ControllerState.REGULATING)); // within the bound
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.REJECTED);
        clock.advanceMillis(30_001);
        u.onControllerStatus(status(CTRL, epoch, ControllerState.REGULATING));
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }

    @Test
    void shouldTakeOnlySignedStatusesWhenKeysAreConfigured() {
        UnitPlantInterface u = unit();
        UnitKey key = UnitKey.always(CTRL, "s1", "status-key-of-controller-1-32-bytes!".getBytes(StandardCharsets.UTF_8));
        StatusSeal seal = new StatusSeal(KeyRing.of(List.of(key)), new MessageCodec());
        u.verifyStatusWith(seal);
        u.onControllerStatus(status(CTRL, epoch + 10_000, ControllerState.REGULATING));
        ControllerStatus signed = seal.sign(status(CTRL, epoch, ControllerState.REGULATING), clock.epochMillis());
        ControllerStatus tampered = signed.withSignature(signed.keyId(), signed.signature()).withSignature("s1",
                seal.sign(status(CTRL, epoch + 1, ControllerState.REGULATING), clock.epochMillis()).signature());
        u.onControllerStatus(tampered);
        assertThat(statusRefusalCodes()).containsExactly("missingSignature", "badSignature");
        u.onControllerStatus(signed);
        assertThat(u.activeController()).isEqualTo(CTRL);
        assertThat(send(u, pulse(CTRL, epoch))).isEqualTo(AckOutcome.ACCEPTED);
    }
}
