package org.wavewarden.demo;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.DdiCodebook;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The committed DDI codebook of the leisure survey, read back by {@link DdiCodebook#read}, says of every variable what
 * the study codebook it was written from says: what is written is what the monitor will read.
 */
class LeisureDdiRoundTripTest {

    private static DatasetCodebook written;
    private static DatasetCodebook read;

    @BeforeAll
    static void readTheCommittedCodebook() throws IOException {
        Path root = Path.of("").toAbsolutePath();
        while (!Files.isDirectory(root.resolve("demo-data"))) {
            root = root.getParent();
        }
        written = new LeisureScenarioGenerator().studyCodebook();
        read = DdiCodebook.read(root.resolve("demo-data").resolve(LeisureScenarioGenerator.FOLDER)
                .resolve(LeisureScenarioGenerator.CODEBOOK_FILE));
    }

    @Test
    void everyVariableReadsBackWithItsLabelLevelStorageCodesAndRanges() {
        assertEquals(LeisureScenarioGenerator.TITLE, read.title());
        assertEquals(written.variables().stream().map(VariableMeta::name).toList(),
                read.variables().stream().map(VariableMeta::name).toList());
        for (VariableMeta w : written.variables()) {
            VariableMeta r = read.variable(w.name()).orElseThrow();
            assertEquals(w.label(), r.label(), w.name());
            assertEquals(w.storage(), r.storage(), w.name());
            assertEquals(w.measure(), r.measure(), w.name());
            assertEquals(w.valueLabels(), r.valueLabels(), w.name());
            assertEquals(w.missingCodes().stream().map(MissingCodeSpec::value).toList(),
                    r.missingCodes().stream().map(MissingCodeSpec::value).toList(), w.name());
            assertEquals(w.missingRanges().stream().map(m -> m.low() + " THRU " + m.high()).toList(),
                    r.missingRanges().stream().map(m -> m.low() + " THRU " + m.high()).toList(), w.name());
            assertEquals(w.validRange(), r.validRange(), w.name());
        }
    }

    /** The 2.5 schema's varType carries the unit as the attribute measUnit of var. */
    @Test
    void unitsReadBackFromTheVarsMeasUnit() {
        for (VariableMeta w : written.variables()) {
            assertEquals(w.unit(), read.variable(w.name()).orElseThrow().unit(), w.name());
        }
    }

    /** invalrng has no label; its key ("a listing of the category values and labels") holds the range's reason. */
    @Test
    void aMissingRangeReadsBackWithItsReason() {
        assertEquals(written.variable("age").orElseThrow().missingRanges(),
                read.variable("age").orElseThrow().missingRanges());
    }
}
