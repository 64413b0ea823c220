package org.wavewarden.compare.design;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * The committed design data sets under {@code design/} in the test resources, columns
 * {@code wave,stratum,psu,w,y,bin,cat} (psu_sums: {@code wave,stratum,psu,w,y,cat} with missing answers, see
 * {@link PsuTotalsTest}), and seeded random designs for property tests.
 *
 * <p>The files were generated in R 4.2.2 with {@code set.seed(20240601)}: weights_only (lognormal weights, waves of
 * 220 and 240), stratified_clustered (4 and 3 strata of 2 to 6 PSUs of 8 to 14 respondents, PSU effects on y, bin and
 * cat, PSU ids restarting in each stratum), lonely_psu (one stratum with a single PSU in each wave), equal_weights
 * (w = 25, waves of 150 and 170). For example, one PSU of stratified_clustered:
 * <pre>
 * m &lt;- sample(8:14, 1); u &lt;- rnorm(1, 0, 4); v &lt;- rnorm(1, 0, 0.8)
 * w &lt;- round(runif(m, 20, 60) * h, 2); y &lt;- round(50 + 2 * h + shift + u + rnorm(m, 0, 6), 3)
 * bin &lt;- rbinom(m, 1, plogis(-0.2 + 0.3 * h - 0.4 + v + shift / 8))
 * pr &lt;- exp(c(0, 0.3 * h + v, 0.2 - v, shift / 4)); cat &lt;- sample(1:4, m, TRUE, pr / sum(pr))
 * </pre>
 */
final class DesignData {

    /** One wave of a data set. */
    record Wave(double[] w, long[] strata, long[] psus, double[] y, boolean[] bin, int[] cat) {

        SurveyDesign design() {
            return SurveyDesign.stratifiedClustered(w, strata, psus);
        }

        SurveyDesign weightsOnly() {
            return SurveyDesign.weightsOnly(w);
        }
    }

    /**
     * One wave of a data set with missing answers, columns {@code wave,stratum,psu,w,y,cat}, {@code NA} read as NaN.
     */
    record Answers(double[] w, long[] strata, long[] psus, double[] y, double[] cat) {

        SurveyDesign design() {
            return SurveyDesign.stratifiedClustered(w, strata, psus);
        }

        /** The design rebuilt from the respondents who answered {@code values} (not a domain: see PsuTotals). */
        SurveyDesign answering(double[] values) {
            int[] keep = answered(values);
            double[] ww = new double[keep.length];
            long[] s = new long[keep.length];
            long[] c = new long[keep.length];
            for (int j = 0; j < keep.length; j++) {
                ww[j] = w[keep[j]];
                s[j] = strata[keep[j]];
                c[j] = psus[keep[j]];
            }
            return SurveyDesign.stratifiedClustered(ww, s, c);
        }

        /** Whether every PSU of the design keeps an answer to {@code values}. */
        boolean everyPsuAnswers(double[] values) {
            return answering(values).psuCount() == design().psuCount();
        }
    }

    private DesignData() {
    }

    static Answers answers(String file, String wave) {
        List<double[]> rows = new ArrayList<>();
        for (String[] f : rows(file, wave)) {
            rows.add(new double[] {Long.parseLong(f[1]), Long.parseLong(f[2]), Double.parseDouble(f[3]),
                    f[4].equals("NA") ? Double.NaN : Double.parseDouble(f[4]),
                    f[5].equals("NA") ? Double.NaN : Double.parseDouble(f[5])});
        }
        return answersOf(rows);
    }

    /** Rows {stratum, psu, w, y, cat}. */
    private static Answers answersOf(List<double[]> rows) {
        int n = rows.size();
        double[] w = new double[n];
        long[] s = new long[n];
        long[] c = new long[n];
        double[] y = new double[n];
        double[] k = new double[n];
        for (int i = 0; i < n; i++) {
            double[] r = rows.get(i);
            s[i] = (long) r[0];
            c[i] = (long) r[1];
            w[i] = r[2];
            y[i] = r[3];
            k[i] = r[4];
        }
        return new Answers(w, s, c, y, k);
    }

    /** Indices of the respondents with an answer (not NaN). */
    static int[] answered(double[] values) {
        return java.util.stream.IntStream.range(0, values.length).filter(i -> !Double.isNaN(values[i])).toArray();
    }

    static Wave wave(String file, String wave) {
        return waveOf(rows(file, wave));
    }

    private static List<String[]> rows(String file, String wave) {
        List<String[]> rows = new ArrayList<>();
        String resource = "/design/" + file + ".csv";
        try (InputStream in = DesignData.class.getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("missing test resource " + resource);
            }
            BufferedReader r = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8));
            r.readLine();
            for (String line = r.readLine(); line != null; line = r.readLine()) {
                String[] f = line.split(",");
                if (f[0].equals(wave)) {
                    rows.add(f);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return rows;
    }

    private static Wave waveOf(List<String[]> rows) {
        int n = rows.size();
        double[] w = new double[n];
        long[] s = new long[n];
        long[] c = new long[n];
        double[] y = new double[n];
        boolean[] b = new boolean[n];
        int[] k = new int[n];
        for (int i = 0; i < n; i++) {
            String[] f = rows.get(i);
            s[i] = Long.parseLong(f[1]);
            c[i] = Long.parseLong(f[2]);
            w[i] = Double.parseDouble(f[3]);
            y[i] = Double.parseDouble(f[4]);
            b[i] = f[5].equals("1");
            k[i] = Integer.parseInt(f[6]);
        }
        return new Wave(w, s, c, y, b, k);
    }

    /** A random stratified cluster wave: strata of 2 to 5 PSUs of 3 to 9 respondents, four categories. */
    static Wave random(Random rnd, int strata, double shift) {
        List<double[]> rows = new ArrayList<>();
        for (int h = 0; h < strata; h++) {
            int psus = 2 + rnd.nextInt(4);
            for (int j = 0; j < psus; j++) {
                double effect = rnd.nextGaussian();
                int m = 3 + rnd.nextInt(7);
                for (int i = 0; i < m; i++) {
                    double y = 10 + shift + h + effect + rnd.nextGaussian() * 2;
                    double cat = Math.floorMod((int) Math.floor(y / 2 + rnd.nextDouble() * 2), 4) + 1;
                    rows.add(new double[] {h, j, 5 + 45 * rnd.nextDouble(), y, y > 11 + h ? 1 : 0, cat});
                }
            }
        }
        int n = rows.size();
        double[] w = new double[n];
        long[] s = new long[n];
        long[] c = new long[n];
        double[] y = new double[n];
        boolean[] b = new boolean[n];
        int[] k = new int[n];
        for (int i = 0; i < n; i++) {
            double[] r = rows.get(i);
            s[i] = (long) r[0];
            c[i] = (long) r[1];
            w[i] = r[2];
            y[i] = r[3];
            b[i] = r[4] == 1;
            k[i] = (int) r[5];
        }
        return new Wave(w, s, c, y, b, k);
    }

    /**
     * A random stratified cluster wave with missing answers: 1 to 4 strata of 1 to 5 PSUs (stratum 0 has 3 to 5, so
     * that answers never lie in a single PSU) of 2 to 9 respondents, four categories. Gaps 0: every answer given;
     * 1: about one in eight missing; 2: besides, every answer of one PSU to y and of another to cat, and with
     * probability 1/3 every answer to y of a whole stratum.
     */
    static Answers randomAnswers(Random rnd, double shift, int gaps) {
        int strata = 1 + rnd.nextInt(4);
        List<double[]> rows = new ArrayList<>();
        List<int[]> psuList = new ArrayList<>();
        for (int h = 0; h < strata; h++) {
            int psus = h == 0 ? 3 + rnd.nextInt(3) : 1 + rnd.nextInt(5);
            for (int j = 0; j < psus; j++) {
                psuList.add(new int[] {h, j});
                double effect = rnd.nextGaussian() * 1.5;
                int m = 2 + rnd.nextInt(8);
                for (int i = 0; i < m; i++) {
                    double y = 20 + shift + h + effect + rnd.nextGaussian() * 3;
                    double cat = Math.floorMod((int) Math.floor(y / 3 + rnd.nextDouble() * 2), 4) + 1;
                    if (gaps > 0 && rnd.nextInt(8) == 0) {
                        y = Double.NaN;
                    }
                    if (gaps > 0 && rnd.nextInt(8) == 0) {
                        cat = Double.NaN;
                    }
                    rows.add(new double[] {h, j, 5 + 45 * rnd.nextDouble(), y, cat});
                }
            }
        }
        if (gaps == 2) {
            int[] silentY = psuList.get(rnd.nextInt(psuList.size()));
            int[] silentCat = psuList.get(rnd.nextInt(psuList.size()));
            int silentStratum = strata > 1 && rnd.nextInt(3) == 0 ? 1 + rnd.nextInt(strata - 1) : -1;
            for (double[] r : rows) {
                if ((r[0] == silentY[0] && r[1] == silentY[1]) || r[0] == silentStratum) {
                    r[3] = Double.NaN;
                }
                if (r[0] == silentCat[0] && r[1] == silentCat[1]) {
                    r[4] = Double.NaN;
                }
            }
        }
        return answersOf(rows);
    }
}
