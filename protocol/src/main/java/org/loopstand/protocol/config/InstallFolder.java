package org.loopstand.protocol.config;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Where shipped configuration is read from. The launcher exports the folder it lives in as
 * {@code LOOPSTAND_HOME} and keeps the user's working directory, so a path the user types resolves
 * against where they stand (as with any command-line tool), while the defaults the commands fall back
 * on (the default scenario, test plan, broker configurations, a site named only by its id) come from
 * the install folder. Without {@code LOOPSTAND_HOME} (tests, a bare {@code java} call) the install
 * folder is the working directory.
 */
public final class InstallFolder {
    /** Environment variable the launcher sets to its own folder. */
    public static final String HOME_VARIABLE = "LOOPSTAND_HOME";

    private final Path home;

    private InstallFolder(Path home) {
        this.home = home;
    }

    /** @return the install folder named by {@value #HOME_VARIABLE}, else the working directory */
    public static InstallFolder fromEnvironment() {
        return of(System.getenv());
    }

    /** @param environment variables as {@link System#getenv()} gives them */
    public static InstallFolder of(Map<String, String> environment) {
        String v = environment.get(HOME_VARIABLE);
        return new InstallFolder(Path.of(v == null || v.isBlank() ? "." : v));
    }

    /** @return the install folder itself */
    public Path home() {
        return home;
    }

    /** @param relative a path inside the install folder, e.g. {@code config/plans/standard.yaml} */
    public Path shipped(String relative) {
        return home.resolve(relative);
    }

    /**
     * The site file of a scenario that names its site only by id: beside the scenario (same folder, then a
     * {@code sites/} folder next to the scenario's folder, as in {@code config/scenarios} and
     * {@code config/sites}), then the shipped {@code config/sites/}.
     *
     * @param scenarioFile the scenario file
     * @param siteId       the scenario's {@code siteId:}
     * @return the first of those that exists
     * @throws IllegalArgumentException naming every place looked in when none does
     */
    public Path siteFor(Path scenarioFile, String siteId) {
        return findSite(scenarioFile, siteId).orElseThrow(() -> new IllegalArgumentException(noSite(scenarioFile, siteId)
                + "; give --site FILE"));
    }

    /** @return the first place of {@link #siteCandidates} that holds a file, empty when none does */
    public Optional<Path> findSite(Path file, String siteId) {
        return siteCandidates(file, siteId).stream().filter(Files::isRegularFile).findFirst();
    }

    /** @return "no site file for siteId … of FILE (looked for …)", for a refusal when {@link #findSite} found none */
    public String noSite(Path file, String siteId) {
        return "no site file for siteId '" + siteId + "' of " + siteIdAt(file) + " (looked for "
                + String.join(", ", siteCandidates(file, siteId).stream().map(Path::toString).toList()) + ")";
    }

    /** @return file:line:column of the file's {@code siteId:} value (or the old {@code site:}), else the file */
    private static String siteIdAt(Path file) {
        try {
            if (YamlNode.read(file) instanceof YamlNode.Mapping m) {
                YamlNode.Entry e = m.entries().containsKey("siteId") ? m.entries().get("siteId") : m.entries().get("site");
                if (e != null) {
                    return e.value().location().toString();
                }
            }
        } catch (ConfigFileException e) {
            // unreadable: its own reader refuses it at its line; here the file alone
        }
        return file.toString();
    }

    /** @return the places {@link #siteFor} looks, in order, without repeats */
    public List<Path> siteCandidates(Path scenarioFile, String siteId) {
        String name = siteId + ".yaml";
        Path dir = scenarioFile.toAbsolutePath().normalize().getParent();
        List<Path> out = new ArrayList<>();
        if (dir != null) {
            addOnce(out, dir.resolve(name));
            if (dir.getParent() != null) {
                addOnce(out, dir.getParent().resolve("sites").resolve(name));
            }
        }
        addOnce(out, home.resolve("config").resolve("sites").resolve(name));
        return out;
    }

    private static void addOnce(List<Path> out, Path p) {
        Path n = p.toAbsolutePath().normalize();
        if (out.stream().noneMatch(q -> q.toAbsolutePath().normalize().equals(n))) {
            out.add(p);
        }
    }
}
