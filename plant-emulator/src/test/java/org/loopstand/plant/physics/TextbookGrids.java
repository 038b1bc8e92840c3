package org.loopstand.plant.physics;

import org.loopstand.protocol.site.AceConvention;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;

/** Grids taken from textbook examples for the outside checks (values named where used). */
final class TextbookGrids {
    private TextbookGrids() {
    }

    /**
     * The two-area worked example (Saadat, Power System Analysis, ch. 12, from memory), on a
     * 1000 MVA base at 60 Hz: D in pu MW/pu Hz → MW/Hz is D·1000/60 (0.6 → 10, 0.9 → 15); the
     * synchronizing coefficient 2.0 pu enters the example's block diagram as ΔP12 = (Ps/s)(Δω1 − Δω2) with
     * Δω in pu of speed, i.e. dP12/dt = Ps·S/f0·(Δf1 − Δf2) MW/s; our tie law is dP/dt = 2πT(Δf1 − Δf2), so
     * T = Ps·S/(2π·f0) = 2.0·1000/(2π·60) ≈ 5.31 MW/rad. (Reading 2.0 pu as 2000 MW/rad gives a 2 Hz swing
     * the example's plots do not show; the steady state is the same either way.) Governor/turbine time constants 0.2/0.5 s and
     * 0.3/0.6 s as in the same example (from memory; they affect only the transient).
     */
    static final double TEXTBOOK_TIE_MW_PER_RAD = 2.0 * 1000 / (2 * Math.PI * 60);

    static Grid twoArea() {
        return twoArea(TEXTBOOK_TIE_MW_PER_RAD);
    }

    /** The same two areas with another tie strength, MW/rad. */
    static Grid twoArea(double synchronizingMwPerRad) {
        GridBuilder b = new GridBuilder("two-area-textbook");
        b.area("area1").nominalFrequencyHz(60).ratingMva(1000).inertiaS(5).dampingMwPerHz(0.6 * 1000 / 60)
                .aceConvention(AceConvention.NORTH_AMERICAN).biasMwPer01Hz(-20.6 * 1000 / 60 / 10);
        b.area("area2").nominalFrequencyHz(60).ratingMva(1000).inertiaS(4).dampingMwPerHz(0.9 * 1000 / 60)
                .aceConvention(AceConvention.NORTH_AMERICAN).biasMwPer01Hz(-16.9 * 1000 / 60 / 10);
        b.tie("tie12", "area1", "area2").synchronizingMwPerRad(synchronizingMwPerRad);
        b.unit("gen1", "area1").nonReheat(0.5).governorTimeConstantS(0.2).ratingMw(1000).droopPct(5)
                .initialOutputMw(500);
        b.unit("gen2", "area2").nonReheat(0.6).governorTimeConstantS(0.3).ratingMw(1000).droopPct(6.25)
                .initialOutputMw(500);
        b.load("load1", "area1").baseMw(500);
        b.load("load2", "area2").baseMw(500);
        return b.build();
    }

    /** One 50 Hz area, 1000 MVA, H = 5 s, D = 20 MW/Hz, one 1000 MW non-reheat unit with 5 % droop. */
    static Grid singleArea(double droopPct, double dampingMwPerHz) {
        GridBuilder b = new GridBuilder("single-area");
        b.area("solo").nominalFrequencyHz(50).ratingMva(1000).inertiaS(5).dampingMwPerHz(dampingMwPerHz).kMwPerHz(420);
        b.unit("g", "solo").nonReheat(0.4).governorTimeConstantS(0.2).ratingMw(1000).droopPct(droopPct)
                .initialOutputMw(600);
        b.load("l", "solo").baseMw(600);
        return b.build();
    }
}
