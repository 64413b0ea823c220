package org.wavewarden.cli;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.HashMap;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The person an action is recorded under: {@code --as}, else WAVEWARDEN_ACTOR, else the login name; a source that is
 * given but blank is refused rather than passed over. (Empty cells are sources not given.)
 */
class ActorOptionTest {

    @ParameterizedTest(name = "--as [{0}], env [{1}], user [{2}]")
    @CsvSource(delimiter = '|', quoteCharacter = '"', textBlock = """
            T. Quill   | Survey Office | mpellow | T. Quill
                       | Survey Office | mpellow | Survey Office
                       |               | mpellow | mpellow
            " T. Quill"|               | mpellow | T. Quill
            " "        | Survey Office | mpellow | refused: the acting person from --as is blank; give a name with --as NAME
                       | " "           | mpellow | refused: the acting person from WAVEWARDEN_ACTOR is blank; give a name with --as NAME
                       |               | " "     | refused: the acting person from the user name is blank; give a name with --as NAME
                       |               |         | refused: no acting person: give --as NAME or set WAVEWARDEN_ACTOR
            """)
    void theFirstSourceGivenNamesThePerson(String option, String env, String user, String expected) {
        Map<String, String> environment = new HashMap<>();
        if (env != null) {
            environment.put(ActorOption.ENV, env);
        }
        String got;
        try {
            got = ActorOption.resolve(option, environment, user);
        } catch (ActorOption.Refused e) {
            got = "refused: " + e.getMessage();
        }
        assertEquals(expected, got);
    }
}
