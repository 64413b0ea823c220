package org.wavewarden.console;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.daemon.Router;

import java.time.Clock;
import java.util.Objects;
import java.util.function.Function;

/**
 * The web console's routes, added to the daemon's router (or the standalone {@code console} command's). Every page
 * needs a session; every POST needs the session's CSRF token; every action goes through the same lifecycle code as
 * the commands ({@code store.AlertReviews}, {@code store.SignOffs}) with the logged-in person as the actor and
 * {@code console} as the source.
 *
 * <pre>
 * GET  /console                                  datasets overview
 * GET  /console/dataset?name=D[&amp;kind=K&amp;verdict=V] variables by waves
 * GET  /console/finding?id=N                      a finding, its trend, its alert's history, the forms
 * GET  /console/wave?dataset=D&amp;wave=W             a wave's alerts by state, sign-off, downloads
 * GET  /console/search?q=TEXT                     variables by name or label across datasets
 * GET  /console/download?dataset=D&amp;wave=W&amp;file=findings.json|digest.md
 * GET  /console/static/console.css
 * GET  /console/login, POST /console/login        fields name, password, csrf, next
 * POST /console/logout                            field csrf
 * POST /console/alert/explain                     fields alert, reason, note, csrf
 * POST /console/alert/mute                        fields alert, reason, note, untilWave, untilDate, csrf
 * POST /console/alert/unmute                      fields alert, note, csrf
 * POST /console/signoff                           fields dataset, wave, release, force, reason, csrf
 * </pre>
 * A successful POST answers 303 to the page it came from with a notice; a missing or wrong CSRF token is 403, a
 * role that does not allow the action is 403, an action the lifecycle refuses is 409 with its reason.
 */
public final class ConsoleApp {

    private final WardenConfig config;
    private final Jdbi jdbi;
    private final Clock clock;
    private final Function<String, String> health;

    /**
     * @param health a dataset's health line from the daemon, or null when no daemon runs here (standalone)
     */
    public ConsoleApp(WardenConfig config, Jdbi jdbi, Clock clock, Function<String, String> health) {
        this.config = Objects.requireNonNull(config, "config");
        this.jdbi = Objects.requireNonNull(jdbi, "jdbi");
        this.clock = Objects.requireNonNull(clock, "clock");
        this.health = health;
    }

    /** Adds the console's routes to {@code router} (before the server starts). */
    public Router install(Router router) {
        throw new UnsupportedOperationException("not yet");
    }
}
