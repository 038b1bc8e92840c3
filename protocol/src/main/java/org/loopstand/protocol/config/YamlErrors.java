package org.loopstand.protocol.config;

import java.io.IOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import org.yaml.snakeyaml.error.Mark;
import org.yaml.snakeyaml.error.MarkedYAMLException;

/**
 * The words a user reads when a YAML file cannot be read at all: where the syntax broke and what the parser expected
 * there, on one line, or why the file could not be opened, without a Java exception's name.
 */
final class YamlErrors {
    private YamlErrors() {
    }

    /**
     * @return {@code file:line:column: not valid YAML: <problem> (<context> at line:column)}, at the place the parser
     *         found the problem (its problem mark), not where the last good token ended
     */
    static String notValid(String fileName, JsonProcessingException e) {
        if (e.getCause() instanceof MarkedYAMLException m && m.getProblemMark() != null) {
            StringBuilder b = new StringBuilder(fileName).append(':').append(at(m.getProblemMark())).append(": not valid YAML: ")
                    .append(oneLine(m.getProblem()));
            if (m.getContext() != null && m.getContextMark() != null) {
                b.append(" (").append(oneLine(m.getContext())).append(" at ").append(at(m.getContextMark())).append(')');
            }
            return b.toString();
        }
        JsonLocation l = e.getLocation();
        String where = l == null ? fileName : fileName + ":" + l.getLineNr() + ":" + l.getColumnNr();
        return where + ": not valid YAML: " + oneLine(e.getOriginalMessage());
    }

    /** @return why the file could not be opened, in words */
    static String cannotRead(Path file, IOException e) {
        if (e instanceof NoSuchFileException) {
            return file + ": no such file (relative paths start at " + Path.of("").toAbsolutePath() + ")";
        }
        if (e instanceof AccessDeniedException) {
            return file + ": not readable (permission denied)";
        }
        return file + ": cannot read: " + (e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage());
    }

    private static String at(Mark m) {
        return (m.getLine() + 1) + ":" + (m.getColumn() + 1);
    }

    private static String oneLine(String s) {
        return s == null ? "" : s.strip().replaceAll("\\s*\\n\\s*", "; ");
    }
}
