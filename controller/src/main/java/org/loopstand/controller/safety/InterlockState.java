package org.loopstand.controller.safety;

/** Regulating: commands may go out. Suspended: nothing is sent. */
public enum InterlockState { REGULATING, SUSPENDED }
