package org.loopstand.protocol.bus.mqtt;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class InflightGateTest {
    @Test
    void shouldRefuseAtOnceWhenAllPermitsAreTakenAndAcceptAfterRelease() {
        InflightGate gate = new InflightGate();
        assertThat(gate.tryAcquire()).as("no permits before the first CONNACK").isFalse();
        gate.resize(2);
        assertThat(gate.tryAcquire()).isTrue();
        assertThat(gate.tryAcquire()).isTrue();
        assertThat(gate.tryAcquire()).isFalse();
        gate.release();
        assertThat(gate.tryAcquire()).isTrue();
    }

    @Test
    void shouldApplyASmallerLimitAfterReconnectOnlyOnceInFlightPublishesFinish() {
        InflightGate gate = new InflightGate();
        gate.resize(20);
        for (int i = 0; i < 5; i++) {
            assertThat(gate.tryAcquire()).isTrue();
        }
        gate.resize(3); // 5 in flight, new limit 3
        assertThat(gate.available()).isEqualTo(-2);
        assertThat(gate.tryAcquire()).isFalse();
        for (int i = 0; i < 5; i++) {
            gate.release();
        }
        assertThat(gate.available()).isEqualTo(3);
        assertThat(gate.limit()).isEqualTo(3);
    }

    @Test
    void shouldGrowTheLimit() {
        InflightGate gate = new InflightGate();
        gate.resize(1);
        assertThat(gate.tryAcquire()).isTrue();
        gate.resize(10);
        assertThat(gate.available()).isEqualTo(9);
    }
}
