package org.wavewarden.review;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.ExpectedChange;
import org.wavewarden.config.MuteRule;
import org.wavewarden.config.WaveOrder;
import org.wavewarden.deliver.Alert;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.read.WaveListing;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.OptionalInt;
import java.util.function.Function;
import java.util.regex.Pattern;

/**
 * Which alerts the configuration explains or mutes when they are created: an expected change whose variable and
 * wave range match explains; otherwise a mute rule (from the configuration or stored by a command) that matches
 * and has not expired mutes. An alert that a signed-off wave's findings changed is never explained or muted by a
 * rule.
 *
 * <p>A variable pattern is a name in which {@code *} stands for any run of characters, matched against the whole
 * name. A relationship alert is named {@code x ~ y}; a pattern matches it when it matches that name or either of
 * the two variables, so that a change expected of a variable also explains its relationships.
 */
public final class CreationRules {

    /** How a relationship alert joins its two variables (as {@code config.RelationshipConfig.label}). */
    private static final String PAIR = " ~ ";

    private CreationRules() {
    }

    /**
     * @param waveOrder  the dataset's waves in order (wave ranges are read in it)
     * @param wave       the judged wave
     * @param today      the day the run is made (date expiries are read against it)
     * @param storedMutes mute rules stored by commands, still in force
     */
    public static Function<Alert, Optional<CreationDecision>> decider(DatasetConfig d, List<String> waveOrder,
                                                                      String wave, LocalDate today,
                                                                      List<MuteRule> storedMutes) {
        Waves waves = new Waves(waveOrder, d.waveOrder());
        List<ExpectedChange> expected = d.alertRules().expectedChanges().stream()
                .filter(e -> waves.within(wave, e.fromWave(), e.toWave())).toList();
        List<Mute> mutes = new ArrayList<>();
        d.alertRules().mutes().forEach(m -> mutes.add(new Mute(m, "config")));
        storedMutes.forEach(m -> mutes.add(new Mute(m, "stored")));
        List<Mute> inForce = mutes.stream().filter(m -> m.inForce(waves, wave, today)).toList();
        return a -> {
            if (a.kind() == FindingKind.SIGNED_WAVE_CHANGED) {
                // A rule written ahead cannot have foreseen that a signed release's numbers would move: that alert
                // is always raised open, whatever pattern or scope a rule has.
                return Optional.empty();
            }
            for (ExpectedChange e : expected) {
                if (matches(e.variable(), a.variable())) {
                    return Optional.of(new CreationDecision(ReviewAction.EXPLAINED, e.reason(), e.note(), e.who(),
                            "expected change \"" + e.variable() + "\" " + e.fromWave()
                                    + (e.toWave().equals(e.fromWave()) ? "" : ".." + e.toWave())));
                }
            }
            for (Mute m : inForce) {
                if (m.matches(a)) {
                    return Optional.of(new CreationDecision(ReviewAction.MUTED,
                            ReviewReason.parse(m.rule().reason()).orElse(null), m.rule().reason(), m.rule().who(),
                            m.describe(), m.rule().untilWave(), m.rule().untilDate()));
                }
            }
            return Optional.empty();
        };
    }

    /** Whether a variable pattern matches an alert's variable, or either variable of a relationship alert. */
    public static boolean matches(String pattern, String variable) {
        Pattern p = glob(pattern);
        if (p.matcher(variable).matches()) {
            return true;
        }
        int at = variable.indexOf(PAIR);
        return at > 0 && (p.matcher(variable.substring(0, at)).matches()
                || p.matcher(variable.substring(at + PAIR.length())).matches());
    }

    private static Pattern glob(String pattern) {
        StringBuilder re = new StringBuilder();
        for (String part : pattern.split("\\*", -1)) {
            if (!re.isEmpty()) {
                re.append(".*");
            }
            re.append(Pattern.quote(part));
        }
        return Pattern.compile(re.toString(), Pattern.DOTALL);
    }

    /** A mute rule with where it came from. */
    private record Mute(MuteRule rule, String origin) {

        boolean inForce(Waves waves, String wave, LocalDate today) {
            boolean byWave = rule.untilWave() == null || waves.notAfter(wave, rule.untilWave());
            boolean byDate = rule.untilDate() == null || !today.isAfter(rule.untilDate());
            return byWave && byDate; // whichever expiry comes first ends it
        }

        boolean matches(Alert a) {
            if (rule.variable() != null && !CreationRules.matches(rule.variable(), a.variable())) {
                return false;
            }
            return rule.kind() == null || a.facets().stream().map(Finding::kind).anyMatch(k -> k == rule.kind());
        }

        String describe() {
            return origin + " mute rule \"" + (rule.variable() == null ? "*" : rule.variable()) + "\" "
                    + (rule.kind() == null ? "every kind" : rule.kind().name()) + " until "
                    + (rule.untilWave() == null ? "" : "wave " + rule.untilWave())
                    + (rule.untilWave() != null && rule.untilDate() != null ? " or " : "")
                    + (rule.untilDate() == null ? "" : rule.untilDate());
        }
    }

    /**
     * Wave labels in the dataset's order. Two labels of the listed waves are compared by their places in the list.
     * A label not (yet) listed, such as the last wave of a mute that runs into waves not fielded, is placed by the
     * configured order: in an explicit waveOrder by its place there, in the natural order by the same rule that
     * sorts the listed waves. A label the order cannot place is matched only by equality.
     */
    private record Waves(List<String> listed, WaveOrder configured) {

        OptionalInt compare(String a, String b) {
            if (a.equals(b)) {
                return OptionalInt.of(0);
            }
            if (listed.contains(a) && listed.contains(b)) {
                return OptionalInt.of(Integer.compare(listed.indexOf(a), listed.indexOf(b)));
            }
            if (!configured.isNatural()) {
                List<String> e = configured.explicit();
                return e.contains(a) && e.contains(b) ? OptionalInt.of(Integer.compare(e.indexOf(a), e.indexOf(b)))
                        : OptionalInt.empty();
            }
            List<String> all = new ArrayList<>(listed);
            all.add(a);
            all.add(b);
            return OptionalInt.of(Integer.signum(WaveListing.naturalOrder(all).compare(a, b)));
        }

        boolean notAfter(String a, String b) {
            OptionalInt c = compare(a, b);
            return c.isPresent() && c.getAsInt() <= 0;
        }

        boolean within(String wave, String from, String to) {
            return notAfter(from, wave) && notAfter(wave, to);
        }
    }
}
