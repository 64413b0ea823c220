/**
 * Orchestration only: a check runs read -> screen -> compare -> judge -> store -> deliver
 * ({@link org.wavewarden.pipeline.WaveJudge}), with each wave screened once and that screened wave handed to every
 * later stage; the panel's pairing, release comparisons and the digest are run from here too. Rules of screening,
 * comparison and judgement live in their stages' packages, not here.
 */
package org.wavewarden.pipeline;
