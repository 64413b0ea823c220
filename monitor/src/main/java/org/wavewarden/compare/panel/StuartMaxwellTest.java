package org.wavewarden.compare.panel;

import org.wavewarden.compare.Checks;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Collectors;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealVector;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.TestResult;

/**
 * The Stuart-Maxwell test that a categorical answer has the same marginal distribution at two waves when the same
 * respondents answered both: the k-category generalisation of McNemar's test.
 *
 * <p>From the k x k table n (rows: the earlier wave, columns: the later wave), with row margins n_i. and column
 * margins n_.i, let d_i = n_i. - n_.i and V_ij = -(n_ij + n_ji) for i != j, V_ii = n_i. + n_.i - 2 n_ii, over the
 * first k - 1 categories (the k-th is implied, the margins summing to n at both waves). Then X2 = d' V^-1 d on k - 1
 * degrees of freedom (Stuart, A. (1955), "A test for homogeneity of the marginal distributions in a two-way
 * classification", Biometrika 42, 412-416; Maxwell, A. E. (1970), "Comparing the classification of subjects by two
 * independent judges", British Journal of Psychiatry 116, 651-655; as statsmodels'
 * {@code SquareTable.homogeneity(method = "stuart_maxwell")} computes it). For k = 2 it is
 * McNemar's X2 without continuity correction.
 *
 * <p>When V is singular: V is the Laplacian of the graph in which categories i and j are joined when n_ij + n_ji &gt;
 * 0, reduced by one category; it is invertible exactly when that graph is connected. Three cases break it, and each
 * is handled without changing what the test asks:
 * <ul>
 *   <li>a category nobody chose at either wave (both margins 0) is dropped;</li>
 *   <li>a category with V_ii = 0, chosen only by respondents who kept it at both waves, is dropped: its d_i is 0 and
 *       its row and column of V are 0, so it carries no information about change and its share cannot move;</li>
 *   <li>when the remaining categories fall into groups that exchange no respondents, each group's margins must
 *       balance on their own; X2 is the sum of the statistic computed within each group (one category of each group
 *       left out), on the sum of their degrees of freedom. This is d' V^+ d with the Moore-Penrose inverse of the
 *       full k x k V, with df its rank.</li>
 * </ul>
 * The degrees of freedom are thus (categories entering the statistic) - (groups), k - 1 when nothing was dropped.
 * A table in which nobody changed answer gives X2 = 0 on 0 df with p = 1. statsmodels instead reports NaN for a
 * singular V, and keeps k - 1 df when the category it leaves out happens to be the only-diagonal one.
 *
 * <p>The effect for the verdict is the share that moved most, in percentage points, p_after,i - p_before,i, with a
 * Wald interval whose variance accounts for the pairing: collapsing the table to category i versus the rest gives a
 * 2 x 2 table with b = n_i. - n_ii and c = n_.i - n_ii discordant pairs, and the variance of (c - b)/n is
 * (b + c)/n^2 - (c - b)^2/n^3 = (n_i. + n_.i - 2 n_ii)/n^2 - (n_i. - n_.i)^2/n^3 (Agresti 2007, An Introduction to
 * Categorical Data Analysis, 2nd ed., section 8.1; the interval of epibasix's {@code mcNemar} without its 1/n
 * continuity correction). The Wald form is used because it is closed form in the table's own counts and, for k = 2,
 * is the textbook interval for the difference of paired proportions that goes with McNemar's test (it uses the
 * unrestricted variance, not the test's null variance V_ii / n^2); its coverage is known to fall short of the
 * nominal level when few respondents moved (then the interval may even be [0, 0]), where Newcombe's (1998)
 * score-based interval for paired proportions would do better. The interval is for the category chosen after the
 * fact as the one that moved most; it is not adjusted for that choice.
 */
public final class StuartMaxwellTest {

    public static final String NAME = "Stuart-Maxwell";
    public static final String EFFECT = "largest marginal share change (points)";

    private StuartMaxwellTest() {
    }

    /**
     * @param table      k x k counts of pairs, {@code table[i][j]} the respondents with answer i at the earlier wave
     *                   and j at the later one; at least one pair
     * @param confidence level of the interval of the largest share change, in (0, 1)
     * @throws IllegalArgumentException on a table that is not square, a negative count, no pairs at all, or a
     *                                  confidence outside (0, 1)
     */
    public static StuartMaxwellResult test(long[][] table, double confidence) {
        SquareTables.check(table, "table");
        Checks.confidence(confidence);
        int k = table.length;
        long[] before = SquareTables.rowTotals(table);
        long[] after = SquareTables.columnTotals(table);
        double n = SquareTables.total(before);

        double[] shareBefore = new double[k];
        double[] shareAfter = new double[k];
        double[] diff = new double[k];
        for (int i = 0; i < k; i++) {
            shareBefore[i] = before[i] / n;
            shareAfter[i] = after[i] / n;
            diff[i] = (after[i] - before[i]) / n;
        }

        List<Integer> empty = new ArrayList<>();
        List<Integer> stayersOnly = new ArrayList<>();
        List<List<Integer>> groups = groups(table, before, after, empty, stayersOnly);
        double x2 = 0;
        int df = 0;
        List<Integer> tested = new ArrayList<>();
        for (List<Integer> g : groups) {
            x2 += quadraticForm(table, before, after, g);
            df += g.size() - 1;
            tested.addAll(g);
        }
        tested.sort(null);
        double p = org.wavewarden.compare.categorical.ChiSquareHomogeneity.upperTail(x2, df);
        TestResult test = new TestResult(NAME, x2, df, p, "categories - 1, summed over the groups tested");

        int largest = 0;
        for (int i = 1; i < k; i++) {
            if (Math.abs(diff[i]) > Math.abs(diff[largest])) {
                largest = i;
            }
        }
        double movedAway = before[largest] + after[largest] - 2.0 * table[largest][largest];
        double net = before[largest] - after[largest];
        double variance = Math.max(0, movedAway / (n * n) - net * net / (n * n * n));
        double half = StandardNormal.twoSidedQuantile(confidence) * Math.sqrt(variance);
        EffectSize shift = new EffectSize(EFFECT, 100 * diff[largest], 100 * (diff[largest] - half),
                100 * (diff[largest] + half), confidence);

        return new StuartMaxwellResult(test, shareBefore, shareAfter, diff, shift, largest,
                tested.stream().mapToInt(Integer::intValue).toArray(), note(empty, stayersOnly, groups));
    }

    /**
     * The groups of categories joined by respondents who moved between them (connected components of the flow
     * graph), each ascending and ordered by its smallest category; categories without any mover are collected
     * in {@code empty} or {@code stayersOnly} instead.
     */
    private static List<List<Integer>> groups(long[][] t, long[] before, long[] after, List<Integer> empty,
                                              List<Integer> stayersOnly) {
        int k = t.length;
        int[] parent = new int[k];
        for (int i = 0; i < k; i++) {
            parent[i] = i;
        }
        for (int i = 0; i < k; i++) {
            for (int j = i + 1; j < k; j++) {
                if (t[i][j] + t[j][i] > 0) {
                    parent[find(parent, i)] = find(parent, j);
                }
            }
        }
        List<List<Integer>> groups = new ArrayList<>();
        int[] groupOfRoot = new int[k];
        Arrays.fill(groupOfRoot, -1);
        for (int i = 0; i < k; i++) {
            if (before[i] + after[i] == 0) {
                empty.add(i);
                continue;
            }
            if (before[i] + after[i] - 2 * t[i][i] == 0) {
                stayersOnly.add(i);
                continue;
            }
            int root = find(parent, i);
            if (groupOfRoot[root] < 0) {
                groupOfRoot[root] = groups.size();
                groups.add(new ArrayList<>());
            }
            groups.get(groupOfRoot[root]).add(i);
        }
        return groups;
    }

    private static int find(int[] parent, int i) {
        while (parent[i] != i) {
            parent[i] = parent[parent[i]];
            i = parent[i];
        }
        return i;
    }

    /** d' V^-1 d within one group of at least two categories, its last category left out. */
    private static double quadraticForm(long[][] t, long[] before, long[] after, List<Integer> group) {
        int m = group.size() - 1;
        double[][] v = new double[m][m];
        double[] d = new double[m];
        for (int a = 0; a < m; a++) {
            int i = group.get(a);
            d[a] = before[i] - after[i];
            for (int b = 0; b < m; b++) {
                int j = group.get(b);
                v[a][b] = a == b ? before[i] + after[i] - 2.0 * t[i][i] : -(double) (t[i][j] + t[j][i]);
            }
        }
        RealVector dv = new ArrayRealVector(d, false);
        RealVector solved = new LUDecomposition(new Array2DRowRealMatrix(v, false)).getSolver().solve(dv);
        return dv.dotProduct(solved);
    }

    private static String note(List<Integer> empty, List<Integer> stayersOnly, List<List<Integer>> groups) {
        StringBuilder s = new StringBuilder();
        if (!empty.isEmpty()) {
            s.append(categories(empty)).append(" left out: chosen by nobody at either wave. ");
        }
        if (!stayersOnly.isEmpty()) {
            s.append(categories(stayersOnly)).append(" left out: everyone who chose ")
                    .append(stayersOnly.size() == 1 ? "it" : "one of them")
                    .append(" kept the same answer at both waves, so the share cannot have moved. ");
        }
        if (groups.size() > 1) {
            s.append("No respondent moved between the groups ")
                    .append(groups.stream().map(g -> g.stream().map(String::valueOf)
                            .collect(Collectors.joining(", ", "{", "}"))).collect(Collectors.joining(", ")))
                    .append("; the statistic sums the test within each group, with one degree of freedom fewer per"
                            + " extra group. ");
        }
        return s.toString().trim();
    }

    private static String categories(List<Integer> c) {
        return c.size() == 1 ? "category " + c.get(0) + " was" : "categories " + c + " were";
    }
}
