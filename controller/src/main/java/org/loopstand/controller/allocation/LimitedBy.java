package org.loopstand.controller.allocation;

/** What bounded a unit's move this cycle. */
public enum LimitedBy { NONE, REGULATING_RANGE, RAMP }
