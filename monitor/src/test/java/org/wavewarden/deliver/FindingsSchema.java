package org.wavewarden.deliver;

import com.fasterxml.jackson.databind.JsonNode;
import com.networknt.schema.JsonSchema;
import com.networknt.schema.JsonSchemaFactory;
import com.networknt.schema.SchemaValidatorsConfig;
import com.networknt.schema.SpecVersion;
import com.networknt.schema.ValidationMessage;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

/** The JSON Schema of findings.json ({@code docs/findings.schema.json}), held by a draft 2020-12 validator. */
public final class FindingsSchema {

    public static final Path FILE = Path.of("..", "docs", "findings.schema.json");

    private static final JsonSchema SCHEMA = load();

    private FindingsSchema() {
    }

    /** What the document breaks of the schema, one line each; empty when it is valid. */
    public static List<String> problems(JsonNode document) {
        return SCHEMA.validate(document).stream().map(ValidationMessage::getMessage).sorted().toList();
    }

    public static JsonNode schema() {
        try {
            return Json.mapper().readTree(Files.readString(FILE));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static JsonSchema load() {
        SchemaValidatorsConfig config = SchemaValidatorsConfig.builder().formatAssertionsEnabled(true).build();
        return JsonSchemaFactory.getInstance(SpecVersion.VersionFlag.V202012).getSchema(schema(), config);
    }
}
