package org.loopstand.bench.run;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.HdrHistogram.EncodableHistogram;
import org.HdrHistogram.Histogram;
import org.HdrHistogram.HistogramLogReader;
import org.loopstand.controller.runtime.ControllerAgent;

/** Reads the controller's own cycle start jitter (µs) from its histogram log, warm-up intervals left out. */
final class JitterLog {
    private JitterLog() {
    }

    /** @return jitter of every cycle in the log intervals that start at or after {@code fromEpochMs} */
    static Histogram since(Path hlog, long fromEpochMs) {
        Histogram sum = new Histogram(3);
        sum.setAutoResize(true);
        try (InputStream in = Files.newInputStream(hlog); HistogramLogReader r = new HistogramLogReader(in)) {
            EncodableHistogram eh;
            while ((eh = r.nextIntervalHistogram()) != null) {
                if (eh instanceof Histogram h && ControllerAgent.JITTER_TAG.equals(h.getTag())
                        && h.getStartTimeStamp() >= fromEpochMs) {
                    sum.add(h);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return sum;
    }
}
