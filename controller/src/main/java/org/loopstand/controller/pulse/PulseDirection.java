package org.loopstand.controller.pulse;

public enum PulseDirection { RAISE, LOWER }
