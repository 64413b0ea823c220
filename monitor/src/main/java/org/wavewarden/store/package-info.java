/**
 * The results schema: its Flyway migrations ({@code ResultsSchema}), a run's findings, alerts and wave summaries
 * written in one transaction ({@link org.wavewarden.store.ResultsStore}), and the outbox of what committed runs still
 * owe their sinks and folders ({@link org.wavewarden.store.OutboxStore}).
 */
package org.wavewarden.store;
