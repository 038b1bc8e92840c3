package org.loopstand.protocol.config;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class MappingReaderTest {
    private static final String UNIT = """
            unit:
              id: g1
              ratingMw: 120
              droop: 5
              online: sometimes
              cycleS: 30
              turbine: diesl
              minPulseMs: 250.5
              shape: [1, two]
            """;

    private final List<String> problems = new ArrayList<>();

    private MappingReader unit() {
        MappingReader root = new MappingReader(YamlNode.read("u.yaml", UNIT), "the file", problems);
        return root.mapping("unit", "unit g1");
    }

    @Test
    void shouldNameTheUnknownKeyWithItsPlaceAndTheKeyItMostLikelyMeant() {
        MappingReader u = unit();
        u.requiredDouble("ratingMw");
        u.optionalDouble("droopPct", 4);
        u.allow("online", "cycleS", "turbine", "minPulseMs", "shape", "id");
        u.finish();
        assertThat(problems).containsExactly(
                "u.yaml:4:3: unknown key 'droop' in unit g1 (did you mean 'droopPct'?); allowed here: "
                        + "[ratingMw, droopPct, online, cycleS, turbine, minPulseMs, shape, id]");
    }

    @Test
    void shouldReadAWholeNumberExactlyAcrossAllSixtyFourBits() {
        // a random seed of a campaign run uses all 64 bits; through a double it would lose its last digits
        List<String> problems = new java.util.ArrayList<>();
        MappingReader r = new MappingReader(YamlNode.read("s.yaml",
                "seed: 2186024489510581814\nnegative: -9223372036854775808\nwritten: 5.0\nhuge: 9223372036854775808\n"), "the file", problems);
        assertThat(r.optionalLong("seed", 0)).isEqualTo(2_186_024_489_510_581_814L);
        assertThat(r.optionalLong("negative", 0)).isEqualTo(Long.MIN_VALUE);
        assertThat(r.optionalLong("written", 0)).isEqualTo(5L);
        assertThat(r.optionalLong("huge", 7)).isEqualTo(7L);
        assertThat(problems).singleElement().asString().startsWith("s.yaml:4:").contains("huge", "9223372036854775808");
    }

    @Test
    void shouldNameTheMissingKeyAtTheMappingItBelongsTo() {
        double v = unit().requiredDouble("governorTimeConstantS");
        assertThat(v).isNaN();
        assertThat(problems).containsExactly("u.yaml:2:3: unit g1 is missing 'governorTimeConstantS'");
    }

    @Test
    void shouldNameTheWrongTypeAndTheTextFound() {
        MappingReader u = unit();
        assertThat(u.optionalBoolean("online", true)).isTrue();
        assertThat(u.requiredDouble("id")).isNaN();
        assertThat(u.optionalLong("minPulseMs", 100)).isEqualTo(100);
        assertThat(u.optionalDoubles("shape")).containsExactly(1.0);
        assertThat(problems).containsExactly(
                "u.yaml:5:11: online of unit g1 must be true or false, got 'sometimes'",
                "u.yaml:2:7: id of unit g1 must be a number, got 'g1'",
                "u.yaml:8:15: minPulseMs of unit g1 must be a whole number, got '250.5'",
                "u.yaml:9:14: shape of unit g1 must hold numbers only");
        assertThat(u.failed("id")).isTrue();
    }

    @Test
    void shouldGiveTheRangeWhenANumberIsOutsideIt() {
        MappingReader u = unit();
        assertThat(u.optionalDouble("cycleS", 4, Range.closed(1, 10))).isEqualTo(4);
        assertThat(u.requiredDouble("ratingMw", Range.positive(100))).isNaN();
        assertThat(u.optionalLong("missingMs", 7, Range.closed(1, 5))).isEqualTo(7);
        assertThat(problems).containsExactly(
                "u.yaml:6:3: cycleS of unit g1 = 30 is outside [1, 10]",
                "u.yaml:3:3: ratingMw of unit g1 = 120 is outside (0, 100]");
    }

    @Test
    void shouldOfferTheClosestWordForAChoice() {
        String t = unit().optionalChoice("turbine", "reheat", "nonReheat", "reheat", "diesel");
        assertThat(t).isEqualTo("reheat");
        assertThat(problems).containsExactly(
                "u.yaml:7:3: turbine of unit g1 must be nonReheat, reheat or diesel, got 'diesl' (did you mean 'diesel'?)");
    }

    @Test
    void shouldListEveryProblemInFileOrder() {
        MappingReader u = unit();
        u.optionalBoolean("online", true);
        u.requiredDouble("governorTimeConstantS");
        assertThatThrownBy(() -> ConfigFileException.throwIfAny(problems)).isInstanceOf(ConfigFileException.class)
                .hasMessage("u.yaml:2:3: unit g1 is missing 'governorTimeConstantS'\n"
                        + "u.yaml:5:11: online of unit g1 must be true or false, got 'sometimes'");
    }

    @Test
    void shouldPointAtTheProblemOfBrokenYamlOnOneLine() {
        // a missing comma in a flow mapping: the parser's problem is at the second key, line 2 column 41
        assertThatThrownBy(() -> YamlNode.read("s.yaml", "faults:\n  - {id: quarry-lossy, type: drop target: quarry-heights}\n"))
                .hasMessage("s.yaml:2:41: not valid YAML: expected ',' or '}', but got : (while parsing a flow mapping at 2:5)");
        // a line indented out of its list: the problem is on that line, not where the list's last item ended
        assertThatThrownBy(() -> YamlNode.read("i.yaml", "events:\n  - {atS: 60}\n   bad: x\n"))
                .hasMessageStartingWith("i.yaml:3:4: not valid YAML: expected <block end>, but found '<block mapping start>'")
                .hasMessageEndingWith("(while parsing a block collection at 2:3)");
    }

    @Test
    void shouldSayInWordsThatAFileIsMissingOrAFolder(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir) {
        java.nio.file.Path missing = dir.resolve("tarnwik.yaml");
        assertThatThrownBy(() -> YamlNode.read(missing)).hasMessage(missing + ": no such file (relative paths start at "
                + java.nio.file.Path.of("").toAbsolutePath() + ")");
        assertThatThrownBy(() -> YamlNode.read(dir)).hasMessage(dir + ": is a folder, not a file");
    }

    @Test
    void shouldRefuseBrokenYamlAndDuplicateKeysWithTheirPlace() {
        assertThatThrownBy(() -> YamlNode.read("b.yaml", "a: [1, 2\nb: 3\n")).isInstanceOf(ConfigFileException.class)
                .hasMessageStartingWith("b.yaml:").hasMessageContaining("not valid YAML");
        assertThatThrownBy(() -> YamlNode.read("d.yaml", "a: 1\nb: 2\na: 3\n"))
                .hasMessage("d.yaml:3:1: key 'a' appears twice (first at line 1)");
        assertThatThrownBy(() -> YamlNode.read("e.yaml", "")).hasMessage("e.yaml:1:1: the file is empty");
    }

    @Test
    void shouldNameEachListItemByItsIdOrPosition() {
        MappingReader root = new MappingReader(YamlNode.read("l.yaml", "units:\n  - id: a\n  - ratingMw: 3\n"),
                "the site", problems);
        assertThat(root.mappings("units", true, "unit")).extracting(MappingReader::what)
                .containsExactly("unit a", "unit #2");
        root.mappings("areas", true, "area");
        assertThat(problems).containsExactly("l.yaml:1:1: the site is missing 'areas'");
    }
}
