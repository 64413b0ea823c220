package org.wavewarden.daemon;

import org.quartz.DisallowConcurrentExecution;
import org.quartz.Job;
import org.quartz.JobExecutionContext;
import org.quartz.JobExecutionException;

/**
 * The Quartz job of one dataset. {@link DisallowConcurrentExecution} holds across the cluster with the JDBC job
 * store, so two instances never judge the same dataset at once; the job requests recovery, so a firing whose
 * instance died is run again by another.
 */
@DisallowConcurrentExecution
public final class JudgeDatasetJob implements Job {

    static final String DATASET = "dataset";
    /** Trigger data: what a firing does; absent for the dataset's schedule (judge, then deliver). */
    static final String MODE = "mode";
    /** Only carry out what is owed and due ({@link Daemon#redeliver}). */
    static final String REDELIVER = "redeliver";

    private final Daemon daemon;

    JudgeDatasetJob(Daemon daemon) {
        this.daemon = daemon;
    }

    @Override
    public void execute(JobExecutionContext context) throws JobExecutionException {
        String dataset = context.getMergedJobDataMap().getString(DATASET);
        if (!JobStoreReconciler.configured(context, dataset)) {
            return;
        }
        if (REDELIVER.equals(context.getMergedJobDataMap().getString(MODE))) {
            daemon.redeliver(dataset);
        } else {
            daemon.fireWithRetries(dataset);
        }
    }
}
