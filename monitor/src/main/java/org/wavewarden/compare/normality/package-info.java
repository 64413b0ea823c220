/** Normality of a frequency table: the Shapiro-Wilk test and the moment estimators of skewness and kurtosis. */
package org.wavewarden.compare.normality;
