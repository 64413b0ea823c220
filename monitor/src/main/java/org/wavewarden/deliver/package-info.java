/**
 * The deliver stage: a judged wave's outputs from its findings ({@code findings.json} through
 * {@link org.wavewarden.deliver.FindingsFiles} and the one JSON mapper {@code Json}, the Markdown digest, the
 * console table, the release report), one alert per event ({@link org.wavewarden.deliver.Alerts#group}), and the
 * guards every output passes data through: {@code OutputPaths} for file names, {@code DataText} for inert text.
 */
package org.wavewarden.deliver;
