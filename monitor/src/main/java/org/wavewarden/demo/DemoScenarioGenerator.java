package org.wavewarden.demo;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.List;
import java.util.SplittableRandom;

/**
 * Writes the waves of the demo survey, the invented Harrowmere County Household Living Conditions Survey, as CSV
 * files that PostgreSQL loads with {@code COPY survey_demo.household_wave FROM ... (FORMAT csv, HEADER true)}.
 *
 * <p>The data are random draws with known, planted changes (see {@code demo-data/README.md} and
 * {@code demo-data/manifest.yaml}): a longer commute after a bridge closure, a small income rise that only the large
 * booster wave can detect, a jump in heat pumps, a shift in a question asked of very few households, and disguised
 * missing values (blank answers, refusal and sentinel codes, a sentinel date, a changed code frame, age heaping after
 * a change of interview mode). Four later columns plant where a change happened: one interviewer keys every 999
 * height, low water pressure rises in one district only, a safety rating moves with the interview mode rather than
 * within it, and the hours of heating follow the seasons. Everything else varies by sampling noise only.
 *
 * <p>Output follows RFC 4180 with PostgreSQL's CSV conventions, which tell SQL NULL from the empty string: NULL is an
 * unquoted empty field, the empty string is {@code ""}. Fields holding a comma, a quote, a line break, or leading or
 * trailing white space are quoted, with inner quotes doubled.
 *
 * <p>Generation is deterministic. Each (wave, variable) pair draws from its own {@link SplittableRandom} stream,
 * seeded from {@link #SEED}, so that retuning one variable does not reshuffle the others. Only
 * {@code nextDouble()} and {@code nextInt(int)} are used, whose algorithms the JDK specifies, and all transcendental
 * functions come from {@link StrictMath}, so the bytes are the same on every platform and JDK.
 */
public final class DemoScenarioGenerator {

    /** The seed the committed demo files were generated with. */
    public static final long SEED = 33L;

    /** The waves, in time order. The fourth is the booster wave with a much larger sample. */
    public static final List<DemoWave> WAVES = List.of(
            new DemoWave("2024-Q1", 0, 4000),
            new DemoWave("2024-Q2", 1, 4100),
            new DemoWave("2024-Q3", 2, 3900),
            new DemoWave("2024-Q4", 3, 32000),
            new DemoWave("2025-Q1", 4, 4000),
            new DemoWave("2025-Q2", 5, 4200),
            new DemoWave("2025-Q3", 6, 3800));

    /** Column order of the CSV files, identical to the table {@code survey_demo.household_wave}. */
    public static final List<String> COLUMNS = List.of(
            "wave", "respondent_id", "interview_mode", "district", "age", "height_cm", "income_monthly",
            "commute_minutes", "housing_satisfaction", "life_satisfaction", "heating_fuel", "tenure",
            "has_broadband", "owns_boat", "children", "occupation", "move_in_date", "mooring_fee",
            "interviewer_id", "water_pressure_low", "neighbourhood_safe", "heating_hours");

    // Wave indexes at which the planted events begin.
    private static final int OCCUPATION_BLANKS_FROM = 1;   // 2024-Q2: the occupation box became optional
    private static final int BRIDGE_CLOSED_FROM = 2;       // 2024-Q3: Saltmarsh Bridge closed for rebuilding
    private static final int BOOSTER = 3;                  // 2024-Q4: booster wave, income uplift
    private static final int TELEPHONE_FROM = 4;           // 2025-Q1: fieldwork moved from web to telephone
    private static final int HOUSING_TRANSFER_FROM = 5;    // 2025-Q2: council homes moved to a housing association
    private static final int MOORING_RISE_FROM = 5;        // 2025-Q2: harbour board raised mooring fees
    private static final int WARM_HOMES_FROM = 6;          // 2025-Q3: heat pump grant takes effect
    private static final double[] HEIGHT_SENTINEL_RATE = {0.0, 0.0, 0.03, 0.0, 0.0, 0.02, 0.0};
    private static final int PUMP_FAILURE_FROM = 5;        // 2025-Q2: Kestle Point's pumping station fails

    /** The interviewer who keys 999 for every height not measured, in both waves that have such heights. */
    public static final String NOT_MEASURED_INTERVIEWER = "H17";
    // Interviewers per wave: a regular quarter's field force, doubled for the booster wave.
    private static final int INTERVIEWERS = 30;
    private static final String INTERVIEWER_STREAM = "interviewer_id:2";
    private static final int BOOSTER_INTERVIEWERS = 60;

    // Share of households reporting low water pressure: 7% everywhere, then Kestle Point +18 points and every
    // other district +1 point from the pumping station failure on.
    private static final double WATER_LOW_BEFORE = 0.07;
    private static final double WATER_LOW_AFTER_KES = 0.25;
    private static final double WATER_LOW_AFTER_ELSEWHERE = 0.08;

    // "How safe do you feel walking in your neighbourhood after dark?" 1 very unsafe .. 5 very safe. Answers given
    // to a telephone interviewer are rosier than those typed into the web form (a mode effect), and the mode mix,
    // not the neighbourhoods, changes in 2025-Q1.
    private static final double[] SAFE_WEB = {0.08, 0.17, 0.33, 0.30, 0.12};
    private static final double[] SAFE_TELEPHONE = {0.02, 0.07, 0.22, 0.39, 0.30};
    private static final double[] SAFE_IN_PERSON = {0.05, 0.12, 0.28, 0.35, 0.20};

    // Median hours a week the heating runs, by quarter (Q1..Q4): winter high, summer low, the same every year.
    private static final double[] HEATING_MEDIAN_BY_QUARTER = {40.0, 22.0, 10.0, 32.0};

    private static final String[] MODES = {"web", "telephone", "in_person"};
    private static final double[] MODE_WEB_ERA = {0.80, 0.08, 0.12};
    private static final double[] MODE_PHONE_ERA = {0.10, 0.78, 0.12};

    private static final String[] DISTRICTS = {"GUL", "SAL", "BRN", "TID", "MOR", "KES"};
    static final double[] DISTRICT_SHARES = {0.24, 0.19, 0.17, 0.15, 0.14, 0.11};

    private static final String[] FUELS = {"GAS", "OIL", "ELEC", "HPUMP", "SOLID", "LPG"};
    private static final double[] FUEL_BEFORE = {0.52, 0.14, 0.16, 0.04, 0.08, 0.06};
    private static final double[] FUEL_AFTER = {0.445, 0.12, 0.155, 0.16, 0.07, 0.05};

    private static final String[] TENURES_BEFORE = {"OWN", "MORT", "PRIV", "COUN", "FREE"};
    private static final String[] TENURES_AFTER = {"OWN", "MORT", "PRIV", "HASS", "FREE"};
    private static final double[] TENURE_SHARES = {0.32, 0.34, 0.23, 0.06, 0.05};

    private static final double[] HOUSING_SATISFACTION = {0.05, 0.10, 0.20, 0.40, 0.25};            // 1..5
    private static final double[] LIFE_SATISFACTION =
            {0.01, 0.01, 0.02, 0.04, 0.05, 0.10, 0.12, 0.22, 0.24, 0.12, 0.07};                        // 0..10
    private static final double[] CHILDREN = {0.55, 0.17, 0.17, 0.07, 0.025, 0.01, 0.005};            // 0..6

    private static final String[] OCCUPATIONS = {
        "teacher", "nurse", "care worker", "fisher", "retired", "student", "shop assistant", "electrician",
        "civil servant", "farm worker", "software developer", "bus driver", "accountant", "chef", "cleaner",
        "harbour pilot", "plumber", "social worker", "Teacher", "Nurse", "Retired", "lecturer", "warehouse operative",
        "boat builder", "hairdresser", "police officer", "pharmacist", "carpenter", "delivery driver",
        "manager, retail", "engineer, marine", "self-employed", "homemaker", "receptionist", "lab technician",
        "odd jobs (\"whatever comes\")"};
    private static final String[] WHITESPACE = {" ", "  ", "   "};

    private static final LocalDate MOVE_IN_LATEST = LocalDate.of(2023, 12, 31);
    private static final LocalDate SENTINEL_DATE = LocalDate.of(1900, 1, 1);

    private final long seed;

    /** A generator for the committed demo data. */
    public DemoScenarioGenerator() {
        this(SEED);
    }

    /** A generator with another seed: same scenario, different noise. */
    public DemoScenarioGenerator(long seed) {
        this.seed = seed;
    }

    /** The whole CSV file of one wave, header included. */
    public String csv(DemoWave wave) {
        StringBuilder out = new StringBuilder(wave.respondents() * 110);
        try {
            write(wave, out);
        } catch (IOException e) {
            throw new UncheckedIOException(e); // a StringBuilder does not throw
        }
        return out.toString();
    }

    /** Appends the CSV file of one wave, header included, to {@code out}. */
    public void write(DemoWave wave, Appendable out) throws IOException {
        if (wave == null || !WAVES.contains(wave)) {
            throw new IllegalArgumentException("wave must be one of DemoScenarioGenerator.WAVES, was " + wave);
        }
        int w = wave.index();
        int n = wave.respondents();
        SplittableRandom mode = stream(w, "interview_mode");
        SplittableRandom district = stream(w, "district");
        SplittableRandom age = stream(w, "age");
        SplittableRandom height = stream(w, "height_cm");
        SplittableRandom income = stream(w, "income_monthly");
        SplittableRandom commute = stream(w, "commute_minutes");
        SplittableRandom housing = stream(w, "housing_satisfaction");
        SplittableRandom life = stream(w, "life_satisfaction");
        SplittableRandom fuel = stream(w, "heating_fuel");
        SplittableRandom tenure = stream(w, "tenure");
        SplittableRandom broadband = stream(w, "has_broadband");
        SplittableRandom children = stream(w, "children");
        SplittableRandom occupation = stream(w, "occupation");
        SplittableRandom moveIn = stream(w, "move_in_date");
        SplittableRandom mooring = stream(w, "mooring_fee");
        boolean[] boatOwners = boatOwners(n, stream(w, "owns_boat"));
        int[] fees = mooringFees(boatOwners, mooring, w >= MOORING_RISE_FROM);
        int nextFee = 0;
        // The stream's name was chosen as the seed was, among a few tried: with about 30 interviewers and 20
        // variables a wave, some draws let one interviewer's refusals or answers stand out by chance, and a demo
        // should not open with a false alarm about an interviewer.
        SplittableRandom interviewer = stream(w, INTERVIEWER_STREAM);
        double[] workloads = workloads(interviewer, n >= 10_000 ? BOOSTER_INTERVIEWERS : INTERVIEWERS);
        SplittableRandom water = stream(w, "water_pressure_low");
        double[] waterCarry = new double[DISTRICTS.length];
        for (int k = 0; k < waterCarry.length; k++) {
            waterCarry[k] = water.nextDouble();
        }
        SplittableRandom safe = stream(w, "neighbourhood_safe");
        SplittableRandom heating = stream(w, "heating_hours");
        double heatingMedian = HEATING_MEDIAN_BY_QUARTER[Integer.parseInt(wave.label().substring(6)) - 1];

        out.append(String.join(",", COLUMNS)).append('\n');
        String[] row = new String[COLUMNS.size()];
        long idBase = idBase(wave.label());
        for (int i = 0; i < n; i++) {
            String interviewMode = MODES[pick(mode, w >= TELEPHONE_FROM ? MODE_PHONE_ERA : MODE_WEB_ERA)];
            row[0] = wave.label();
            row[1] = Long.toString(idBase + i + 1);
            row[2] = interviewMode;
            row[3] = DISTRICTS[pick(district, DISTRICT_SHARES)];
            row[4] = Integer.toString(age(age, w >= TELEPHONE_FROM && interviewMode.equals("telephone")));
            row[5] = Integer.toString(height(height, HEIGHT_SENTINEL_RATE[w]));
            row[6] = Long.toString(income(income, w >= BOOSTER));
            row[7] = commute(commute, w >= BRIDGE_CLOSED_FROM);
            row[8] = Integer.toString(1 + pick(housing, HOUSING_SATISFACTION));
            row[9] = Integer.toString(pick(life, LIFE_SATISFACTION));
            row[10] = FUELS[pick(fuel, w >= WARM_HOMES_FROM ? FUEL_AFTER : FUEL_BEFORE)];
            row[11] = (w >= HOUSING_TRANSFER_FROM ? TENURES_AFTER : TENURES_BEFORE)[pick(tenure, TENURE_SHARES)];
            row[12] = broadband.nextDouble() < 0.87 ? "yes" : "no";
            row[13] = boatOwners[i] ? "1" : "0";
            row[14] = children(children, w >= TELEPHONE_FROM);
            row[15] = occupation(occupation, w >= OCCUPATION_BLANKS_FROM ? 0.10 : 0.01);
            row[16] = moveIn(moveIn, w == BOOSTER ? 0.025 : 0.0);
            row[17] = boatOwners[i] ? Integer.toString(fees[nextFee++]) : null;
            row[18] = interviewer(interviewer, workloads, row[5].equals("999"));
            row[19] = waterPressureLow(waterCarry, pickDistrict(row[3]), w >= PUMP_FAILURE_FROM) ? "yes" : "no";
            row[20] = Integer.toString(1 + pick(safe, switch (interviewMode) {
                case "telephone" -> SAFE_TELEPHONE;
                case "in_person" -> SAFE_IN_PERSON;
                default -> SAFE_WEB;
            }));
            row[21] = Long.toString(heatingHours(heating, heatingMedian));
            for (int c = 0; c < row.length; c++) {
                if (c > 0) {
                    out.append(',');
                }
                appendField(out, row[c]);
            }
            out.append('\n');
        }
    }

    /** Writes every wave into {@code directory} as {@code <wave>.csv}, replacing existing files. */
    public void writeAll(Path directory) throws IOException {
        Files.createDirectories(directory);
        for (DemoWave wave : WAVES) {
            try (Writer out = Files.newBufferedWriter(directory.resolve(wave.fileName()), StandardCharsets.UTF_8)) {
                write(wave, out);
            }
        }
    }

    /** Rewrites the committed demo waves; the optional argument is the target folder (default demo-data/waves). */
    public static void main(String[] args) throws IOException {
        Path directory = Path.of(args.length > 0 ? args[0] : "demo-data/waves");
        new DemoScenarioGenerator().writeAll(directory);
    }

    /** Writes one field: NULL as nothing, anything that could be misread (including the empty string) quoted. */
    static void appendField(Appendable out, String value) throws IOException {
        if (value == null) {
            return;
        }
        boolean quote = value.isEmpty()
                || Character.isWhitespace(value.charAt(0))
                || Character.isWhitespace(value.charAt(value.length() - 1));
        for (int k = 0; k < value.length() && !quote; k++) {
            char ch = value.charAt(k);
            quote = ch == ',' || ch == '"' || ch == '\n' || ch == '\r';
        }
        if (!quote) {
            out.append(value);
            return;
        }
        out.append('"');
        for (int k = 0; k < value.length(); k++) {
            char ch = value.charAt(k);
            if (ch == '"') {
                out.append('"');
            }
            out.append(ch);
        }
        out.append('"');
    }

    private SplittableRandom stream(int waveIndex, String variable) {
        return stream(seed, waveIndex, variable);
    }

    /** The random stream of one (wave, variable) pair under a seed; shared with the panel scenario. */
    static SplittableRandom stream(long seed, int waveIndex, String variable) {
        long h = seed;
        h = mix(h + 0x9E3779B97F4A7C15L * (waveIndex + 1));
        for (int k = 0; k < variable.length(); k++) {
            h = mix(h ^ variable.charAt(k));
        }
        return new SplittableRandom(h);
    }

    /** Stafford's variant 13 of the MurmurHash3 finaliser: spreads nearby inputs over the whole seed space. */
    private static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    private static long idBase(String label) {
        // "2024-Q3" -> 202430000000: ids stay unique across waves and show the wave they came from
        long year = Long.parseLong(label.substring(0, 4));
        long quarter = Long.parseLong(label.substring(6));
        return (year * 10 + quarter) * 10_000_000L;
    }

    static int pick(SplittableRandom rnd, double[] shares) {
        double u = rnd.nextDouble();
        double cumulative = 0;
        for (int k = 0; k < shares.length - 1; k++) {
            cumulative += shares[k];
            if (u < cumulative) {
                return k;
            }
        }
        return shares.length - 1;
    }

    static double normal(SplittableRandom rnd) {
        // Box and Muller (1958), Ann. Math. Statist. 29; 1 - u keeps the logarithm finite
        double u1 = 1.0 - rnd.nextDouble();
        double u2 = rnd.nextDouble();
        return StrictMath.sqrt(-2.0 * StrictMath.log(u1)) * StrictMath.cos(2.0 * StrictMath.PI * u2);
    }

    static int age(SplittableRandom rnd, boolean statedOnTelephone) {
        // Kumaraswamy (1980), J. Hydrology 46, with a = 1.7, b = 2.6 on [16, 96), drawn by its closed-form inverse:
        // a smooth, right-skewed adult age profile with no digit preference
        double u = rnd.nextDouble();
        double x = StrictMath.pow(1.0 - StrictMath.pow(1.0 - u, 1.0 / 2.6), 1.0 / 1.7);
        int age = Math.min(95, 16 + (int) (80 * x));
        double roundingDraw = rnd.nextDouble(); // drawn always, so the heaping plant does not shift the stream
        if (statedOnTelephone && roundingDraw < 0.22) {
            // A stated age on the telephone is often rounded to the nearest 0 or 5
            int rounded = 5 * ((age + 2) / 5);
            if (rounded >= 16 && rounded <= 95) {
                age = rounded;
            }
        }
        return age;
    }

    private static int height(SplittableRandom rnd, double sentinelRate) {
        boolean female = rnd.nextDouble() < 0.51;
        double z = normal(rnd);
        double sentinelDraw = rnd.nextDouble();
        if (sentinelDraw < sentinelRate) {
            return 999; // "not measured", keyed by interviewers without a codebook entry
        }
        return (int) StrictMath.rint(female ? 164.5 + 6.8 * z : 177.8 + 7.2 * z);
    }

    private static long income(SplittableRandom rnd, boolean uplifted) {
        double z = normal(rnd);
        double refusalDraw = rnd.nextDouble();
        if (refusalDraw < 0.025) {
            return -9; // refused: declared in the codebook
        }
        double monthly = StrictMath.exp(StrictMath.log(2650.0) + 0.5 * z) * (uplifted ? 1.06 : 1.0);
        return Math.max(1, StrictMath.round(monthly));
    }

    private static String commute(SplittableRandom rnd, boolean bridgeClosed) {
        double notCommuting = rnd.nextDouble();
        // Gamma(3, 9 minutes) as the sum of three exponentials
        double base = -9.0 * StrictMath.log((1.0 - rnd.nextDouble()) * (1.0 - rnd.nextDouble())
                * (1.0 - rnd.nextDouble()));
        double crosses = rnd.nextDouble();
        double detour = 10.0 + 8.0 * rnd.nextDouble();
        if (notCommuting < 0.36) {
            return null; // not working or working from home: question not asked
        }
        double minutes = base + (bridgeClosed && crosses < 0.55 ? detour : 0.0);
        return Long.toString(Math.max(1, Math.min(180, StrictMath.round(minutes))));
    }

    private static String children(SplittableRandom rnd, boolean refusalOffered) {
        int count = pick(rnd, CHILDREN);
        double refusalDraw = rnd.nextDouble();
        if (refusalOffered && refusalDraw < 0.015) {
            return "77"; // the telephone script records a refusal as 77
        }
        return Integer.toString(count);
    }

    private static String occupation(SplittableRandom rnd, double blankRate) {
        double u = rnd.nextDouble();
        int job = rnd.nextInt(OCCUPATIONS.length);
        int space = rnd.nextInt(WHITESPACE.length);
        if (u < 0.03) {
            return null;
        }
        if (u < 0.03 + blankRate / 2) {
            return "";
        }
        if (u < 0.03 + blankRate) {
            return WHITESPACE[space];
        }
        return OCCUPATIONS[job];
    }

    private static String moveIn(SplittableRandom rnd, double sentinelRate) {
        double sentinelDraw = rnd.nextDouble();
        long daysBack;
        do {
            // years in the current home: exponential with a mean of 12, at most 59 years
            daysBack = (long) (-12.0 * 365.25 * StrictMath.log(1.0 - rnd.nextDouble()));
        } while (daysBack > 59L * 365);
        if (sentinelDraw < sentinelRate) {
            return SENTINEL_DATE.toString(); // unknown dates filled in when the booster sample was imported
        }
        return MOVE_IN_LATEST.minusDays(daysBack).toString();
    }

    private static int[] mooringFees(boolean[] owner, SplittableRandom rnd, boolean raised) {
        int k = 0;
        for (boolean o : owner) {
            k += o ? 1 : 0;
        }
        // Stratified draws: one fee from each of k equal-probability slices of the normal, in random order. With
        // only 30 to 40 answers, plain draws would let chance decide whether the planted rise looks like 0.1 or
        // 0.8 standard deviations; stratifying keeps the realised shift close to the planted 0.4.
        int[] slice = permutation(k, rnd);
        int[] fees = new int[k];
        for (int j = 0; j < k; j++) {
            double z = inverseNormal((slice[j] + rnd.nextDouble()) / k);
            fees[j] = (int) StrictMath.rint(780.0 + 140.0 * z + (raised ? 56.0 : 0.0));
        }
        return fees;
    }

    private static int[] permutation(int n, SplittableRandom rnd) {
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rnd.nextInt(i + 1);
            int t = order[i];
            order[i] = order[j];
            order[j] = t;
        }
        return order;
    }

    /**
     * The standard normal quantile by P. J. Acklam's rational approximation (2003, relative error below 1.2e-9; the
     * tails use the same form in sqrt(-2 log p) as Wichura's AS 241, Appl. Statist. 37, 1988), written with
     * {@link StrictMath} so that it gives the same bits everywhere.
     */
    static double inverseNormal(double p) {
        if (!(p > 0.0 && p < 1.0)) {
            throw new IllegalArgumentException("p must lie in (0, 1), was " + p);
        }
        final double[] a = {-3.969683028665376e+01, 2.209460984245205e+02, -2.759285104469687e+02,
            1.383577518672690e+02, -3.066479806614716e+01, 2.506628277459239e+00};
        final double[] b = {-5.447609879822406e+01, 1.615858368580409e+02, -1.556989798598866e+02,
            6.680131188771972e+01, -1.328068155288572e+01};
        final double[] c = {-7.784894002430293e-03, -3.223964580411365e-01, -2.400758277161838e+00,
            -2.549732539343734e+00, 4.374664141464968e+00, 2.938163982698783e+00};
        final double[] d = {7.784695709041462e-03, 3.224671290700398e-01, 2.445134137142996e+00,
            3.754408661907416e+00};
        double low = 0.02425;
        if (p < low || p > 1 - low) {
            double q = StrictMath.sqrt(-2 * StrictMath.log(p < low ? p : 1 - p));
            double x = (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5])
                    / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
            return p < low ? x : -x;
        }
        double q = p - 0.5;
        double r = q * q;
        return (((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q
                / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
    }

    /**
     * Each interviewer's share of the wave's interviews: log-normal workloads (a few carry twice the median, some
     * half of it), as when part-time and full-time interviewers share a field force.
     */
    private static double[] workloads(SplittableRandom rnd, int interviewers) {
        double[] share = new double[interviewers];
        double total = 0;
        for (int k = 0; k < interviewers; k++) {
            share[k] = StrictMath.exp(0.35 * normal(rnd));
            total += share[k];
        }
        for (int k = 0; k < interviewers; k++) {
            share[k] /= total;
        }
        return share;
    }

    /**
     * The interviewer of one household. Every height keyed as 999 was keyed by one interviewer, who does the rest of
     * a normal workload besides; the draw is made for every household so the stream does not depend on the plant.
     */
    private static String interviewer(SplittableRandom rnd, double[] workloads, boolean heightNotMeasured) {
        String drawn = String.format(java.util.Locale.ROOT, "H%02d", 1 + pick(rnd, workloads));
        return heightNotMeasured ? NOT_MEASURED_INTERVIEWER : drawn;
    }

    private static int pickDistrict(String code) {
        for (int k = 0; k < DISTRICTS.length; k++) {
            if (DISTRICTS[k].equals(code)) {
                return k;
            }
        }
        throw new IllegalStateException("unknown district " + code);
    }

    /**
     * Low water pressure, by systematic selection within each district: every household adds the district's share
     * to a running total that started at a random point in [0, 1), and answers yes whenever the total passes a whole
     * number. Each district's share then lands within one household of the planted one, so the demo shows the
     * planted 18 points in Kestle Point and 1 point elsewhere rather than whatever sampling noise adds to them (as
     * with the mooring fees); which households answer yes is still spread over the whole wave.
     */
    private static boolean waterPressureLow(double[] carry, int district, boolean pumpFailed) {
        double share = !pumpFailed ? WATER_LOW_BEFORE
                : DISTRICTS[district].equals("KES") ? WATER_LOW_AFTER_KES : WATER_LOW_AFTER_ELSEWHERE;
        carry[district] += share;
        if (carry[district] >= 1.0) {
            carry[district] -= 1.0;
            return true;
        }
        return false;
    }

    private static long heatingHours(SplittableRandom rnd, double median) {
        // log-normal around the quarter's median: the same distribution every year, so only the season moves it
        double hours = StrictMath.exp(StrictMath.log(median) + 0.45 * normal(rnd));
        return Math.min(168, StrictMath.round(hours));
    }

    private static boolean[] boatOwners(int n, SplittableRandom rnd) {
        // 30 to 40 boat owners in a regular wave, 0.9% in the booster: a subgroup too small to compare well
        int owners = n >= 10_000 ? (int) StrictMath.round(0.009 * n) : 30 + rnd.nextInt(11);
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        boolean[] owner = new boolean[n];
        for (int k = 0; k < owners; k++) {
            int j = k + rnd.nextInt(n - k);
            int t = order[k];
            order[k] = order[j];
            order[j] = t;
            owner[order[k]] = true;
        }
        return owner;
    }
}
