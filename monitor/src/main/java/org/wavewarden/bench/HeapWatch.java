package org.wavewarden.bench;

import com.sun.management.GarbageCollectionNotificationInfo;

import javax.management.NotificationEmitter;
import javax.management.NotificationListener;
import javax.management.openmbean.CompositeData;
import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryMXBean;
import java.lang.management.MemoryUsage;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;

/**
 * Heap use of the JVM while a piece of work runs: the largest used heap seen by sampling every few milliseconds
 * (garbage included, so it depends on the collector's timing) and the largest heap still in use right after a
 * collection (close to the largest live set; zero when no collection ran).
 */
public final class HeapWatch implements AutoCloseable {

    private final MemoryMXBean memory = ManagementFactory.getMemoryMXBean();
    private final AtomicLong peakUsed = new AtomicLong();
    private final AtomicLong peakAfterGc = new AtomicLong();
    private final List<Runnable> detach = new ArrayList<>();
    private final Thread sampler;
    private volatile boolean running = true;

    /** Heap figures of one piece of work, in bytes. */
    public record Heap(long peakUsedSampled, long peakLiveAfterGc) {
    }

    private HeapWatch() {
        NotificationListener listener = (n, handback) -> {
            if (GarbageCollectionNotificationInfo.GARBAGE_COLLECTION_NOTIFICATION.equals(n.getType())) {
                var info = GarbageCollectionNotificationInfo.from((CompositeData) n.getUserData());
                long after = info.getGcInfo().getMemoryUsageAfterGc().values().stream()
                        .mapToLong(MemoryUsage::getUsed).sum();
                long nonHeap = ManagementFactory.getMemoryPoolMXBeans().stream()
                        .filter(p -> p.getType() == java.lang.management.MemoryType.NON_HEAP)
                        .filter(p -> info.getGcInfo().getMemoryUsageAfterGc().containsKey(p.getName()))
                        .mapToLong(p -> info.getGcInfo().getMemoryUsageAfterGc().get(p.getName()).getUsed()).sum();
                peakAfterGc.accumulateAndGet(after - nonHeap, Math::max);
            }
        };
        for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
            if (gc instanceof NotificationEmitter e) {
                e.addNotificationListener(listener, null, null);
                detach.add(() -> {
                    try {
                        e.removeNotificationListener(listener);
                    } catch (javax.management.ListenerNotFoundException ignored) {
                        // already gone
                    }
                });
            }
        }
        sampler = new Thread(() -> {
            while (running) {
                peakUsed.accumulateAndGet(memory.getHeapMemoryUsage().getUsed(), Math::max);
                try {
                    Thread.sleep(5);
                } catch (InterruptedException e) {
                    return;
                }
            }
        }, "heap-watch");
        sampler.setDaemon(true);
        sampler.start();
    }

    public static HeapWatch start() {
        return new HeapWatch();
    }

    /** Stops watching and returns the figures. */
    public Heap stop() {
        running = false;
        sampler.interrupt();
        try {
            sampler.join(1000);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        peakUsed.accumulateAndGet(memory.getHeapMemoryUsage().getUsed(), Math::max);
        detach.forEach(Runnable::run);
        detach.clear();
        return new Heap(peakUsed.get(), peakAfterGc.get());
    }

    @Override
    public void close() {
        if (running || !detach.isEmpty()) {
            stop();
        }
    }
}
