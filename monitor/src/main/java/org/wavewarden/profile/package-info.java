/**
 * The profile stage: the bounded per-wave summary a scan produces and the results schema stores
 * ({@link org.wavewarden.profile.WaveProfile}: each column's {@code ColumnTally}, joint tallies of configured pairs,
 * the design's PSU sums), frequency tables of numbers and categories, the columns added, retyped and dropped between
 * two waves ({@code SchemaChanges}), and the project's one open-addressing index
 * ({@link org.wavewarden.profile.ValueIndex}) and one quantile function ({@link org.wavewarden.profile.Quantiles}).
 */
package org.wavewarden.profile;
