package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.EnumKeys;
import org.wavewarden.deliver.ConsoleTable;
import org.wavewarden.deliver.DataText;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.Session;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.store.AlertReviews;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.function.BiConsumer;
import java.util.function.Function;

@Command(name = "alerts", mixinStandardHelpOptions = true,
        description = "What people concluded about alerts: list them with their states, explain, mute, unmute or reopen"
                + " one, and show its history. Every action is recorded with the acting person and never changed.",
        subcommands = {AlertsCommand.ListAlerts.class, AlertsCommand.Explain.class, AlertsCommand.Mute.class,
                AlertsCommand.Unmute.class, AlertsCommand.Reopen.class, AlertsCommand.History.class})
final class AlertsCommand implements Runnable {

    /** Where an entry written from the command line says it came from. */
    static final String SOURCE = "command";

    static final DateTimeFormatter WHEN = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm 'UTC'", Locale.ROOT)
            .withZone(ZoneOffset.UTC);

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    /**
     * Runs an action on the results schema: a refusal (an unknown alert, an action the alert's state does not
     * allow, a missing person) is exit 2 with its reason; anything else goes to the command line's error handler.
     */
    static int act(ConfigOption config, CommandLine.Model.CommandSpec spec, Function<Session, Integer> action) {
        return act(config, spec, action, (s, err) -> { });
    }

    /**
     * As {@link #act(ConfigOption, CommandLine.Model.CommandSpec, Function)}; when the results schema refuses the
     * action, {@code wayOut} then prints what the person can do about it, with the store still open.
     */
    static int act(ConfigOption config, CommandLine.Model.CommandSpec spec, Function<Session, Integer> action,
                   BiConsumer<Session, PrintWriter> wayOut) {
        PrintWriter err = spec.commandLine().getErr();
        try (Session s = Session.open(config.load(), null, System.getenv())) {
            s.migrate(); // a results schema written by an earlier version gains the history tables first
            try {
                return action.apply(s);
            } catch (ReviewException e) {
                err.println(refused(e));
                wayOut.accept(s, err);
                return Main.USAGE;
            }
        } catch (ReviewException | ActorOption.Refused e) {
            err.println(refused(e));
            return Main.USAGE;
        }
    }

    private static String refused(RuntimeException e) {
        return "refused: " + DataText.visible(e.getMessage());
    }

    /** What an action on one alert is given: the session, the alert store, the alert and the acting person. */
    record Acting(Session session, AlertReviews reviews, AlertView alert, String actor) {
    }

    /**
     * Takes one action on alert {@code id} as the acting person, and prints the alert as it stands after it with
     * the entry the action wrote: explain, mute and unmute differ only in the action.
     */
    static int review(ConfigOption config, CommandLine.Model.CommandSpec spec, ActorOption actor, long id,
                      Function<Acting, ReviewEntry> action) {
        return act(config, spec, s -> {
            String who = actor.resolve();
            AlertReviews reviews = reviews(s);
            ReviewEntry e = action.apply(new Acting(s, reviews, alert(reviews, id), who));
            PrintWriter out = spec.commandLine().getOut();
            out.println(describe(alert(reviews, id)));
            out.println("  " + entry(e));
            return Main.OK;
        });
    }

    static AlertReviews reviews(Session s) {
        return new AlertReviews(s.store().jdbi(), s.config().results().schema());
    }

    static AlertView alert(AlertReviews reviews, long id) {
        return reviews.get(id).orElseThrow(() -> new ReviewException("there is no alert " + id
                + "; 'alerts list' shows their ids"));
    }

    /** One line naming an alert, its data made inert. */
    static String describe(AlertView a) {
        return "alert " + a.alertId() + ": " + DataText.visible(a.dataset()) + " wave " + DataText.visible(a.wave())
                + (a.againstWave() == null || a.againstWave().isEmpty() ? ""
                : " against " + DataText.visible(a.againstWave())) + ", " + DataText.visible(a.variable()) + " "
                + a.kind() + (a.verdict() == null ? "" : " " + a.verdict()) + ", " + state(a.state());
    }

    static String state(AlertState s) {
        return s == null ? "-" : s.name().toLowerCase(Locale.ROOT);
    }

    static String entry(ReviewEntry e) {
        StringBuilder sb = new StringBuilder();
        sb.append(WHEN.format(e.at())).append("  ").append(e.action().name().toLowerCase(Locale.ROOT))
                .append(" by ").append(DataText.visible(e.actor()));
        if (e.reason() != null) {
            sb.append(", ").append(e.reason().key());
        }
        if (e.untilWave() != null || e.untilDate() != null) {
            sb.append(", until").append(e.untilWave() == null ? "" : " wave " + DataText.visible(e.untilWave()))
                    .append(e.untilWave() != null && e.untilDate() != null ? " or" : "")
                    .append(e.untilDate() == null ? "" : " " + e.untilDate());
        }
        if (e.source() != null) {
            sb.append(" (").append(DataText.visible(e.source())).append(')');
        }
        if (e.note() != null && !e.note().isBlank()) {
            sb.append(": ").append(DataText.visible(e.note()));
        }
        return sb.toString();
    }

    @Command(name = "list", mixinStandardHelpOptions = true,
            description = "List alerts, oldest first: id, dataset, wave, variable, kind, verdict, state and the latest"
                    + " action.")
    static final class ListAlerts implements Callable<Integer> {
        @Mixin
        ConfigOption config;
        @Option(names = {"-d", "--dataset"}, paramLabel = "NAME", description = "only this dataset")
        String dataset;
        @Option(names = "--wave", paramLabel = "WAVE", description = "only this wave")
        String wave;
        @Option(names = "--state", paramLabel = "STATE", converter = StateConverter.class,
                description = "only alerts in this state: open, explained, muted or superseded")
        AlertState state;
        @Option(names = "--verdict", paramLabel = "VERDICT", converter = VerdictConverter.class,
                description = "only alerts led by this verdict: MATERIAL, UNCERTAIN, MINOR, STABLE or CLEARED")
        Verdict verdict;
        @Option(names = "--kind", paramLabel = "KIND", converter = KindConverter.class,
                description = "only alerts with a finding of this kind, e.g. SHIFT or MISSING_RATE_CHANGE")
        FindingKind kind;
        @picocli.CommandLine.Spec
        picocli.CommandLine.Model.CommandSpec spec;

        @Override
        public Integer call() {
            return act(config, spec, s -> {
                List<AlertView> alerts = reviews(s).list(new AlertReviews.Filter(dataset, wave, state,
                        verdict == null ? null : verdict.name(), kind == null ? null : kind.name()));
                List<List<String>> rows = new ArrayList<>();
                for (AlertView a : alerts) {
                    rows.add(List.of(String.valueOf(a.alertId()), a.dataset(), a.wave(), a.variable(), a.kind(),
                            a.verdict() == null ? "-" : a.verdict(), state(a.state()),
                            a.last() == null ? "-" : a.last().action().name().toLowerCase(Locale.ROOT) + " by "
                                    + a.last().actor() + " " + WHEN.format(a.last().at())));
                }
                PrintWriter out = spec.commandLine().getOut();
                out.print(ConsoleTable.table(List.of("id", "dataset", "wave", "variable", "kind", "verdict", "state",
                        "last action"), new int[] {6, 20, 10, 24, 20, 9, 10, 0}, rows));
                out.println(alerts.size() + " alert(s)");
                return Main.OK;
            });
        }
    }

    /**
     * An action a person takes on one alert: the configuration, the alert's id and the acting person are read alike
     * by every such command, and {@link #review} takes the action and prints the result.
     */
    abstract static class OnOneAlert implements Callable<Integer> {
        @Mixin
        ConfigOption config;
        @Parameters(index = "0", paramLabel = "ID", description = "the alert, as 'alerts list' shows it")
        long id;
        @Mixin
        ActorOption actor;
        @picocli.CommandLine.Spec
        picocli.CommandLine.Model.CommandSpec spec;

        /** The action, given the alert and the person. */
        abstract ReviewEntry take(Acting a);

        @Override
        public Integer call() {
            return review(config, spec, actor, id, this::take);
        }
    }

    @Command(name = "explain", mixinStandardHelpOptions = true,
            description = "Give the reason for an open or muted alert; it is explained from now on.")
    static final class Explain extends OnOneAlert {
        @Option(names = "--reason", required = true, paramLabel = "KEY", converter = ReasonConverter.class,
                description = "planned-change, fix-upstream, real-change or no-problem")
        ReviewReason reason;
        @Option(names = "--note", paramLabel = "TEXT", description = "what was found, in words")
        String note;

        @Override
        ReviewEntry take(Acting a) {
            return a.reviews().explain(a.alert().alertId(), a.actor(), reason, note, SOURCE);
        }
    }

    @Command(name = "mute", mixinStandardHelpOptions = true,
            description = "Mute an alert until a wave or a day (or both: whichever comes first). A muted alert is"
                    + " recorded and shown in the digest's muted section, never delivered; the same alert of a later"
                    + " wave is muted when it is raised, until the mute ends.")
    static final class Mute extends OnOneAlert {
        @Option(names = "--until-wave", paramLabel = "WAVE", description = "the last wave muted")
        String untilWave;
        @Option(names = "--until-date", paramLabel = "DATE", description = "the last day muted, e.g. 2025-06-30")
        LocalDate untilDate;
        @Option(names = "--reason", paramLabel = "KEY", converter = ReasonConverter.class,
                description = "planned-change, fix-upstream, real-change or no-problem")
        ReviewReason reason;
        @Option(names = "--note", paramLabel = "TEXT", description = "why, in words")
        String note;

        @Override
        public Integer call() {
            if (untilWave == null && untilDate == null) {
                // No mute is forever: a forgotten one would hide the variable's alerts for good.
                spec.commandLine().getErr().println("refused: give --until-wave WAVE, --until-date DATE or both;"
                        + " a mute always ends");
                return Main.USAGE;
            }
            if (untilDate != null && untilDate.isBefore(LocalDate.now(ZoneOffset.UTC))) {
                spec.commandLine().getErr().println("refused: --until-date " + untilDate + " is past; a mute ending"
                        + " then would mute nothing");
                return Main.USAGE;
            }
            return super.call();
        }

        @Override
        ReviewEntry take(Acting a) {
            if (untilWave != null) {
                knownWave(a.session(), a.alert().dataset(), untilWave);
            }
            return a.reviews().mute(a.alert().alertId(), a.actor(), untilWave, untilDate, reason, note, SOURCE);
        }

        /** With an explicit wave order, the last wave muted must be one of it (as in a configured mute rule). */
        static void knownWave(Session s, String dataset, String wave) {
            for (DatasetConfig d : s.config().datasets()) {
                List<String> order = d.waveOrder().explicit();
                if (d.name().equals(dataset) && !d.waveOrder().isNatural() && !order.contains(wave)) {
                    throw new ReviewException("wave '" + DataText.visible(wave) + "' is not in the waveOrder of "
                            + dataset + ": " + order);
                }
            }
        }
    }

    @Command(name = "unmute", mixinStandardHelpOptions = true,
            description = "Lift the mute of an alert: it is open again, and later waves' alerts are no longer muted"
                    + " by it.")
    static final class Unmute extends OnOneAlert {
        @Option(names = "--note", paramLabel = "TEXT", description = "why, in words")
        String note;

        @Override
        ReviewEntry take(Acting a) {
            return a.reviews().unmute(a.alert().alertId(), a.actor(), note, SOURCE);
        }
    }

    @Command(name = "reopen", mixinStandardHelpOptions = true,
            description = "Open an explained alert again, when its explanation no longer holds; the explanation stays"
                    + " in the history.")
    static final class Reopen extends OnOneAlert {
        @Option(names = "--note", required = true, paramLabel = "TEXT",
                description = "why the explanation no longer holds, in words")
        String note;

        @Override
        ReviewEntry take(Acting a) {
            return a.reviews().reopen(a.alert().alertId(), a.actor(), note, SOURCE);
        }
    }

    @Command(name = "history", mixinStandardHelpOptions = true,
            description = "Show an alert and every action taken on it, oldest first.")
    static final class History implements Callable<Integer> {
        @Mixin
        ConfigOption config;
        @Parameters(index = "0", paramLabel = "ID", description = "the alert, as 'alerts list' shows it")
        long id;
        @picocli.CommandLine.Spec
        picocli.CommandLine.Model.CommandSpec spec;

        @Override
        public Integer call() {
            return act(config, spec, s -> {
                AlertReviews reviews = reviews(s);
                AlertView a = alert(reviews, id);
                PrintWriter out = spec.commandLine().getOut();
                out.println(describe(a));
                out.println("  " + DataText.visible(a.sentence()));
                for (ReviewEntry e : reviews.history(a.alertId())) {
                    out.println("  " + entry(e));
                }
                return Main.OK;
            });
        }
    }

    /** An enum value written in any case, refused with the list of values. */
    static <E extends Enum<E>> E parse(Class<E> type, String text, Function<E, String> shown) {
        return EnumKeys.parse(type, shown, text).orElseThrow(() -> new CommandLine.TypeConversionException(
                "expected one of " + EnumKeys.listed(type, shown) + " but got '" + DataText.visible(text) + "'"));
    }

    static final class StateConverter implements CommandLine.ITypeConverter<AlertState> {
        @Override
        public AlertState convert(String value) {
            return parse(AlertState.class, value, AlertsCommand::state);
        }
    }

    static final class VerdictConverter implements CommandLine.ITypeConverter<Verdict> {
        @Override
        public Verdict convert(String value) {
            return parse(Verdict.class, value, Enum::name);
        }
    }

    static final class KindConverter implements CommandLine.ITypeConverter<FindingKind> {
        @Override
        public FindingKind convert(String value) {
            return parse(FindingKind.class, value, Enum::name);
        }
    }

    static final class ReasonConverter implements CommandLine.ITypeConverter<ReviewReason> {
        @Override
        public ReviewReason convert(String value) {
            return parse(ReviewReason.class, value, ReviewReason::key);
        }
    }
}
