package org.risetrace.report;

import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.UUID;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Future;

/**
 * The images of one report page, rendered on up to two threads (one per core) while the page's text is assembled:
 * {@link #add} starts an image and returns a placeholder for the page, {@link #fill} waits for every image and puts
 * each one's base64 text in its placeholder's place. The page is the same, byte for byte, as when the images are
 * drawn one after another; only the wall time drops (the plots are the page's largest cost).
 */
final class Figures {
    private final String token = "risetrace-figure-" + UUID.randomUUID() + "-";
    private final List<Future<byte[]>> images = new ArrayList<>();
    private ExecutorService pool;

    /** Starts rendering an image; the returned text stands for its base64 in the page until {@link #fill}. */
    String add(Callable<byte[]> png) {
        if (pool == null) {
            int threads = Math.max(1, Math.min(2, Runtime.getRuntime().availableProcessors()));
            // idle threads end after a second, also when the page was never filled (an error while assembling it)
            java.util.concurrent.ThreadPoolExecutor p = new java.util.concurrent.ThreadPoolExecutor(threads, threads,
                    1, java.util.concurrent.TimeUnit.SECONDS, new java.util.concurrent.LinkedBlockingQueue<>(), r -> {
                Thread t = new Thread(r, "risetrace-report-figure");
                t.setDaemon(true);
                return t;
            });
            p.allowCoreThreadTimeOut(true);
            pool = p;
        }
        images.add(pool.submit(png));
        return token + (images.size() - 1) + ";";
    }

    /** The page with every placeholder replaced by its image's base64; rethrows a rendering failure. */
    String fill(String page) {
        try {
            StringBuilder out = new StringBuilder(page.length() + (images.size() << 18));
            int from = 0;
            for (int k = 0; k < images.size(); k++) {
                String mark = token + k + ";";
                int at = page.indexOf(mark, from);
                if (at < 0) throw new IllegalStateException("figure " + k + " has no place in the page");
                out.append(page, from, at).append(Base64.getEncoder().encodeToString(get(images.get(k))));
                from = at + mark.length();
            }
            return out.append(page, from, page.length()).toString();
        } finally {
            if (pool != null) pool.shutdownNow();
        }
    }

    private static byte[] get(Future<byte[]> f) {
        try {
            return f.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("report rendering interrupted", e);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) throw re;
            if (e.getCause() instanceof Error err) throw err;
            throw new IllegalStateException(e.getCause());
        }
    }
}
