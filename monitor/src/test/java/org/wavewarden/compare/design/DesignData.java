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
 * {@code wave,stratum,psu,w,y,bin,cat}, and seeded random designs for property tests.
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

    private DesignData() {
    }

    static Wave wave(String file, String wave) {
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
}
