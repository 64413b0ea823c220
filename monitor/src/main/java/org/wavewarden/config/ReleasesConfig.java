package org.wavewarden.config;

/**
 * Where a dataset keeps earlier publications of the same wave, for the release comparison. Exactly one of the two
 * is set.
 *
 * @param column        a column of the dataset's table telling each row's release; the release of a wave with the
 *                      greatest value, in the column's own sort order in the database (numbers and dates as such,
 *                      text by the database's collation), is the published one, and it alone is judged
 * @param previousTable a table holding the earlier publication with the same layout ({@code schema.table}, or a
 *                      pattern with {@code {wave}} when the dataset uses {@code tablePattern}); the dataset's own
 *                      table is then the current publication
 */
public record ReleasesConfig(String column, String previousTable) {

    public ReleasesConfig {
        if ((column == null) == (previousTable == null)) {
            throw new IllegalArgumentException("exactly one of column and previousTable, got " + column + " and "
                    + previousTable);
        }
    }

    public boolean inOneTable() {
        return column != null;
    }
}
