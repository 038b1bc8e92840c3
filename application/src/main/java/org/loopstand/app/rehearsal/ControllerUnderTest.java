package org.loopstand.app.rehearsal;

import java.util.regex.Pattern;

/**
 * The controller a rehearsal runs against: the built-in reference controller (the default), a command
 * line the rig starts as a child process (through the shell, in the folder the rehearsal was started from, with the connection
 * facts in {@code LOOPSTAND_*} environment variables), or an external controller the user starts
 * themselves. The built-in one is started exactly like any other command.
 *
 * @param controllerId the controller id the plant accepts commands from (an id: letters, digits, _ and -)
 * @param commandLine  the shell command that starts it, or null for an external controller
 * @param builtIn      true for the built-in reference controller
 */
public record ControllerUnderTest(String controllerId, String commandLine, boolean builtIn) {
    /** The id the built-in controller runs under, and the default for a command. */
    public static final String DEFAULT_ID = "controller-1";
    /** The built-in controller, started through the launcher like any user's command. */
    public static final String BUILT_IN_COMMAND = "\"${LOOPSTAND_HOME:-.}/loopstand\" control --site \"$LOOPSTAND_SITE_FILE\""
            + " --broker \"$LOOPSTAND_BROKER_URL\" --clock bus --controller-id \"$LOOPSTAND_CONTROLLER_ID\""
            + " --journal \"$LOOPSTAND_RUN_DIR\"";
    private static final Pattern ID = Pattern.compile("[A-Za-z0-9][A-Za-z0-9_-]{0,63}");

    public ControllerUnderTest {
        if (controllerId == null || !ID.matcher(controllerId).matches()) {
            throw new IllegalArgumentException("controller id '" + controllerId + "' is not an id: 1 to 64 letters, digits,"
                    + " '_' or '-', starting with a letter or digit");
        }
        if (commandLine != null && commandLine.isBlank()) {
            throw new IllegalArgumentException("the controller command is empty");
        }
    }

    public static ControllerUnderTest builtInController() {
        return new ControllerUnderTest(DEFAULT_ID, BUILT_IN_COMMAND, true);
    }

    public static ControllerUnderTest command(String controllerId, String commandLine) {
        return new ControllerUnderTest(controllerId, commandLine, false);
    }

    public static ControllerUnderTest external(String controllerId) {
        return new ControllerUnderTest(controllerId, null, false);
    }

    /** @return true when the user starts the controller themselves */
    public boolean external() {
        return commandLine == null;
    }

    /** @return how the report and the terminal name it */
    public String describe() {
        return builtIn ? "built-in reference controller (" + controllerId + ")"
                : external() ? "external controller " + controllerId + ", started by the user"
                : "controller " + controllerId + " started by the rig: " + commandLine;
    }
}
