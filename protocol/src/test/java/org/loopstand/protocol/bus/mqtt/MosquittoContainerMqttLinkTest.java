package org.loopstand.protocol.bus.mqtt;

import org.testcontainers.containers.GenericContainer;
import org.testcontainers.junit.jupiter.Container;
import org.testcontainers.junit.jupiter.Testcontainers;
import org.testcontainers.utility.DockerImageName;
import org.testcontainers.utility.MountableFile;

/** The MQTT contract against Mosquitto in a container; skipped where there is no Docker engine. */
@Testcontainers(disabledWithoutDocker = true)
class MosquittoContainerMqttLinkTest extends MqttLinkContract {
    @Container
    private static final GenericContainer<?> MOSQUITTO = new GenericContainer<>(
            DockerImageName.parse("eclipse-mosquitto:2.0.11"))
            .withCopyFileToContainer(MountableFile.forClasspathResource("mosquitto-container.conf"),
                    "/mosquitto/config/mosquitto.conf")
            .withExposedPorts(1883);

    @Override
    protected String serverUri() {
        return "tcp://" + MOSQUITTO.getHost() + ":" + MOSQUITTO.getMappedPort(1883);
    }
}
