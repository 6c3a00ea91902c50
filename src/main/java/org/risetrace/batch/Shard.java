package org.risetrace.batch;

import java.util.ArrayList;
import java.util.List;

/**
 * One of {@code count} parts of a batch, numbered from 1: series sorted by relative path, the k-th (from 0) taken
 * when k % count == index - 1. Deterministic, so every machine of a job array agrees without talking to the others.
 */
public record Shard(int index, int count) {
    public static final Shard ALL = new Shard(1, 1);

    public Shard {
        if (count < 1 || index < 1 || index > count)
            throw new IllegalArgumentException("shard " + index + "/" + count + ": use i/n with 1 <= i <= n");
    }

    /** "i/n". */
    public static Shard parse(String text) {
        String[] p = text.trim().split("/", -1);
        if (p.length != 2) throw new IllegalArgumentException("'" + text + "': use i/n, for example 2/8");
        try {
            return new Shard(Integer.parseInt(p[0].trim()), Integer.parseInt(p[1].trim()));
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException("'" + text + "': use i/n, for example 2/8");
        }
    }

    /** This shard's share of tasks already sorted by relative path. */
    public List<SeriesTask> select(List<SeriesTask> sorted) {
        List<SeriesTask> mine = new ArrayList<>();
        for (int k = 0; k < sorted.size(); k++) if (k % count == index - 1) mine.add(sorted.get(k));
        return mine;
    }

    @Override public String toString() {
        return index + "/" + count;
    }
}
