package org.wavewarden.pipeline;

/**
 * Named points in a run where the reliability tests inject faults: {@code -Dwavewarden.fault.pause=POINT} stops
 * the process there (so a test can kill it mid-run), {@code -Dwavewarden.fault.fail=POINT} throws there (as a lost
 * connection would). Both are unset in normal operation, where a hit costs one property read.
 */
public final class FaultPoints {

    /** After the wave was read and judged, before anything is written. */
    public static final String BEFORE_WRITE = "before-write";
    /** Inside the results transaction, after the run row and before its findings. */
    public static final String INSIDE_WRITE = "inside-write";
    /** While one variable is judged: this prefix and the variable's name ({@code judge-variable:income}). */
    public static final String JUDGE_VARIABLE = "judge-variable:";
    /** While the data of one alert's chart are prepared: this prefix and the variable's name. */
    public static final String PLOT_VARIABLE = "plot-variable:";

    private FaultPoints() {
    }

    public static void hit(String point) {
        if (point.equals(System.getProperty("wavewarden.fault.fail"))) {
            throw new InjectedFault(point);
        }
        if (point.equals(System.getProperty("wavewarden.fault.pause"))) {
            System.err.println("wavewarden: paused at fault point " + point);
            System.err.flush();
            try {
                Thread.sleep(Long.MAX_VALUE);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new InjectedFault(point);
            }
        }
    }

    /** The failure a fault point throws. */
    public static final class InjectedFault extends RuntimeException {
        private static final long serialVersionUID = 1L;

        InjectedFault(String point) {
            super("injected fault at " + point);
        }
    }
}
