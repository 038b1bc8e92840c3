package org.loopstand.brokernode.hosts;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

/**
 * The clean-up of hosts left behind: a bench or test JVM killed with -9 cannot remove its namespaces nor stop
 * the broker nodes it started in them; the next run of the same family does. Needs root and iproute2 (skipped
 * otherwise; the hosts tests proper fail under CI when namespaces cannot be made).
 */
class NamespaceHostsTest {
    @Test
    void shouldRemoveTheHostsOfAGoneOwnerWithTheirProcessesAndLeaveALiveOwnersAlone() throws Exception {
        Process gone = new ProcessBuilder("true").start();
        gone.waitFor(10, TimeUnit.SECONDS);
        long deadPid = gone.pid(); // exited and reaped: no process has this pid (until the kernel reuses it)
        Assumptions.assumeFalse(ProcessHandle.of(deadPid).isPresent(), "pid " + deadPid + " reused already");
        NamespaceHosts orphan;
        NamespaceHosts mine;
        try {
            orphan = NamespaceHosts.create("lx" + deadPid + "a", 1);
            mine = NamespaceHosts.forThisProcess("lx", 'b', 1);
        } catch (IllegalStateException e) {
            Assumptions.abort("cannot create network namespaces: " + e.getMessage());
            return;
        }
        Process inside = new ProcessBuilder(List.of("ip", "netns", "exec", orphan.host(1), "sleep", "300")).start();
        try {
            waitUntilInside(orphan.host(1));
            List<String> swept = NamespaceHosts.sweepOrphans("lx");

            assertThat(swept).hasSize(2).anySatisfy(s -> assertThat(s).startsWith(orphan.hub()))
                    .anySatisfy(s -> assertThat(s).startsWith(orphan.host(1) + " (killed "));
            assertThat(inside.waitFor(10, TimeUnit.SECONDS)).as("the process inside the orphaned host is stopped").isTrue();
            assertThat(namespaces()).doesNotContain(orphan.hub(), orphan.host(1)).contains(mine.hub(), mine.host(1));
            assertThat(NamespaceHosts.sweepOrphans("lx")).as("nothing left to sweep").isEmpty();
        } finally {
            inside.destroyForcibly();
            mine.close();
            orphan.close(); // already gone after a passing run: the clean-up says so on stderr
        }
    }

    private static void waitUntilInside(String ns) throws Exception {
        for (int i = 0; i < 100 && !new String(new ProcessBuilder("ip", "netns", "pids", ns).start().getInputStream()
                .readAllBytes()).strip().matches("\\d+"); i++) {
            Thread.sleep(50);
        }
    }

    private static String namespaces() throws Exception {
        return new String(new ProcessBuilder("ip", "netns", "list").start().getInputStream().readAllBytes());
    }
}
