package org.loopstand.app.rehearsal;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.charset.StandardCharsets;

import org.junit.jupiter.api.Test;

class ControllerLaunchTest {
    private static final String ROOT = "loopstand/v1/tarnwick/controller/";
    private static final String OWN_TOPIC = ROOT + "controller-1/status";

    private static byte[] status(String controllerId, boolean withCycle) {
        return ("{\"seq\":1,\"sourceTime\":1796335038007,\"controllerId\":\"" + controllerId + "\",\"epoch\":1796335030000,"
                + "\"state\":\"regulating\",\"reasons\":[]" + (withCycle ? ",\"cycle\":1" : "") + ",\"areas\":[]}")
                .getBytes(StandardCharsets.UTF_8);
    }

    @Test
    void shouldNameTheMissingFieldWhenTheControllersStatusesDoNotDecode() {
        ControllerLaunch launch = new ControllerLaunch(ControllerUnderTest.external("controller-1"));
        launch.onStatus(OWN_TOPIC, status("controller-1", false), false);
        launch.onStatus(OWN_TOPIC, status("controller-1", false), false);

        assertThatThrownBy(() -> launch.awaitFirstStatus(500, null, OWN_TOPIC, () -> false))
                .hasMessageContaining("no status from controller 'controller-1'")
                .hasMessageContaining("2 statuses on " + OWN_TOPIC + " did not decode")
                .hasMessageContaining("MISSING_FIELD at cycle");
    }

    @Test
    void shouldNotTakeAStatusOnAnotherControllersTopicAsReady() {
        ControllerLaunch launch = new ControllerLaunch(ControllerUnderTest.external("controller-1"));
        // the units refuse such a status (wrongTopic, docs/plant.md): it is no sign that the controller is ready
        launch.onStatus(ROOT + "someone-else/status", status("controller-1", true), false);

        assertThatThrownBy(() -> launch.awaitFirstStatus(500, null, OWN_TOPIC, () -> false))
                .hasMessageContaining("arrived on [" + ROOT + "someone-else/status], not on its own topic")
                .hasMessageContaining("wrongTopic");
    }

    @Test
    void shouldTakeAWellFormedStatusOnItsOwnTopicAsReady() {
        ControllerLaunch launch = new ControllerLaunch(ControllerUnderTest.external("controller-1"));
        launch.onStatus(OWN_TOPIC, status("controller-1", true), false);

        assertThat(launch.awaitFirstStatus(500, null, OWN_TOPIC, () -> false).epoch()).isEqualTo(1796335030000L);
    }
}
