package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.deliver.ConsoleTable;
import org.wavewarden.deliver.DataText;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.SignOff;
import org.wavewarden.review.SignOffRule;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.store.SignOffs;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;

@Command(name = "signoff", mixinStandardHelpOptions = true,
        description = {"Record that a named person released a wave, on its current run: the run, the configuration"
                + " fingerprint and tool version it was judged under, and the wave's alerts with their states.",
                "Refused (exit 2) while a MATERIAL alert of the wave is open, unless forced with a reason, which is"
                        + " recorded. With --show: the wave's latest sign-off, or without WAVE every sign-off of the"
                        + " dataset."})
final class SignOffCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Mixin
    DatasetOption dataset;
    @Parameters(index = "0", arity = "0..1", paramLabel = "WAVE", description = "the wave to sign off (or show)")
    String wave;
    @Option(names = "--release", paramLabel = "RELEASE", description = "the release (revision) signed, for a dataset"
            + " with releases")
    String release;
    @Option(names = "--force", description = "sign although a MATERIAL alert of the wave is open (needs --reason)")
    boolean force;
    @Option(names = "--reason", paramLabel = "TEXT", description = "why the wave is released although it is blocked")
    String reason;
    @Option(names = "--show", description = "show the wave's latest sign-off instead of signing; without WAVE, every"
            + " sign-off of the dataset")
    boolean show;
    @Mixin
    ActorOption actor;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        PrintWriter err = spec.commandLine().getErr();
        String misuse = misuse();
        if (misuse != null) {
            err.println(misuse);
            spec.commandLine().usage(err);
            return Main.USAGE;
        }
        return AlertsCommand.act(config, spec, s -> {
            DatasetConfig d = dataset.pick(s.config());
            SignOffs signOffs = new SignOffs(s.store().jdbi(), s.config().results().schema());
            PrintWriter out = spec.commandLine().getOut();
            if (show) {
                return show(signOffs, d, out, err);
            }
            print(signOffs.signOff(new SignOffs.Request(d.name(), wave, release == null ? "" : release,
                    actor.resolve(), force, reason)), out);
            return Main.OK;
        }, (s, refusalOut) -> blocking(AlertsCommand.reviews(s), dataset.pick(s.config()).name(), refusalOut));
    }

    /** What the options say together that none says alone, or null. */
    private String misuse() {
        if (show && (force || reason != null || release != null || actor.name != null)) {
            return "--show reads a sign-off; --force, --reason, --release and --as belong to signing";
        }
        if (!show && wave == null) {
            return "name the WAVE to sign off";
        }
        if (force && (reason == null || reason.isBlank())) {
            return "--force needs --reason TEXT: a forced sign-off records why it went ahead";
        }
        if (!force && reason != null) {
            return "--reason goes with --force; to explain an alert use 'alerts explain ID --reason KEY'";
        }
        return null;
    }

    /** The wave's MATERIAL alerts that are open, and how to move each of them. */
    private void blocking(AlertReviews reviews, String datasetName, PrintWriter err) {
        List<AlertView> open = SignOffRule.blocking(reviews.list(new AlertReviews.Filter(datasetName, wave, null,
                null, null)));
        if (open.isEmpty()) {
            return;
        }
        err.println("open MATERIAL alerts of wave " + DataText.visible(wave) + ":");
        err.print(ConsoleTable.table(List.of("id", "variable", "kind", "verdict"), new int[] {6, 24, 20, 0},
                open.stream().map(a -> List.of(String.valueOf(a.alertId()), a.variable(), a.kind(),
                        a.verdict() == null ? "-" : a.verdict())).toList()));
        err.println("explain each with 'alerts explain ID --reason KEY --note TEXT', or sign with --force --reason"
                + " TEXT (the reason is recorded with the sign-off)");
    }

    private int show(SignOffs signOffs, DatasetConfig d, PrintWriter out, PrintWriter err) {
        if (wave == null) {
            List<SignOff> all = signOffs.all(d.name());
            List<List<String>> rows = new ArrayList<>();
            for (SignOff so : all) {
                rows.add(List.of(so.wave(), so.release(), so.actor(), AlertsCommand.WHEN.format(so.signedAt()),
                        String.valueOf(so.runId()), so.forced() ? "forced: " + so.forceReason() : ""));
            }
            out.print(ConsoleTable.table(List.of("wave", "release", "signed by", "when", "run", "forced"),
                    new int[] {10, 8, 20, 20, 6, 0}, rows));
            out.println(all.size() + " sign-off(s) of " + DataText.visible(d.name()));
            return Main.OK;
        }
        var latest = signOffs.latest(d.name(), wave);
        if (latest.isEmpty()) {
            err.println("wave " + DataText.visible(wave) + " of " + DataText.visible(d.name()) + " is not signed off;"
                    + " sign it with 'signoff " + DataText.visible(wave) + "'");
            return Main.USAGE;
        }
        print(latest.get(), out);
        return Main.OK;
    }

    static void print(SignOff so, PrintWriter out) {
        out.println(DataText.visible(so.dataset()) + " wave " + DataText.visible(so.wave())
                + (so.release() == null || so.release().isEmpty() ? "" : " release " + DataText.visible(so.release()))
                + " signed off by " + DataText.visible(so.actor()) + " at " + AlertsCommand.WHEN.format(so.signedAt()));
        out.println("  run " + so.runId() + ", configuration " + so.configFingerprint() + ", "
                + DataText.visible(so.toolVersion()));
        if (so.forced()) {
            out.println("  forced although a MATERIAL alert was open: " + DataText.visible(so.forceReason()));
        }
        out.println("  alerts at sign-off:");
        out.print(ConsoleTable.table(List.of("id", "variable", "kind", "verdict", "state"),
                new int[] {6, 24, 20, 9, 0}, so.alertsAtSignOff().stream().map(a -> List.of(
                        String.valueOf(a.alertId()), a.variable(), a.kind(), a.verdict() == null ? "-" : a.verdict(),
                        AlertsCommand.state(a.state()))).toList()));
        out.println("  " + so.alertsAtSignOff().size() + " alert(s)");
    }
}
