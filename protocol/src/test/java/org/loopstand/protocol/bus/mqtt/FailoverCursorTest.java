package org.loopstand.protocol.bus.mqtt;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;

class FailoverCursorTest {
    private static final String A = "tcp://10.9.0.1:1883";
    private static final String B = "tcp://10.9.0.2:1883";
    private static final String C = "tcp://10.9.0.3:1883";

    private static FailoverCursor cursor(String list) {
        // no jitter: delays are the plain doubling 100, 200, 400 ms capped at 400
        return new FailoverCursor(BrokerEndpoints.parse(list), new ReconnectBackoff(100, 400, 0, new Random(1)));
    }

    @Test
    void shouldTryEveryNodeAtOnceAndBackOffOnlyAfterAWholeRoundFailed() {
        FailoverCursor c = cursor(A + "," + B + "," + C);
        assertThat(c.uri()).isEqualTo(A);
        assertThat(c.failed()).isZero();
        assertThat(c.uri()).isEqualTo(B);
        assertThat(c.failed()).isZero();
        assertThat(c.uri()).isEqualTo(C);
        assertThat(c.failed()).isEqualTo(100);
        assertThat(c.uri()).isEqualTo(A);
        c.failed();
        c.failed();
        assertThat(c.failed()).isEqualTo(200);
        assertThat(c.failuresInRow()).isEqualTo(6);
    }

    @Test
    void shouldMoveToTheNextNodeOnALostConnectionAndStartCleanThere() {
        FailoverCursor c = cursor(A + "," + B);
        assertThat(c.switchingNode()).isFalse();
        c.connected();
        assertThat(c.lastConnectedUri()).isEqualTo(A);
        assertThat(c.lost()).isEqualTo(100);
        assertThat(c.uri()).isEqualTo(B);
        assertThat(c.switchingNode()).isTrue();
        c.connected();
        assertThat(c.switchingNode()).isFalse();
        assertThat(c.failuresInRow()).isZero();
    }

    @Test
    void shouldRetryTheOnlyNodeOfASingleBrokerWithBackoffAndKeepItsSession() {
        FailoverCursor c = cursor(A);
        c.connected();
        assertThat(c.lost()).isEqualTo(100);
        assertThat(c.uri()).isEqualTo(A);
        assertThat(c.switchingNode()).isFalse();
        assertThat(c.failed()).isEqualTo(100);
        assertThat(c.failed()).isEqualTo(200);
        assertThat(c.failed()).isEqualTo(400);
        assertThat(c.failed()).isEqualTo(400);
    }
}
