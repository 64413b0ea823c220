/**
 * The {@code soak} command: the daemon in a child JVM under seeded faults ({@code FaultInjector}, the loopback
 * database forwarder {@code TcpProxy}, the idempotent webhook receiver {@code WebhookReceiver}), waves produced while
 * it runs, and an audit of the results schema and the receivers' evidence ({@code SoakAudit}).
 */
package org.wavewarden.soak;
