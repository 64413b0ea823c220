package org.wavewarden.console.auth;

import java.net.InetAddress;
import java.net.UnknownHostException;
import java.util.Optional;
import java.util.regex.Pattern;

/**
 * An IP address written as a literal (IPv4 dotted quad or IPv6, with or without brackets), read without any name
 * lookup, so that {@code ::1}, {@code [::1]} and {@code 0:0:0:0:0:0:0:1} are one address and a host name is never
 * resolved.
 */
public final class IpLiteral {

    private static final Pattern IPV4 = Pattern.compile("(25[0-5]|2[0-4]\\d|1\\d\\d|[1-9]?\\d)"
            + "(\\.(25[0-5]|2[0-4]\\d|1\\d\\d|[1-9]?\\d)){3}");
    // Hex groups, colons and at most a trailing dotted quad; the shape is checked by InetAddress below.
    private static final Pattern IPV6 = Pattern.compile("[0-9A-Fa-f:]*:[0-9A-Fa-f:.]*");

    private IpLiteral() {
    }

    /** The address {@code text} is a literal of, or empty for anything else (host names, ranges, zone ids). */
    public static Optional<InetAddress> parse(String text) {
        if (text == null) {
            return Optional.empty();
        }
        String t = text.strip();
        if (t.startsWith("[") && t.endsWith("]")) {
            t = t.substring(1, t.length() - 1);
        }
        if (!IPV4.matcher(t).matches() && !(IPV6.matcher(t).matches() && t.length() <= 45)) {
            return Optional.empty();
        }
        try {
            // With a literal, getByName parses and never asks a name server.
            return Optional.of(InetAddress.getByName(t));
        } catch (UnknownHostException e) {
            return Optional.empty();
        }
    }
}
