package org.loopstand.protocol.site;

/**
 * What a site file is read for. The file format is one; what must be written differs: the plant needs
 * every physics figure, a controller needs only areas, ties and units' regulating figures.
 */
public enum SiteUse {
    /** the plant and the pulse test: the physics keys of areas and units are required */
    PHYSICS,
    /** a controller: physics keys may be left out; the controller's own checks decide what it needs */
    CONTROL
}
