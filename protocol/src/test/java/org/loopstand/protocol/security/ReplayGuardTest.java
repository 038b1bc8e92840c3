package org.loopstand.protocol.security;

import static org.assertj.core.api.Assertions.assertThat;

import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.Size;
import org.junit.jupiter.api.Test;

class ReplayGuardTest {
    @Test
    void shouldKeepControllersAndUnitsApart() {
        ReplayGuard g = new ReplayGuard();
        assertThat(g.tryAccept("G1", "c1", 1, 5, 100)).isEmpty();
        assertThat(g.tryAccept("G2", "c1", 1, 5, 100)).isEmpty();
        assertThat(g.tryAccept("G1", "c2", 1, 5, 100)).isEmpty();
        assertThat(g.tryAccept("G1", "c1", 1, 5, 100)).isPresent();
    }

    @Test
    void shouldStayBoundedAndNeverReadmitAForgottenPairsOldCommand() {
        ReplayGuard g = new ReplayGuard(2);
        assertThat(g.tryAccept("G1", "c1", 1, 10, 1_000)).isEmpty();
        assertThat(g.tryAccept("G2", "c1", 1, 10, 2_000)).isEmpty();
        assertThat(g.tryAccept("G3", "c1", 1, 10, 3_000)).isEmpty(); // forgets G1 (least recently used)

        assertThat(g.trackedPairs()).isEqualTo(2);
        assertThat(g.forgottenPairs()).isEqualTo(1);
        assertThat(g.tryAccept("G1", "c1", 1, 10, 1_000)).as("replay of G1's last command").isPresent();
        assertThat(g.tryAccept("G1", "c1", 1, 11, 3_500)).as("fresh G1 command").isEmpty();
    }

    /** Replaying any already-accepted command is refused, however many pairs are forgotten. */
    @Property(tries = 200)
    void shouldRefuseEveryReplayEvenWithEviction(@ForAll @Size(min = 1, max = 60) java.util.List<@IntRange(min = 0,
            max = 5) Integer> unitPicks, @ForAll @IntRange(min = 1, max = 4) int maxTracked) {
        ReplayGuard g = new ReplayGuard(maxTracked);
        long[] seq = new long[6];
        java.util.List<long[]> accepted = new java.util.ArrayList<>();
        long t = 0;
        for (int u : unitPicks) {
            t += 10;
            seq[u]++;
            if (g.tryAccept("G" + u, "c1", 1, seq[u], t).isEmpty()) {
                accepted.add(new long[] {u, seq[u], t});
            }
        }
        assertThat(accepted).isNotEmpty();
        for (long[] a : accepted) {
            assertThat(g.tryAccept("G" + a[0], "c1", 1, a[1], a[2])).isPresent();
        }
    }
}
