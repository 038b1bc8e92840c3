package org.loopstand.plant.study;

/**
 * Writes numbers as plain decimals rounded to 1e-6 (no exponent, trailing zeros dropped), the same
 * bytes on every JVM: faster than String.format and independent of locale.
 */
final class DecimalText {
    private static final long SCALE = 1_000_000L;

    private DecimalText() {
    }

    static void append(StringBuilder out, double value) {
        if (!Double.isFinite(value)) {
            out.append(Double.isNaN(value) ? "NaN" : value > 0 ? "Infinity" : "-Infinity");
            return;
        }
        long scaled = Math.round(value * SCALE);
        if (scaled < 0) {
            out.append('-');
            scaled = -scaled;
        }
        out.append(scaled / SCALE);
        long frac = scaled % SCALE;
        if (frac != 0) {
            out.append('.');
            int digits = 6;
            while (frac % 10 == 0) {
                frac /= 10;
                digits--;
            }
            String f = Long.toString(frac);
            for (int i = f.length(); i < digits; i++) {
                out.append('0');
            }
            out.append(f);
        }
    }

    static String of(double value) {
        StringBuilder sb = new StringBuilder();
        append(sb, value);
        return sb.toString();
    }
}
