package org.loopstand.protocol.config;

/** A place in a configuration file, printed as {@code file:line:column} (1-based). */
public record SourceLocation(String file, int line, int column) {
    @Override
    public String toString() {
        return file + ":" + line + ":" + column;
    }
}
