package org.loopstand.protocol.agent;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.awaitility.Awaitility.await;

import java.time.Duration;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;

class AgentRunnerTest {

    /** Takes items a producer thread hands over; reports work only when it took one. */
    private static final class QueueAgent implements Agent {
        final ConcurrentLinkedQueue<Integer> inbox = new ConcurrentLinkedQueue<>();
        final AtomicInteger taken = new AtomicInteger();
        final AtomicInteger started = new AtomicInteger();
        final AtomicInteger closed = new AtomicInteger();

        @Override
        public void onStart() {
            started.incrementAndGet();
        }

        @Override
        public int doWork() {
            int n = 0;
            while (inbox.poll() != null) {
                n++;
            }
            taken.addAndGet(n);
            return n;
        }

        @Override
        public void onClose() {
            closed.incrementAndGet();
        }

        @Override
        public String roleName() {
            return "queue-agent";
        }
    }

    @Test
    void shouldTakeEveryHandedOverItemWhenWokenByTheProducer() {
        QueueAgent agent = new QueueAgent();
        try (AgentRunner runner = new AgentRunner(agent, 100_000_000L).start()) {
            for (int i = 0; i < 500; i++) {
                agent.inbox.add(i);
                runner.wake();
            }
            // nothing handed over is left behind, whatever the interleaving of wake and park
            await().atMost(Duration.ofSeconds(30)).until(() -> agent.taken.get() == 500);
        }
        assertThat(agent.started).hasValue(1);
        assertThat(agent.closed).hasValue(1);
        assertThat(agent.inbox).isEmpty();
    }

    @Test
    void shouldAcceptWakeBeforeStartAndAfterClose() {
        QueueAgent agent = new QueueAgent();
        AgentRunner runner = new AgentRunner(agent, 1_000_000L);
        runner.wake();
        runner.start();
        runner.close();
        runner.wake();
        assertThat(runner.isRunning()).isFalse();
        assertThat(runner.failure()).isNull();
        assertThat(agent.closed).hasValue(1);
    }

    @Test
    void shouldRefuseAnIdlePeriodOutsideItsRange() {
        assertThatThrownBy(() -> new AgentRunner(new QueueAgent(), 999L))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("idleNanos");
        assertThatThrownBy(() -> new AgentRunner(new QueueAgent(), 100_000_001L))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("idleNanos");
    }
}
