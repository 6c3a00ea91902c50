package org.risetrace.bench;

import com.sun.management.GarbageCollectionNotificationInfo;

import javax.management.NotificationEmitter;
import javax.management.NotificationListener;
import javax.management.openmbean.CompositeData;
import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.lang.management.MemoryUsage;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * Heap use while something runs, from the JVM's own management beans: the peak of the heap in use (every pool at
 * the same moment, just before each collection, when the heap is fullest, and at the end: the collectors'
 * notifications), the sum of every pool's own peak ({@link MemoryPoolMXBean#getPeakUsage}; the pools peak at
 * different moments, so this overstates the heap's peak) and the largest heap left after any collection (the live
 * data, what the heap needs).
 */
final class HeapWatch implements AutoCloseable {
    private final List<MemoryPoolMXBean> pools = new ArrayList<>();
    private final List<NotificationEmitter> emitters = new ArrayList<>();
    private volatile long maxAfterGc, maxBeforeGc;
    private final NotificationListener listener = (n, h) -> {
        if (!GarbageCollectionNotificationInfo.GARBAGE_COLLECTION_NOTIFICATION.equals(n.getType())) return;
        GarbageCollectionNotificationInfo info = GarbageCollectionNotificationInfo.from((CompositeData) n.getUserData());
        long used = 0, before = 0;
        for (Map.Entry<String, MemoryUsage> e : info.getGcInfo().getMemoryUsageAfterGc().entrySet())
            if (isHeap(e.getKey())) used += e.getValue().getUsed();
        for (Map.Entry<String, MemoryUsage> e : info.getGcInfo().getMemoryUsageBeforeGc().entrySet())
            if (isHeap(e.getKey())) before += e.getValue().getUsed();
        synchronized (this) {
            maxAfterGc = Math.max(maxAfterGc, used);
            maxBeforeGc = Math.max(maxBeforeGc, before);
        }
    };

    HeapWatch() {
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans())
            if (p.getType() == MemoryType.HEAP) pools.add(p);
        System.gc();
        for (MemoryPoolMXBean p : pools) p.resetPeakUsage();
        for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans())
            if (gc instanceof NotificationEmitter e) {
                e.addNotificationListener(listener, null, null);
                emitters.add(e);
            }
    }

    private boolean isHeap(String pool) {
        for (MemoryPoolMXBean p : pools) if (p.getName().equals(pool)) return true;
        return false;
    }

    /** Heap in use after full collections (three, until it stops falling), bytes. */
    static long usedAfterFullGc() {
        long used = Long.MAX_VALUE;
        for (int i = 0; i < 3; i++) {
            fullCollection();
            long now = ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed();
            if (now >= used) break;
            used = now;
        }
        return used;
    }

    /**
     * {@code System.gc()} until the full collector has run (at most about 2 s): while another thread is inside a JNI
     * critical region (the PNG inflater of a frame being read) the JVM holds the GC locker and may skip the
     * requested collection. Seen on the 3,000-frame run: a "live" sample then counted the garbage too (156 MB
     * where the full collections around it left 94-112 MB).
     */
    static void fullCollection() {
        long before = fullCollections();
        for (int k = 0; k < 200; k++) {
            System.gc();
            if (fullCollections() > before) return;
            try {
                Thread.sleep(10);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
    }

    /** Collections so far of the collectors that collect the whole heap (not the young generation alone). */
    private static long fullCollections() {
        long n = 0;
        for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
            String name = gc.getName();
            if (name.contains("Young") || name.equals("Copy") || name.contains("Scavenge") || name.contains("ParNew")
                    || name.contains("Concurrent"))
                continue;
            n += Math.max(0, gc.getCollectionCount());
        }
        return n;
    }

    /** Sum of the heap pools' peaks since this watch began, bytes. */
    long poolPeakBytes() {
        long sum = 0;
        for (MemoryPoolMXBean p : pools) sum += p.getPeakUsage().getUsed();
        return sum;
    }

    /**
     * The peak of the heap in use since this watch began, bytes: the largest total of all pools just before a
     * collection (allocation only adds between collections, so the heap is fullest then) or now.
     */
    long peakInUseBytes() {
        long now = ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed();
        synchronized (this) {
            return Math.max(maxBeforeGc, now);
        }
    }

    /** The largest heap in use right after a collection since this watch began, bytes (0 if none ran). */
    long maxAfterGcBytes() {
        return maxAfterGc;
    }

    @Override
    public void close() {
        for (NotificationEmitter e : emitters) {
            try {
                e.removeNotificationListener(listener);
            } catch (javax.management.ListenerNotFoundException ignored) {
                // already gone
            }
        }
    }
}
