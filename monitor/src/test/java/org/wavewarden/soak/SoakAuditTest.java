package org.wavewarden.soak;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.soak.SoakAudit.AlertRef;
import org.wavewarden.soak.SoakAudit.AlertRow;
import org.wavewarden.soak.SoakAudit.Delivery;
import org.wavewarden.soak.SoakAudit.RunRow;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.soak.WebhookReceiver.Outcome.ACCEPTED;
import static org.wavewarden.soak.WebhookReceiver.Outcome.REFUSED;
import static org.wavewarden.soak.WebhookReceiver.Outcome.REPEAT;

class SoakAuditTest {

    static final AlertRef INCOME = new AlertRef("harrowmere-soak", "W0004", "W0003", "income_monthly", "SHIFT");
    static final AlertRef HEIGHT = new AlertRef("harrowmere-soak", "W0005", "W0004", "height_cm", "NUMERIC_SENTINEL");
    static final List<AlertRow> ALERTS = List.of(new AlertRow(INCOME, "MATERIAL"), new AlertRow(HEIGHT, null));

    @TempDir
    Path dir;

    @Test
    void retriesAfterRefusedAnswersAreNeitherLostNorDuplicated() {
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, SinkFilter.all(), List.of(
                new Delivery(INCOME, "k1", REFUSED), new Delivery(INCOME, "k1", REFUSED), new Delivery(INCOME, "k1", ACCEPTED),
                new Delivery(HEIGHT, "k2", REFUSED), new Delivery(HEIGHT, "k2", ACCEPTED)));
        assertEquals(0, s.lost());
        assertEquals(0, s.duplicated());
        assertEquals(2, s.delivered());
        assertEquals(5, s.requests());
        assertEquals(2, s.accepted());
    }

    @Test
    void retriesUnderAKeyTheReceiverHadTakenAreRepeatsRecognisedByKeyNeitherDeliveriesNorDuplicates() {
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, SinkFilter.all(), List.of(
                new Delivery(INCOME, "k1", ACCEPTED), new Delivery(INCOME, "k1", REPEAT),
                new Delivery(INCOME, "k1", REPEAT), new Delivery(HEIGHT, "k2", ACCEPTED)));
        assertEquals(0, s.duplicated());
        assertEquals(2, s.repeats());
        assertEquals(2, s.accepted());
        assertEquals(2, s.delivered());
        assertEquals(4, s.requests());
        assertEquals(0, s.lost());
    }

    @Test
    void anAlertTakenUnderThreeDifferentKeysCountsTwoDuplicates() {
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, SinkFilter.all(), List.of(
                new Delivery(INCOME, "k1", ACCEPTED), new Delivery(INCOME, "k8", ACCEPTED),
                new Delivery(INCOME, "k9", ACCEPTED), new Delivery(HEIGHT, "k2", ACCEPTED)));
        assertEquals(2, s.duplicated());
        assertEquals(0, s.repeats());
        assertEquals(4, s.keys());
        assertEquals(List.of(INCOME + " (accepted 3 times, under 3 keys)"), s.duplicatedAlerts());
    }

    @Test
    void aRepeatAloneIsNoDeliveryTheAlertNeverTakenIsLost() {
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, SinkFilter.all(), List.of(
                new Delivery(INCOME, "k1", REPEAT), new Delivery(HEIGHT, "k2", ACCEPTED)));
        assertEquals(1, s.lost());
        assertEquals(1, s.repeats());
        assertEquals(List.of(INCOME + " (never sent)"), s.lostAlerts());
    }

    @Test
    void anAlertWhoseEveryDeliveryWasRefusedIsLost() {
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, SinkFilter.all(), List.of(
                new Delivery(INCOME, "k1", REFUSED), new Delivery(INCOME, "k1", REFUSED), new Delivery(HEIGHT, "k2", ACCEPTED)));
        assertEquals(1, s.lost());
        assertEquals(List.of(INCOME + " (sent 2 times, never accepted)"), s.lostAlerts());
        assertEquals(1, s.delivered());
    }

    @Test
    void anAcceptedDeliveryOfNoCurrentAlertIsUnexpected() {
        AlertRef ghost = new AlertRef("harrowmere-soak", "W0009", "W0008", "age", "SHIFT");
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, SinkFilter.all(), List.of(
                new Delivery(INCOME, "k1", ACCEPTED), new Delivery(HEIGHT, "k2", ACCEPTED), new Delivery(ghost, "k3", ACCEPTED),
                new Delivery(null, "k4", ACCEPTED)));
        assertEquals(2, s.unexpected());
        assertEquals(0, s.lost());
    }

    @Test
    void anAlertTheSinkFilterRefusesIsNotExpectedThere() {
        SinkFilter shiftsOnly = SinkFilter.of("MATERIAL", Set.of("SHIFT"));
        SoakAudit.Sink s = SoakAudit.sink("webhook", ALERTS, shiftsOnly, List.of(new Delivery(INCOME, "k1", ACCEPTED)));
        assertEquals(1, s.expected());
        assertEquals(0, s.lost());
    }

    @Test
    void anEventIsExpectedAtASinkThatTakesAnyOfItsFindingsNotOnlyItsLead() {
        AlertRef height = new AlertRef("harrowmere-soak", "W0005", "W0004", "height_cm", "MISSING_RATE_CHANGE");
        AlertRow event = new AlertRow(height, "UNCERTAIN", List.of(new SinkFilter.Judged(
                org.wavewarden.judge.FindingKind.NUMERIC_SENTINEL, null)));
        SinkFilter sentinels = SinkFilter.of("MATERIAL", Set.of("NUMERIC_SENTINEL"));
        assertEquals(1, SoakAudit.sink("webhook", List.of(event), sentinels, List.of()).lost());
        assertEquals(0, SoakAudit.sink("webhook", List.of(new AlertRow(height, "UNCERTAIN")), sentinels, List.of())
                .expected(), "the lead alone is refused");
    }

    @Test
    void everyWaveWithExactlyOneCurrentRunIsJudgedAndSupersededRunsDoNotCount() {
        SoakAudit.Waves w = SoakAudit.waves(List.of("W0001", "W0002", "W0003", "W0004"), List.of(
                new RunRow("W0001", true), new RunRow("W0002", false), new RunRow("W0002", true),
                new RunRow("W0003", true), new RunRow("W0003", true), new RunRow("W0007", true)));
        assertEquals(2, w.judged());
        assertEquals(List.of("W0004"), w.notJudged());
        assertEquals(List.of("W0003 (2 current runs)"), w.judgedMoreThanOnce());
        assertEquals(List.of("W0007"), w.judgedButNotProduced());
        assertEquals(6, w.runs());
        assertEquals(1, w.supersededRuns());
        assertFalse(w.clean());
        assertTrue(SoakAudit.waves(List.of("W0001"), List.of(new RunRow("W0001", true))).clean());
    }

    @Test
    void jsonLinesCountEveryCompleteLineAndLeaveOutAnUnfinishedLastOneAndASecondLineOfOneKeyIsADuplicate() throws Exception {
        Path file = dir.resolve("alerts.jsonl");
        String income = "{\"dataset\":\"harrowmere-soak\",\"wave\":\"W0004\",\"againstWave\":\"W0003\","
                + "\"variable\":\"income_monthly\",\"kind\":\"SHIFT\",\"idempotencyKey\":\"k1\"}";
        String height = "{\"dataset\":\"harrowmere-soak\",\"wave\":\"W0005\",\"againstWave\":\"W0004\","
                + "\"variable\":\"height_cm\",\"kind\":\"NUMERIC_SENTINEL\",\"idempotencyKey\":\"k2\"}";
        Files.writeString(file, income + "\n" + income + "\n" + height.substring(0, 40));
        List<Delivery> lines = SoakAudit.fromJsonLines(file);
        assertEquals(List.of(new Delivery(INCOME, "k1", ACCEPTED), new Delivery(INCOME, "k1", ACCEPTED)), lines);
        SoakAudit.Sink s = SoakAudit.sink("jsonLines", ALERTS, SinkFilter.all(), lines);
        assertEquals(1, s.duplicated());
        assertEquals(0, s.repeats());
        assertEquals(List.of(INCOME + " (accepted 2 times, under 1 key)"), s.duplicatedAlerts());
        assertEquals(1, s.lost());
        assertEquals(List.of(HEIGHT + " (never sent)"), s.lostAlerts());
    }

    @Test
    void aWebhookBodyWithoutComparisonWaveNamesTheFirstWavesAlert() {
        AlertRef first = new AlertRef("harrowmere-soak", "W0001", "", "height_cm", "NUMERIC_SENTINEL");
        List<Delivery> d = SoakAudit.fromWebhook(List.of(new WebhookReceiver.Request(java.time.Instant.EPOCH, "k5",
                200, ACCEPTED, true, true, "{\"dataset\":\"harrowmere-soak\",\"wave\":\"W0001\","
                + "\"againstWave\":null,\"variable\":\"height_cm\",\"kind\":\"NUMERIC_SENTINEL\"}")));
        assertEquals(List.of(new Delivery(first, "k5", ACCEPTED)), d);
    }

    @Test
    void theWebhookEvidenceKeepsWhatTheReceiverMadeOfEachRequest() {
        String body = "{\"dataset\":\"harrowmere-soak\",\"wave\":\"W0004\",\"againstWave\":\"W0003\","
                + "\"variable\":\"income_monthly\",\"kind\":\"SHIFT\"}";
        List<Delivery> d = SoakAudit.fromWebhook(List.of(
                new WebhookReceiver.Request(java.time.Instant.EPOCH, "k1", 500, REFUSED, true, true, body),
                new WebhookReceiver.Request(java.time.Instant.EPOCH, "k1", 200, ACCEPTED, false, true, body),
                new WebhookReceiver.Request(java.time.Instant.EPOCH, "k1", 200, REPEAT, true, true, body)));
        assertEquals(List.of(new Delivery(INCOME, "k1", REFUSED), new Delivery(INCOME, "k1", ACCEPTED),
                new Delivery(INCOME, "k1", REPEAT)), d);
    }
}
