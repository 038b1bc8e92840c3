package org.loopstand.app.campaign;

import java.nio.file.Path;

/** The command line that reruns one scenario of a campaign on its own, with journals and report. */
final class Reproduce {
    private Reproduce() {
    }

    /**
     * @param scenario the run's scenario file (holds the run's seed too; {@code --seed} says it again)
     * @param site     the campaign's site file
     * @return e.g. {@code ./loopstand study runs/…/scenarios/run-0007.yaml --with-controller --site config/sites/demo-site.yaml --seed 123}
     */
    static String command(Path scenario, Path site, long seed) {
        return "./loopstand study " + shown(scenario) + " --with-controller --site " + shown(site) + " --seed " + seed;
    }

    /** @return the path relative to the working folder when it lies under it, else absolute */
    private static String shown(Path p) {
        Path abs = p.toAbsolutePath().normalize();
        Path cwd = Path.of("").toAbsolutePath();
        String s = abs.startsWith(cwd) ? cwd.relativize(abs).toString() : abs.toString();
        return s.contains(" ") ? "'" + s + "'" : s;
    }
}
