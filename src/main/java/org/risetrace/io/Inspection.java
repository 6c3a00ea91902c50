package org.risetrace.io;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.util.function.Consumer;

/**
 * Reads frames and summarises each, for {@code risetrace inspect}. A folder is read as one series (its sidecar,
 * order and times); a file named on its own is a one-frame series that still takes profile, span and t_s from
 * a {@code series.json} beside it.
 */
public final class Inspection {
    private Inspection() {
    }

    /**
     * Summarises every frame of every input, in order, handing each summary to {@code each} as soon as it is read.
     *
     * @return the warnings, without repeats
     */
    public static List<String> inspect(List<Path> inputs, String profileOverride, long maxPixels,
                                       Consumer<FrameSummary> each) {
        Set<String> warnings = new LinkedHashSet<>();
        for (Path input : inputs) {
            Series series;
            if (!Files.exists(input)) throw new org.risetrace.frame.InputRejected(input, "no such file or folder");
            if (Files.isDirectory(input)) {
                series = Series.open(input, profileOverride, maxPixels);
            } else {
                Path parent = input.toAbsolutePath().getParent();
                Path sidecar = parent == null ? null : parent.resolve(Sidecars.FILE_NAME);
                boolean isSidecar = input.getFileName().toString().equals(Sidecars.FILE_NAME);
                series = Series.open(List.of(input), sidecar != null && Files.isRegularFile(sidecar) && !isSidecar
                        ? sidecar : null, profileOverride, maxPixels);
            }
            for (String w : series.warnings())
                if (!w.startsWith(Sidecars.FILE_NAME + " lists frame") || Files.isDirectory(input)) warnings.add(w);
            for (int i = 0; i < series.size(); i++) each.accept(FrameSummary.of(series.file(i).toString(), series.read(i)));
        }
        return new ArrayList<>(warnings);
    }
}
