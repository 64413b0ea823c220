package org.wavewarden.demo;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.math.BigDecimal;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;

/**
 * Writes the waves of the demo's second dataset, the invented Harrowmere Household Panel: the same households of the
 * same county re-interviewed every quarter, as CSV files that PostgreSQL loads with
 * {@code COPY survey_demo.panel_wave FROM ... (FORMAT csv, HEADER true)}.
 *
 * <p>The panel is a stratified cluster sample: the six districts are the strata, and within each district 9 to 13
 * villages (enumeration areas) are the primary sampling units, 49 households recruited in each. Answers share a
 * village effect, so design effects are well above 1. Each quarter about 9% of the households drop out and new ones
 * are recruited in the same villages; the weight is calibrated to the county register's household count of each
 * district. One wave, {@link #REVISED_WAVE}, is published twice ({@code revision} 1 and 2). The planted events
 * (see {@code demo-data/README.md} and {@code demo-data/panel-manifest.yaml}) are a conversion of employees to
 * self-employed contractors, an energy price rise, a storm that cuts the water in a few villages, a recalibration of
 * the weights to a revised register, a widened fuel support scheme, a top-up sample drawn from the wrong address
 * list and a processing fault that puts incomes on the wrong households.
 *
 * <p>Generation is deterministic and follows {@link DemoScenarioGenerator}: each (wave, variable) pair draws from its
 * own {@link SplittableRandom} stream, every household draws the same number of values from a stream whatever
 * happens to it, only {@code nextDouble()} is used and all transcendental functions come from {@link StrictMath}.
 */
public final class PanelScenarioGenerator {

    /** The seed the committed panel files were generated with. */
    public static final long SEED = 45L;

    /** The panel's waves, in time order. */
    public static final List<String> WAVES = List.of("2024-Q4", "2025-Q1", "2025-Q2", "2025-Q3");

    /** The wave published twice: revision 1, then revision 2 with corrections, late returns and withdrawals. */
    public static final String REVISED_WAVE = "2025-Q2";

    /** Column order of the CSV files, identical to the table {@code survey_demo.panel_wave}. */
    public static final List<String> COLUMNS = List.of(
            "wave", "revision", "household_id", "district", "village", "weight", "household_size", "rooms",
            "employment_status", "hours_worked", "income_monthly", "energy_bill", "life_satisfaction", "mains_gas",
            "water_outage", "fuel_support");

    static final String[] DISTRICTS = {"GUL", "SAL", "BRN", "TID", "MOR", "KES"};
    static final int[] VILLAGES_PER_DISTRICT = {9, 10, 10, 11, 12, 13};
    /**
     * Households per district in the county register. The 2025 revision adds Gullhaven's new harbour estates and no
     * longer counts Kestle Point's holiday lets as households.
     */
    static final long[] REGISTER = {21_600, 17_100, 15_300, 13_500, 12_600, 9_900};
    static final long[] REGISTER_REVISED = {45_000, 17_100, 15_300, 13_500, 12_600, 6_000};

    private static final int RECRUITED_PER_VILLAGE = 49;
    private static final int[] REFRESHED_PER_VILLAGE = {0, 3, 4, 16};
    private static final double ATTRITION = 0.09;
    private static final double LATE_RETURN = 0.35;   // of the revised wave's drop-outs, answered after release 1
    private static final double WITHDRAWAL = 0.004;   // of the revised wave's release 1, withdrawn before release 2
    private static final Set<String> CENTS_VILLAGES = Set.of("BRN-03", "BRN-07");
    private static final int STORM_VILLAGES = 3;

    // Wave indexes at which the planted events happen.
    private static final int CONTRACTS_FROM = 1;       // 2025-Q1: fish-processing staff become contractors
    private static final int PRICE_CAP_FROM = 1;       // 2025-Q1: energy price cap rises by 18%
    private static final int STORM = 1;                // 2025-Q1: the February storm
    private static final int RECALIBRATED_FROM = 2;    // 2025-Q2: weights calibrated to the revised register
    private static final int FUEL_SUPPORT_FROM = 2;    // 2025-Q2: the fuel support scheme is widened
    private static final int REVISED = 2;              // 2025-Q2: published twice
    private static final int FLAT_LIST_TOP_UP = 3;     // 2025-Q3: top-up sample drawn from a list of small flats
    private static final int INCOME_MISMATCH = 3;      // 2025-Q3: incomes matched to the wrong households

    /** Household size 1..6 (6: six or more): the county register's shares, which the config also names. */
    static final double[] HOUSEHOLD_SIZE = {0.30, 0.34, 0.15, 0.13, 0.06, 0.02};
    private static final double[] HOUSEHOLD_SIZE_FLAT_LIST = {0.78, 0.18, 0.04, 0.0, 0.0, 0.0};
    private static final double[] ROOMS = {0.04, 0.12, 0.22, 0.26, 0.17, 0.10, 0.05, 0.03, 0.01};   // 1..9
    private static final String[] EMPLOYMENT = {"EMP", "SELF", "UNEMP", "INACT", "RETD"};
    private static final double[] EMPLOYMENT_BEFORE = {0.50, 0.09, 0.05, 0.14, 0.22};
    private static final double[] EMPLOYMENT_AFTER = {0.375, 0.215, 0.05, 0.14, 0.22};
    private static final double CONVERTED = 0.25;     // of employees, made contractors in 2025-Q1
    private static final double[] LIFE_SATISFACTION =
            {0.01, 0.01, 0.02, 0.04, 0.05, 0.10, 0.12, 0.22, 0.24, 0.12, 0.07};                        // 0..10
    private static final double[] MAINS_GAS = {0.92, 0.25, 0.15, 0.10, 0.06, 0.05};                  // by district
    private static final double FUEL_SUPPORT_BEFORE = 0.10;
    private static final double FUEL_SUPPORT_AFTER = 0.325;
    private static final double FUEL_SUPPORT_TAKE_UP = 0.25;

    private final long seed;
    private Map<String, String> files;

    /** A generator for the committed panel data. */
    public PanelScenarioGenerator() {
        this(SEED);
    }

    /** A generator with another seed: same scenario, different noise. */
    public PanelScenarioGenerator(long seed) {
        this.seed = seed;
    }

    /** The file name a wave is committed under in the panel data folder. */
    public static String fileName(String wave) {
        return wave + ".csv";
    }

    /** The whole CSV file of one wave, header included; the revised wave's file holds both its releases. */
    public String csv(String wave) {
        if (!WAVES.contains(wave)) {
            throw new IllegalArgumentException("wave must be one of PanelScenarioGenerator.WAVES, was " + wave);
        }
        if (files == null) {
            files = simulate();
        }
        return files.get(wave);
    }

    /** Writes every wave into {@code directory} as {@code <wave>.csv}, replacing existing files. */
    public void writeAll(Path directory) throws IOException {
        Files.createDirectories(directory);
        for (String wave : WAVES) {
            try (Writer out = Files.newBufferedWriter(directory.resolve(fileName(wave)), StandardCharsets.UTF_8)) {
                out.write(csv(wave));
            }
        }
    }

    /** Rewrites the committed panel waves; the optional argument is the target folder (default demo-data/panel). */
    public static void main(String[] args) throws IOException {
        new PanelScenarioGenerator().writeAll(Path.of(args.length > 0 ? args[0] : "demo-data/panel"));
    }

    // ---- the simulation ---------------------------------------------------------------------------------------

    private record Village(String label, int district, double income, double energy, double life, double hours,
                           double gasLogit, double waterLogit) {
    }

    /** One household across the waves: who it is, and its answers as they stand after the latest wave. */
    private static final class Household {
        final long id;
        final Village village;
        final int entry;
        final boolean flatList;
        double adjustment;            // non-response adjustment of the weight, fixed at recruitment
        double zHours;
        double zIncome;
        double zEnergy;
        double zLife;
        int size;
        int rooms;
        int employment;
        boolean gas;
        boolean fuelSupport;
        Integer hours;
        long income;
        long energy;
        int life;
        boolean outage;

        Household(long id, Village village, int entry, boolean flatList) {
            this.id = id;
            this.village = village;
            this.entry = entry;
            this.flatList = flatList;
        }

        boolean working() {
            return employment <= 1;
        }
    }

    private Map<String, String> simulate() {
        List<Village> villages = villages();
        Set<Integer> storm = stormVillages(villages.size());
        double[] lifeCuts = lifeCuts();
        Map<String, String> out = new LinkedHashMap<>();
        List<Household> previous = List.of();
        for (int w = 0; w < WAVES.size(); w++) {
            List<Household> stayers = new ArrayList<>();
            List<Household> late = new ArrayList<>();
            Set<Household> withdrawn = new HashSet<>();
            SplittableRandom attrition = stream(w, "attrition");
            for (Household h : previous) {
                double drop = attrition.nextDouble();
                double lateDraw = attrition.nextDouble();
                double withdrawDraw = attrition.nextDouble();
                if (drop >= ATTRITION) {
                    stayers.add(h);
                    if (w == REVISED && withdrawDraw < WITHDRAWAL) {
                        withdrawn.add(h);
                    }
                } else if (w == REVISED && lateDraw < LATE_RETURN) {
                    late.add(h);
                }
            }
            List<Household> recruits = recruit(w, villages);
            List<Household> interviewed = new ArrayList<>(stayers);
            interviewed.addAll(recruits);
            interviewed.addAll(late);
            interviewed.sort(Comparator.comparingLong(h -> h.id));
            answer(w, interviewed, storm.stream().map(villages::get).toList(), lifeCuts);

            List<Household> first = new ArrayList<>(stayers);
            first.addAll(recruits);
            first.sort(Comparator.comparingLong(h -> h.id));
            Map<Household, Long> published = incomes(w, first);
            StringBuilder csv = new StringBuilder(first.size() * 220);
            csv.append(String.join(",", COLUMNS)).append('\n');
            if (w == REVISED) {
                List<Household> second = new ArrayList<>(first);
                second.removeAll(withdrawn);
                second.addAll(late);
                second.sort(Comparator.comparingLong(h -> h.id));
                Map<Household, Long> corrected = incomes(w, second);
                Map<Household, Long> keyedInCents = new LinkedHashMap<>(published);
                keyedInCents.replaceAll((h, v) -> CENTS_VILLAGES.contains(h.village.label()) ? v * 100 : v);
                write(csv, w, 1, first, keyedInCents);
                write(csv, w, 2, second, corrected);
                previous = second;
            } else {
                write(csv, w, 1, first, published);
                previous = first;
            }
            out.put(WAVES.get(w), csv.toString());
        }
        return out;
    }

    private List<Village> villages() {
        List<Village> out = new ArrayList<>();
        SplittableRandom rnd = stream(-1, "villages");
        for (int d = 0; d < DISTRICTS.length; d++) {
            for (int v = 1; v <= VILLAGES_PER_DISTRICT[d]; v++) {
                String label = DISTRICTS[d] + "-" + (v < 10 ? "0" : "") + v;
                double income = 0.10 * DemoScenarioGenerator.normal(rnd);
                double energy = 0.06 * DemoScenarioGenerator.normal(rnd);
                double life = 0.20 * DemoScenarioGenerator.normal(rnd);
                double hours = 1.5 * DemoScenarioGenerator.normal(rnd);
                double gas = logit(MAINS_GAS[d]) + 0.3 * DemoScenarioGenerator.normal(rnd);
                double water = logit(0.05) + 0.4 * DemoScenarioGenerator.normal(rnd);
                out.add(new Village(label, d, income, energy, life, hours, gas, water));
            }
        }
        return out;
    }

    private Set<Integer> stormVillages(int villages) {
        SplittableRandom rnd = stream(STORM, "water_outage/storm");
        int[] order = new int[villages];
        for (int i = 0; i < villages; i++) {
            order[i] = i;
        }
        Set<Integer> out = new HashSet<>();
        for (int k = 0; k < STORM_VILLAGES; k++) {
            int j = k + (int) (rnd.nextDouble() * (villages - k));
            int t = order[k];
            order[k] = order[j];
            order[j] = t;
            out.add(order[k]);
        }
        return out;
    }

    private List<Household> recruit(int w, List<Village> villages) {
        int perVillage = w == 0 ? RECRUITED_PER_VILLAGE : REFRESHED_PER_VILLAGE[w];
        SplittableRandom rnd = stream(w, "weight");
        List<Household> out = new ArrayList<>();
        long id = 100_000L + 10_000L * w;
        for (Village v : villages) {
            for (int k = 0; k < perVillage; k++) {
                Household h = new Household(++id, v, w, w == FLAT_LIST_TOP_UP);
                h.adjustment = 0.8 + 0.45 * rnd.nextDouble();
                out.add(h);
            }
        }
        return out;
    }

    /** Draws every interviewed household's answers for wave {@code w}, one stream per variable. */
    private void answer(int w, List<Household> households, List<Village> storm, double[] lifeCuts) {
        SplittableRandom size = stream(w, "household_size");
        SplittableRandom rooms = stream(w, "rooms");
        SplittableRandom employment = stream(w, "employment_status");
        SplittableRandom hours = stream(w, "hours_worked");
        SplittableRandom income = stream(w, "income_monthly");
        SplittableRandom energy = stream(w, "energy_bill");
        SplittableRandom life = stream(w, "life_satisfaction");
        SplittableRandom gas = stream(w, "mains_gas");
        SplittableRandom water = stream(w, "water_outage");
        SplittableRandom fuel = stream(w, "fuel_support");
        for (Household h : households) {
            boolean entering = h.entry == w;

            double change = size.nextDouble();
            double draw = size.nextDouble();
            if (entering) {
                h.size = 1 + pick(draw, h.flatList ? HOUSEHOLD_SIZE_FLAT_LIST : HOUSEHOLD_SIZE);
            } else if (change < 0.015) {
                h.size = 1 + pick(draw, HOUSEHOLD_SIZE);
            }

            // The panel follows the household in its home: rooms never change, so rooms are not compared paired.
            draw = rooms.nextDouble();
            if (entering) {
                h.rooms = 1 + pick(draw, ROOMS);
            }

            change = employment.nextDouble();
            draw = employment.nextDouble();
            double converted = employment.nextDouble();
            double[] shares = w >= CONTRACTS_FROM ? EMPLOYMENT_AFTER : EMPLOYMENT_BEFORE;
            if (entering) {
                h.employment = pick(draw, shares);
            } else if (w == CONTRACTS_FROM && h.employment == 0 && converted < CONVERTED) {
                h.employment = 1;
            } else if (change < 0.02) {
                h.employment = pick(draw, shares);
            }

            double noise = DemoScenarioGenerator.normal(hours);
            double z = DemoScenarioGenerator.normal(hours);
            if (entering) {
                h.zHours = z;
            }
            h.hours = h.working()
                    ? (int) Math.max(2, Math.min(72, StrictMath.rint(36 + 8 * h.zHours + h.village.hours()
                    + 2.5 * noise)))
                    : null;

            z = DemoScenarioGenerator.normal(income);
            noise = DemoScenarioGenerator.normal(income);
            if (entering) {
                h.zIncome = z;
            }
            double logIncome = h.working()
                    ? 7.85 + 0.30 * h.zHours + 0.28 * h.zIncome + h.village.income() + 0.15 * noise
                    : 7.55 + 0.35 * h.zIncome + h.village.income() + 0.15 * noise;
            h.income = Math.max(1, StrictMath.round(StrictMath.exp(logIncome)));

            z = DemoScenarioGenerator.normal(energy);
            noise = DemoScenarioGenerator.normal(energy);
            if (entering) {
                h.zEnergy = z;
            }
            double logEnergy = 4.95 + 0.10 * (h.rooms - 4) + 0.22 * h.zEnergy + h.village.energy() + 0.07 * noise
                    + (w >= PRICE_CAP_FROM ? StrictMath.log(1.18) : 0.0);
            h.energy = StrictMath.round(StrictMath.exp(logEnergy));

            z = DemoScenarioGenerator.normal(life);
            noise = DemoScenarioGenerator.normal(life);
            if (entering) {
                h.zLife = z;
            }
            double latent = 0.8 * h.zLife + h.village.life() + 0.55 * noise;
            int score = 0;
            while (score < lifeCuts.length && latent >= lifeCuts[score]) {
                score++;
            }
            h.life = score;

            draw = gas.nextDouble();
            change = gas.nextDouble();
            if (entering || change < 0.004) {
                h.gas = draw < logistic(h.village.gasLogit());
            }

            draw = water.nextDouble();
            double outageRate = w == STORM && storm.contains(h.village) ? 0.9 : logistic(h.village.waterLogit());
            h.outage = draw < outageRate;

            draw = fuel.nextDouble();
            change = fuel.nextDouble();
            double takeUp = fuel.nextDouble();
            double level = w >= FUEL_SUPPORT_FROM ? FUEL_SUPPORT_AFTER : FUEL_SUPPORT_BEFORE;
            if (entering) {
                h.fuelSupport = draw < level;
            } else if (w == FUEL_SUPPORT_FROM && !h.fuelSupport && takeUp < FUEL_SUPPORT_TAKE_UP) {
                h.fuelSupport = true;
            } else if (change < 0.05) {
                h.fuelSupport = draw < level;
            }
        }
    }

    /**
     * The incomes as one release publishes them. In the wave of the processing fault, two thirds of the households
     * had their income answers attached by row number within a batch that had been sorted differently: their incomes
     * are a random permutation of each other's, so the distribution of income is untouched while its link to
     * everything else about the household is lost.
     */
    private Map<Household, Long> incomes(int w, List<Household> release) {
        Map<Household, Long> out = new LinkedHashMap<>();
        release.forEach(h -> out.put(h, h.income));
        if (w != INCOME_MISMATCH) {
            return out;
        }
        SplittableRandom rnd = stream(w, "income_monthly/processing");
        List<Household> batch = new ArrayList<>();
        for (Household h : release) {
            if (rnd.nextDouble() < 2.0 / 3.0) {
                batch.add(h);
            }
        }
        for (int i = batch.size() - 1; i > 0; i--) {
            int j = (int) (rnd.nextDouble() * (i + 1));
            Household a = batch.get(i);
            Household b = batch.get(j);
            long t = out.get(a);
            out.put(a, out.get(b));
            out.put(b, t);
        }
        return out;
    }

    /** Appends one release's rows, each weight calibrated to its district's register count within the release. */
    private void write(StringBuilder csv, int w, int revision, List<Household> release, Map<Household, Long> income) {
        long[] totals = w >= RECALIBRATED_FROM ? REGISTER_REVISED : REGISTER;
        double[] adjustments = new double[DISTRICTS.length];
        for (Household h : release) {
            adjustments[h.village.district()] += h.adjustment;
        }
        String[] row = new String[COLUMNS.size()];
        for (Household h : release) {
            int d = h.village.district();
            row[0] = WAVES.get(w);
            row[1] = Integer.toString(revision);
            row[2] = Long.toString(h.id);
            row[3] = DISTRICTS[d];
            row[4] = h.village.label();
            // the exact binary value rounded, not Double.toString's digits, which differ between JDK versions
            row[5] = new BigDecimal(totals[d] * h.adjustment / adjustments[d]).setScale(3, RoundingMode.HALF_EVEN)
                    .toPlainString();
            row[6] = Integer.toString(h.size);
            row[7] = Integer.toString(h.rooms);
            row[8] = EMPLOYMENT[h.employment];
            row[9] = h.hours == null ? null : Integer.toString(h.hours);
            row[10] = Long.toString(income.get(h));
            row[11] = Long.toString(h.energy);
            row[12] = Integer.toString(h.life);
            row[13] = h.gas ? "yes" : "no";
            row[14] = h.outage ? "yes" : "no";
            row[15] = h.fuelSupport ? "1" : "0";
            for (int c = 0; c < row.length; c++) {
                if (c > 0) {
                    csv.append(',');
                }
                try {
                    DemoScenarioGenerator.appendField(csv, row[c]);
                } catch (IOException e) {
                    throw new UncheckedIOException(e); // a StringBuilder does not throw
                }
            }
            csv.append('\n');
        }
    }

    /** Cut points of the latent well-being score that give the life-satisfaction shares 0..10. */
    private static double[] lifeCuts() {
        double sd = StrictMath.sqrt(0.8 * 0.8 + 0.20 * 0.20 + 0.55 * 0.55);
        double[] cuts = new double[LIFE_SATISFACTION.length - 1];
        double cumulative = 0;
        for (int k = 0; k < cuts.length; k++) {
            cumulative += LIFE_SATISFACTION[k];
            cuts[k] = sd * DemoScenarioGenerator.inverseNormal(cumulative);
        }
        return cuts;
    }

    private SplittableRandom stream(int waveIndex, String variable) {
        return DemoScenarioGenerator.stream(seed, waveIndex, variable);
    }

    private static int pick(double u, double[] shares) {
        double cumulative = 0;
        for (int k = 0; k < shares.length - 1; k++) {
            cumulative += shares[k];
            if (u < cumulative) {
                return k;
            }
        }
        return shares.length - 1;
    }

    private static double logit(double p) {
        return StrictMath.log(p / (1 - p));
    }

    private static double logistic(double x) {
        return 1 / (1 + StrictMath.exp(-x));
    }
}
