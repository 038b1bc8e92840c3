package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.site.SiteLoader;

class FaultBehaviourTest {
    private static final TargetCatalog CATALOG;

    static {
        try {
            CATALOG = TargetCatalog.of(SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml")));
        } catch (Exception e) {
            throw new IllegalStateException(e);
        }
    }

    private static FaultSpec spec(String type, String target, Map<String, ?> parameters) {
        return FaultSpec.builder(FaultLibrary.standard(), CATALOG).id("f1").type(type).target(target)
                .parameters(parameters).window(0, 10).build();
    }

    @Test
    void shouldBindEveryStandardTypeToABehaviourOfItsStage() {
        for (FaultType t : FaultLibrary.standard().types()) {
            Class<?> stage = switch (t.category()) {
                case LOSS, STALE, TIMING -> StreamFault.class;
                case VALUE -> ValueFault.class;
                case COMMAND -> CommandFault.class;
                case PLANT -> PlantFault.class;
                case CONNECTION -> LinkFault.class;
                case NETWORK -> NetworkFault.class;
            };
            assertThat(stage).as(t.name()).isAssignableFrom(t.behaviour());
        }
        assertThat(FaultLibrary.standard().types()).hasSize(33);
    }

    @Test
    void shouldCarryTheGivenParametersAsTypedFields() {
        FaultSpec delay = spec("delay", "north-basin", Map.of("delayMs", 250, "jitterMs", 40));
        assertThat(delay.behaviour()).isEqualTo(new StreamFaults.Delay(250, 40));
        FaultSpec slow = spec("slowResponse", "basin-gas-1", Map.of());
        assertThat(((PlantFault) slow.behaviour()).slowFactor()).isEqualTo(4.0); // the library's default
        FaultSpec quality = spec("quality", "north-basin", Map.of("validity", "questionable"));
        assertThat(quality.behaviour()).isEqualTo(new ValueFault.QualityOverride("questionable", "none"));
        FaultSpec cut = spec("disconnectClean", "plant", Map.of());
        assertThat(((LinkFault) cut.behaviour()).refuseReconnectS()).isNaN();
    }

    @Test
    void shouldDrawTheDelayFromItsOwnFields() {
        // uniform jitter: 250 + u·40 with u in [0, 1), rounded to whole ms
        StreamFault delay = (StreamFault) spec("delay", "north-basin", Map.of("delayMs", 250, "jitterMs", 40)).behaviour();
        SplittableRandom a = new SplittableRandom(5);
        double u = new SplittableRandom(5).nextDouble();
        assertThat(delay.delayMs(a)).isEqualTo(Math.round(250 + u * 40));
        assertThat(delay.extraCopies(a)).isZero();
        assertThat(delay.lossVerdict(new StreamMemory(), a)).isNull();
    }

    @Test
    void shouldRefuseABehaviourThatReadsAParameterTheTypeDoesNotHave() {
        assertThatThrownBy(() -> new FaultType("delayed", FaultCategory.TIMING, Set.of(TargetKind.AREA),
                List.of(ParameterSpec.number("delayMs", "ms", 0, 1000, 10.0, "fixed delay")), null, "x", StreamFaults.Delay.class))
                .hasMessageContaining("reads 'jitterMs', which is not one of its parameters");
        assertThatThrownBy(() -> new FaultType("quality2", FaultCategory.VALUE, Set.of(TargetKind.AREA),
                List.of(ParameterSpec.number("validity", "", 0, 1, 0.0, "v"), ParameterSpec.choice("flag", "none", List.of(), "f")),
                null, "x", ValueFault.QualityOverride.class))
                .hasMessageContaining("parameter validity is a number but QualityOverride reads a String");
    }
}
