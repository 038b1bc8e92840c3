package org.loopstand.controller.config;

/**
 * @param id              tie id
 * @param fromArea        area the flow is positive out of
 * @param toArea          area the flow is positive into
 * @param scheduledFlowMw scheduled flow from → to, MW (0 when the file gives none)
 */
public record SiteTie(String id, String fromArea, String toArea, double scheduledFlowMw) {
    /** @return the other end of the tie, or null if {@code areaId} is not an end */
    public String otherEnd(String areaId) {
        return areaId.equals(fromArea) ? toArea : areaId.equals(toArea) ? fromArea : null;
    }

    /** @return +1 when flow + means export from {@code areaId}, −1 for the other end */
    public double exportSign(String areaId) {
        return areaId.equals(fromArea) ? 1.0 : -1.0;
    }
}
