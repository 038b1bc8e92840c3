package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.PriorityQueue;

/**
 * Items held until a release time on the run's monotonic clock; equal times leave in the order they
 * came. Bounded: {@link #offer} refuses when full, so the caller can report the loss (nothing is lost
 * silently). Never sleeps: the owner asks for what is due.
 */
final class DelayLine<T> {
    private record Held<T>(long releaseNanos, long order, T item) {
    }

    private final PriorityQueue<Held<T>> queue = new PriorityQueue<>(
            Comparator.<Held<T>>comparingLong(Held::releaseNanos).thenComparingLong(Held::order));
    private final int capacity;
    private long order;

    /** @param capacity most items held at once, ≥ 1 */
    DelayLine(int capacity) {
        if (capacity < 1) {
            throw new IllegalArgumentException("delay line capacity must be >= 1, got " + capacity);
        }
        this.capacity = capacity;
    }

    /** @return false (item not taken) when full */
    boolean offer(long releaseNanos, T item) {
        if (queue.size() >= capacity) {
            return false;
        }
        queue.add(new Held<>(releaseNanos, order++, item));
        return true;
    }

    /** @return every item due at {@code nowNanos}, in release order */
    List<T> due(long nowNanos) {
        List<T> out = new ArrayList<>();
        while (!queue.isEmpty() && queue.peek().releaseNanos() <= nowNanos) {
            out.add(queue.poll().item());
        }
        return out;
    }

    int size() {
        return queue.size();
    }
}
