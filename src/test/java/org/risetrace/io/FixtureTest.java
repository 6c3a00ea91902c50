package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Files made by other software (ImageMagick 6.9.11, libtiff 4.5 tiffcp, netpbm 11; commands in
 * fixtures/import/README.md) from one source pattern, count(x, y) = 27315 + 37 x + 101 y on 64 x 48 pixels.
 * Every container, compression, layout and byte order must give the same counts.
 */
class FixtureTest {
    static Path fixture(String name) {
        try {
            return Path.of(FixtureTest.class.getResource("/fixtures/import/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    static List<Path> fixtures(String prefix) throws IOException {
        try (Stream<Path> s = Files.list(fixture("README.md").getParent())) {
            return s.filter(p -> p.getFileName().toString().startsWith(prefix)).sorted().toList();
        }
    }

    @Test
    void everySixteenBitFixtureGivesThePatternCounts() throws IOException {
        List<Path> files = fixtures("u16-");
        // 16 TIFF (4 compressions x strips/tiles x 2 byte orders) + 2 partial strip/tile + 2 with predictor
        // + 2 PNG + 3 PGM
        assertEquals(25, files.size(), files.toString());
        for (Path f : files) {
            Frame frame = FrameReaders.read(f, ReadContext.of(Profiles.load("u16-centikelvin")));
            assertEquals(64, frame.width(), f.toString());
            assertEquals(48, frame.height(), f.toString());
            assertEquals(16, frame.decoding().bitDepth(), f.toString());
            for (int y = 0; y < 48; y++)
                for (int x = 0; x < 64; x++) {
                    // u16-centikelvin: 0.01 K per count, 0 degC = 273.15 K (SI)
                    double expected = TestImages.count(x, y) * 0.01 - 273.15;
                    assertEquals(expected, frame.at(x, y), 1e-4, f.getFileName() + " pixel " + x + "," + y);
                }
        }
    }

    @Test
    void tiffDetailNamesCompressionLayoutAndByteOrder() {
        Frame f = FrameReaders.read(fixture("u16-zip-predictor-tiles-msb.tif"), ReadContext.defaults());
        String d = f.decoding().detail();
        assertTrue(d.contains("Deflate") && d.contains("tiled") && d.contains("big-endian")
                && d.contains("predictor"), d);
        Frame g = FrameReaders.read(fixture("u16-packbits-strips-lsb.tif"), ReadContext.defaults());
        assertTrue(g.decoding().detail().contains("PackBits") && g.decoding().detail().contains("little-endian"),
                g.decoding().detail());
    }

    @Test
    void floatTiffFromImageMagickHoldsItsNormalisedSamples() throws IOException {
        List<Path> files = fixtures("f32-");
        assertEquals(3, files.size());
        for (Path f : files) {
            Frame frame = FrameReaders.read(f, ReadContext.of(Profiles.load("f32-celsius")));
            assertEquals(32, frame.decoding().bitDepth());
            for (int y = 0; y < 48; y++)
                for (int x = 0; x < 64; x++) {
                    // ImageMagick writes floating-point TIFF samples as value / QuantumRange (65535 at Q16)
                    double expected = TestImages.count(x, y) / 65535.0;
                    assertEquals(expected, frame.at(x, y), 1e-6, f.getFileName() + " pixel " + x + "," + y);
                }
        }
    }

    @Test
    void eightBitGreyFixturesMapThroughTheSpan() throws IOException {
        double[] span = {20.0, 45.5};
        for (String name : new String[]{"grey8-imagemagick.png", "grey8-imagemagick.tif", "grey8-imagemagick.bmp",
                "grey8-imagemagick.jpg"}) {
            Frame frame = FrameReaders.read(fixture(name), new ReadContext(Profiles.load("u8-span"), span,
                    ReadContext.DEFAULT_MAX_PIXELS));
            boolean lossy = name.endsWith(".jpg");
            for (int y = 0; y < 48; y++)
                for (int x = 0; x < 64; x++) {
                    int grey = (3 * x + 5 * y) & 0xFF;
                    double expected = span[0] + (span[1] - span[0]) * grey / 255.0; // linear span, by definition
                    // JPEG at quality 100 is still lossy: allow 3 grey levels (common practice)
                    double tol = lossy ? 3 * (span[1] - span[0]) / 255.0 : 1e-4;
                    assertEquals(expected, frame.at(x, y), tol, name + " pixel " + x + "," + y);
                }
        }
    }

    @Test
    void colourGradientFromImageMagickIsRefused() {
        org.risetrace.frame.InputRejected e = org.junit.jupiter.api.Assertions.assertThrows(
                org.risetrace.frame.InputRejected.class,
                () -> FrameReaders.read(fixture("colour-gradient.png"), ReadContext.defaults()));
        assertTrue(e.getMessage().contains("colour-gradient.png")
                && e.getMessage().contains("colour palette image: export radiometric or greyscale frames"), e.getMessage());
    }
}
