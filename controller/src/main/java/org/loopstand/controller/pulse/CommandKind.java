package org.loopstand.controller.pulse;

public enum CommandKind { PULSE, SETPOINT }
