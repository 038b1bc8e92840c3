package org.loopstand.app.rehearsal;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Objects;

/**
 * How one rehearsal runs.
 *
 * @param scenarioFile  the scenario (YAML)
 * @param siteFile      the site (YAML)
 * @param brokerUrl     an external broker, or null to let the plant start the embedded one
 * @param rate          scenario seconds per wall second, (0, 1000]
 * @param runsDir       where run folders are made
 * @param javaCommand   the java launcher for the children
 * @param plantClassPath      class path of the plant process
 * @param controllerClassPath class path of the controller process
 * @param embeddedPort  the embedded broker's port (checked free before start)
 * @param readyTimeoutMs how long a child may take to say it is ready, ms
 * @param extraPlantArgs extra arguments for the plant process (tests), may be empty
 * @param commandDir    where a controller command runs: the working directory the user gave the command in
 * @param controller    the controller under test
 * @param controllerWaitMs how long to wait for the controller's first status, ms, &gt; 0
 * @param wireProfile   a wire profile the plant speaks to the controller (docs/controller-contract.md), or null
 */
public record RehearsalSettings(Path scenarioFile, Path siteFile, String brokerUrl, double rate, Path runsDir,
                                String javaCommand, String plantClassPath, String controllerClassPath, int embeddedPort,
                                long readyTimeoutMs, List<String> extraPlantArgs, Path commandDir,
                                ControllerUnderTest controller, long controllerWaitMs, Path wireProfile) {
    public static final int EMBEDDED_PORT = 1884;

    /** Without a wire profile. */
    public RehearsalSettings(Path scenarioFile, Path siteFile, String brokerUrl, double rate, Path runsDir, String javaCommand,
                             String plantClassPath, String controllerClassPath, int embeddedPort, long readyTimeoutMs,
                             List<String> extraPlantArgs, Path commandDir, ControllerUnderTest controller, long controllerWaitMs) {
        this(scenarioFile, siteFile, brokerUrl, rate, runsDir, javaCommand, plantClassPath, controllerClassPath, embeddedPort,
                readyTimeoutMs, extraPlantArgs, commandDir, controller, controllerWaitMs, null);
    }

    /** The built-in controller, waited for as long as a child's ready line. */
    public RehearsalSettings(Path scenarioFile, Path siteFile, String brokerUrl, double rate, Path runsDir, String javaCommand,
                             String plantClassPath, String controllerClassPath, int embeddedPort, long readyTimeoutMs,
                             List<String> extraPlantArgs, Path commandDir) {
        this(scenarioFile, siteFile, brokerUrl, rate, runsDir, javaCommand, plantClassPath, controllerClassPath, embeddedPort,
                readyTimeoutMs, extraPlantArgs, commandDir, ControllerUnderTest.builtInController(), readyTimeoutMs, null);
    }

    public RehearsalSettings {
        Objects.requireNonNull(scenarioFile, "scenarioFile");
        Objects.requireNonNull(siteFile, "siteFile");
        Objects.requireNonNull(runsDir, "runsDir");
        extraPlantArgs = List.copyOf(extraPlantArgs);
        Objects.requireNonNull(commandDir, "commandDir");
        Objects.requireNonNull(controller, "controller");
        if (controllerWaitMs <= 0) {
            throw new IllegalArgumentException("the wait for the controller must be positive, got " + controllerWaitMs + " ms");
        }
        if (!Files.isRegularFile(scenarioFile)) {
            throw new IllegalArgumentException("scenario file " + scenarioFile + " does not exist");
        }
        if (!Files.isRegularFile(siteFile)) {
            throw new IllegalArgumentException("site file " + siteFile + " does not exist (give it with --site FILE)");
        }
        if (wireProfile != null && !Files.isRegularFile(wireProfile)) {
            throw new IllegalArgumentException("wire profile " + wireProfile + " does not exist");
        }
        if (!(rate > 0) || rate > 1000) {
            throw new IllegalArgumentException("rate must be in (0, 1000], got " + rate);
        }
        if (plantClassPath == null || plantClassPath.isBlank()
                || (controller.builtIn() && (controllerClassPath == null || controllerClassPath.isBlank()))) {
            throw new IllegalArgumentException("the class paths of the plant and controller processes are not known;"
                    + " run the rehearsal through ./loopstand (it sets LOOPSTAND_PLANT_CP and LOOPSTAND_CONTROLLER_CP)");
        }
    }

    /** @return the URL both processes use */
    public String effectiveBrokerUrl() {
        return brokerUrl != null ? brokerUrl : "tcp://127.0.0.1:" + embeddedPort;
    }

    /** @return the scenario's name (file name without .yaml) */
    public String scenarioName() {
        String n = scenarioFile.getFileName().toString();
        return n.replaceFirst("\\.ya?ml$", "");
    }
}
