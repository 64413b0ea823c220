/**
 * Alert sinks: JSON Lines files and signed webhooks, each with its filter, retries with backoff and dead letters for
 * what it gave up on. Sinks are handed alerts from stored results; they never judge.
 */
package org.wavewarden.deliver.sink;
