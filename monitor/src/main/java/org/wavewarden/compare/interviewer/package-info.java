/**
 * Interviewer monitoring within one wave, from the interviewer column's domain tallies: per interviewer the rates
 * of missing and disguised-missing answers and the distributions of key variables, the interviewer effect (the
 * intra-interviewer correlation by the ANOVA estimator with its interval), and the interviewers whose answers stand
 * out beyond chance after false-discovery-rate control, each with the evidence. Interviewers below the minimum
 * workload are counted and not judged.
 */
package org.wavewarden.compare.interviewer;
