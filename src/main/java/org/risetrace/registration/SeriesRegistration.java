package org.risetrace.registration;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.awt.image.DataBufferUShort;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;

/**
 * Registers a whole series, in order, and writes {@code registration.json} and, on request, the rectified frames
 * as 16-bit PNGs in centikelvin (sample = round((celsius + 273.15) * 100); 0 where the board pixel fell outside
 * the frame), for inspection.
 */
public final class SeriesRegistration {
    public static final String FILE_NAME = "registration.json";
    private static final ObjectMapper MAPPER = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private SeriesRegistration() {
    }

    /**
     * Registers every frame of a series in order (the reference among them). Frame i is read only when it is
     * registered: a frame that cannot be read (cut short, damaged) is recorded as failed with the reader's reason
     * and the others are registered, as the analysis leaves such a frame out (before, one damaged frame ended the
     * whole run).
     *
     * @param count        how many frames
     * @param read         frame i (may throw InputRejected)
     * @param names        frame i's file name
     * @param times        frame i's time in the series, s
     * @param rectifiedDir where rectified frames go (same file name, .png), or null for none
     * @param pxPerMm      resolution of the rectified frames; 0 or less: {@link Rectifier#defaultPxPerMm}
     */
    public static RegistrationReport run(Board board, Frame reference, int count,
                                         java.util.function.IntFunction<Frame> read,
                                         java.util.function.IntFunction<String> names,
                                         java.util.function.IntToDoubleFunction times,
                                         RegistrationConfig config, Path rectifiedDir, double pxPerMm) {
        Registrar registrar = Registrars.create(reference, board, config);
        Rectifier rectifier = null;
        if (rectifiedDir != null) {
            rectifier = new Rectifier(board, pxPerMm > 0 ? pxPerMm : Rectifier.defaultPxPerMm(board));
            try {
                Files.createDirectories(rectifiedDir);
            } catch (IOException e) {
                throw new InputRejected(rectifiedDir, "cannot create the folder: " + e.getMessage(), null, e);
            }
        }
        List<FrameRegistration> results = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            Frame f;
            try {
                f = read.apply(i);
            } catch (InputRejected e) {
                results.add(new FrameRegistration(names.apply(i), times.applyAsDouble(i), RegistrationStatus.FAILED,
                        "cannot be read: " + e.reason(), null, null, 0, Double.NaN, Double.NaN));
                continue;
            }
            FrameRegistration r = registrar.register(f);
            results.add(r);
            if (rectifier != null && r.status().usable()) {
                String name = f.fileName();
                int dot = name.lastIndexOf('.');
                writeCentikelvinPng(rectifier.rectify(f, r.boardToFrame()),
                        rectifiedDir.resolve((dot > 0 ? name.substring(0, dot) : name) + ".png"));
            }
        }
        List<RegistrationReport.Entry> entries = new ArrayList<>();
        for (FrameRegistration r : results) entries.add(RegistrationReport.Entry.of(r));
        return new RegistrationReport(board.outline().frame(), rectifier == null ? null : rectifier.pxPerMm(),
                entries, RegistrationReport.Summary.of(results));
    }

    public static void write(RegistrationReport report, Path file) {
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) Files.createDirectories(parent);
            Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
            MAPPER.writeValue(tmp.toFile(), report);
            Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot write: " + e.getMessage(), null, e);
        }
    }

    public static RegistrationReport read(Path file) {
        try {
            return MAPPER.readValue(file.toFile(), RegistrationReport.class);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read registration file: " + e.getMessage(), null, e);
        }
    }

    /** 16-bit grey PNG in centikelvin; invalid board pixels are 0. */
    public static void writeCentikelvinPng(BoardRaster raster, Path file) {
        BufferedImage img = new BufferedImage(raster.width(), raster.height(), BufferedImage.TYPE_USHORT_GRAY);
        short[] data = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
        float[] c = raster.celsius();
        for (int i = 0; i < c.length; i++) {
            if (!raster.valid()[i]) { data[i] = 0; continue; }
            long v = Math.round((c[i] + 273.15) * 100);
            data[i] = (short) Math.max(1, Math.min(65535, v));
        }
        try {
            if (!ImageIO.write(img, "png", file.toFile())) throw new IOException("no PNG writer");
        } catch (IOException e) {
            throw new InputRejected(file, "cannot write rectified frame: " + e.getMessage(), null, e);
        }
    }
}
