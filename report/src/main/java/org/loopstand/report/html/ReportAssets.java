package org.loopstand.report.html;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;

/**
 * The files inlined into every report: uPlot from its webjar, and the report's own CSS and script.
 * The plant's live view serves the same uPlot files.
 */
public final class ReportAssets {
    /** uPlot version bundled (matches the webjar dependency). */
    static final String UPLOT_VERSION = "1.6.30";
    private static final String UPLOT_DIR = "META-INF/resources/webjars/uplot/" + UPLOT_VERSION + "/";

    private ReportAssets() {
    }

    public static String uplotJs() {
        return load(UPLOT_DIR + "dist/uPlot.iife.min.js");
    }

    public static String uplotCss() {
        return load(UPLOT_DIR + "dist/uPlot.min.css");
    }

    public static String uplotLicense() {
        return load(UPLOT_DIR + "LICENSE");
    }

    static String reportCss() {
        return load("org/loopstand/report/html/report.css");
    }

    static String reportJs() {
        return load("org/loopstand/report/html/report.js");
    }

    private static String load(String resource) {
        try (InputStream in = ReportAssets.class.getClassLoader().getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("report asset missing from the class path: " + resource
                        + " (is the org.webjars.npm:uplot:" + UPLOT_VERSION + " dependency present?)");
            }
            String text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
            // Inlined text must not close the element it sits in.
            if (text.toLowerCase(java.util.Locale.ROOT).contains("</script") || text.toLowerCase(java.util.Locale.ROOT).contains("</style")) {
                throw new IllegalStateException("report asset " + resource + " contains a closing script/style tag");
            }
            return text;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read report asset " + resource, e);
        }
    }
}
