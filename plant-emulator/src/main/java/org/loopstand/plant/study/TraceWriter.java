package org.loopstand.plant.study;

import java.io.Closeable;
import java.io.IOException;
import java.io.Writer;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.physics.GridSimulator;

/**
 * Writes trace.csv: {@code time_s}, then every area's {@code .frequency_hz}, every tie's
 * {@code .flow_mw}, every unit's {@code .output_mw} and {@code .setpoint_mw}, every area's
 * {@code .load_mw}; values rounded to 1e-6, '\n' line ends.
 */
public final class TraceWriter implements Closeable {
    private final Writer out;
    private final StringBuilder line = new StringBuilder(4096);

    public TraceWriter(Writer out, Grid grid) throws IOException {
        this.out = out;
        line.append("time_s");
        for (Area a : grid.areas()) {
            line.append(',').append(a.id()).append(".frequency_hz");
        }
        for (TieLine t : grid.ties()) {
            line.append(',').append(t.id()).append(".flow_mw");
        }
        for (GeneratingUnit u : grid.units()) {
            line.append(',').append(u.id()).append(".output_mw");
            line.append(',').append(u.id()).append(".setpoint_mw");
        }
        for (Area a : grid.areas()) {
            line.append(',').append(a.id()).append(".load_mw");
        }
        flushLine();
    }

    public void write(GridSimulator sim) throws IOException {
        Grid grid = sim.grid();
        DecimalText.append(line, sim.timeS());
        for (int a = 0; a < grid.areas().size(); a++) {
            line.append(',');
            DecimalText.append(line, sim.frequencyHz(a));
        }
        for (int t = 0; t < grid.ties().size(); t++) {
            line.append(',');
            DecimalText.append(line, sim.tieFlowMw(t));
        }
        for (int u = 0; u < grid.units().size(); u++) {
            line.append(',');
            DecimalText.append(line, sim.outputMw(u));
            line.append(',');
            DecimalText.append(line, sim.loadReferenceMw(u));
        }
        for (int a = 0; a < grid.areas().size(); a++) {
            line.append(',');
            DecimalText.append(line, sim.loadMw(a));
        }
        flushLine();
    }

    private void flushLine() throws IOException {
        line.append('\n');
        out.append(line);
        line.setLength(0);
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
