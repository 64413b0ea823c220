package org.wavewarden.demo;

import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.DdiCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.load.spss.SavWriter;
import org.wavewarden.load.spss.SavWriter.Compression;

import java.io.IOException;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

/**
 * Writes the demo's third dataset, the invented Harrowmere Libraries and Leisure Survey, as the county's leisure
 * department delivers it: one SPSS system file a wave, each with its own dictionary (variable labels, value labels,
 * user-missing values and ranges, measurement levels, formats), and one DDI-Codebook 2.5 file for the study. The
 * monitor's configuration names no variable of this dataset: everything it knows of them comes from these files.
 *
 * <p>The planted events (see {@code demo-data/README.md} and {@code demo-data/leisure-manifest.yaml}): interviewers
 * at the leisure centres key 99 for a sports question they did not ask, undeclared; the county halves the libraries'
 * opening hours and visits fall; the dictionary renames one membership code's label; a new answer code appears
 * without a value label. Everything else varies by sampling noise only.
 *
 * <p>Generation is deterministic and follows {@link DemoScenarioGenerator}: each (wave, variable) pair draws from
 * its own {@link SplittableRandom} stream, every respondent draws the same number of values from a stream whatever
 * happens to it, only {@code nextDouble()} is used and all transcendental functions come from {@link StrictMath}.
 */
public final class LeisureScenarioGenerator {

    /** The seed the committed files were generated with. */
    public static final long SEED = 74L;

    /** The folder, below {@code demo-data}, that holds this dataset's files. */
    public static final String FOLDER = "leisure";

    /** The study's DDI codebook file in {@link #FOLDER}. */
    public static final String CODEBOOK_FILE = "harrowmere-leisure-ddi.xml";

    /** The study's title, as the DDI codebook and every wave's file label give it. */
    public static final String TITLE = "Harrowmere Libraries and Leisure Survey";

    /**
     * One wave as delivered.
     *
     * @param label       the wave label, as the import stores it in the wave column
     * @param index       position in time order, from 0
     * @param respondents people interviewed
     * @param compression how the department's software stored the cases; ZLIB files are delivered as {@code .zsav}
     */
    public record Wave(String label, int index, int respondents, Compression compression) {

        /** The file name the wave is committed under. */
        public String fileName() {
            return label + (compression == Compression.ZLIB ? ".zsav" : ".sav");
        }
    }

    /** The waves, in time order. */
    public static final List<Wave> WAVES = List.of(
            new Wave("2024-Q3", 0, 2480, Compression.BYTECODE),
            new Wave("2024-Q4", 1, 2530, Compression.NONE),
            new Wave("2025-Q1", 2, 2460, Compression.ZLIB),
            new Wave("2025-Q2", 3, 2510, Compression.BYTECODE));

    /**
     * The creation time each committed SPSS file records in its header: fixed, so that regenerating the files gives
     * the same bytes (SavWriter's overload with a creation time takes it).
     */
    static final LocalDateTime FILES_CREATED = LocalDateTime.of(2025, 7, 7, 9, 0);

    /** The variables in file order. */
    public static final List<String> VARIABLES = List.of(
            "respondent_id", "district", "library_visits", "main_activity", "satisfaction", "age", "sport_hours",
            "travel_minutes", "ebook_user", "membership", "visit_date", "comments");

    // Wave indexes at which the planted events begin.
    private static final int NOT_ASKED_99_FROM = 1;      // 2024-Q4: new interviewers at the leisure centres
    private static final int HOURS_CUT_FROM = 2;         // 2025-Q1: library opening hours halved
    private static final int RELABELLED_FROM = 2;        // 2025-Q1: 'Concession' becomes 'Reduced rate'
    private static final int MAKERSPACE_FROM = 3;        // 2025-Q2: code 7 on the tablets, not in the dictionary

    static final double NOT_ASKED_RATE = 0.028;
    static final double VISITS_FACTOR_AFTER_CUT = 0.5;
    static final double MAKERSPACE_SHARE = 0.06;

    private static final String[] DISTRICT_NAMES =
            {"Gullhaven", "Saltmarsh", "Brannock", "Tidewick", "Morrow Fen", "Kestle Point"};
    private static final String[] ACTIVITIES = {"Borrowing books", "Study or work space", "Computers and wifi",
        "Children's activities", "Swimming", "Gym and fitness classes"};
    private static final double[] ACTIVITY_SHARES = {0.36, 0.14, 0.12, 0.10, 0.15, 0.13};
    private static final String[] SATISFACTION = {"Very dissatisfied", "Dissatisfied", "Neither", "Satisfied",
        "Very satisfied"};
    private static final double[] SATISFACTION_SHARES = {0.06, 0.11, 0.24, 0.38, 0.21};
    private static final double[] MEMBERSHIP_SHARES = {0.31, 0.47, 0.22};          // none, standard, concession
    private static final LocalDate FIRST_VISIT_LATEST = LocalDate.of(2024, 6, 30);
    private static final String[] COMMENTS = {
        "More opening hours please", "The children's library is wonderful", "Parking at the leisure centre is hard",
        "Swimming pool too cold", "Staff very helpful", "Would like more large-print books",
        "Wifi keeps dropping out", "Café at Gullhaven library is great", "Bus to Kestle Point library is too rare",
        "Gym equipment needs repair", "Quiet study room is always full", "Love the Saturday story time",
        "Morrow Fen branch feels unsafe after dark", "Please keep the mobile library",
        "The e-book app is confusing", "Lane swimming times clash with school lessons"};
    private static final String LONG_COMMENT = "I have used the Tidewick branch library every week for twenty "
            + "years. It is the only warm, quiet place in the village where I can read the newspapers and get "
            + "help with forms online. If the opening hours are cut again many of us older residents will have "
            + "nowhere to go on weekday afternoons.";

    private final long seed;
    private final Map<String, List<Object[]>> cases = new LinkedHashMap<>();

    /** A generator for the committed files. */
    public LeisureScenarioGenerator() {
        this(SEED);
    }

    /** A generator with another seed: same scenario, different noise. */
    public LeisureScenarioGenerator(long seed) {
        this.seed = seed;
    }

    /** Rewrites the committed files; the optional argument is the target folder (default demo-data/leisure). */
    public static void main(String[] args) throws IOException {
        new LeisureScenarioGenerator().writeAll(Path.of(args.length > 0 ? args[0] : "demo-data/" + FOLDER));
    }

    /** Writes every wave's SPSS file and the study's DDI codebook into {@code directory}, replacing existing files. */
    public void writeAll(Path directory) throws IOException {
        Files.createDirectories(directory);
        Files.writeString(directory.resolve(CODEBOOK_FILE), ddi(), StandardCharsets.UTF_8);
        for (Wave w : WAVES) {
            SavWriter.write(directory.resolve(w.fileName()), dictionary(w), cases(w), w.compression(), FILES_CREATED);
        }
    }

    /** The study's DDI-Codebook 2.5 document. */
    public String ddi() {
        StringWriter out = new StringWriter();
        try {
            DdiCodebook.write(studyCodebook(), out);
        } catch (IOException e) {
            throw new UncheckedIOException(e); // a StringWriter does not throw
        }
        return out.toString();
    }

    /**
     * The study's codebook as the department documents it: the latest wave's dictionary (so code 7 of main_activity
     * has no label here either), with what an SPSS dictionary cannot hold: units, a valid range, and no measurement
     * level for the free-text comments.
     */
    public DatasetCodebook studyCodebook() {
        List<VariableMeta> out = new ArrayList<>();
        for (VariableMeta v : dictionary(WAVES.get(WAVES.size() - 1)).variables()) {
            String unit = switch (v.name()) {
                case "library_visits" -> "visits per month";
                case "age" -> "years";
                case "sport_hours" -> "hours per week";
                case "travel_minutes" -> "minutes";
                default -> null;
            };
            RangeSpec valid = v.name().equals("travel_minutes") ? new RangeSpec(0.0, 180.0) : v.validRange();
            // SPSS gives every string a level (nominal); free text has none, and the codebook says so by giving none
            Measure measure = v.name().equals("comments") ? Measure.UNKNOWN : v.measure();
            out.add(new VariableMeta(v.name(), v.label(), v.storage(), v.width(), v.decimals(), v.format(), measure,
                    unit, v.valueLabels(), v.missingCodes(), v.missingRanges(), valid));
        }
        return new DatasetCodebook("one SPSS system file a wave, named after the wave (2024-Q3.sav ...)", TITLE, out);
    }

    /** The dictionary of one wave's SPSS file, as the department's software wrote it. */
    public DatasetCodebook dictionary(Wave w) {
        List<VariableMeta> v = new ArrayList<>();
        v.add(text("respondent_id", "Respondent identifier", 13));
        v.add(coded("district", "District of residence", Measure.NOMINAL, labels(DISTRICT_NAMES), List.of()));
        Map<String, String> visits = new LinkedHashMap<>();
        visits.put("-9", "Refused");
        visits.put("-8", "Don't know");
        v.add(new VariableMeta("library_visits", "Library visits in the last month", StorageType.NUMBER, null, 0,
                "F2.0", Measure.SCALE, null, visits,
                List.of(new MissingCodeSpec("-9", "Refused"), new MissingCodeSpec("-8", "Don't know")), List.of(),
                null));
        v.add(coded("main_activity", "Main reason for visiting", Measure.NOMINAL, labels(ACTIVITIES), List.of()));
        Map<String, String> satisfaction = labels(SATISFACTION);
        satisfaction.put("8", "Don't know");
        satisfaction.put("9", "Refused");
        v.add(coded("satisfaction", "Satisfaction with library and leisure services", Measure.ORDINAL, satisfaction,
                List.of(new MissingCodeSpec("8", "Don't know"), new MissingCodeSpec("9", "Refused"))));
        v.add(new VariableMeta("age", "Age in years", StorageType.NUMBER, null, 0, "F3.0", Measure.SCALE, null, null,
                null, List.of(new MissingRangeSpec(997.0, 999.0, "not given")), null));
        v.add(new VariableMeta("sport_hours", "Hours of sport or exercise in a usual week", StorageType.NUMBER, null, 1,
                "F4.1", Measure.SCALE, null, null, null, null, null));
        v.add(new VariableMeta("travel_minutes", "Travel time to the nearest library", StorageType.NUMBER, null, 0,
                "F3.0", Measure.SCALE, null, null, null, null, null));
        Map<String, String> yesNo = new LinkedHashMap<>();
        yesNo.put("0", "No");
        yesNo.put("1", "Yes");
        v.add(coded("ebook_user", "Borrowed an e-book in the last year", Measure.NOMINAL, yesNo, List.of()));
        Map<String, String> membership = new LinkedHashMap<>();
        membership.put("1", "No card");
        membership.put("2", "Standard");
        membership.put("3", w.index() >= RELABELLED_FROM ? "Reduced rate" : "Concession");
        v.add(coded("membership", "Library and leisure card", Measure.NOMINAL, membership, List.of()));
        v.add(new VariableMeta("visit_date", "Date of first visit to a county library", StorageType.DATE, null, null,
                "DATE11", Measure.SCALE, null, null, null, null, null));
        v.add(text("comments", "Any other comments", 300));
        return new DatasetCodebook(w.fileName(), TITLE + ", " + w.label(), v);
    }

    private static VariableMeta text(String name, String label, int width) {
        return new VariableMeta(name, label, StorageType.TEXT, width, null, "A" + width, Measure.NOMINAL, null, null,
                null, null, null);
    }

    private static VariableMeta coded(String name, String label, Measure measure, Map<String, String> labels,
                                      List<MissingCodeSpec> missing) {
        return new VariableMeta(name, label, StorageType.NUMBER, null, 0, "F1.0", measure, null, labels, missing, null,
                null);
    }

    /** Labels of the codes 1, 2, ... in order. */
    private static Map<String, String> labels(String[] names) {
        Map<String, String> out = new LinkedHashMap<>();
        for (int k = 0; k < names.length; k++) {
            out.put(Integer.toString(k + 1), names[k]);
        }
        return out;
    }

    /** One wave's cases, values in {@link #VARIABLES} order as {@link org.wavewarden.load.CaseSource} gives them. */
    public List<Object[]> cases(Wave w) {
        return cases.computeIfAbsent(w.label(), k -> simulate(w));
    }

    private List<Object[]> simulate(Wave w) {
        SplittableRandom district = stream(w, "district");
        SplittableRandom visits = stream(w, "library_visits");
        SplittableRandom activity = stream(w, "main_activity");
        SplittableRandom satisfaction = stream(w, "satisfaction");
        SplittableRandom age = stream(w, "age");
        SplittableRandom sport = stream(w, "sport_hours");
        SplittableRandom travel = stream(w, "travel_minutes");
        SplittableRandom ebook = stream(w, "ebook_user");
        SplittableRandom membership = stream(w, "membership");
        SplittableRandom firstVisit = stream(w, "visit_date");
        SplittableRandom comments = stream(w, "comments");
        String idPrefix = "HL" + w.label().substring(0, 4) + w.label().substring(6) + "-";
        List<Object[]> out = new ArrayList<>(w.respondents());
        for (int i = 0; i < w.respondents(); i++) {
            Object[] row = new Object[VARIABLES.size()];
            row[0] = idPrefix + String.format(java.util.Locale.ROOT, "%05d", i + 1);
            row[1] = (double) (1 + DemoScenarioGenerator.pick(district, DemoScenarioGenerator.DISTRICT_SHARES));
            row[2] = visits(visits, w.index() >= HOURS_CUT_FROM);
            row[3] = activity(activity, w.index() >= MAKERSPACE_FROM);
            row[4] = satisfaction(satisfaction);
            row[5] = age(age);
            row[6] = sportHours(sport, w.index() >= NOT_ASKED_99_FROM);
            row[7] = travelMinutes(travel);
            row[8] = ebook.nextDouble() < 0.27 ? 1.0 : 0.0;
            row[9] = (double) (1 + DemoScenarioGenerator.pick(membership, MEMBERSHIP_SHARES));
            row[10] = firstVisit(firstVisit);
            row[11] = comment(comments);
            out.add(row);
        }
        return out;
    }

    private static double visits(SplittableRandom rnd, boolean hoursCut) {
        double user = rnd.nextDouble();
        double z = DemoScenarioGenerator.normal(rnd);
        double poisson = rnd.nextDouble();
        double missing = rnd.nextDouble();
        if (missing < 0.015) {
            return -9;
        }
        if (missing < 0.035) {
            return -8;
        }
        if (user < 0.35) {
            return 0;
        }
        double rate = StrictMath.exp(StrictMath.log(3.5) + 0.6 * z) * (hoursCut ? VISITS_FACTOR_AFTER_CUT : 1.0);
        return Math.min(31, poissonQuantile(poisson, rate));
    }

    /** The Poisson(rate) quantile of u by summing the probabilities: one uniform per draw, whatever the rate. */
    private static int poissonQuantile(double u, double rate) {
        double p = StrictMath.exp(-rate);
        double cumulative = p;
        int k = 0;
        while (u > cumulative && k < 200) {
            k++;
            p *= rate / k;
            cumulative += p;
        }
        return k;
    }

    private static double activity(SplittableRandom rnd, boolean makerspace) {
        double first = rnd.nextDouble();
        int code = 1 + DemoScenarioGenerator.pick(rnd, ACTIVITY_SHARES);
        return makerspace && first < MAKERSPACE_SHARE ? 7 : code;
    }

    private static double satisfaction(SplittableRandom rnd) {
        double missing = rnd.nextDouble();
        int code = 1 + DemoScenarioGenerator.pick(rnd, SATISFACTION_SHARES);
        if (missing < 0.025) {
            return 8;
        }
        return missing < 0.035 ? 9 : code;
    }

    private static double age(SplittableRandom rnd) {
        int age = DemoScenarioGenerator.age(rnd, false);
        double missing = rnd.nextDouble();
        if (missing < 0.005) {
            return 997;
        }
        return missing < 0.025 ? 999 : age;
    }

    private static double sportHours(SplittableRandom rnd, boolean notAskedKeyed99) {
        double none = rnd.nextDouble();
        // Gamma(2, 2.5 hours) as the sum of two exponentials, answered to the half hour
        double hours = -2.5 * StrictMath.log((1.0 - rnd.nextDouble()) * (1.0 - rnd.nextDouble()));
        double notAsked = rnd.nextDouble();
        if (notAskedKeyed99 && notAsked < NOT_ASKED_RATE) {
            return 99;
        }
        if (none < 0.38) {
            return 0;
        }
        return Math.max(0.5, Math.min(40, StrictMath.rint(2 * hours) / 2));
    }

    private static double travelMinutes(SplittableRandom rnd) {
        double z = DemoScenarioGenerator.normal(rnd);
        return Math.max(1, Math.min(120, StrictMath.rint(StrictMath.exp(StrictMath.log(14) + 0.55 * z))));
    }

    private static LocalDate firstVisit(SplittableRandom rnd) {
        long daysBack;
        do {
            // years since the first visit: exponential with a mean of 11, at most 60 years
            daysBack = (long) (-11.0 * 365.25 * StrictMath.log(1.0 - rnd.nextDouble()));
        } while (daysBack > 60L * 365);
        return FIRST_VISIT_LATEST.minusDays(daysBack);
    }

    private static String comment(SplittableRandom rnd) {
        double u = rnd.nextDouble();
        double which = rnd.nextDouble();
        if (u < 0.70) {
            return "";
        }
        if (u < 0.703) {
            return LONG_COMMENT;
        }
        return COMMENTS[(int) (which * COMMENTS.length)];
    }

    private SplittableRandom stream(Wave w, String variable) {
        return DemoScenarioGenerator.stream(seed, w.index(), "leisure/" + variable);
    }
}
