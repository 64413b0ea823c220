package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The {@code alerts} settings of a dataset for e-mail, roll-ups and chat webhooks: what a good section gives, the
 * defaults (a webhook keeps one post per alert, e-mail gets one roll-up per firing, STARTTLS required), and each
 * bad value refused with the full key path.
 */
class SinkSettingsConfigTest {

    static final String HEAD = """
            source:
              jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey"
              user: reader
            datasets:
              - name: household
                table: survey.household_wave
                waveColumn: wave
                variables:
                  - {name: age, kind: continuous, unit: years}
                alerts:
            """;

    static SinkSettings alerts(String section) {
        return ConfigLoader.parse(HEAD + section).dataset("household").alerts();
    }

    static final String EMAIL = """
                  email:
                    host: smtp.harrowmere.example
                    userEnv: RELAY_USER
                    passwordEnv: RELAY_PASSWORD
                    from: wavewarden@harrowmere.example
                    to: [survey-ops@harrowmere.example, fieldwork@harrowmere.example]
            """;

    @Test
    void anEmailSinkDefaultsToOneRollUpPerFiringOverStartTlsOnTheSubmissionPort() {
        SinkSettings.Email e = alerts(EMAIL).email();
        assertEquals(587, e.port());
        assertEquals(SinkSettings.Tls.STARTTLS, e.tls());
        assertNull(e.caFile());
        assertEquals(SinkSettings.Messages.PER_FIRING, e.messages());
        assertEquals(List.of("survey-ops@harrowmere.example", "fieldwork@harrowmere.example"), e.to());
        assertEquals("RELAY_PASSWORD", e.passwordEnv());
    }

    @Test
    void aWebhookKeepsOnePostPerAlertUnlessToldOtherwise() {
        String hook = "      webhook: {url: \"https://chat.harrowmere.example/hook\", secretEnv: HOOK_SECRET}\n";
        assertEquals(SinkSettings.Messages.PER_ALERT, alerts(hook).webhook().messages());
        assertNull(alerts(hook).webhook().textField());
        SinkSettings.Webhook chat = alerts(hook.replace("secretEnv: HOOK_SECRET",
                "secretEnv: HOOK_SECRET, messages: both, textField: text")).webhook();
        assertEquals(SinkSettings.Messages.BOTH, chat.messages());
        assertEquals("text", chat.textField());
    }

    @Test
    void theDigestBaseUrlLosesItsTrailingSlash() {
        assertEquals("https://reports.harrowmere.example/ww",
                alerts("      digestBaseUrl: \"https://reports.harrowmere.example/ww/\"\n").digestBaseUrl());
    }

    @Test
    void aPlainRelayOnLoopbackIsAllowedWhenAskedFor() {
        SinkSettings.Email e = alerts(EMAIL.replace("smtp.harrowmere.example", "127.0.0.1")
                .replace("    userEnv", "    tls: none\n        port: 25\n        userEnv")).email();
        assertEquals(SinkSettings.Tls.NONE, e.tls());
        assertEquals(25, e.port());
    }

    static Stream<Arguments> badSections() {
        return Stream.of(
                Arguments.of("password written inline", EMAIL.replace("passwordEnv: RELAY_PASSWORD",
                        "password: hunter2"), "datasets[0].alerts.email.password"),
                Arguments.of("second recipient not an address", EMAIL.replace("fieldwork@harrowmere.example",
                        "fieldwork at harrowmere"), "datasets[0].alerts.email.to[1]"),
                Arguments.of("recipient with a display name", EMAIL.replace("[survey-ops@harrowmere.example,",
                        "[\"Ops <survey-ops@harrowmere.example>\","), "datasets[0].alerts.email.to[0]"),
                Arguments.of("sender not an address", EMAIL.replace("from: wavewarden@harrowmere.example",
                        "from: wavewarden"), "datasets[0].alerts.email.from"),
                Arguments.of("no recipient", EMAIL.replace(
                        "to: [survey-ops@harrowmere.example, fieldwork@harrowmere.example]", "to: []"),
                        "datasets[0].alerts.email.to"),
                Arguments.of("plain SMTP to a remote relay", EMAIL.replace("    userEnv", "    tls: none\n"
                        + "        userEnv"), "datasets[0].alerts.email.tls"),
                Arguments.of("unknown tls", EMAIL.replace("    userEnv", "    tls: ssl\n        userEnv"),
                        "datasets[0].alerts.email.tls"),
                Arguments.of("user without password", EMAIL.replace("        passwordEnv: RELAY_PASSWORD\n", ""),
                        "datasets[0].alerts.email.passwordEnv"),
                Arguments.of("password variable not a name", EMAIL.replace("RELAY_PASSWORD", "relay-password"),
                        "datasets[0].alerts.email.passwordEnv"),
                Arguments.of("port out of range", EMAIL.replace("    userEnv", "    port: 70000\n        userEnv"),
                        "datasets[0].alerts.email.port"),
                Arguments.of("unknown messages value", EMAIL.replace("    userEnv", "    messages: digest\n"
                        + "        userEnv"), "datasets[0].alerts.email.messages"),
                Arguments.of("chat field not a name", "      webhook: {url: \"https://h.example/x\", secretEnv: S,"
                        + " textField: \"a b\"}\n", "datasets[0].alerts.webhook.textField"),
                Arguments.of("digest base URL with a query", "      digestBaseUrl: \"https://h.example/x?token=1\"\n",
                        "datasets[0].alerts.digestBaseUrl"),
                Arguments.of("misspelt key", EMAIL.replace("from:", "form:"), "datasets[0].alerts.email.form"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("badSections")
    void aBadValueIsRefusedNamingItsFullKeyPath(String what, String section, String key) {
        ConfigException e = assertThrows(ConfigException.class, () -> alerts(section), what);
        assertEquals(key, e.key(), what + ": " + e.getMessage());
        assertTrue(!e.getMessage().contains("hunter2"), "a password is never echoed: " + e.getMessage());
    }
}
