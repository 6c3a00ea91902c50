package org.risetrace.web;

import java.security.SecureRandom;
import java.util.Base64;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.function.Function;

/**
 * Long work in the background: one analysis at a time on its own thread (the analysis itself uses every core),
 * the rest queued. The page polls a job's state and progress by its id. The last 32 jobs are kept.
 */
final class Jobs implements AutoCloseable {
    enum State { queued, running, done, failed }

    /** A job: its progress as frames done out of total, and when finished its value or its error line. */
    static final class Job {
        final String id;
        final String label;
        volatile State state = State.queued;
        volatile int done, total;
        volatile Object value;
        volatile String error;

        Job(String id, String label) {
            this.id = id;
            this.label = label;
        }
    }

    private static final int KEPT = 32;
    private final ExecutorService worker = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "workbench-job");
        t.setDaemon(true);
        return t;
    });
    private final Map<String, Job> jobs = new LinkedHashMap<>();
    private final SecureRandom random = new SecureRandom();

    /** Starts work that reports progress to the job it is given; returns the job at once. */
    Job submit(String label, Function<Job, Object> work, Function<Throwable, String> errorLine) {
        byte[] b = new byte[12];
        random.nextBytes(b);
        Job job = new Job(Base64.getUrlEncoder().withoutPadding().encodeToString(b), label);
        synchronized (jobs) {
            jobs.put(job.id, job);
            while (jobs.size() > KEPT) jobs.remove(jobs.keySet().iterator().next());
        }
        worker.execute(() -> {
            job.state = State.running;
            try {
                job.value = work.apply(job);
                job.state = State.done;
            } catch (Throwable t) {
                job.error = errorLine.apply(t);
                job.state = State.failed;
            }
        });
        return job;
    }

    Job get(String id) {
        synchronized (jobs) {
            Job j = jobs.get(id);
            if (j == null) throw WebError.notFound("no job '" + id.replaceAll("[^A-Za-z0-9_-]", "?") + "'");
            return j;
        }
    }

    @Override
    public void close() {
        worker.shutdownNow();
    }
}
