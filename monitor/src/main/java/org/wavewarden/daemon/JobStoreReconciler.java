package org.wavewarden.daemon;

import org.quartz.CronTrigger;
import org.quartz.JobExecutionContext;
import org.quartz.JobKey;
import org.quartz.Scheduler;
import org.quartz.SchedulerException;
import org.quartz.Trigger;
import org.quartz.TriggerKey;
import org.quartz.impl.matchers.GroupMatcher;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.DatasetConfig;

import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;

/**
 * Brings the persistent job store in line with the config when a daemon starts. The clustered store outlives any
 * one config: a dataset removed or renamed there would otherwise keep its trigger and fire forever, failing each
 * time. Jobs and triggers of the daemon's group whose dataset is not configured are deleted (logged once, by
 * name); a changed schedule is logged here and replaced when the daemon schedules its datasets.
 */
final class JobStoreReconciler {

    private static final Logger LOG = LoggerFactory.getLogger(JobStoreReconciler.class);
    /** Scheduler-context key of the configured dataset names, read by each firing. */
    static final String CONFIGURED = "wavewarden.configuredDatasets";

    private JobStoreReconciler() {
    }

    static void reconcile(Scheduler scheduler, List<DatasetConfig> datasets) throws SchedulerException {
        Set<String> configured = datasets.stream().map(DatasetConfig::name).collect(Collectors.toUnmodifiableSet());
        scheduler.getContext().put(CONFIGURED, configured);
        Set<String> removed = new TreeSet<>();
        for (JobKey job : scheduler.getJobKeys(GroupMatcher.jobGroupEquals(Daemon.GROUP))) {
            if (!configured.contains(job.getName())) {
                scheduler.deleteJob(job); // its triggers go with it
                removed.add(job.getName());
            }
        }
        for (TriggerKey trigger : scheduler.getTriggerKeys(GroupMatcher.triggerGroupEquals(Daemon.GROUP))) {
            if (!configured.contains(trigger.getName())) {
                scheduler.unscheduleJob(trigger);
                removed.add(trigger.getName());
            }
        }
        if (!removed.isEmpty()) {
            LOG.warn("the job store held {} dataset(s) that are no longer in the config; their schedules are"
                    + " deleted: {}", removed.size(), removed);
        }
        for (DatasetConfig d : datasets) {
            String wanted = d.schedule() == null ? Daemon.DEFAULT_SCHEDULE : d.schedule();
            Trigger stored = scheduler.getTrigger(TriggerKey.triggerKey(d.name(), Daemon.GROUP));
            if (stored instanceof CronTrigger cron && !cron.getCronExpression().equals(wanted)) {
                LOG.info("schedule of dataset {} changed from '{}' to '{}'", d.name(), cron.getCronExpression(),
                        wanted);
            }
        }
    }

    /**
     * Whether a firing's dataset is in this daemon's config. One that is not can only come from another instance
     * that still runs an older config (re-adding the job after this one removed it): it is skipped with one line,
     * and its job deleted, instead of failing with a stack trace on every firing.
     */
    static boolean configured(JobExecutionContext context, String dataset) {
        Object names;
        try {
            names = context.getScheduler().getContext().get(CONFIGURED);
        } catch (SchedulerException e) {
            return true;
        }
        if (!(names instanceof Set<?> set) || set.contains(dataset)) {
            return true;
        }
        LOG.warn("a firing of dataset {} was skipped: it is not in this daemon's config (is another instance running"
                + " an older config?); its job is deleted", dataset);
        try {
            context.getScheduler().deleteJob(context.getJobDetail().getKey());
        } catch (SchedulerException e) {
            LOG.warn("could not delete the job of dataset {}: {}", dataset, e.toString());
        }
        return false;
    }
}
