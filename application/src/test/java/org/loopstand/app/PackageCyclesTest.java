package org.loopstand.app;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;

/**
 * No package of the project's main sources depends, directly or through others, on itself: layers stay
 * layers (e.g. intake reads config, the cycle reads intake, never the other way round). A dependency is
 * an import or a fully qualified name of a project class in code or docs comments alike.
 */
class PackageCyclesTest {
    private static final List<String> MODULES = List.of("protocol", "report", "plant-emulator", "controller", "application", "bench",
            "application/broker-node");
    private static final Pattern PACKAGE = Pattern.compile("^package ([\\w.]+);", Pattern.MULTILINE);
    private static final Pattern REFERENCE = Pattern.compile("\\b(org\\.loopstand(?:\\.[a-z]\\w*)+)\\.[A-Z]");

    @Test
    void shouldHaveNoCycleBetweenPackages() throws IOException {
        Map<String, Set<String>> deps = new TreeMap<>();
        Path root = Path.of("..").toAbsolutePath().normalize();
        for (String module : MODULES) {
            Path src = root.resolve(module).resolve("src/main/java");
            if (!Files.isDirectory(src)) {
                continue;
            }
            try (Stream<Path> files = Files.walk(src)) {
                files.filter(f -> f.toString().endsWith(".java")).forEach(f -> collect(f, deps));
            }
        }
        assertThat(deps).as("packages found").containsKeys("org.loopstand.controller.intake", "org.loopstand.plant.fault");
        Set<String> inCycles = new TreeSet<>();
        for (String p : deps.keySet()) {
            if (reachable(p, deps).contains(p)) {
                inCycles.add(p + " -> " + new TreeSet<>(deps.get(p)).stream().filter(q -> reachable(q, deps).contains(p)).toList());
            }
        }
        assertThat(inCycles).as("packages on a dependency cycle, each with the dependencies that lead back to it").isEmpty();
    }

    @Test
    void shouldFindACycleWhenThereIsOne() {
        Map<String, Set<String>> deps = new TreeMap<>(Map.of("a", Set.of("b"), "b", Set.of("c"), "c", Set.of("a"), "d", Set.of("a")));
        assertThat(reachable("a", deps)).contains("a");
        assertThat(reachable("d", deps)).doesNotContain("d");
    }

    private static void collect(Path file, Map<String, Set<String>> deps) {
        try {
            String text = Files.readString(file);
            Matcher pkg = PACKAGE.matcher(text);
            if (!pkg.find()) {
                return;
            }
            Set<String> out = deps.computeIfAbsent(pkg.group(1), k -> new TreeSet<>());
            Matcher ref = REFERENCE.matcher(text);
            while (ref.find()) {
                if (!ref.group(1).equals(pkg.group(1))) {
                    out.add(ref.group(1));
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static Set<String> reachable(String from, Map<String, Set<String>> deps) {
        Set<String> seen = new TreeSet<>();
        Deque<String> todo = new ArrayDeque<>(deps.getOrDefault(from, Set.of()));
        while (!todo.isEmpty()) {
            String p = todo.pop();
            if (seen.add(p)) {
                todo.addAll(deps.getOrDefault(p, Set.of()));
            }
        }
        return seen;
    }
}
