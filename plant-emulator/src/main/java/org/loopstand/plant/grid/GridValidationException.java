package org.loopstand.plant.grid;

import java.util.List;
import java.util.stream.Collectors;

/** Thrown by {@link GridBuilder#build()} with every problem found, not just the first. */
public final class GridValidationException extends RuntimeException {
    private final transient List<GridProblem> problems;

    public GridValidationException(List<GridProblem> problems) {
        super(problems.size() + " problem(s) in the network description:\n  "
                + problems.stream().map(GridProblem::toString).collect(Collectors.joining("\n  ")));
        this.problems = List.copyOf(problems);
    }

    public List<GridProblem> problems() {
        return problems;
    }
}
